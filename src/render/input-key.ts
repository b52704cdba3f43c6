import { createHash } from 'node:crypto';
import type { ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import type { Problem } from '../problems.ts';
import { buildSiteView, productInputs } from '../report/site-view.ts';
import { physicalLines } from '../report/written.ts';
import type { Table } from '../schema/table.ts';
import type { FigureGraph } from '../trace/graph.ts';
import { flowFactor } from '../process/run.ts';
import { RESULTS_FORMAT } from '../report/results.ts';
import { PROCESS_PREFIX } from '../schema/process-parameters.ts';

/**
 * What a product's pages and results files are made of, as one hash: the product's own
 * rows and every row of another file it reaches (`productReach`), each as written with its line number (pages print both), plus the
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
  const shown = { tool: view.tool, resultsFormat: RESULTS_FORMAT, declaration: view.declaration, settings: project.declaration, cautions: view.cautions, processCaution: view.processCaution, pdfs: view.pdfs, methodology: view.methodology, indicators: view.indicators };
  return createHash('sha256').update(JSON.stringify(shown)).digest('hex');
}

/** The project's input tables by file name. */
export function inputTables(project: Project): Map<string, Table<unknown>> {
  const list: Array<Table<unknown>> = [project.products, project.bom, project.materials, project.eol, project.activities, project.transport, project.factors, project.process, project.site, project.production, project.familyRows];
  return new Map(list.map((table) => [table.file, table]));
}

/** Where each record of a table ends (records may span lines), built once per table. */
const recordEnds = new WeakMap<object, Map<number, number>>();
function recordEnd(table: Table<unknown>, line: number): number {
  let ends = recordEnds.get(table);
  if (!ends) recordEnds.set(table, (ends = new Map(table.rows.map((row) => [row.line, row.lineEnd]))));
  return ends.get(line) ?? line;
}

/**
 * Every input row a product reads, found from its rows alone (no calculation): its own rows
 * (product, BOM lines, activities, transport legs), the rows its page shows (its materials,
 * its end-of-life scenario, the factor rows they name, its processes) and, through each
 * process, the factor rows of the process's flows. The calculation reads nothing else:
 * every build checks that each product's figure graph stays inside this set
 * (`readsOutside`, called by the results writer), so a key that missed a row would stop
 * the build rather than keep a stale product.
 */
export function productReach(project: Project, rows: ProductRows): Map<string, Set<number>> {
  const byFile = new Map<string, Set<number>>();
  const addRows = (table: Table<unknown>, list: ReadonlyArray<{ line: number }>) => {
    let lines = byFile.get(table.file);
    if (!lines) byFile.set(table.file, (lines = new Set()));
    for (const row of list) lines.add(row.line);
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
  addRows(project.site, shown.siteRows);
  addRows(project.production, shown.productionRows);
  // Mass keys read every product's unit mass of the period.
  addRows(project.products, shown.siteProducts);
  addRows(project.familyRows, shown.familyRows);
  // A process's flows are charged with factors of their own (electricity, alumina, reagents),
  // which may in turn be processes.
  const seen = new Set<string>();
  const pending = [...shown.factorIds].filter((id) => id.startsWith(PROCESS_PREFIX));
  while (pending.length > 0) {
    const processId = pending.pop()!.slice(PROCESS_PREFIX.length);
    if (seen.has(processId)) continue;
    seen.add(processId);
    const definition = project.processes.find((process) => process.id === processId);
    if (!definition) continue;
    addRows(project.process, [...definition.rows.values()]);
    const flowFactors = new Set(definition.result.inventory.map((flow) => flowFactor(definition, flow.flow).factor).filter((id) => id !== undefined));
    addRows(project.factors, factorRowsOf(project, flowFactors));
    for (const id of flowFactors) if (id.startsWith(PROCESS_PREFIX)) pending.push(id);
  }
  return byFile;
}

const factorRowsOf = (project: Project, ids: ReadonlySet<string>) => project.factors.rows.filter((row) => ids.has(row.value.factor_id));

/**
 * The first term of a product's figure graph that reads an input row outside its reach
 * (declaration.json aside: it is part of the page context), or undefined when there is none.
 */
export function readsOutside(project: Project, reach: ReadonlyMap<string, ReadonlySet<number>>, graph: FigureGraph): { figure: string; file: string; line: number } | undefined {
  const context = project.declarationFile.file;
  for (const node of graph.nodes.values()) {
    for (const term of node.terms) {
      const at = term.kind === 'cell' ? term.cell : term.kind === 'factor' ? term.factor : undefined;
      if (at && at.file !== context && !reach.get(at.file)?.has(at.line)) return { figure: node.id, file: at.file, line: at.line };
    }
  }
  return undefined;
}

/** A product's input key, from the rows it reaches (`productReach`) and the page context. */
export function productInputKey(project: Project, rows: ProductRows, context: string): InputKey {
  const byFile = productReach(project, rows);
  const hash = createHash('sha256').update(context);
  const files = inputTables(project);
  const sorted = new Map<string, number[]>();
  for (const file of [...byFile.keys()].sort()) {
    const lines = [...byFile.get(file)!].sort((a, b) => a - b);
    if (lines.length === 0) continue;
    sorted.set(file, lines);
    const table = files.get(file)!;
    const text = physicalLines(table.csv);
    // The header decides how every row is read.
    hash.update(`\n${file}:header\n${text[table.csv.header.line - 1] ?? ''}`);
    for (const line of lines) hash.update(`\n${file}:${line}\n${text.slice(line - 1, recordEnd(table, line)).join('\n')}`);
  }
  return { key: hash.digest('hex'), rows: sorted };
}
