import { z } from 'zod';
import type { Dialect } from './numbers.ts';
import type { CellMeta } from './cells.ts';
import type { Severity } from '../problems.ts';

/** The columns that identify a row of a file, and what a second row with the same values is. */
export interface KeyRule {
  columns: readonly string[];
  /** An error, or a warning where a repeat is legal but usually a double count. */
  repeat: Severity;
  /** The key in words, for the message ("line_id within its product"). */
  what: string;
}

/**
 * One input CSV: its name, what it is for, and the zod schema of one row. The row
 * schema's keys are the canonical column names (the public contract); its cells carry
 * the metadata the docs are generated from.
 */
export interface CsvFileSchema<Shape extends z.ZodRawShape = z.ZodRawShape> {
  file: string;
  purpose: string;
  /** Built per dialect, because a semicolon file may write decimal commas. */
  row: (dialect: Dialect) => z.ZodObject<Shape>;
  /** A filled-in example row for `init` (written as a comment) and the docs. */
  example: Record<string, string>;
  /** The columns whose values together identify a row, and the duplicate rule (src/model/checks/duplicate-keys.ts). */
  key: KeyRule;
  /** True when the project is incomplete without at least one row. */
  needsRows: boolean;
  /** True when the file may be left out of the data folder (read as having no rows). */
  optional: boolean;
}

export function defineCsv<Shape extends z.ZodRawShape>(definition: {
  file: string;
  purpose: string;
  row: (dialect: Dialect) => z.ZodObject<Shape>;
  example: Record<string, string>;
  /** A repeat is an error unless said otherwise; the key in words defaults to its columns ("scenario and material"). */
  key: Pick<KeyRule, 'columns'> & Partial<KeyRule>;
  needsRows?: boolean;
  optional?: boolean;
}): CsvFileSchema<Shape> {
  const cache = new Map<boolean, z.ZodObject<Shape>>();
  return {
    ...definition,
    key: { repeat: 'error', what: inWords(definition.key.columns), ...definition.key },
    needsRows: definition.needsRows ?? false,
    optional: definition.optional ?? false,
    row: (dialect) => {
      let schema = cache.get(dialect.decimalComma);
      if (!schema) {
        schema = definition.row(dialect);
        cache.set(dialect.decimalComma, schema);
      }
      return schema;
    },
  };
}

/** `a`, `a and b`, `a, b and c`. */
const inWords = (names: readonly string[]): string => (names.length < 2 ? names.join('') : `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`);

export const DEFAULT_DIALECT: Dialect = { decimalComma: false };

export interface ColumnInfo extends CellMeta {
  name: string;
}

/** The columns of a file with their metadata, in contract order. */
export function columnsOf(schema: CsvFileSchema): ColumnInfo[] {
  const shape = schema.row(DEFAULT_DIALECT).shape;
  return Object.entries(shape).map(([name, field]) => ({ name, ...((z.globalRegistry.get(field as z.ZodType) ?? {}) as CellMeta) }));
}

export type RowOf<S> = S extends CsvFileSchema<infer Shape> ? z.output<z.ZodObject<Shape>> : never;
