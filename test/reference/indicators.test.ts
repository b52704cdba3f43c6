import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { ROOT } from '../helpers.ts';
import { INDICATORS, IndicatorSet, findIndicator } from '../../src/reference/indicators.ts';
import { GREENHOUSE_GASES, findGas } from '../../src/reference/ghg.ts';

describe('EN 15804+A2 indicator registry', () => {
  it('has the 37 indicators of EN 15804+A2 in their five tables: core 13, additional 6, resource 10, waste 3, output 5 (field guide §2)', () => {
    const codes = INDICATORS.map((i) => i.code);
    expect(new Set(codes).size).toBe(codes.length);
    for (const code of ['GWP-total', 'GWP-fossil', 'GWP-biogenic', 'GWP-luluc', 'ODP', 'AP', 'EP-freshwater', 'EP-marine', 'EP-terrestrial', 'POCP', 'ADP-minerals&metals', 'ADP-fossil', 'WDP']) {
      expect(findIndicator(code)?.group).toBe('core');
    }
    expect(INDICATORS.filter((i) => i.group === 'core')).toHaveLength(13);
    expect(INDICATORS.filter((i) => i.group === 'additional').map((i) => i.code)).toEqual(['PM', 'IRP', 'ETP-fw', 'HTP-c', 'HTP-nc', 'SQP']);
    expect(INDICATORS.filter((i) => i.group === 'resource').map((i) => i.code)).toEqual(['PERE', 'PERM', 'PERT', 'PENRE', 'PENRM', 'PENRT', 'SM', 'RSF', 'NRSF', 'FW']);
    expect(INDICATORS.filter((i) => i.group === 'waste').map((i) => i.code)).toEqual(['HWD', 'NHWD', 'RWD']);
    expect(INDICATORS.filter((i) => i.group === 'output').map((i) => i.code)).toEqual(['CRU', 'MFR', 'MER', 'EEE', 'EET']);
  });

  it('names every indicator with the name, unit and UUID of the published ILCD+EPD list (EN15804+A2_EF3.1_indicators.csv, read here on its own)', () => {
    const text = readFileSync(path.join(ROOT, 'reference-data/ilcd-epd/identifiers/EN15804+A2_EF3.1_indicators.csv'), 'utf8');
    const rows = parse(text, { columns: true, skip_empty_lines: true, relax_column_count: true }) as Array<Record<string, string>>;
    const listed = rows.filter((row) => /^[0-9a-f]{8}-[0-9a-f]{4}-/.test(row.UUID ?? ''));
    // 18 flow indicators and 19 impact indicators, each once in the registry.
    expect(listed).toHaveLength(37);
    for (const row of listed) {
      const indicator = INDICATORS.find((i) => i.uuid === row.UUID);
      expect(indicator, row['Name (en)']).toBeDefined();
      expect(`${indicator!.name} (${indicator!.code.replace('ADP-fossil', 'ADPF').replace('ADP-minerals&metals', 'ADPE')})`).toBe(row['Name (en)']);
      expect(indicator!.unit).toBe(row['Unit (en)']);
    }
    expect(findIndicator('GWP-total')?.unit).toBe('kg CO2 eqv.');
    expect(findIndicator('AP')?.unit).toBe('mol H+ eqv.');
  });

  it('SM, CRU, MFR, MER and the exported energy EEE, EET come from the product’s own flows, not from factors (EN 15804+A2; field guide §2)', () => {
    expect(INDICATORS.filter((i) => i.basis === 'flows').map((i) => i.code).sort()).toEqual(['CRU', 'EEE', 'EET', 'MER', 'MFR', 'SM']);
  });

  it('sorts into reporting order and matches codes case-insensitively', () => {
    expect(new IndicatorSet().inReportingOrder(['PENRT', 'AP', 'GWP-total'])).toEqual(['GWP-total', 'AP', 'PENRT']);
    // A programme's own indicator comes after EN 15804+A2's.
    expect(new IndicatorSet([{ code: 'GWP-GHG', name: 'GHG', unit: 'kg CO2 eqv.' }]).inReportingOrder(['GWP-GHG', 'PENRT', 'AP'])).toEqual(['AP', 'PENRT', 'GWP-GHG']);
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
