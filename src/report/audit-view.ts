import type { BomLine, Project } from '../model/types.ts';
import type { Row } from '../schema/table.ts';
import type { ProductResult } from '../calc/product.ts';
import type { FigureGraph, FigureNode, Term } from '../trace/graph.ts';
import { processStep, resultStep, stepGroup, type ResultMethod } from '../trace/ids.ts';
import { fragment, inputAnchor } from './figure-links.ts';
import { formatFigure as show } from '../format.ts';
import { physicalLines } from './written.ts';

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
export interface AuditTerm {
  symbol: string;
  href: string;
  /** Another step, an input cell, a factor row. */
  kind: 'step' | 'cell' | 'factor';
  /** What a table cell shows: a scalar step's value, the cell as written (`“”` when empty), the factor id; empty for a step with a value per indicator. */
  text: string;
  /** A scalar step's unit; the column of a cell not named by its symbol. */
  qualifier: string;
  /** All of it in one line, as a step entry shows it: ` = 1.25 kg`, ` mass_kg “0.83”`, ` factor al-primary-ingot`. */
  note: string;
}

export interface AuditStep {
  /** Its element id. */
  anchor: string;
  id: string;
  description: string;
  formula: string;
  /** A scalar step's value and unit, formatted. */
  value?: string;
  unit?: string;
  /** Its terms; in a run, those its rows do not share; with `keyed`, those before the first keyed one. */
  terms: AuditTerm[];
  /**
   * A sum over lines or materials whose terms are named `X(key)` (`G(L3)`, `M_eol(al-6060)`),
   * each maybe followed by terms of the same key without one (`recycling`): a row per key and
   * a column per symbol, instead of a list that repeats each symbol and unit for every key.
   */
  keyed?: { columns: Array<{ symbol: string; qualifier: string }>; rows: Array<{ key: string; cells: Array<AuditTerm | undefined> }>; after: AuditTerm[] };
  /** A step with one value per indicator: its row of the group's values table. */
  values?: { anchor: string; numbers: readonly number[]; linked: boolean };
}

/**
 * Steps of one kind, one per line or per material (`cutoff/A1/line:*`), with the same formula
 * and the same description but for the part or material they are about: one table, a row per
 * step (anchored `s<k>` as a step entry would be) with its terms' values and, for a step with
 * a value per indicator, its values. Written once instead of once per line, the formula,
 * description and term names cost a few hundred bytes instead of tens of kilobytes.
 */
export interface AuditRun {
  /** The members' id with the varying segment as `*`. */
  pattern: string;
  /** The members' description with what varies as ‹part› (the line's component) or ‹material›. */
  description: string;
  formula: string;
  /** Scalar steps: their unit. */
  unit?: string;
  /** Which of part and material a row names besides its id (what the description varies by and the id does not say). */
  subjects: Array<'part' | 'material'>;
  /**
   * Where every member has the same terms by symbol: a column per term, with what all its rows
   * share (a unit, a column name, `factor`; empty where they differ, and then each cell says
   * it). Undefined where the members' terms differ (a sum over a material's lines): each row
   * lists its terms in one cell.
   */
  columns?: Array<{ symbol: string; qualifier: string }>;
  /** Terms that are the same in every row (same step or input row, same value): said once, above the table; their columns are left out. */
  shared: AuditTerm[];
  /** Steps with a value per indicator: each row carries its values. */
  vector: boolean;
  /** Each step, what its id puts for the pattern's `*` (`L3`), and its subjects. */
  rows: Array<{ step: AuditStep; key: string; subjects: string[] }>;
}

export type AuditItem = { step: AuditStep; run?: undefined } | { run: AuditRun; step?: undefined };

export interface AuditGroup {
  title: string;
  items: AuditItem[];
}

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
  inputs: Array<{ file: string; rows: Array<{ anchor: string; short: string; line: number; written: string }> }>;
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
};

/** Groups whose steps other pages link to by id (product flows, process models, site shares). */
const LINKED_GROUPS = new Set(['flows', 'process', 'allocation']);

/** Fewer steps of a kind than this stay entries of their own. */
const MIN_RUN = 3;

/** The vector steps whose values other pages link to, and the scalar steps of the results' flow indicators. */
function linkedSteps(result: ProductResult, project: Project): Set<string> {
  const linked = new Set<string>([result.cutoff.total, ...Object.values(result.cutoff.modules)]);
  for (const flows of [...Object.values(result.flows.moduleFlows), result.flows.totalFlows]) for (const id of Object.values(flows)) linked.add(id);
  for (const [method, r] of Object.entries(result.methods)) {
    linked.add(resultStep(method as ResultMethod, 'total'));
    for (const part of Object.keys(r!.parts)) linked.add(resultStep(method as ResultMethod, part));
  }
  for (const process of project.processes) linked.add(processStep.factor(process.id));
  return linked;
}

/** `line:L3`, `packaging:P1` or `material:al-6060` as a segment of a step id: what a run of steps varies by. */
const SUBJECT = /(^|\/)(line|packaging|material):([^/]+)/;

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
  const groups = new Map<string, { title: string; items: AuditItem[]; runs: Map<string, AuditRun> }>();
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
    const subject = anchor === node.id ? null : SUBJECT.exec(node.id);
    if (!subject) {
      keyTerms(step);
      group.items.push({ step });
      continue;
    }
    // The description with the line's component and material (or the material) named generically.
    const line = subject[2] !== 'material' ? lines.get(subject[3]!) : undefined;
    const said: Array<['part' | 'material', string]> = line ? [['part', line.component], ['material', line.material]] : subject[2] === 'material' ? [['material', subject[3]!]] : [];
    let description = node.description;
    const subjects: Array<'part' | 'material'> = [];
    const values: string[] = [];
    for (const [what, text] of said) {
      const generic = replaceWord(description, text, `‹${what}›`);
      if (generic === description) continue;
      description = generic;
      if (!(what === 'material' && subject[2] === 'material')) {
        subjects.push(what);
        values.push(text);
      }
    }
    const pattern = node.id.replace(SUBJECT, '$1$2:*');
    const runKey = [pattern, node.kind, step.unit ?? '', node.formula, description, subjects.join()].join('\u0000');
    let run = group.runs.get(runKey);
    if (!run) {
      run = { pattern, description, formula: node.formula, ...(step.unit !== undefined ? { unit: step.unit } : {}), subjects, shared: [], vector: node.kind === 'vector', rows: [] };
      group.runs.set(runKey, run);
      group.items.push({ run });
    }
    run.rows.push({ step, key: subject[3]!, subjects: values });
  }

  const files = inputFiles(project);
  const byFile = new Map<string, AuditView['inputs'][number]['rows']>();
  for (const [anchor, entry] of [...inputs].sort(([, a], [, b]) => (a.file === b.file ? a.line - b.line : a.file < b.file ? -1 : 1))) {
    if (!byFile.has(entry.file)) byFile.set(entry.file, []);
    byFile.get(entry.file)!.push({ anchor, short: entry.short, line: entry.line, written: (files.has(entry.file) ? physicalLines(files.get(entry.file)!) : [])[entry.line - 1] ?? '' });
  }

  return {
    productId: result.productId,
    indicators: [...graph.indicators],
    groups: describedOnce([...groups.values()].map((group) => ({ title: group.title, items: group.items.flatMap(runOrSteps) }))),
    inputs: [...byFile].map(([file, rows]) => ({ file, rows })),
    stepCount: graph.nodes.size,
    figureCount,
  };
}

/**
 * A run of a few steps is shown as their entries. A run whose members' terms have the same
 * symbols gets a column per term, and a term that is the same in every row is said once; a
 * column's qualifier that differs between rows is said in each cell.
 */
function runOrSteps(item: AuditItem): AuditItem[] {
  if (!item.run) return [item];
  const run = item.run;
  if (run.rows.length < MIN_RUN) return run.rows.map((row) => ({ step: keyTerms(row.step) }));
  const first = run.rows[0]!.step.terms;
  const symbols = (step: AuditStep) => step.terms.map((t) => `${t.kind}:${t.symbol}`).join('\u0000');
  if (!run.rows.every((row) => symbols(row.step) === symbols(run.rows[0]!.step))) {
    for (const row of run.rows) keyTerms(row.step);
    return [item];
  }
  const same = first.map((term, i) => run.rows.every(({ step }) => step.terms[i]!.href === term.href && step.terms[i]!.note === term.note));
  run.shared = first.filter((_, i) => same[i]);
  run.columns = first.flatMap((term, i) => (same[i] ? [] : [{ symbol: term.symbol, qualifier: run.rows.every(({ step }) => step.terms[i]!.qualifier === term.qualifier) ? term.qualifier : '' }]));
  for (const row of run.rows) row.step.terms = row.step.terms.filter((_, i) => !same[i]);
  return [item];
}

/** A run names each row's part and material only where no run above it on the page has named them for all its rows. */
function describedOnce(groups: AuditGroup[]): AuditGroup[] {
  const described = new Set<string>();
  for (const { items } of groups) {
    for (const { run } of items) {
      if (!run || run.subjects.length === 0) continue;
      const keys = run.rows.map((row) => `${run.subjects.join()}\u0000${row.key}`);
      if (keys.every((key) => described.has(key))) {
        run.subjects = [];
        for (const row of run.rows) row.subjects = [];
      }
      for (const key of keys) described.add(key);
    }
  }
  return groups;
}

const KEYED = /^(.+)\(([^()]+)\)$/;

/** Lays out a step's terms by key where they are a sum over keys (`AuditStep.keyed`); otherwise leaves them a list. */
function keyTerms(step: AuditStep): AuditStep {
  const columns: string[] = [];
  const unkeyed = new Set<string>();
  const rows: Array<{ key: string; cells: Map<string, AuditTerm> }> = [];
  let lead = 0;
  // Terms after the last keyed one whose names the first key does not have are terms of the whole sum (`Σ G·R1 / G_product`).
  let end = step.terms.length;
  const firstKey = step.terms.map((t) => KEYED.exec(t.symbol)?.[2]).find((key) => key !== undefined);
  let lastKeyed = -1;
  step.terms.forEach((t, i) => {
    if (KEYED.test(t.symbol)) lastKeyed = i;
  });
  const ofFirstKey = new Set<string>();
  for (let i = step.terms.findIndex((t) => KEYED.test(t.symbol)); i >= 0 && i < step.terms.length; i++) {
    const keyed = KEYED.exec(step.terms[i]!.symbol);
    if (keyed && keyed[2] !== firstKey) break;
    ofFirstKey.add(keyed ? keyed[1]! : step.terms[i]!.symbol);
  }
  while (end > lastKeyed + 1 && !ofFirstKey.has(step.terms[end - 1]!.symbol)) end--;
  const after = step.terms.slice(end);
  for (const term of step.terms.slice(0, end)) {
    const keyed = KEYED.exec(term.symbol);
    if (keyed) {
      const [, symbol, key] = keyed as unknown as [string, string, string];
      if (rows.at(-1)?.key !== key) rows.push({ key, cells: new Map() });
      if (rows.at(-1)!.cells.has(symbol)) return step;
      rows.at(-1)!.cells.set(symbol, term);
      if (!columns.includes(symbol)) columns.push(symbol);
    } else if (rows.length === 0) {
      lead++;
    } else {
      if (rows.at(-1)!.cells.has(term.symbol)) return step;
      rows.at(-1)!.cells.set(term.symbol, term);
      unkeyed.add(term.symbol);
      if (!columns.includes(term.symbol)) columns.push(term.symbol);
    }
  }
  if (rows.length < MIN_RUN || new Set(rows.map((row) => row.key)).size !== rows.length) return step;
  // A term without a key belongs to the key before it only if every key has one of its name (else it may be a term of the whole sum).
  if ([...unkeyed].some((symbol) => rows.some((row) => !row.cells.has(symbol)))) return step;
  const cells = rows.map((row) => columns.map((column) => row.cells.get(column)));
  step.keyed = {
    columns: columns.map((symbol, i) => {
      const qualifiers = new Set(cells.flatMap((row) => (row[i] ? [row[i]!.qualifier] : [])));
      return { symbol, qualifier: qualifiers.size === 1 ? [...qualifiers][0]! : '' };
    }),
    rows: rows.map((row, r) => ({ key: row.key, cells: cells[r]! })),
    after,
  };
  step.terms = step.terms.slice(0, lead);
  return step;
}

/** `text` replaced where it stands as a word of its own (a material id inside another word is left alone). */
function replaceWord(description: string, text: string, by: string): string {
  if (!text || !description.includes(text)) return description;
  let word = words.get(text);
  // Part names and material ids repeat across a catalogue's products: each pattern made once (and the cache kept bounded).
  if (!word && words.size > 10_000) words.clear();
  if (!word) words.set(text, (word = new RegExp(`(?<![\\w-])${text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}(?![\\w-])`, 'g')));
  return description.replace(word, by);
}
const words = new Map<string, RegExp>();

type InputRows = Map<string, { file: string; line: number; short: string }>;

/** The page's own link to an input row (`#i<k>`, numbered as the page first reads it). */
function inputHref(inputs: InputRows, file: string, line: number): string {
  const anchor = inputAnchor(file, line);
  let entry = inputs.get(anchor);
  if (!entry) inputs.set(anchor, (entry = { file, line, short: `i${inputs.size}` }));
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
    case 'factor':
      return { symbol: term.symbol, href: inputHref(inputs, term.factor.file, term.factor.line), kind: 'factor', text: term.factor.factorId, qualifier: 'factor', note: ` factor ${term.factor.factorId}` };
  }
}

/** Each input file by name, to show a row exactly as it appears in it. */
function inputFiles(project: Project): Map<string, { text: string }> {
  const files = new Map<string, { text: string }>();
  for (const table of [project.products, project.bom, project.materials, project.eol, project.activities, project.transport, project.factors, project.process, project.site, project.production, project.familyRows]) files.set(table.file, table.csv);
  files.set(project.declarationFile.file, project.declarationFile);
  return files;
}
