import type { BomLine, Project } from '../model/types.ts';
import { parse } from 'csv-parse/sync';
import type { CsvSource } from '../load/csv.ts';
import { inputTables } from '../model/reach.ts';
import type { Row } from '../schema/table.ts';
import type { ProductResult } from '../calc/product.ts';
import type { FigureGraph, FigureNode, Term } from '../trace/graph.ts';
import { cutoffStep, inventoryStep, processStep, resultStep, stepGroup, type ResultMethod } from '../trace/ids.ts';
import { fragment, inputAnchor } from './figure-links.ts';
import { formatFigure as show } from '../format.ts';
import { physicalLines } from '../load/lines.ts';
import { layOut, placeStep, type AuditGroup, type AuditStep, type AuditTerm, type GroupDraft } from './audit-layout.ts';

export type { AuditGroup, AuditItem, AuditRun, AuditStep, AuditTerm } from './audit-layout.ts';

/**
 * The audit trail of one product, as one page, in the shape of the calculation: one entry
 * per step with its formula and terms (each a link down, to another step or to the input
 * row as written, with its value where it has one), and for a step with a value per
 * indicator a row of its group's values table, whose columns are the indicators (codes
 * written once per group, not once per step). Steps of one kind, one per line or material,
 * are a run: one table with the formula, description and term names once and a row per step
 * holding its terms' values and its own value or values (`AuditRun`). A verifier recomputes a
 * figure from the step's terms and, one click away, their rows; the page's script adds the
 * way up (“used by”) from the same links. Measured on the synthetic 40-line × 25-indicator
 * product: 611 KB as one entry per step, 357 KB with runs (docs/performance.md).
 *
 * Anchors: a step that other pages link to (the results' modules, parts and totals, their
 * flow indicators, product flows, process models, site shares) is anchored by its step id,
 * and each of its values by its figure id `<step>/<indicator>`; any other step by `s<k>`,
 * its index in results.json `graph.steps` (a step entry or a run's row), and its values row
 * by `v<k>`. An input row by `input:<file>:<line>` for other pages and `i<k>` for the page's
 * own links.
 */
export interface AuditView {
  productId: string;
  /** The indicator codes of the values tables' columns. */
  indicators: string[];
  groups: AuditGroup[];
  /**
   * The input rows the steps read. A row is anchored `input:<file>:<line>` for other pages
   * and `i<k>` (in the order the page first reads it) for the page's own links, which are
   * thousands: the short anchor keeps them small.
   */
  /** The input rows the figures read, by file: for a CSV file its header and each row's cells, so that a reader need not count delimiters. */
  /** `what`: what a line of a supplier's dataset holds (`A1-A3 GWP-total`), where the line alone does not say. */
  inputs: Array<{ file: string; header?: readonly string[]; rows: Array<{ anchor: string; short: string; line: number; written: string; cells?: readonly string[]; what?: string }> }>;
  stepCount: number;
  figureCount: number;
  /** The page's body, filled in by the renderer (src/render/audit-html.ts). */
  html?: unknown;
}

const GROUP_TITLES: Record<string, string> = {
  inventory: 'Mass flows (inventory)',
  cutoff: 'Cut-off and module D (EN 15804+A2)',
  cff: 'Circular Footprint Formula',
  'eol-recycling': 'End-of-life recycling (0:100)',
  'fifty-fifty': '50:50',
  reference: 'Reference values and presets',
  flows: 'Recycled content and biogenic carbon',
  process: 'Process models (process.csv)',
  allocation: 'Site data shared among products (ISO 14044 §4.3.4)',
  scenario: 'End-of-life scenario information (EN 15804+A2)',
};

/** Groups whose steps other pages link to by id (product flows, process models, site shares, scenario quantities). */
const LINKED_GROUPS = new Set(['flows', 'process', 'allocation', 'scenario']);

/** The vector steps whose values other pages link to, and the scalar steps of the results' flow indicators. */
function linkedSteps(result: ProductResult, project: Project): Set<string> {
  const linked = new Set<string>([result.cutoff.total, ...Object.values(result.cutoff.modules)]);
  for (const flows of [...Object.values(result.flows.moduleFlows), result.flows.totalFlows]) for (const id of Object.values(flows)) linked.add(id);
  for (const [method, r] of Object.entries(result.methods)) {
    linked.add(resultStep(method as ResultMethod, 'total'));
    for (const part of Object.keys(r!.parts)) linked.add(resultStep(method as ResultMethod, part));
  }
  for (const process of project.processes) linked.add(processStep.factor(process.id));
  // The scenario tables link to each material's end-of-life mass and module D's net flows.
  for (const scenario of result.scenarios.endOfLife) for (const id of Object.values(scenario.ids)) if (id) linked.add(id);
  for (const d of result.scenarios.moduleD) for (const id of Object.values(d.ids)) linked.add(id);
  // The verifier's checklist links to the product's mass and the release of its packaging's biogenic carbon.
  linked.add(inventoryStep.product('G'));
  linked.add(inventoryStep.product('M'));
  for (const m of result.cutoff.packaging?.materials ?? []) linked.add(cutoffStep.packaging('biogenic-carbon', m.materialId));
  return linked;
}

export function auditView(project: Project, result: ProductResult, bom: readonly Row<BomLine>[]): AuditView {
  const { graph } = result;
  const linked = linkedSteps(result, project);
  const lines = new Map(bom.map((row) => [row.value.line_id, row.value]));
  // The anchor of each step, by the order of the graph (that of results.json graph.steps).
  const anchors = new Map<string, string>();
  const hrefs = new Map<string, string>();
  let k = 0;
  for (const node of graph.nodes.values()) {
    const anchor = linked.has(node.id) || LINKED_GROUPS.has(stepGroup(node.id)) ? node.id : `s${k}`;
    anchors.set(node.id, anchor);
    hrefs.set(node.id, `#${fragment(anchor)}`);
    k++;
  }
  const inputs: InputRows = new Map();
  const groups = new Map<string, GroupDraft>();
  let figureCount = 0;
  k = 0;
  for (const node of graph.nodes.values()) {
    const key = stepGroup(node.id);
    let group = groups.get(key);
    if (!group) groups.set(key, (group = { title: GROUP_TITLES[key] ?? key, items: [], runs: new Map() }));
    const terms: AuditTerm[] = [];
    for (const term of node.terms) terms.push(termView(graph, term, hrefs, inputs));
    const anchor = anchors.get(node.id)!;
    const step: AuditStep = { anchor, id: node.id, description: node.description, formula: node.formula, terms };
    if (node.kind === 'scalar') {
      step.value = show(node.value);
      step.unit = node.unit;
      figureCount++;
    } else {
      const isLinked = anchor === node.id;
      step.values = { anchor: isLinked ? `values:${node.id}` : `v${k}`, numbers: node.values, linked: isLinked };
      figureCount += graph.indicators.length;
    }
    k++;
    placeStep(group, node, step, anchor === node.id, lines);
  }

  const tables = inputTables(project);
  const files = new Map<string, { text: string }>([...tables].map(([file, table]) => [file, table.csv]));
  files.set(project.declarationFile.file, project.declarationFile);
  for (const supplier of project.suppliers.values()) {
    files.set(supplier.dataset.file, { text: supplier.dataset.source });
    if (supplier.dataset.flow) files.set(supplier.dataset.flow.file, { text: supplier.dataset.flow.source });
  }
  const byFile = new Map<string, AuditView['inputs'][number]['rows']>();
  for (const [anchor, entry] of [...inputs].sort(([, a], [, b]) => (a.file === b.file ? a.line - b.line : a.file < b.file ? -1 : 1))) {
    if (!byFile.has(entry.file)) byFile.set(entry.file, []);
    const written = (files.has(entry.file) ? physicalLines(files.get(entry.file)!) : [])[entry.line - 1] ?? '';
    const csv = tables.get(entry.file)?.csv;
    const cells = csv ? cellsOf(csv, entry.line, written) : undefined;
    byFile.get(entry.file)!.push({ anchor, short: entry.short, line: entry.line, written, ...(cells ? { cells } : {}), ...(entry.what ? { what: entry.what } : {}) });
  }

  return {
    productId: result.productId,
    indicators: [...graph.indicators],
    groups: layOut([...groups.values()]),
    inputs: [...byFile].map(([file, rows]) => ({ file, ...(tables.has(file) ? { header: tables.get(file)!.csv.header.names } : {}), rows })),
    stepCount: graph.nodes.size,
    figureCount,
  };
}

type InputRows = Map<string, { file: string; line: number; short: string; what?: string }>;

/** The page's own link to an input row (`#i<k>`, numbered as the page first reads it). */
function inputHref(inputs: InputRows, file: string, line: number, what?: string): string {
  const anchor = inputAnchor(file, line);
  let entry = inputs.get(anchor);
  if (!entry) inputs.set(anchor, (entry = { file, line, short: `i${inputs.size}`, ...(what ? { what } : {}) }));
  return `#${entry.short}`;
}

/** `hrefs`: each step's link on the page (`#s<k>` or `#<step id>`), made once per step rather than once per term. */
function termView(graph: FigureGraph, term: Term, hrefs: ReadonlyMap<string, string>, inputs: InputRows): AuditTerm {
  switch (term.kind) {
    case 'figure': {
      const target: FigureNode | undefined = graph.get(term.id);
      const href = hrefs.get(term.id)!;
      if (target?.kind !== 'scalar') return { symbol: term.symbol, href, kind: 'step', text: '', qualifier: '', note: '' };
      const text = show(target.value);
      return { symbol: term.symbol, href, kind: 'step', text, qualifier: target.unit, note: ` = ${text} ${target.unit}` };
    }
    case 'cell': {
      const qualifier = term.cell.column === term.symbol ? '' : term.cell.column;
      return { symbol: term.symbol, href: inputHref(inputs, term.cell.file, term.cell.line), kind: 'cell', text: term.cell.value === '' ? '“”' : term.cell.value, qualifier, note: ` ${qualifier ? `${qualifier} ` : ''}“${term.cell.value}”` };
    }
    case 'factor': {
      // A supplier's dataset: every element read is an input row of the page, under the dataset's name.
      const elements = Object.entries(term.factor.elements ?? {});
      for (const [code, element] of elements) inputHref(inputs, term.factor.file, element.line, `${element.module} ${code}`);
      const note = elements.length ? ` factor ${term.factor.factorId}, the supplier’s declared A1-A3 (${elements.length} elements of ${term.factor.file})` : ` factor ${term.factor.factorId}`;
      return { symbol: term.symbol, href: inputHref(inputs, term.factor.file, term.factor.line), kind: 'factor', text: term.factor.factorId, qualifier: 'factor', note };
    }
  }
}

/** A CSV line's cells as written (quotes removed), read once per file and line for all the products that read it. */
const parsedCells = new WeakMap<object, Map<number, readonly string[] | undefined>>();
function cellsOf(csv: CsvSource, line: number, written: string): readonly string[] | undefined {
  let lines = parsedCells.get(csv);
  if (!lines) parsedCells.set(csv, (lines = new Map()));
  if (!lines.has(line)) {
    // A record that spans lines (a quoted line break) is shown as written instead.
    let cells: readonly string[] | undefined;
    try {
      const records = parse(written, { delimiter: csv.delimiter, relax_column_count: true }) as string[][];
      cells = records.length === 1 ? records[0] : undefined;
    } catch {
      cells = undefined;
    }
    lines.set(line, cells);
  }
  return lines.get(line);
}
