import type { CsvFile, CsvRecord, CsvSource } from '../load/csv.ts';
import type { Problem } from '../problems.ts';
import { nearestName } from '../reference/nearest.ts';
import { findIndicator } from '../reference/indicators.ts';
import { columnsOf, type CsvFileSchema, type RowOf } from './csv-file.ts';
import { describeIssue } from './issues.ts';

/** One validated row and where it came from. */
export interface Row<T> {
  /** First and last physical line of the record (1-based). */
  line: number;
  lineEnd: number;
  value: T;
  /** The cells as written, by canonical column name. */
  raw: Record<string, string>;
}

export interface Table<T> {
  file: string;
  delimiter: ',' | ';';
  /** Canonical column name → 1-based position in the header, for the columns present. */
  columns: Record<string, number>;
  /** Rows that passed their schema. */
  rows: Row<T>[];
  /** Every data record's cells as written (valid or not), for reference checks. */
  written: Array<{ line: number; raw: Record<string, string> }>;
  /** The file as read (its text, to show rows as written); the parsed records are not kept. */
  csv: CsvSource;
}

export interface TableOptions {
  /** Header names matched to a canonical name other than by case (indicator codes). */
  canonicalName?: (header: string) => string | undefined;
  /** Known columns that this file does not read, with the reason (warning). */
  ignored?: (canonical: string) => string | undefined;
  /**
   * Header cells outside the contract are the user's own columns (production.csv's
   * allocation keys): kept in `columns` and `raw` under their trimmed header, not warned
   * about here (the reader of the file says which it uses).
   */
  extraColumns?: boolean;
}

/** Turns records into validated rows one at a time; `finish` returns the table and every problem. */
export interface TableReader<T> {
  add: (record: CsvRecord) => void;
  finish: () => { table: Table<T>; problems: Problem[] };
}

/**
 * Applies a file's zod row schema to its records, as they are read: matches header names to the contract's
 * column names (case-insensitively, after trimming), reports missing, duplicate and
 * unknown columns, and turns every cell issue into a located problem.
 */
export function tableReader<S extends CsvFileSchema>(csv: CsvSource, schema: S, options: TableOptions = {}): TableReader<RowOf<S>> {
  const problems: Problem[] = [];
  const file = csv.file;
  const known = columnsOf(schema);
  const knownNames = known.map((column) => column.name);
  const byLower = new Map(knownNames.map((name) => [name.toLowerCase(), name]));
  const columns: Record<string, number> = {};
  const headerLine = csv.header.line;

  csv.header.names.forEach((header, index) => {
    const position = index + 1;
    if (header === '') return;
    const canonical = byLower.get(header.toLowerCase()) ?? options.canonicalName?.(header) ?? (options.extraColumns ? header : undefined);
    if (canonical === undefined) {
      const near = nearestName(header, knownNames);
      problems.push({
        severity: 'warning', code: 'COLUMN_UNKNOWN', file, line: headerLine, column: header, columnIndex: position, value: header,
        message: 'is not a column of this file and is ignored',
        ...(near ? { hint: `did you mean "${near}"?` } : {}),
      });
      return;
    }
    const ignoredBecause = options.ignored?.(canonical);
    if (ignoredBecause) {
      problems.push({ severity: 'warning', code: 'COLUMN_IGNORED', file, line: headerLine, column: header, columnIndex: position, value: header, message: ignoredBecause });
      return;
    }
    if (columns[canonical] !== undefined) {
      problems.push({ severity: 'error', code: 'COLUMN_DUPLICATE', file, line: headerLine, column: canonical, columnIndex: position, value: header, message: `names the same column as header cell ${columns[canonical]}`, expected: 'each column once' });
      return;
    }
    columns[canonical] = position;
  });

  const missing = new Set<string>();
  for (const column of known) {
    if (column.required && columns[column.name] === undefined) {
      missing.add(column.name);
      problems.push({ severity: 'error', code: 'COLUMN_MISSING', file, line: headerLine, column: column.name, message: `required column ${column.name} is not in the header`, expected: `a column named ${column.name}: ${column.description.replace(/\.$/, '')}` });
    }
  }

  const columnEntries = Object.entries(columns);
  const rowSchema = schema.row({ decimalComma: csv.delimiter === ';' });
  const rows: Row<RowOf<S>>[] = [];
  const written: Table<RowOf<S>>['written'] = [];
  const headerWidth = csv.header.names.length;
  let records = 0;
  const rawOf = (fields: readonly string[]): Record<string, string> => {
    const raw: Record<string, string> = {};
    for (const [name, position] of columnEntries) {
      const field = fields[position - 1];
      if (field !== undefined) raw[name] = field;
    }
    return raw;
  };
  /**
   * `0,995` in a comma-separated file is two fields, and every cell after it moves one column
   * on. Where joining two neighbouring whole numbers as a decimal (`0` and `995` as 0.995)
   * makes the row valid, that is the cause: said once, at the cell, instead of blaming the
   * shifted cells or the extra field.
   */
  const decimalCommaAt = (fields: readonly string[]): { joins: number[]; fields: string[] } | undefined => {
    if (csv.delimiter !== ',') return undefined;
    const joinable = (at: number) => /^\s*[+-]?\d+\s*$/.test(fields[at]!) && /^\s*\d+(?:[eE][+-]?\d+)?\s*%?\s*$/.test(fields[at + 1]!);
    const join = (joins: number[]): string[] => {
      const out: string[] = [];
      for (let at = 0; at < fields.length; at++) {
        if (joins.includes(at)) {
          out.push(`${fields[at]!.trim()}.${fields[at + 1]!.trim()}`);
          at++;
        } else out.push(fields[at]!);
      }
      return out;
    };
    const valid = (joined: string[]) => joined.length <= headerWidth && rowSchema.safeParse(rawOf(joined)).success;
    const candidates = Array.from({ length: Math.max(0, fields.length - 1) }, (_, at) => at).filter(joinable);
    // One decimal comma, anywhere; else every joinable pair from the left (`0,83` and `0,15` in one row).
    for (const at of candidates) if (valid(join([at]))) return { joins: [at], fields: join([at]) };
    const greedy: number[] = [];
    for (const at of candidates) if (!greedy.includes(at - 1)) greedy.push(at);
    return greedy.length > 1 && valid(join(greedy)) ? { joins: greedy, fields: join(greedy) } : undefined;
  };
  const reportDecimalComma = (record: CsvRecord, found: { joins: number[]; fields: string[] }): void => {
    found.joins.forEach((at, k) => {
      // Each join before this one has moved this cell's column one on.
      const position = at + 1 - k;
      const column = columnEntries.find(([, p]) => p === position)?.[0];
      const [whole, decimals] = [record.fields[at]!.trim(), record.fields[at + 1]!.trim()];
      problems.push({
        severity: 'error', code: 'DECIMAL_COMMA', file, line: record.line,
        ...(column ? { column } : {}), columnIndex: position, value: `${whole},${decimals}`,
        message: `reads as two fields, "${whole}" and "${decimals}", and moves every cell after it one column on${record.fields.length > headerWidth ? ` (row has ${record.fields.length} fields, header has ${headerWidth})` : ''}: a decimal comma in a comma-separated file?`,
        expected: `a decimal point (${whole}.${decimals}), or the file saved with semicolons, where decimal commas are read`,
      });
    });
    written.push({ line: record.line, raw: rawOf(found.fields) });
  };
  const add = (record: CsvRecord): void => {
    records++;
    if (record.fields.length > headerWidth && record.fields.slice(headerWidth).some((field) => field.trim() !== '')) {
      const found = decimalCommaAt(record.fields);
      if (found) return reportDecimalComma(record, found);
      problems.push({
        severity: 'error', code: 'FIELD_COUNT', file, line: record.line, columnIndex: headerWidth + 1,
        value: record.fields.slice(headerWidth).join(csv.delimiter),
        message: `row has ${record.fields.length} fields, header has ${headerWidth}`,
        expected: `at most ${headerWidth} fields (a decimal comma in a comma-separated file needs quotes, or save with semicolons)`,
      });
      // Its ids still count, so that no reference to the row is reported as well.
      written.push({ line: record.line, raw: rawOf(record.fields.slice(0, headerWidth)) });
      return;
    }
    const raw = rawOf(record.fields);
    const result = rowSchema.safeParse(raw);
    if (!result.success) {
      const found = decimalCommaAt(record.fields);
      if (found) return reportDecimalComma(record, found);
    }
    written.push({ line: record.line, raw });
    if (result.success) {
      rows.push({ line: record.line, lineEnd: record.lineEnd, value: result.data as RowOf<S>, raw });
      return;
    }
    for (const issue of result.error.issues) {
      const column = String(issue.path[0] ?? '');
      if (missing.has(column)) continue;
      const described = describeIssue(issue);
      const value = raw[column];
      problems.push({
        severity: 'error',
        code: described.code,
        file,
        line: record.line,
        column,
        ...(columns[column] === undefined ? {} : { columnIndex: columns[column] }),
        ...(value === undefined ? {} : { value }),
        message: described.message,
        ...(described.expected ? { expected: described.expected } : {}),
        ...(described.hint ? { hint: described.hint } : {}),
      });
    }
  };
  const finish = () => {
    if (schema.needsRows && records === 0) {
      problems.push({ severity: 'error', code: 'NO_ROWS', file, line: headerLine, message: `${file} has a header but no rows`, expected: 'at least one row' });
    }
    const source: CsvSource = { file, delimiter: csv.delimiter, header: csv.header, text: csv.text };
    return { table: { file, delimiter: csv.delimiter, columns, rows, written, csv: source }, problems };
  };
  return { add, finish };
}

/** parseTable over records already read (tests, small files). */
export function parseTable<S extends CsvFileSchema>(csv: CsvFile, schema: S, options: TableOptions = {}): { table: Table<RowOf<S>>; problems: Problem[] } {
  const reader = tableReader(csv, schema, options);
  for (const record of csv.records) reader.add(record);
  return reader.finish();
}

/** factors.csv headers: indicator codes match whatever their case. */
export const indicatorHeaderName = (header: string): string | undefined => findIndicator(header)?.code;

/** A problem at a cell of a table's row: the file, line, column name and position, and the value as written. */
export function cellProblem(table: { file: string; columns: Record<string, number> }, row: { line: number; raw: Record<string, string> }, column: string, severity: Problem['severity'], code: Problem['code'], message: string, extra: Partial<Problem> = {}): Problem {
  const value = row.raw[column];
  const columnIndex = table.columns[column];
  return {
    severity, code, file: table.file, line: row.line, column,
    ...(columnIndex === undefined ? {} : { columnIndex }),
    ...(value === undefined ? {} : { value }),
    message, ...extra,
  };
}
