import { z } from 'zod';
import { PROBLEM_CODES } from '../problems.ts';
import { INDICATORS } from '../reference/indicators.ts';
import { GREENHOUSE_GASES, GWP_SOURCES } from '../reference/ghg.ts';
import { KNOWN_UNITS } from '../reference/units.ts';
import { columnsOf, DEFAULT_DIALECT, type ColumnInfo, type CsvFileSchema } from './csv-file.ts';
import { declarationSchema } from './declaration.ts';
import { CSV_FILES, factorsCsv } from './index.ts';
import { kindDescription, parametersOf, PROCESS_KINDS } from './process-kinds.ts';
import { FACTOR_BASE_COLUMNS } from './factors.ts';

/**
 * Documentation generated from the zod schemas, so the docs cannot drift from the checks:
 * the column reference (`columns.md`, the init README, docs/input-format.md) and the JSON
 * Schemas that `loopsheet schema` writes.
 */
const escapeCell = (text: string) => text.replace(/\|/g, '\\|').replace(/\n/g, ' ');

function typeOf(column: ColumnInfo): string {
  switch (column.kind) {
    case 'number':
      return `number (${column.unit})`;
    case 'share':
      return 'share: 0.35 or 35%';
    case 'choice':
      return `one of ${(column.choices ?? []).map((c) => `\`${c}\``).join(', ')}`;
    case 'unit':
      return 'unit';
    case 'reference':
      return `id → ${column.references}`;
    case 'id':
      return 'identifier';
    default:
      return column.kind;
  }
}

function columnTable(schema: CsvFileSchema, columns: ColumnInfo[]): string {
  const rows = columns.map((column) => {
    const presence = column.required ? 'required' : column.default === undefined ? 'optional' : `optional, default \`${column.default}\``;
    return `| \`${column.name}\` | ${escapeCell(typeOf(column))} | ${presence} | ${escapeCell(column.description)} |`;
  });
  const example = schema.example;
  return [
    `### \`${schema.file}\``,
    '',
    schema.purpose,
    '',
    '| column | type | presence | meaning |',
    '|---|---|---|---|',
    ...rows,
    '',
    `Key: ${schema.key.columns.map((name) => `\`${name}\``).join(' + ')}; a second row with the same key is ${schema.key.repeat === 'error' ? 'an error' : 'a warning (legal, but usually a double count)'}.`,
    '',
    `Example row: \`${Object.values(example).join(',')}\``,
  ].join('\n');
}

export function columnReference(): string {
  const sections = CSV_FILES.map((schema) => {
    if (schema !== factorsCsv) return columnTable(schema, columnsOf(schema));
    const base = columnsOf(schema).filter((column) => FACTOR_BASE_COLUMNS.includes(column.name));
    const indicators = INDICATORS.map(
      (indicator) => `| \`${indicator.code}\` | ${escapeCell(indicator.name)} | ${escapeCell(indicator.unit)} per row unit | ${indicator.basis === 'flows' ? 'computed from mass flows; not read from factors.csv' : 'optional column; empty cell = not available'} |`,
    );
    return [
      columnTable(schema, base),
      '',
      'Then one column per indicator, headed by its EN 15804+A2 code (matched case-insensitively):',
      '',
      '| code | indicator | unit | in factors.csv |',
      '|---|---|---|---|',
      ...indicators,
    ].join('\n');
  });
  const declarationProperties = Object.entries(declarationSchema.shape).map(([key, field]) => {
    const meta = z.globalRegistry.get(field as z.ZodType) ?? (field as z.ZodType).meta?.() ?? {};
    return `| \`${key}\` | ${escapeCell(String((meta as { description?: string }).description ?? ''))} |`;
  });
  return [
    '### `declaration.json`',
    '',
    'Who declares, under which standard and PCR, for which period, and what is reported. The full JSON Schema is `declaration.schema.json` (written by `loopsheet schema`).',
    '',
    '| key | meaning |',
    '|---|---|',
    ...declarationProperties,
    '',
    ...sections.flatMap((section) => [section, '']),
    '### Process kinds and their parameters (`process.csv`)',
    '',
    'One parameter a row. A share may be written 0.95 (unit `share`) or 95% (unit `%`); words and counts have an empty unit. Parameters shown as `family:<name>` are named per item (a reagent by its factor id, a reductant by its name). Values below a physical or stoichiometric floor (Faraday-law energy, stoichiometric carbon and alumina) are refused with `PROCESS_INFEASIBLE`.',
    '',
    ...PROCESS_KINDS.flatMap((kind) => [
      `#### \`${kind}\``,
      '',
      kindDescription(kind),
      '',
      '| parameter | unit | required | meaning |',
      '|---|---|---|---|',
      ...parametersOf(kind).map(({ name, meta }) => `| \`${meta.family ? `${name}:<name>` : name}\` | ${meta.unit === '' ? '—' : escapeCell(meta.unit === 'share' ? 'share or %' : meta.unit)} | ${meta.required ? 'required' : 'optional'} | ${escapeCell(meta.description)} |`),
      '',
    ]),
    '### Units',
    '',
    `Known units (case-insensitive; common spellings such as \`tonne\`, \`litre\`, \`pcs\` are accepted): ${KNOWN_UNITS.map((u) => `\`${u}\``).join(', ')}. An activity's unit must convert to its factor's unit (kWh ↔ MJ ↔ GJ, g ↔ kg ↔ t, L ↔ m3).`,
    '',
    '### Built-in greenhouse gases',
    '',
    `Use as \`factor\` in activities.csv with an amount in a mass unit. GWP-100: ${GWP_SOURCES.AR6}; ${GWP_SOURCES.AR5}.`,
    '',
    '| factor | gas | AR6 | AR5 |',
    '|---|---|---|---|',
    ...GREENHOUSE_GASES.map((gas) => `| \`ghg:${gas.id}\` | ${gas.name} | ${gas.AR6} | ${gas.AR5} |`),
    '',
    '### Problem codes',
    '',
    'Every problem `loopsheet check` reports carries one of these stable codes.',
    '',
    '| code | meaning |',
    '|---|---|',
    ...Object.entries(PROBLEM_CODES).map(([code, meaning]) => `| \`${code}\` | ${escapeCell(meaning)} |`),
  ].join('\n');
}

export function jsonSchemas(): Record<string, unknown> {
  const schemas: Record<string, unknown> = {
    'declaration.schema.json': z.toJSONSchema(declarationSchema, { io: 'input', unrepresentable: 'any' }),
  };
  for (const schema of CSV_FILES) {
    const name = schema.file.replace(/\.csv$/, '.row.schema.json');
    schemas[name] = {
      ...z.toJSONSchema(schema.row(DEFAULT_DIALECT), { io: 'input', unrepresentable: 'any' }),
      title: `${schema.file}: one row, as the cells' text`,
      description: schema.purpose,
    };
  }
  return schemas;
}

export const GENERATED_START = '<!-- generated by `npm run docs` from the zod schemas: do not edit by hand -->';
export const GENERATED_END = '<!-- end of generated part -->';

/** Replaces the generated part of docs/input-format.md. */
export function withGeneratedReference(document: string): string {
  const start = document.indexOf(GENERATED_START);
  const end = document.indexOf(GENERATED_END);
  if (start === -1 || end === -1 || end < start) throw new Error('docs/input-format.md has lost its generated-part markers');
  return `${document.slice(0, start + GENERATED_START.length)}\n\n${columnReference()}\n\n${document.slice(end)}`;
}
