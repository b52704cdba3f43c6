import type { Project } from '../model/types.ts';
import type { ProductResult } from '../calc/product.ts';
import type { FigureGraph, FigureNode, Term } from '../trace/graph.ts';
import { processStep, resultStep, stepGroup, type ResultMethod } from '../trace/ids.ts';
import { fragment, inputAnchor } from './figure-links.ts';
import { formatFigure as show } from './format.ts';
import { physicalLines } from './written.ts';

/**
 * The audit trail of one product, as one page, in the shape of the calculation: one entry
 * per step with its formula and terms (each a link down, to another step or to the input
 * row as written, with its value where it has one), and for a step with a value per
 * indicator a row of its group's values table, whose columns are the indicators (codes
 * written once per group, not once per step). A verifier recomputes a figure from the step's
 * terms and, one click away, their rows of the values table; the page's script adds the way
 * up (“used by”) from the same links. A 40-line × 25-indicator product's page stays within a
 * few hundred kilobytes (docs/performance.md).
 *
 * Anchors: a step that other pages link to (the results' modules, parts and totals, their
 * flow indicators, product flows, process models, site shares) is anchored by its step id,
 * and each of its values by its figure id `<step>/<indicator>`; any other step by `s<k>`,
 * its index in results.json `graph.steps`, and its values row by `v<k>`.
 */
export interface AuditTerm {
  symbol: string;
  href: string;
  /** What it is and its value where it does not vary by indicator: ` = 1.25 kg`, `mass_kg “0.83”`, `factor al-primary-ingot`. */
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
  terms: AuditTerm[];
  /** A step with one value per indicator: its row of the group's values table. */
  values?: { anchor: string; numbers: readonly number[]; linked: boolean };
}

export interface AuditGroup {
  title: string;
  steps: AuditStep[];
}

export interface AuditView {
  productId: string;
  /** The indicator codes of the values tables' columns. */
  indicators: string[];
  groups: AuditGroup[];
  inputs: Array<{ file: string; rows: Array<{ anchor: string; line: number; written: string }> }>;
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

export function auditView(project: Project, result: ProductResult): AuditView {
  const { graph } = result;
  const linked = linkedSteps(result, project);
  // The anchor of each step, by the order of the graph (that of results.json graph.steps).
  const anchors = new Map<string, string>();
  let k = 0;
  for (const node of graph.nodes.values()) {
    anchors.set(node.id, linked.has(node.id) || LINKED_GROUPS.has(stepGroup(node.id)) ? node.id : `s${k}`);
    k++;
  }
  const inputs = new Map<string, { file: string; line: number }>();
  const groups = new Map<string, AuditGroup>();
  let figureCount = 0;
  k = 0;
  for (const node of graph.nodes.values()) {
    const key = stepGroup(node.id);
    let group = groups.get(key);
    if (!group) groups.set(key, (group = { title: GROUP_TITLES[key] ?? key, steps: [] }));
    const terms = node.terms.map((term) => termView(graph, term, anchors, inputs));
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
    group.steps.push(step);
    k++;
  }

  const files = inputFiles(project);
  const byFile = new Map<string, AuditView['inputs'][number]['rows']>();
  for (const [anchor, entry] of [...inputs].sort(([, a], [, b]) => (a.file === b.file ? a.line - b.line : a.file < b.file ? -1 : 1))) {
    if (!byFile.has(entry.file)) byFile.set(entry.file, []);
    byFile.get(entry.file)!.push({ anchor, line: entry.line, written: (files.has(entry.file) ? physicalLines(files.get(entry.file)!) : [])[entry.line - 1] ?? '' });
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

function termView(graph: FigureGraph, term: Term, anchors: ReadonlyMap<string, string>, inputs: Map<string, { file: string; line: number }>): AuditTerm {
  const input = (file: string, line: number) => {
    const anchor = inputAnchor(file, line);
    if (!inputs.has(anchor)) inputs.set(anchor, { file, line });
    return `#${fragment(anchor)}`;
  };
  switch (term.kind) {
    case 'figure': {
      const target: FigureNode | undefined = graph.get(term.id);
      return { symbol: term.symbol, href: `#${fragment(anchors.get(term.id)!)}`, note: target?.kind === 'scalar' ? ` = ${show(target.value)} ${target.unit}` : '' };
    }
    case 'cell':
      return { symbol: term.symbol, href: input(term.cell.file, term.cell.line), note: ` ${term.cell.column === term.symbol ? '' : `${term.cell.column} `}“${term.cell.value}”` };
    case 'factor':
      return { symbol: term.symbol, href: input(term.factor.file, term.factor.line), note: ` factor ${term.factor.factorId}` };
  }
}

/** Each input file by name, to show a row exactly as it appears in it. */
function inputFiles(project: Project): Map<string, { text: string }> {
  const files = new Map<string, { text: string }>();
  for (const table of [project.products, project.bom, project.materials, project.eol, project.activities, project.transport, project.factors, project.process, project.site, project.production, project.familyRows]) files.set(table.file, table.csv);
  files.set(project.declarationFile.file, project.declarationFile);
  return files;
}
