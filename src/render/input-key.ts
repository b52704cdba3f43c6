import { createHash } from 'node:crypto';
import type { ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import { suppliersReached } from '../model/supplier-datasets.ts';
import { siteContext } from '../report/site-view.ts';
import { inputTables, productReach } from '../model/reach.ts';
import { physicalLines } from '../load/lines.ts';
import type { Table } from '../schema/table.ts';
import type { FigureGraph } from '../trace/graph.ts';
import { RESULTS_FORMAT } from '../report/results.ts';

/**
 * What a product's pages and results files are made of, as one hash: the product's own
 * rows and every row of another file it reaches (`productReach`, src/model/reach.ts), each as written with its line number (pages print both), plus the
 * project-wide part of its pages (declaration.json, tool version, cautions, methodology,
 * whether PDFs are made). Two builds with the same key for a product write the same bytes
 * for it (test/render/incremental.test.ts), so an incremental build may keep its files.
 */
export interface InputKey {
  key: string;
  /** The input rows behind the key, by file: start lines. */
  rows: Map<string, number[]>;
}

/**
 * The parts of the project-wide context of every product's pages, each hashed, in the words
 * `build --changed` says when one of them changed (`contextChanges`).
 */
export const CONTEXT_PARTS = {
  tool: 'the tool version',
  settings: 'declaration.json',
  pdfs: 'the PDF setting (with or without PDFs)',
  texts: 'the texts every page carries (cautions, methodology, indicator names)',
  verification: 'the verification record or the verifier’s key',
} as const;

/** The project-wide part of every product's pages, hashed once per build: a JSON object of each part's hash. */
export function pageContextKey(project: Project, pdfs: boolean): string {
  const view = siteContext(project, pdfs);
  const parts: Record<keyof typeof CONTEXT_PARTS, unknown> = {
    tool: { tool: view.tool, resultsFormat: RESULTS_FORMAT },
    settings: { declaration: view.declaration, settings: project.declaration },
    pdfs: view.pdfs,
    texts: { cautions: view.cautions, processCaution: view.processCaution, methodology: view.methodology, indicators: view.indicators },
    // Every page says whether its declaration is as verified: the record, and whether its signature checks against the key.
    verification: project.verification.state,
  };
  return JSON.stringify(Object.fromEntries(Object.entries(parts).map(([part, value]) => [part, createHash('sha256').update(JSON.stringify(value)).digest('hex').slice(0, 16)])));
}

/** What differs between two page contexts, in words; the whole context when an old one cannot be read part by part. */
export function contextChanges(before: string, now: string): string[] {
  try {
    const [a, b] = [JSON.parse(before) as Record<string, string>, JSON.parse(now) as Record<string, string>];
    const changed = (Object.keys(CONTEXT_PARTS) as Array<keyof typeof CONTEXT_PARTS>).filter((part) => a[part] !== b[part]).map((part) => `${CONTEXT_PARTS[part]} changed`);
    if (changed.length > 0) return changed;
  } catch {
    // A cache of an earlier format: its context was one hash.
  }
  return ['declaration.json or the page settings changed'];
}

/** Where each record of a table ends (records may span lines), built once per table. */
const recordEnds = new WeakMap<object, Map<number, number>>();
function recordEnd(table: Table<unknown>, line: number): number {
  let ends = recordEnds.get(table);
  if (!ends) recordEnds.set(table, (ends = new Map(table.rows.map((row) => [row.line, row.lineEnd]))));
  return ends.get(line) ?? line;
}

/**
 * The first term of a product's figure graph that reads an input row outside its reach
 * (declaration.json aside: it is part of the page context), or undefined when there is none.
 */
export function readsOutside(project: Project, reach: ReadonlyMap<string, ReadonlySet<number>>, graph: FigureGraph): { figure: string; file: string; line: number } | undefined {
  const context = project.declarationFile.file;
  // A supplier's dataset is covered whole, by its checksum, where its factor row is reached.
  const datasets = new Set(suppliersReached(project, reach).flatMap((supplier) => [supplier.dataset.file, ...(supplier.dataset.flow ? [supplier.dataset.flow.file] : [])]));
  for (const node of graph.nodes.values()) {
    for (const term of node.terms) {
      const at = term.kind === 'cell' ? term.cell : term.kind === 'factor' ? term.factor : undefined;
      if (at && at.file !== context && !datasets.has(at.file) && !reach.get(at.file)?.has(at.line)) return { figure: node.id, file: at.file, line: at.line };
    }
  }
  return undefined;
}

/** A product's input key, from the rows it reaches (`productReach`, given where the caller has it already) and the page context. */
export function productInputKey(project: Project, rows: ProductRows, context: string, byFile: ReadonlyMap<string, ReadonlySet<number>> = productReach(project, rows)): InputKey {
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
  // A supplier's dataset a reached factor row reads: its bytes, by checksum.
  for (const supplier of suppliersReached(project, byFile)) hash.update(`\nsupplier:${supplier.file}\n${supplier.sha256}`);
  return { key: hash.digest('hex'), rows: sorted };
}
