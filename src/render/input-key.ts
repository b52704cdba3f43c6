import { createHash } from 'node:crypto';
import type { ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import type { Problem } from '../problems.ts';
import { buildSiteView, productInputs } from '../report/site-view.ts';
import { physicalLines } from '../report/written.ts';
import type { Table } from '../schema/table.ts';
import type { FigureGraph } from '../trace/graph.ts';

/**
 * What a product's pages and results files are made of, as one hash: the product's own
 * rows and every row of another file it reaches (through its figure graph, and the rows its
 * page shows), each as written with its line number (pages print both), plus the
 * project-wide part of its pages (declaration.json, tool version, cautions, methodology,
 * whether PDFs are made). Two builds with the same key for a product write the same bytes
 * for it (test/render/incremental.test.ts), so an incremental build may keep its files.
 */
export interface InputKey {
  key: string;
  /** The input rows behind the key, by file: start lines. */
  rows: Map<string, number[]>;
}

/** The project-wide part of every product's pages, hashed once per build. */
export function pageContextKey(project: Project, problems: readonly Problem[], pdfs: boolean): string {
  const view = buildSiteView(project, problems, { products: [], pdfs });
  const shown = { tool: view.tool, declaration: view.declaration, settings: project.declaration, cautions: view.cautions, processCaution: view.processCaution, pdfs: view.pdfs, methodology: view.methodology, indicators: view.indicators };
  return createHash('sha256').update(JSON.stringify(shown)).digest('hex');
}

/** The project's input tables by file name. */
export function inputTables(project: Project): Map<string, Table<unknown>> {
  const list: Array<Table<unknown>> = [project.products, project.bom, project.materials, project.eol, project.activities, project.transport, project.factors, project.process];
  return new Map(list.map((table) => [table.file, table]));
}

/** Where each record of a table ends (records may span lines), built once per table. */
const recordEnds = new WeakMap<object, Map<number, number>>();
function recordEnd(table: Table<unknown>, line: number): number {
  let ends = recordEnds.get(table);
  if (!ends) recordEnds.set(table, (ends = new Map(table.rows.map((row) => [row.line, row.lineEnd]))));
  return ends.get(line) ?? line;
}

export function productInputKey(project: Project, rows: ProductRows, graph: FigureGraph, context: string): InputKey {
  const byFile = new Map<string, Set<number>>();
  const add = (file: string, line: number) => {
    let lines = byFile.get(file);
    if (!lines) byFile.set(file, (lines = new Set()));
    lines.add(line);
  };
  const addRows = (table: Table<unknown>, list: ReadonlyArray<{ line: number }>) => {
    for (const row of list) add(table.file, row.line);
  };
  addRows(project.products, [rows.product]);
  addRows(project.bom, rows.bom);
  addRows(project.activities, rows.activities);
  addRows(project.transport, rows.transport);
  const shown = productInputs(project, rows);
  addRows(project.eol, shown.eolRows);
  addRows(project.materials, shown.materials);
  addRows(project.factors, shown.factors);
  addRows(project.process, shown.processRows);
  for (const node of graph.nodes.values()) {
    for (const term of node.terms) {
      if (term.kind === 'cell') add(term.cell.file, term.cell.line);
      else if (term.kind === 'factor') add(term.factor.file, term.factor.line);
    }
  }

  const hash = createHash('sha256').update(context);
  const files = inputTables(project);
  const sorted = new Map<string, number[]>();
  for (const file of [...byFile.keys()].sort()) {
    const lines = [...byFile.get(file)!].sort((a, b) => a - b);
    sorted.set(file, lines);
    const table = files.get(file);
    // declaration.json cells are part of the context; any other file is hashed line by line.
    if (!table) continue;
    const text = physicalLines(table.csv);
    // The header decides how every row is read.
    hash.update(`\n${file}:header\n${text[table.csv.header.line - 1] ?? ''}`);
    for (const line of lines) hash.update(`\n${file}:${line}\n${text.slice(line - 1, recordEnd(table, line)).join('\n')}`);
  }
  return { key: hash.digest('hex'), rows: sorted };
}
