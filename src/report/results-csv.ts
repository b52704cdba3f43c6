import type { ResultMethod } from '../trace/ids.ts';
import { resultFigureId, type ResultsSummary } from './results.ts';

/**
 * One row per product × method × module (or part) × indicator. Text cells that a
 * spreadsheet would run as a formula (starting with = + - @) are neutralised with a
 * leading apostrophe (OWASP "CSV injection" guidance).
 */
export const RESULTS_CSV_HEADER = ['product_id', 'method', 'module', 'indicator', 'unit', 'value', 'figure_id'];

/** A text cell, neutralised against formula injection and quoted where needed. */
export function textCell(text: string): string {
  let cell = cells.get(text);
  if (cell === undefined) {
    cell = quote(text);
    // Ids, modules, codes and units repeat across products; product ids do not stay long.
    if (cells.size < 100_000) cells.set(text, cell);
  }
  return cell;
}
const cells = new Map<string, string>();

function quote(text: string): string {
  const safe = /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return /[",\n\r]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

const numberCell = (value: number | null): string => (value === null ? '' : String(value));

export function resultsCsvRows(results: ResultsSummary): string[] {
  const units = new Map(results.indicators.map((i) => [i.code, i.unit]));
  const product = textCell(results.product_id);
  // The indicator and unit cells, once per product.
  const codeUnit = new Map<string, string>();
  const rows: string[] = [];
  const emit = (method: ResultMethod, module: string, values: Record<string, number | null>) => {
    const head = `${product},${method},${textCell(module)},`;
    for (const [code, value] of Object.entries(values)) {
      let cells = codeUnit.get(code);
      if (cells === undefined) codeUnit.set(code, (cells = `${textCell(code)},${textCell(units.get(code) ?? '')},`));
      rows.push(`${head}${cells}${numberCell(value)},${textCell(resultFigureId(method, module, code))}`);
    }
  };
  const { cutoff, ...others } = results.methods;
  for (const [module, values] of Object.entries(cutoff.modules)) emit('cutoff', module, values);
  emit('cutoff', 'total', cutoff.total);
  for (const [method, result] of Object.entries(others) as Array<[ResultMethod, (typeof others)['cff']]>) {
    if (!result) continue;
    for (const [part, values] of Object.entries(result.parts)) emit(method, part, values);
    emit(method, 'total', result.total);
  }
  return rows;
}

export const resultsCsv = (all: readonly ResultsSummary[]): string => `${[RESULTS_CSV_HEADER.join(','), ...all.flatMap(resultsCsvRows)].join('\n')}\n`;
