import type { FactorUse, FigureGraph } from '../trace/graph.ts';
import { PROCESS_PREFIX } from '../schema/process-parameters.ts';
import type { CalcContext } from './context.ts';
import type { Vec } from './vector.ts';

/** A factor's share in a set of modules: how much of it they take and what that adds, per indicator. */
export interface FactorContribution {
  factor: string;
  amount: number;
  values: Vec;
  /** The input rows that take it (BOM lines, activities, legs, site rows, materials). */
  inputs: Array<{ file: string; line: number }>;
}

/**
 * The factor uses of the given modules, with every process factor opened into the factors of
 * its flows (kWh of grid electricity, kg of alumina, kg of CO2), so a smelter's electricity
 * counts as the electricity factor it is.
 */
export function expandedUses(ctx: CalcContext, graph: FigureGraph, modules: readonly string[]): FactorUse[] {
  const wanted = new Set(modules);
  const out: FactorUse[] = [];
  const expand = (use: FactorUse, depth: number) => {
    if (!use.factor.startsWith(PROCESS_PREFIX) || depth > 8) {
      out.push(use);
      return;
    }
    for (const flow of ctx.processFlows(use.factor)) expand({ ...use, factor: flow.factor, amount: use.amount * flow.perKg }, depth + 1);
  };
  for (const use of graph.uses) if (wanted.has(use.module)) expand(use, 0);
  return out;
}

/** Each factor's contribution to the given modules, Σ amount × F, in order of first use. */
export function factorContributions(ctx: CalcContext, graph: FigureGraph, modules: readonly string[]): FactorContribution[] {
  const byFactor = new Map<string, FactorContribution>();
  for (const use of expandedUses(ctx, graph, modules)) {
    const f = ctx.factor(use.factor);
    let entry = byFactor.get(use.factor);
    if (!entry) byFactor.set(use.factor, (entry = { factor: use.factor, amount: 0, values: f.values.map(() => 0), inputs: [] }));
    entry.amount += use.amount;
    f.values.forEach((value, i) => (entry.values[i]! += use.amount * value));
    if (use.input && !entry.inputs.some((i) => i.file === use.input!.file && i.line === use.input!.line)) entry.inputs.push(use.input);
  }
  return [...byFactor.values()];
}
