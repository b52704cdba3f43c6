import { indicatorValue, type Project } from '../model/project.ts';
import { factorsCsv } from '../schema/factors.ts';
import { AUDIT_PAGE } from '../files.ts';
import { factorAnchor, fragment, inputAnchor } from './figure-links.ts';
import type { CatalogueEntry } from './product-view.ts';
import { num, sourceOf, txt, type Cell, type TableView } from './table-view.ts';
import { NOT_AVAILABLE } from '../format.ts';

/** The factor table page: every row of factors.csv once, with the products that read it. */

/** Products linked by name beside a factor row; the rest are counted. */
const LINKED_PRODUCTS = 8;

/** Per factors.csv line, the products that read it, as a cell with links into their audit trails. */
export function readersOf(catalogue: readonly CatalogueEntry[]): (line: number) => Cell {
  const readers = new Map<number, CatalogueEntry[]>();
  for (const entry of catalogue) {
    for (const line of entry.factorLines) {
      if (!readers.has(line)) readers.set(line, []);
      readers.get(line)!.push(entry);
    }
  }
  return (line: number): Cell => {
    const products = readers.get(line) ?? [];
    const rest = products.length - LINKED_PRODUCTS;
    return {
      text: products.length === 0 ? 'none' : `${products.length} product${products.length === 1 ? '' : 's'}${rest > 0 ? `, ${rest} not listed` : ''}:`,
      links: products.slice(0, LINKED_PRODUCTS).map((product) => ({ text: product.id, href: `../${product.id}/${AUDIT_PAGE}#${fragment(inputAnchor(factorsCsv.file, line))}` })),
    };
  };
}

export function factorTable(project: Project, rows: Project['factors']['rows'], catalogue: readonly CatalogueEntry[]): TableView {
  const codes = project.indicators.filter((code) => project.factorIndicators.includes(code));
  const readBy = readersOf(catalogue);
  return {
    title: 'Factor table',
    caption: 'Every row of factors.csv, values per row unit. An empty cell is “not available”, never zero. “Read by”: the products whose figures read the row, each linked to the row in its audit trail.',
    headers: [{ text: 'Factor' }, { text: 'Name' }, { text: 'Per' }, { text: 'Dataset' }, { text: 'Read by' }, ...codes.map((code) => ({ text: code, numeric: true }))],
    rows: rows.map((row) => ({
      anchor: factorAnchor(row.value.factor_id),
      source: sourceOf(project.factors, row),
      cells: [
        txt(row.value.factor_id),
        txt(row.value.name),
        txt(row.value.unit),
        txt(row.value.dataset),
        readBy(row.line),
        ...codes.map((code) => {
          const value = indicatorValue(row.value, code);
          return value === null ? txt(NOT_AVAILABLE) : num(value);
        }),
      ],
    })),
    empty: 'No factors.',
  };
}
