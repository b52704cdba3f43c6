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

export type NumberRead = { ok: true; value: number } | { ok: false; code: 'NOT_A_NUMBER' | 'THOUSANDS_SEPARATOR'; reason: string };

const PLAIN = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/;
const DOT_GROUPS = /^[+-]?[1-9]\d{0,2}(?:\.\d{3})+$/;
const COMMA_GROUPS = /^[+-]?[1-9]\d{0,2}(?:,\d{3})+(?:\.\d+)?$/;
const MIXED = /^[+-]?\d{1,3}(?:[.,]\d{3})+[.,]\d+$/;
const SPACE_OR_APOSTROPHE_GROUPS = /^[+-]?\d{1,3}(?:[ \u00a0\u202f'’]\d{3})+(?:[.,]\d+)?$/;

export function readNumber(written: string, dialect: Dialect): NumberRead {
  const text = written.trim();
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
  const percent = /^(.*?)\s*%$/.exec(text);
  const read = readNumber(percent ? (percent[1] ?? '') : text, dialect);
  if (!read.ok) return read;
  return { ok: true, value: percent ? read.value / 100 : read.value };
}
