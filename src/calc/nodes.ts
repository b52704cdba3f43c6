import { figureTerm, type Driver, type FigureGraph, type Term, type VectorNode } from '../trace/graph.ts';
import { cutoffModuleOf, lastSegment, referenceStep } from '../trace/ids.ts';
import { CO2_PER_C } from '../reference/constants.ts';
import { bomCsv } from '../schema/bom.ts';
import { zeros, add, type Vec } from './vector.ts';

/** Adds a vector figure. */
export function vectorFigure(graph: FigureGraph, id: string, values: Vec, formula: string, description: string, terms: Term[]): VectorNode {
  return graph.add({ kind: 'vector', id, values, formula, description, terms });
}

/** A figure that is the sum of other vector figures: its terms are exactly its children. */
export function sumFigure(graph: FigureGraph, id: string, childIds: readonly string[], formula: string, description: string, symbol = lastSegment): VectorNode {
  const values = zeros(graph.indicators.length);
  for (const child of childIds) add(values, graph.vector(child).values);
  return vectorFigure(graph, id, values, formula, description, childIds.map((child) => figureTerm(child, symbol(child))));
}

/**
 * Records a factor use of a leaf figure (module from the figure id: cutoff/<module>/…), with
 * the input cells its amount is proportional to; its input row is the first driver's.
 */
export function useFactor(graph: FigureGraph, figure: string, factor: string, amount: number, drivers: Driver[][]): void {
  const first = drivers[0]?.[0];
  graph.uses.push({ module: cutoffModuleOf(figure), figure, factor, amount, ...(first ? { input: { file: first.file, line: first.line } } : {}), drivers });
}

/** One driver cell with the whole of the amount. */
export const driver = (file: string, line: number, column: string, share = 1): Driver => ({ file, line, column, share });

/** 44/12 as a reference step, made once per graph. */
export function co2PerCStep(graph: FigureGraph): string {
  const id = referenceStep.co2PerC;
  if (!graph.get(id)) graph.add({ kind: 'scalar', id, value: CO2_PER_C, unit: 'kg CO2 per kg C', formula: '44/12', description: 'Molar mass of CO2 over that of C (EN 16449).', terms: [] });
  return id;
}

/** A BOM line's mass cell as a driver, with the share of the amount it drives. */
export const bomMass = (line: { row: { line: number } }, share = 1): Driver => driver(bomCsv.file, line.row.line, 'mass_kg', share);
