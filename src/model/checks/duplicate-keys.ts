import { CSV_FILES } from '../../schema/index.ts';
import { columnsOf } from '../../schema/csv-file.ts';
import type { CheckContext } from './context.ts';

/**
 * Each file's key rule, as its schema declares it (`key` in src/schema): a second row with
 * the same key values is reported on its last key column, pointing at the first. A row with
 * a required key cell empty is left to that cell's own problem.
 */
export function duplicateKeys(ctx: CheckContext): void {
  for (const schema of CSV_FILES) {
    const table = ctx.table(schema.file);
    if (!table) continue;
    const { columns, repeat, what } = schema.key;
    const required = new Set(columnsOf(schema).filter((column) => column.required).map((column) => column.name));
    const column = columns.at(-1)!;
    const seen = new Map<string, number>();
    for (const row of table.written) {
      const parts = columns.map((name) => (row.raw[name] ?? '').trim());
      if (parts.some((part, i) => part === '' && required.has(columns[i]!))) continue;
      const key = parts.join('\u0000');
      const first = seen.get(key);
      if (first === undefined) {
        seen.set(key, row.line);
        continue;
      }
      ctx.at(table, row.line, row.raw, column, repeat, 'DUPLICATE_ID', `repeats the ${what} of line ${first}`, { expected: `a ${what} not used before`, hint: `line ${first} has it already: change one, or delete the row that repeats it` });
    }
  }
}

/**
 * Ids that name output folders (products, families) must differ in more than letter case:
 * Windows and macOS would write `KV-1` and `kv-1` into one folder.
 */
export function caseClashes(ctx: CheckContext): void {
  for (const schema of CSV_FILES) {
    const table = ctx.table(schema.file);
    if (!table) continue;
    for (const column of columnsOf(schema).filter((info) => info.path === true)) {
      const first = new Map<string, { spelling: string; line: number }>();
      for (const row of table.written) {
        const value = (row.raw[column.name] ?? '').trim();
        if (value === '') continue;
        const seen = first.get(value.toLowerCase());
        if (!seen) first.set(value.toLowerCase(), { spelling: value, line: row.line });
        else if (seen.spelling !== value) {
          ctx.at(table, row.line, row.raw, column.name, 'error', 'ID_CASE_CLASH', `differs only in letter case from ${seen.spelling} on line ${seen.line}; both would name one folder on Windows and macOS`, { expected: 'an id that differs from the others in more than letter case' });
        }
      }
    }
  }
}
