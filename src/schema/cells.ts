import { z } from 'zod';
import { TOP_LEVEL_NAMES } from '../files.ts';
import type { ProblemCode } from '../problems.ts';
import { nearestName } from '../reference/nearest.ts';
import { canonicalUnit, KNOWN_UNITS, unitsOf, dimensionOf, type Dimension } from '../reference/units.ts';
import { readNumber, readShare, type Dialect } from './numbers.ts';

/**
 * Cell schemas: each turns the text of one CSV cell (or undefined when the column is
 * absent) into a typed value, or adds an issue whose `params` carry the stable problem
 * code and what was expected. The metadata (`meta`) is what `loopsheet schema` and the
 * column reference are generated from.
 */
export interface CellMeta {
  description: string;
  kind: 'text' | 'id' | 'reference' | 'number' | 'share' | 'choice' | 'date' | 'unit';
  required: boolean;
  unit?: string;
  default?: string | number;
  choices?: readonly string[];
  references?: string;
  [key: string]: unknown;
}

export interface IssueParams {
  problem: ProblemCode;
  expected: string;
  hint?: string;
}

type Ctx = z.RefinementCtx;

export function report(ctx: Ctx, problem: ProblemCode, message: string, expected: string, hint?: string): typeof z.NEVER {
  const params: IssueParams = { problem, expected, ...(hint ? { hint } : {}) };
  ctx.addIssue({ code: 'custom', message, params });
  return z.NEVER;
}

/** The same, for a row-level rule, on the column the rule is reported against. */
export function reportAt(ctx: Ctx, column: string, problem: ProblemCode, message: string, expected: string): void {
  const params: IssueParams = { problem, expected };
  ctx.addIssue({ code: 'custom', message, params, path: [column] });
}

const isBlank = (raw: string | undefined): raw is undefined => raw === undefined || raw.trim() === '';

const cell = () => z.string().optional();

function withMeta<T extends z.ZodType>(schema: T, meta: CellMeta): T {
  return schema.meta(meta) as T;
}

export function text(description: string, options: { required?: boolean } = {}) {
  const required = options.required ?? false;
  return withMeta(
    cell().transform((raw, ctx) => {
      if (isBlank(raw)) return required ? report(ctx, 'VALUE_REQUIRED', 'is empty', 'text') : undefined;
      return raw.trim();
    }),
    { description, kind: 'text', required },
  );
}

export function requiredText(description: string) {
  return withMeta(
    cell().transform((raw, ctx): string => {
      if (isBlank(raw)) return report(ctx, 'VALUE_REQUIRED', 'is empty', 'text');
      return raw.trim();
    }),
    { description, kind: 'text', required: true },
  );
}

const ID = /^[A-Za-z0-9][A-Za-z0-9._:+\-/]*$/;
/** Ids that name output folders stay to characters safe in any path on any system. */
const PATH_SAFE_ID = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;
/** Longest id: long enough for any catalogue number, short of any file system's name limit. */
export const MAX_ID_LENGTH = 200;
/** Longest id that names a folder: its files' paths must stay within every system's limits. */
export const MAX_PATH_ID_LENGTH = 100;
/** Names Windows keeps for devices, with or without an extension (`nul`, `con.txt`). */
const DEVICE_NAME = /^(?:con|prn|aux|nul|com[0-9¹²³]|lpt[0-9¹²³])(?:\..*)?$/i;
const RESERVED = new Set(TOP_LEVEL_NAMES.map((name) => name.toLowerCase()));

const ID_EXPECTED = 'an identifier: letters, digits and . _ - : + / , starting with a letter or digit';
const PATH_ID_EXPECTED = `an identifier of letters, digits, ".", "_" and "-", starting with a letter or digit, at most ${MAX_PATH_ID_LENGTH} characters (it names a folder in the output)`;

/** Checks an id's text; an issue and false when it is not one. `names` says where it becomes a folder name. */
function checkId(value: string, pattern: RegExp, expected: string, ctx: Ctx, names: 'folder' | 'none'): boolean {
  const limit = names === 'folder' ? MAX_PATH_ID_LENGTH : MAX_ID_LENGTH;
  if (value.length > limit) {
    report(ctx, 'ID_TOO_LONG', `is ${value.length} characters long; an identifier has at most ${limit}`, expected);
    return false;
  }
  if (!pattern.test(value)) {
    report(ctx, 'BAD_ID', 'is not a valid identifier', expected);
    return false;
  }
  if (names === 'folder') {
    if (value.endsWith('.')) {
      report(ctx, 'BAD_ID', 'ends in "." (Windows drops it from a folder name)', expected);
      return false;
    }
    if (RESERVED.has(value.toLowerCase()) || DEVICE_NAME.test(value)) {
      const why = DEVICE_NAME.test(value) ? 'is a device name on Windows' : 'is the name of a file or folder the build writes beside the products';
      report(ctx, 'ID_RESERVED', `${why}, so it cannot name this folder`, expected, `choose another id; reserved: ${TOP_LEVEL_NAMES.join(', ')} and Windows device names (con, nul, com1, …)`);
      return false;
    }
  }
  return true;
}

function idCell(description: string, kind: 'id' | 'reference', pattern: RegExp, expected: string, names: 'folder' | 'none', references?: string) {
  return withMeta(
    cell().transform((raw, ctx): string => {
      if (isBlank(raw)) return report(ctx, 'VALUE_REQUIRED', 'is empty', expected);
      const value = raw.trim();
      return checkId(value, pattern, expected, ctx, names) ? value : z.NEVER;
    }),
    { description, kind, required: true, ...(names === 'folder' ? { path: true } : {}), ...(references ? { references } : {}) },
  );
}

export const id = (description: string) => idCell(description, 'id', ID, ID_EXPECTED, 'none');
/** An id that names a folder in the output (products, families): a single safe path segment. */
export const folderId = (description: string) => idCell(description, 'id', PATH_SAFE_ID, PATH_ID_EXPECTED, 'folder');
/** A reference that may also be `*`, "every other" (eol.csv material). */
export const referenceOrWildcard = (description: string, references: string) =>
  idCell(description, 'reference', /^(?:\*|[A-Za-z0-9][A-Za-z0-9._:+\-/]*)$/, `the id of a row in ${references}, or *`, 'none', references);
export const reference = (description: string, references: string) =>
  idCell(description, 'reference', ID, `the id of a row in ${references}`, 'none', references);

export function optionalReference(description: string, references: string) {
  return withMeta(
    cell().transform((raw, ctx): string | undefined => {
      if (isBlank(raw)) return undefined;
      const value = raw.trim();
      return checkId(value, ID, `the id of a row in ${references}`, ctx, 'none') ? value : z.NEVER;
    }),
    { description, kind: 'reference', required: false, references },
  );
}

interface QuantityOptions {
  required?: boolean;
  default?: number;
  /** Zero is not a meaningful value (a declared unit's mass). */
  positive?: boolean;
  /** Values may be negative (credits); off by default. */
  signed?: boolean;
}

function quantityIssue(value: number, options: QuantityOptions, expected: string, ctx: Ctx): boolean {
  if (!options.signed && value < 0) {
    report(ctx, 'NEGATIVE_VALUE', 'is negative', expected);
    return false;
  }
  if (options.positive && value <= 0) {
    report(ctx, 'OUT_OF_RANGE', 'must be greater than zero', expected);
    return false;
  }
  return true;
}

/** Reads a written (non-blank) number cell and applies the sign rules; z.NEVER after an issue. */
function parseQuantity(written: string, dialect: Dialect, options: QuantityOptions, expected: string, ctx: Ctx): number {
  const read = readNumber(written, dialect);
  if (!read.ok) return report(ctx, read.code, `expected ${expected}: ${read.reason}`, expected);
  if (!quantityIssue(read.value, options, expected, ctx)) return z.NEVER;
  return read.value;
}

/** Reads a written (non-blank) share cell and checks its range; z.NEVER after an issue. */
function parseShare(written: string, dialect: Dialect, belowOne: boolean, expected: string, ctx: Ctx): number {
  const read = readShare(written, dialect);
  if (!read.ok) return report(ctx, read.code, `expected ${expected}: ${read.reason}`, expected);
  if (read.value < 0 || read.value > 1 || (belowOne && read.value >= 1)) {
    return report(ctx, 'OUT_OF_RANGE', `is outside ${belowOne ? '0 ≤ x < 1' : '0–1'}`, expected);
  }
  return read.value;
}

/** A number in a stated unit. Empty is "not given": undefined, or the default. */
export function quantity(dialect: Dialect, description: string, unit: string, options: QuantityOptions = {}) {
  const required = options.required ?? options.default === undefined;
  const expected = `a${options.positive ? ' positive' : options.signed ? '' : ' non-negative'} number in ${unit}`;
  return withMeta(
    cell().transform((raw, ctx): number => {
      if (isBlank(raw)) {
        if (options.default !== undefined) return options.default;
        return report(ctx, 'VALUE_REQUIRED', 'is empty', expected);
      }
      return parseQuantity(raw, dialect, options, expected, ctx);
    }),
    { description, kind: 'number', required, unit, ...(options.default === undefined ? {} : { default: options.default }) },
  );
}

/** A number that may be absent: an empty cell means "not available", never 0. */
export function optionalQuantity(dialect: Dialect, description: string, unit: string, options: QuantityOptions = {}) {
  const expected = `a${options.signed ? '' : ' non-negative'} number in ${unit}, or empty for "not available"`;
  return withMeta(
    cell().transform((raw, ctx): number | null => {
      if (isBlank(raw)) return null;
      return parseQuantity(raw, dialect, options, expected, ctx);
    }),
    { description, kind: 'number', required: false, unit },
  );
}

interface ShareOptions {
  default?: number;
  /** The share may not reach 1 (a scrap rate of 100 % leaves no product). */
  belowOne?: boolean;
}

/** A share between 0 and 1, written as a fraction (0.35) or a percentage (35%). */
export function share(dialect: Dialect, description: string, options: ShareOptions = {}) {
  const expected = options.belowOne ? 'a share from 0 to below 1 (0.35 or 35%)' : 'a share from 0 to 1 (0.35 or 35%)';
  const required = options.default === undefined;
  return withMeta(
    cell().transform((raw, ctx): number => {
      if (isBlank(raw)) {
        if (options.default !== undefined) return options.default;
        return report(ctx, 'VALUE_REQUIRED', 'is empty', expected);
      }
      return parseShare(raw, dialect, options.belowOne ?? false, expected, ctx);
    }),
    { description, kind: 'share', required, unit: 'share (0–1 or %)', ...(options.default === undefined ? {} : { default: options.default }) },
  );
}

/** A written word matched case-insensitively against the choices; a located issue with the nearest one otherwise. */
function matchChoice<const T extends readonly [string, ...string[]]>(raw: string, choices: T, expected: string, ctx: Ctx): T[number] {
  const value = raw.trim().toLowerCase();
  const found = choices.find((c) => c.toLowerCase() === value);
  if (found !== undefined) return found;
  const near = nearestName(raw.trim(), choices);
  return report(ctx, 'BAD_CHOICE', `is not ${expected}`, expected, near ? `did you mean "${near}"?` : undefined);
}

/** One of a fixed set of words, matched case-insensitively. */
export function choice<const T extends readonly [string, ...string[]]>(description: string, choices: T, defaultValue?: T[number]) {
  const expected = `one of ${choices.join(', ')}`;
  return withMeta(
    cell().transform((raw, ctx): T[number] => {
      if (isBlank(raw)) {
        if (defaultValue !== undefined) return defaultValue;
        return report(ctx, 'VALUE_REQUIRED', 'is empty', expected);
      }
      return matchChoice(raw, choices, expected, ctx);
    }),
    { description, kind: 'choice', required: defaultValue === undefined, choices, ...(defaultValue === undefined ? {} : { default: defaultValue }) },
  );
}

/** One of a fixed set of words, or empty (undefined). */
export function optionalChoice<const T extends readonly [string, ...string[]]>(description: string, choices: T) {
  const expected = `one of ${choices.join(', ')}, or empty`;
  return withMeta(
    cell().transform((raw, ctx): T[number] | undefined => {
      if (isBlank(raw)) return undefined;
      return matchChoice(raw, choices, expected, ctx);
    }),
    { description, kind: 'choice', required: false, choices },
  );
}

/**
 * The geometric standard deviation of a lognormal around the row's value (its median), at
 * least 1; empty: the value is fixed in an uncertainty run.
 */
export function gsdCell(dialect: Dialect, description: string) {
  const expected = 'a geometric standard deviation of at least 1 (1.1 is about ±10 % at one sigma), or empty for "fixed"';
  return withMeta(
    cell().transform((raw, ctx): number | null => {
      if (isBlank(raw)) return null;
      const read = readNumber(raw, dialect);
      if (!read.ok) return report(ctx, read.code, `expected ${expected}: ${read.reason}`, expected);
      if (!(read.value >= 1)) return report(ctx, 'OUT_OF_RANGE', 'is below 1', expected);
      return read.value;
    }),
    { description, kind: 'number', required: false, unit: 'GSD (≥ 1)' },
  );
}

/** An optional whole number within a range (a score, a year); empty is null, never 0. */
function optionalWholeNumber(description: string, range: { min: number; max: number; expected: string; unit: string }) {
  return withMeta(
    cell().transform((raw, ctx): number | null => {
      if (isBlank(raw)) return null;
      if (!/^\s*\d+\s*$/.test(raw)) return report(ctx, 'NOT_A_NUMBER', `expected ${range.expected}`, range.expected);
      const value = Number(raw.trim());
      if (value < range.min || value > range.max) return report(ctx, 'OUT_OF_RANGE', `is outside ${range.min}–${range.max}`, range.expected);
      return value;
    }),
    { description, kind: 'number', required: false, unit: range.unit },
  );
}

/** A pedigree score: a whole number from 1 (best) to 5, or empty (not scored, never guessed). */
export const pedigreeScore = (description: string) => optionalWholeNumber(description, { min: 1, max: 5, expected: 'a whole number from 1 (best) to 5, or empty for "not scored"', unit: 'score 1–5' });

/** A calendar year the data represent (1900–2100), or empty: not given. */
export const yearCell = (description: string) => optionalWholeNumber(description, { min: 1900, max: 2100, expected: 'a year such as 2024, or empty for "not given"', unit: 'year' });

/** A unit from the unit registry, optionally of one dimension. Returns the canonical spelling. */
export function unitCell(description: string, dimension?: Dimension) {
  const allowed = dimension ? unitsOf(dimension) : [...KNOWN_UNITS];
  const expected = `a unit: one of ${allowed.join(', ')}`;
  return withMeta(
    cell().transform((raw, ctx): string => {
      if (isBlank(raw)) return report(ctx, 'VALUE_REQUIRED', 'is empty', expected);
      const unit = canonicalUnit(raw);
      if (unit === undefined) {
        const near = nearestName(raw.trim(), allowed);
        return report(ctx, 'BAD_UNIT', 'is not a known unit', expected, near ? `did you mean "${near}"?` : undefined);
      }
      if (dimension && dimensionOf(unit) !== dimension) {
        return report(ctx, 'UNIT_MISMATCH', `is not a unit of ${dimension}`, expected);
      }
      return unit;
    }),
    { description, kind: 'unit', required: true, choices: allowed },
  );
}

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

/** Checks an ISO calendar date, including the day of the month (2026-02-30 is refused). */
export function isIsoDate(value: string): boolean {
  const match = ISO_DATE.exec(value);
  if (!match) return false;
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const date = new Date(Date.UTC(year, month - 1, day));
  return date.getUTCFullYear() === year && date.getUTCMonth() === month - 1 && date.getUTCDate() === day;
}

/** A share that may be absent (undefined): the method then uses its documented default. */
export function optionalShare(dialect: Dialect, description: string) {
  const expected = 'a share from 0 to 1 (0.2 or 20%), or empty for the default';
  return withMeta(
    cell().transform((raw, ctx): number | undefined => {
      if (isBlank(raw)) return undefined;
      return parseShare(raw, dialect, false, expected, ctx);
    }),
    { description, kind: 'share', required: false, unit: 'share (0–1 or %)' },
  );
}
