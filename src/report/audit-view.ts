import type { Project } from '../model/types.ts';
import type { ProductResult } from '../calc/product.ts';
import type { FigureGraph, FigureNode, Term } from '../trace/graph.ts';
import { fragment, inputAnchor } from './figure-links.ts';
import { formatInput } from './format.ts';
import { physicalLines } from './written.ts';

/**
 * The audit trail of one product, as one page: every figure of its graph with formula,
 * terms and values, each term a link down (to another figure or to the input row as
 * written), every figure and input row with the figures that use it (the way up). Figures
 * are anchored by their results.json ids.
 */
export interface AuditLink {
  text: string;
  href: string;
}

export interface AuditTerm {
  symbol: string;
  /** What the term is: a figure id or `file:line column`. */
  target: AuditLink;
  /** Its value, where it does not vary by indicator (scalar figures, cells). */
  value?: string;
}

export interface AuditNode {
  id: string;
  /** Heading level group, e.g. `cutoff`, `inventory`. */
  description: string;
  formula: string;
  /** Scalar figures: value and unit. */
  value?: string;
  unit?: string;
  terms: AuditTerm[];
  /** Vector figures: one row per indicator, anchored `<node id>/<code>`. */
  rows?: Array<{ anchor: string; code: string; value: string; cells: Array<{ text: string; href?: string }> }>;
  /** Column heads of the per-indicator term values (symbols), when shown. */
  termColumns?: string[];
  usedBy: AuditLink[];
}

export interface AuditGroup {
  title: string;
  nodes: AuditNode[];
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
  groups: AuditGroup[];
  inputs: Array<{ file: string; rows: AuditInputRow[] }>;
  figureCount: number;
}

/** At most this many per-indicator term columns beside a vector figure; sums over many parts link to each part instead. */
const MAX_TERM_COLUMNS = 6;

const GROUP_TITLES: Record<string, string> = {
  inventory: 'Mass flows (inventory)',
  cutoff: 'Cut-off and module D (EN 15804+A2)',
  cff: 'Circular Footprint Formula',
  'eol-recycling': 'End-of-life recycling (0:100)',
  'fifty-fifty': '50:50',
  reference: 'Reference values and presets',
  flows: 'Recycled content and biogenic carbon',
  process: 'Process models (process.csv)',
};

const show = (value: number): string => (Number.isNaN(value) ? 'n/a' : formatInput(value));
const local = (id: string): string => `#${fragment(id)}`;

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

  const groups = new Map<string, AuditNode[]>();
  let figureCount = 0;
  for (const node of graph.nodes.values()) {
    const group = node.id.split('/')[0]!;
    if (!groups.has(group)) groups.set(group, []);
    groups.get(group)!.push(nodeView(graph, node, (usedBy.get(node.id) ?? []).map((id) => ({ text: id, href: local(id) }))));
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
    groups: [...groups].map(([key, nodes]) => ({ title: GROUP_TITLES[key] ?? key, nodes })),
    inputs: [...byFile].map(([file, rows]) => ({ file, rows })),
    figureCount,
  };
}

function nodeView(graph: FigureGraph, node: FigureNode, usedBy: AuditLink[]): AuditNode {
  const terms: AuditTerm[] = node.terms.map((term) => termView(graph, term));
  if (node.kind === 'scalar') {
    return { id: node.id, description: node.description, formula: node.formula, value: show(node.value), unit: node.unit, terms, usedBy };
  }
  // Terms that vary by indicator: vector figures and factor rows.
  const varying = node.terms.filter((term) => term.kind === 'factor' || (term.kind === 'figure' && graph.get(term.id)?.kind === 'vector'));
  const columns = varying.length <= MAX_TERM_COLUMNS ? varying : [];
  const rows = graph.indicators.map((code, i) => ({
    anchor: `${node.id}/${code}`,
    code,
    value: show(node.values[i]!),
    cells: columns.map((term) => {
      if (term.kind === 'factor') {
        // The factor row is linked once, in the terms list; here its cell as written.
        const written = term.factor.raw[code] ?? '';
        return { text: written === '' ? 'n/a' : written };
      }
      const target = graph.vector((term as Extract<Term, { kind: 'figure' }>).id);
      return { text: show(target.values[i]!), href: local(`${target.id}/${code}`) };
    }),
  }));
  return { id: node.id, description: node.description, formula: node.formula, terms, rows, termColumns: columns.map((term) => term.symbol), usedBy };
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
      return { symbol: term.symbol, target: { text: `${term.factor.file}:${term.factor.line} (factor ${term.factor.factorId})`, href: local(inputAnchor(term.factor.file, term.factor.line)) } };
  }
}

/** Each input file by name, to show a row exactly as it appears in it. */
function inputFiles(project: Project): Map<string, { text: string }> {
  const files = new Map<string, { text: string }>();
  for (const table of [project.products, project.bom, project.materials, project.eol, project.activities, project.transport, project.factors, project.process, project.site, project.production, project.familyRows]) files.set(table.file, table.csv);
  files.set(project.declarationFile.file, project.declarationFile);
  return files;
}
