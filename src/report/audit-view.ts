import type { Project } from '../model/types.ts';
import type { ProductResult } from '../calc/product.ts';
import type { FigureGraph, FigureNode, Term } from '../trace/graph.ts';
import { figureId, processStep, resultStep, stepGroup, type ResultMethod } from '../trace/ids.ts';
import { fragment, inputAnchor } from './figure-links.ts';
import { formatInput } from './format.ts';
import { physicalLines } from './written.ts';

/**
 * The audit trail of one product, as one page, in the shape of the calculation: one section
 * per step with its formula and terms (each a link down, to another step or to the input row
 * as written, with its value where it has one) and the steps that use it (the way up). A
 * vector step's values, one per indicator, are a row of its group's values table, whose
 * columns are the indicators, so indicator codes are written once per group, not once per
 * step: a 40-line product's page stays a few hundred kilobytes (docs/performance.md). A
 * verifier recomputes a figure from the step's terms and, one click away, their rows of the
 * values table. The values a declaration page links to (`step/indicator`) carry that anchor.
 */
export interface AuditLink {
  text: string;
  href: string;
}

export interface AuditTerm {
  symbol: string;
  /** What the term is: a step id or `file:line column`. */
  target: AuditLink;
  /** Its value, where it does not vary by indicator (scalar steps, cells). */
  value?: string;
}

export interface AuditStep {
  id: string;
  description: string;
  formula: string;
  /** A scalar step's value and unit. */
  value?: string;
  unit?: string;
  /** A vector step: its values are a row of the group's values table. */
  vector: boolean;
  terms: AuditTerm[];
  usedBy: AuditLink[];
}

export interface AuditValuesRow {
  step: string;
  /** One per indicator of the page, formatted; `anchor` where a page links to that value. */
  cells: Array<{ text: string; anchor?: string }>;
}

export interface AuditGroup {
  title: string;
  steps: AuditStep[];
  values: AuditValuesRow[];
}

export interface AuditInputRow {
  anchor: string;
  line: number;
  label: string;
  written: string;
  usedBy: AuditLink[];
}

export interface AuditView {
  productId: string;
  /** The indicator codes of the values tables' columns. */
  indicators: string[];
  groups: AuditGroup[];
  inputs: Array<{ file: string; rows: AuditInputRow[] }>;
  stepCount: number;
  figureCount: number;
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

const show = (value: number): string => (Number.isNaN(value) ? 'n/a' : formatInput(value));
const local = (id: string): string => `#${fragment(id)}`;
/** The anchor of a vector step's row in its group's values table. */
export const valuesAnchor = (step: string): string => `values:${step}`;

/** The vector steps whose values other pages link to: the results' modules, parts and totals, and each process's factor. */
function linkedSteps(result: ProductResult, project: Project): Set<string> {
  const linked = new Set<string>([result.cutoff.total, ...Object.values(result.cutoff.modules)]);
  for (const [method, r] of Object.entries(result.methods)) {
    linked.add(resultStep(method as ResultMethod, 'total'));
    for (const part of Object.keys(r!.parts)) linked.add(resultStep(method as ResultMethod, part));
  }
  for (const process of project.processes) linked.add(processStep.factor(process.id));
  return linked;
}

export function auditView(project: Project, result: ProductResult): AuditView {
  const { graph } = result;
  const files = inputFiles(project);
  const usedBy = new Map<string, string[]>();
  const inputs = new Map<string, { file: string; line: number; users: string[] }>();
  const useInput = (file: string, line: number, nodeId: string) => {
    const key = inputAnchor(file, line);
    let entry = inputs.get(key);
    if (!entry) inputs.set(key, (entry = { file, line, users: [] }));
    if (entry.users[entry.users.length - 1] !== nodeId) entry.users.push(nodeId);
  };
  for (const node of graph.nodes.values()) {
    for (const term of node.terms) {
      if (term.kind === 'figure') {
        const users = usedBy.get(term.id) ?? [];
        if (users[users.length - 1] !== node.id) users.push(node.id);
        usedBy.set(term.id, users);
      } else if (term.kind === 'cell') useInput(term.cell.file, term.cell.line, node.id);
      else useInput(term.factor.file, term.factor.line, node.id);
    }
  }

  const linked = linkedSteps(result, project);
  const groups = new Map<string, AuditGroup>();
  let figureCount = 0;
  for (const node of graph.nodes.values()) {
    const key = stepGroup(node.id);
    let group = groups.get(key);
    if (!group) groups.set(key, (group = { title: GROUP_TITLES[key] ?? key, steps: [], values: [] }));
    group.steps.push(stepView(graph, node, (usedBy.get(node.id) ?? []).map((id) => ({ text: id, href: local(id) }))));
    if (node.kind === 'vector') {
      const anchored = linked.has(node.id);
      group.values.push({ step: node.id, cells: graph.indicators.map((code, i) => ({ text: show(node.values[i]!), ...(anchored ? { anchor: figureId(node.id, code) } : {}) })) });
    }
    figureCount += node.kind === 'vector' ? graph.indicators.length : 1;
  }

  const byFile = new Map<string, AuditInputRow[]>();
  for (const [anchor, entry] of [...inputs].sort(([, a], [, b]) => (a.file === b.file ? a.line - b.line : a.file < b.file ? -1 : 1))) {
    if (!byFile.has(entry.file)) byFile.set(entry.file, []);
    byFile.get(entry.file)!.push({
      anchor,
      line: entry.line,
      label: `${entry.file}:${entry.line}`,
      written: (files.has(entry.file) ? physicalLines(files.get(entry.file)!) : [])[entry.line - 1] ?? '',
      usedBy: entry.users.map((id) => ({ text: id, href: local(id) })),
    });
  }

  return {
    productId: result.productId,
    indicators: [...graph.indicators],
    groups: [...groups.values()],
    inputs: [...byFile].map(([file, rows]) => ({ file, rows })),
    stepCount: graph.nodes.size,
    figureCount,
  };
}

function stepView(graph: FigureGraph, node: FigureNode, usedBy: AuditLink[]): AuditStep {
  const terms: AuditTerm[] = node.terms.map((term) => termView(graph, term));
  const head = { id: node.id, description: node.description, formula: node.formula, terms, usedBy };
  return node.kind === 'scalar' ? { ...head, vector: false, value: show(node.value), unit: node.unit } : { ...head, vector: true };
}

function termView(graph: FigureGraph, term: Term): AuditTerm {
  switch (term.kind) {
    case 'figure': {
      const target = graph.get(term.id);
      return { symbol: term.symbol, target: { text: term.id, href: local(term.id) }, ...(target?.kind === 'scalar' ? { value: `${show(target.value)} ${target.unit}` } : {}) };
    }
    case 'cell':
      return { symbol: term.symbol, target: { text: `${term.cell.file}:${term.cell.line} ${term.cell.column}`, href: local(inputAnchor(term.cell.file, term.cell.line)) }, value: `“${term.cell.value}”` };
    case 'factor':
      return { symbol: term.symbol, target: { text: `${term.factor.file}:${term.factor.line} (factor ${term.factor.factorId}, the indicator’s column)`, href: local(inputAnchor(term.factor.file, term.factor.line)) } };
  }
}

/** Each input file by name, to show a row exactly as it appears in it. */
function inputFiles(project: Project): Map<string, { text: string }> {
  const files = new Map<string, { text: string }>();
  for (const table of [project.products, project.bom, project.materials, project.eol, project.activities, project.transport, project.factors, project.process, project.site, project.production, project.familyRows]) files.set(table.file, table.csv);
  files.set(project.declarationFile.file, project.declarationFile);
  return files;
}
