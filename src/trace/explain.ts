import { formatCounted, formatSignificant } from '../format.ts';
import { findIndicator } from '../reference/indicators.ts';
import type { FigureGraph, Term } from './graph.ts';
import { figureId, parseFigureId } from './ids.ts';

/** A figure id of the results contract, resolved to its node and indicator. */
export interface ResolvedFigure {
  nodeId: string;
  /** Indicator code for a vector node's figure. */
  code?: string;
}

export function resolveFigure(graph: FigureGraph, id: string): ResolvedFigure | undefined {
  const address = parseFigureId(id, (step) => graph.get(step)?.kind === 'vector', (step) => graph.get(step)?.kind === 'scalar', graph.indicators);
  return address ? { nodeId: address.step, ...(address.indicator === undefined ? {} : { code: address.indicator }) } : undefined;
}

/** Every figure id of a graph, as results.json lists them. */
export function figureIds(graph: FigureGraph): string[] {
  const ids: string[] = [];
  for (const node of graph.nodes.values()) {
    if (node.kind === 'scalar') ids.push(node.id);
    else for (const code of graph.indicators) ids.push(figureId(node.id, code));
  }
  return ids;
}

const format = (value: number): string => formatSignificant(value, 6);

/**
 * The derivation of a figure as an indented tree, down to the input cells, with the value
 * at each step. A figure reached a second time is named, not repeated.
 */
export function explainFigure(graph: FigureGraph, figure: ResolvedFigure, maxDepth = Infinity): string[] {
  const lines: string[] = [];
  const shown = new Set<string>();
  const codeIndex = figure.code === undefined ? -1 : graph.indicators.indexOf(figure.code);

  const describe = (nodeId: string): { id: string; value: string; unit: string; formula: string; description: string; terms: Term[] } => {
    const node = graph.get(nodeId)!;
    if (node.kind === 'scalar') return { id: node.id, value: format(node.value), unit: node.unit, formula: node.formula, description: node.description, terms: node.terms };
    const code = figure.code!;
    return { id: figureId(node.id, code), value: format(node.values[codeIndex]!), unit: findIndicator(code)?.unit ?? '', formula: node.formula, description: node.description, terms: node.terms };
  };

  const walk = (nodeId: string, prefix: string, symbol: string, depth: number) => {
    const d = describe(nodeId);
    const label = symbol ? `${symbol}  ` : '';
    if (shown.has(d.id)) {
      lines.push(`${prefix}${label}${d.id} = ${d.value} ${d.unit}  (derivation shown above)`);
      return;
    }
    shown.add(d.id);
    lines.push(`${prefix}${label}${d.id} = ${d.value} ${d.unit}`);
    const inner = prefix.replace(/├─ $/, '│  ').replace(/└─ $/, '   ');
    lines.push(`${inner}   ${d.formula}   — ${d.description}`);
    if (depth >= maxDepth) {
      if (d.terms.length) lines.push(`${inner}   … ${formatCounted(d.terms.length, 'term', 'terms')} (raise --depth to see them)`);
      return;
    }
    d.terms.forEach((term, i) => {
      const last = i === d.terms.length - 1;
      const branch = `${inner}${last ? '└─ ' : '├─ '}`;
      if (term.kind === 'figure') {
        walk(term.id, branch, term.symbol, depth + 1);
      } else if (term.kind === 'cell') {
        lines.push(`${branch}${term.symbol}  ${term.cell.file}:${term.cell.line} ${term.cell.column} = ${JSON.stringify(term.cell.value)}`);
      } else if (term.factor.elements) {
        // A supplier's dataset: the indicator's own element — file, line, module, indicator and the text written there.
        const element = figure.code === undefined ? undefined : term.factor.elements[figure.code];
        lines.push(
          element
            ? `${branch}${term.symbol}  ${term.factor.file}:${element.line} ${element.module} ${figure.code} = ${JSON.stringify(element.value)}  (factor ${term.factor.factorId}, the supplier’s declared value)`
            : `${branch}${term.symbol}  ${term.factor.file} has no ${figure.code ?? 'value'} for A1-A3  (factor ${term.factor.factorId}: not available)`,
        );
      } else {
        const column = figure.code ?? 'factor_id';
        lines.push(`${branch}${term.symbol}  ${term.factor.file}:${term.factor.line} ${column} = ${JSON.stringify(term.factor.raw[column] ?? '')}  (factor ${term.factor.factorId})`);
      }
    });
  };
  walk(figure.nodeId, '', '', 0);
  return lines;
}
