import { describe, expect, it } from 'vitest';
import { readNumber, readShare } from '../../src/schema/numbers.ts';

// Expected values are the arithmetic value of the text as written, under the reading rules of
// docs/input-format.md; refusing grouped digits follows common practice for locale-neutral
// data files (1,234 and 1.234 mean different numbers in different locales).
const comma = { decimalComma: false };
const semicolon = { decimalComma: true };

describe('numbers as users write them', () => {
  it.each([
    ['0.35', 0.35],
    ['12', 12],
    ['-3.5', -3.5],
    ['+2', 2],
    ['.5', 0.5],
    ['1.2e-3', 0.0012],
    ['4E2', 400],
    [' 7.25 ', 7.25],
    ['0.350', 0.35],
  ])('comma file: %s → %d', (written, value) => {
    expect(readNumber(written, comma)).toEqual({ ok: true, value });
  });

  it.each([
    ['0,35', 0.35],
    ['12,5', 12.5],
    ['-0,001', -0.001],
    ['1,5e3', 1500],
    ['0.35', 0.35],
    ['0.350', 0.35],
  ])('semicolon file: %s → %d (decimal comma accepted)', (written, value) => {
    expect(readNumber(written, semicolon)).toEqual({ ok: true, value });
  });

  it.each([
    ['1,234.5', comma],
    ['1,234', comma],
    ['1.234,5', semicolon],
    ['1 234', comma],
    ['1 234,5', semicolon],
    ["1'234", comma],
    ['1.234', semicolon],
    ['12.345.678', semicolon],
  ])('refuses the thousands separator in %s', (written, dialect) => {
    expect(readNumber(written, dialect)).toMatchObject({ ok: false, code: 'THOUSANDS_SEPARATOR' });
  });

  it.each([['12,5kg'], ['12.5kg'], ['abc'], [''], ['1.2.3'], ['NaN'], ['Infinity'], ['0x10'], ['5%']])('refuses %s as a number', (written) => {
    expect(readNumber(written, semicolon)).toMatchObject({ ok: false, code: 'NOT_A_NUMBER' });
  });

  it('refuses a number beyond the largest double, which JavaScript would read as Infinity (IEEE 754 binary64: about 1.797E+308)', () => {
    expect(Number('1e309')).toBe(Infinity);
    for (const written of ['1e309', '-1e309', '1,8e308']) expect(readNumber(written, semicolon)).toMatchObject({ ok: false, code: 'OUT_OF_RANGE' });
    expect(readNumber('1.7e308', comma)).toEqual({ ok: true, value: 1.7e308 });
  });

  it('refuses cells too long to be a number, and a long cell of digits or spaces is read in one pass', () => {
    expect(readNumber('1'.repeat(1_000_000), comma)).toMatchObject({ ok: false, code: 'NOT_A_NUMBER', reason: expect.stringMatching(/1000000 characters long; a number has at most 64/) });
    expect(readShare(`${' '.repeat(300_000)}x%`, comma)).toMatchObject({ ok: false, code: 'NOT_A_NUMBER' });
    expect(readShare(`1${' '.repeat(300_000)}%`, comma)).toEqual({ ok: true, value: 0.01 });
    // The longest number read in full: 17 significant digits and an exponent fit many times over.
    expect(readNumber(`0.${'0'.repeat(40)}12345678901234567`, comma)).toMatchObject({ ok: true });
  });

  it('says why a decimal comma fails in a comma-separated file', () => {
    expect(readNumber('0,35', comma)).toMatchObject({ ok: false, code: 'NOT_A_NUMBER', reason: expect.stringMatching(/semicolon/) });
  });

  it.each([
    ['35%', comma, 0.35],
    ['35 %', comma, 0.35],
    ['0.35', comma, 0.35],
    ['12,5%', semicolon, 0.125],
    ['100%', comma, 1],
    ['0', comma, 0],
  ])('share %s → %d', (written, dialect, value) => {
    const read = readShare(written, dialect);
    expect(read.ok).toBe(true);
    if (read.ok) expect(read.value).toBeCloseTo(value, 12);
  });
});
