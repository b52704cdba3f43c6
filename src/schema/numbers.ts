/**
 * How numbers are written in users' CSV files. A semicolon-separated file may use a
 * decimal comma (`0,35`); no file may use thousands separators, because `1,234` and
 * `1.234` mean different things in different locales and a silent misreading by a
 * factor of a thousand is the worst thing this tool could do.
 */
export interface Dialect {
  /** True for semicolon-separated files, where `0,35` means 0.35. */
  decimalComma: boolean;
}

export type NumberRead = { ok: true; value: number } | { ok: false; code: 'NOT_A_NUMBER' | 'THOUSANDS_SEPARATOR' | 'OUT_OF_RANGE'; reason: string };

/*
 * Every pattern is linear in the length of the text: no two parts of one can match the same
 * characters, so a long cell of digits fails in one pass, never by backtracking.
 */
const PLAIN = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/;
const DOT_GROUPS = /^[+-]?[1-9]\d{0,2}(?:\.\d{3})+$/;
const COMMA_GROUPS = /^[+-]?[1-9]\d{0,2}(?:,\d{3})+(?:\.\d+)?$/;
/** Groups of three, then a decimal part (`1.234,5`, `1,234.56`); \d+ stops at the next separator, so a failure backtracks once per group. */
const MIXED = /^[+-]?\d{1,3}(?:[.,]\d{3})+[.,]\d+$/;
const SPACE_OR_APOSTROPHE_GROUPS = /^[+-]?\d{1,3}(?:[ \u00a0\u202f'’]\d{3})+(?:[.,]\d+)?$/;

/** Longest number cell read: 64 characters hold any double in full (17 significant digits and an exponent) many times over. */
export const MAX_NUMBER_LENGTH = 64;

export function readNumber(written: string, dialect: Dialect): NumberRead {
  const text = written.trim();
  if (text.length > MAX_NUMBER_LENGTH) return { ok: false, code: 'NOT_A_NUMBER', reason: `${text.length} characters long; a number has at most ${MAX_NUMBER_LENGTH}` };
  const read = readWritten(text, dialect);
  // 1e309 is beyond the largest double (about 1.8E+308): JavaScript reads it as Infinity,
  // which no result can carry (results.json has no Infinity, and null means "not available").
  if (read.ok && !Number.isFinite(read.value)) return { ok: false, code: 'OUT_OF_RANGE', reason: 'beyond the largest number a result can hold (about 1.8E+308)' };
  return read;
}

function readWritten(text: string, dialect: Dialect): NumberRead {
  if (SPACE_OR_APOSTROPHE_GROUPS.test(text) || MIXED.test(text)) {
    return { ok: false, code: 'THOUSANDS_SEPARATOR', reason: 'thousands separators are not accepted' };
  }
  if (PLAIN.test(text)) {
    if (dialect.decimalComma && DOT_GROUPS.test(text)) {
      return { ok: false, code: 'THOUSANDS_SEPARATOR', reason: 'ambiguous in a semicolon-separated file: a dot here may be a thousands separator' };
    }
    return { ok: true, value: Number(text) };
  }
  if (DECIMAL_COMMA.test(text) || COMMA_GROUPS.test(text)) {
    if (!dialect.decimalComma) {
      return COMMA_GROUPS.test(text)
        ? { ok: false, code: 'THOUSANDS_SEPARATOR', reason: 'thousands separators are not accepted' }
        : { ok: false, code: 'NOT_A_NUMBER', reason: 'a decimal comma is accepted only in semicolon-separated files' };
    }
    if (COMMA_GROUPS.test(text) && !DECIMAL_COMMA.test(text)) {
      return { ok: false, code: 'THOUSANDS_SEPARATOR', reason: 'thousands separators are not accepted' };
    }
    return { ok: true, value: Number(text.replace(',', '.')) };
  }
  return { ok: false, code: 'NOT_A_NUMBER', reason: 'not a number' };
}

/** A share as a fraction (`0.35`) or a percentage (`35%`, `35 %`). */
export function readShare(written: string, dialect: Dialect): NumberRead {
  const text = written.trim();
  const percent = text.endsWith('%');
  const read = readNumber(percent ? text.slice(0, -1) : text, dialect);
  if (!read.ok) return read;
  return { ok: true, value: percent ? read.value / 100 : read.value };
}
