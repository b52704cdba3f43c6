import { describe, expect, it } from 'vitest';
import { unit as mathUnit } from 'mathjs';
import { canonicalUnit, conversionFactor, convertible, dimensionOf } from '../../src/reference/units.ts';

// Reference: mathjs (general-purpose math library from the npm registry) and its unit system.
const viaMathjs = (from: string, to: string) => mathUnit(1, from).toNumber(to);

describe('unit conversion', () => {
  it.each([
    ['kWh', 'MJ', 'kWh', 'MJ'],
    ['MJ', 'kWh', 'MJ', 'kWh'],
    ['GJ', 'MJ', 'GJ', 'MJ'],
    ['kJ', 'MJ', 'kJ', 'MJ'],
    ['MWh', 'GJ', 'MWh', 'GJ'],
    ['Wh', 'kJ', 'Wh', 'kJ'],
    ['g', 'kg', 'g', 'kg'],
    ['t', 'kg', 'tonne', 'kg'],
    ['g', 't', 'g', 'tonne'],
    ['L', 'm3', 'L', 'm3'],
    ['m3', 'L', 'm3', 'L'],
    ['mm', 'm', 'mm', 'm'],
    ['km', 'm', 'km', 'm'],
  ])('1 %s in %s agrees with mathjs', (from, to, mFrom, mTo) => {
    expect(conversionFactor(from, to)).toBeCloseTo(viaMathjs(mFrom, mTo), 12);
  });

  it('1 kWh = 3.6 MJ exactly (1 W = 1 J/s, 1 h = 3600 s; SI Brochure, 9th ed.)', () => {
    expect(conversionFactor('kWh', 'MJ')).toBe(3.6);
  });

  it('tonne-kilometres: 1 kg·km = 0.001 tkm (mass × distance, SI prefixes)', () => {
    expect(conversionFactor('kgkm', 'tkm')).toBeCloseTo(viaMathjs('kg', 'tonne') * viaMathjs('km', 'km'), 15);
  });

  it('accepts common spellings case-insensitively and refuses other dimensions', () => {
    expect(canonicalUnit('KWH')).toBe('kWh');
    expect(canonicalUnit('tonnes')).toBe('t');
    expect(canonicalUnit('litre')).toBe('L');
    expect(canonicalUnit('pcs')).toBe('piece');
    expect(canonicalUnit('furlong')).toBeUndefined();
    expect(dimensionOf('m³')).toBe('volume');
    expect(convertible('kWh', 'kg')).toBe(false);
    expect(() => conversionFactor('kWh', 'kg')).toThrow(/cannot convert/);
  });
});
