import { describe, expect, it } from 'vitest';
import { INDICATORS, findIndicator, inReportingOrder } from '../../src/reference/indicators.ts';
import { GREENHOUSE_GASES, findGas } from '../../src/reference/ghg.ts';

describe('EN 15804+A2 indicator registry', () => {
  it('has unique codes and the core, resource, waste and output indicators of EN 15804+A2 (from memory of §7.2 tables 3–7)', () => {
    const codes = INDICATORS.map((i) => i.code);
    expect(new Set(codes).size).toBe(codes.length);
    for (const code of ['GWP-total', 'GWP-fossil', 'GWP-biogenic', 'GWP-luluc', 'ODP', 'AP', 'EP-freshwater', 'EP-marine', 'EP-terrestrial', 'POCP', 'ADP-minerals&metals', 'ADP-fossil', 'WDP']) {
      expect(findIndicator(code)?.group).toBe('core');
    }
    expect(INDICATORS.filter((i) => i.group === 'core')).toHaveLength(13);
    expect(INDICATORS.filter((i) => i.group === 'additional').map((i) => i.code)).toEqual(['PM', 'IRP', 'ETP-fw', 'HTP-c', 'HTP-nc', 'SQP']);
    expect(INDICATORS.filter((i) => i.group === 'waste').map((i) => i.code)).toEqual(['HWD', 'NHWD', 'RWD']);
    expect(findIndicator('GWP-total')?.unit).toBe('kg CO2 eq.');
    expect(findIndicator('AP')?.unit).toBe('mol H+ eq.');
  });

  it('SM, CRU, MFR, MER and the exported energy EEE, EET come from the product’s own flows, not from factors (EN 15804+A2; field guide §2)', () => {
    expect(INDICATORS.filter((i) => i.basis === 'flows').map((i) => i.code).sort()).toEqual(['CRU', 'EEE', 'EET', 'MER', 'MFR', 'SM']);
  });

  it('sorts into reporting order and matches codes case-insensitively', () => {
    expect(inReportingOrder(['PENRT', 'AP', 'GWP-total'])).toEqual(['GWP-total', 'AP', 'PENRT']);
    expect(findIndicator('gwp-TOTAL')?.code).toBe('GWP-total');
  });
});

describe('GWP-100 tables', () => {
  // IPCC AR6 WG1 (2021) Table 7.15 and IPCC AR5 WG1 (2013) Table 8.A.1.
  it.each([
    ['CO2', 1, 1],
    ['CH4-fossil', 29.8, 28],
    ['CH4-nonfossil', 27.0, 28],
    ['N2O', 273, 265],
    ['CF4', 7380, 6630],
    ['C2F6', 12400, 11100],
    ['SF6', 25200, 23500],
    ['HFC-134a', 1530, 1300],
  ])('%s: AR6 %d, AR5 %d', (id, ar6, ar5) => {
    const gas = findGas(`ghg:${id}`);
    expect(gas?.AR6).toBe(ar6);
    expect(gas?.AR5).toBe(ar5);
  });

  it('knows each gas once', () => {
    expect(new Set(GREENHOUSE_GASES.map((g) => g.id)).size).toBe(GREENHOUSE_GASES.length);
  });
});
