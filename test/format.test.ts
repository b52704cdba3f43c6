import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { declaredNotation } from './helpers.ts';
import { formatAmount, formatCount, formatFigure, formatFixed, formatInput, formatScientific, formatShare, formatSignificant, NOT_AVAILABLE, showControls } from '../src/format.ts';

/**
 * The one number formatter against ECMA-262 itself: six significant figures are what
 * Number.prototype.toPrecision(6) gives (ECMA-262 §21.1.3.5), shortest form as Number → String
 * prints it (§6.1.6.1.20); outside 1e-3 … 1e7, exponent notation with trailing zeros cut.
 */
describe('formatInput', () => {
  it('prints six significant figures as toPrecision(6) read back as a number, for any value from 1e-3 to 1e7', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 9.99999e6, noNaN: true }), fc.boolean(), (magnitude, negative) => {
        const value = negative ? -magnitude : magnitude;
        expect(formatInput(value)).toBe(String(Number(value.toPrecision(6))));
      }),
      { numRuns: 20_000 },
    );
  });

  it('cuts trailing zeros, keeps integers whole and turns toPrecision’s exponent form back into digits', () => {
    expect(formatInput(0.5)).toBe('0.5');
    expect(formatInput(2.5e-3)).toBe('0.0025');
    expect(formatInput(120)).toBe('120');
    expect(formatInput(100000)).toBe('100000');
    expect(formatInput(1234567)).toBe('1234570');
    expect(formatInput(-0.0600)).toBe('-0.06');
    expect(formatInput(0)).toBe('0');
    expect(formatInput(1.95212e-4)).toBe('1.95212E-04');
    expect(formatInput(3.2e9)).toBe('3.2E+09');
    expect(formatFigure(Number.NaN)).toBe('n/a');
  });

  it('says “not available” one way: a missing or non-finite number is n/a, a DQR keeps two decimals (Number.prototype.toFixed)', () => {
    expect(formatFixed(2.25, 2)).toBe('2.25');
    expect(formatFixed(3, 2)).toBe('3.00');
    expect(formatFixed(null, 2)).toBe(NOT_AVAILABLE);
    expect(formatFixed(Number.NaN, 2)).toBe('n/a');
    expect(formatFigure(Number.NaN)).toBe(NOT_AVAILABLE);
  });

  it('gives any number of significant figures in the shortest form, as toPrecision read back as a number', () => {
    expect(formatSignificant(0.042537, 3)).toBe('0.0425');
    expect(formatSignificant(1234.5, 3)).toBe('1230');
    expect(formatSignificant(-12.345678, 4)).toBe('-12.35');
    expect(formatSignificant(1.5e-7, 4)).toBe('1.5e-7');
    expect(formatSignificant(null, 4)).toBe(NOT_AVAILABLE);
    expect(formatSignificant(Number.NaN, 6)).toBe(NOT_AVAILABLE);
  });

  it('writes a count with thousands separated by commas, as Intl.NumberFormat with the en locale does (ECMA-402), without depending on the ICU data installed', () => {
    const reference = new Intl.NumberFormat('en', { useGrouping: true, maximumFractionDigits: 0 });
    for (const value of [0, 7, 999, 1000, 12345, 100000, 1234567, 1000000000]) expect(formatCount(value)).toBe(reference.format(value));
  });
});

describe('showControls', () => {
  it('shows C0 and C1 controls and DEL as JSON escapes, keeps line breaks, tabs and other text (Unicode C0/C1 control ranges; ECMA-404 \\u escapes)', () => {
    expect(showControls('a\u001b[2Jb\rc\u009bd\u007f\n\tä€')).toBe('a\\u001b[2Jb\\u000dc\\u009bd\\u007f\n\tä€');
    // Escaped text inside a JSON string still parses to the original.
    const json = JSON.stringify({ column: 'x\u009by' });
    expect(JSON.parse(showControls(json))).toEqual({ column: 'x\u009by' });
  });
});

describe('formatAmount and formatShare (pages)', () => {
  it('groups the thousands of large amounts as counts are written, and prints shares at one decimal', () => {
    // Six significant figures as toPrecision(6) gives them (ECMA-262 §21.1.3.5), thousands grouped by commas as English text writes them (common practice).
    expect(formatAmount(1200000)).toBe('1,200,000');
    expect(formatAmount(412000.5)).toBe('412,001'); // six significant figures, as formatInput
    expect(formatAmount(-25000)).toBe('-25,000');
    expect(formatAmount(9999)).toBe('9999');
    expect(formatAmount(0.83)).toBe('0.83');
    expect(formatAmount(1.5e8)).toBe('1.5E+08');
    expect([0.45, 0.62998, 1, 0].map(formatShare)).toEqual(['45.0 %', '63.0 %', '100.0 %', '0.0 %']);
  });

  it('writes results in the notation declarations print: mantissa, E, sign, at least two exponent digits (from ECMA-262 toExponential)', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 2, max: 6 }), (value, digits) => {
        expect(formatScientific(value, digits)).toBe(declaredNotation(value, digits));
      }),
      { numRuns: 5000 },
    );
  });
});
