import type { FactorUse, FigureGraph } from '../trace/graph.ts';
import { PROCESS_PREFIX } from '../schema/process-kinds.ts';
import type { CalcContext } from './context.ts';
import type { Vec } from './vector.ts';
import { findGas } from '../reference/ghg.ts';

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
  // Data quality, sensitivity and the Monte Carlo run all ask for A1-A3 of the same product: open it once.
  let cached = expandedCache.get(graph);
  if (!cached) expandedCache.set(graph, (cached = new Map()));
  const key = modules.join(',');
  let uses = cached.get(key);
  if (!uses) cached.set(key, (uses = openProcesses(ctx, graph, modules)));
  return uses;
}

const expandedCache = new WeakMap<FigureGraph, Map<string, FactorUse[]>>();

function openProcesses(ctx: CalcContext, graph: FigureGraph, modules: readonly string[]): FactorUse[] {
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
    const resolved = ctx.factor(use.factor);
    let entry = byFactor.get(use.factor);
    if (!entry) byFactor.set(use.factor, (entry = { factor: use.factor, amount: 0, values: resolved.values.map(() => 0), inputs: [] }));
    entry.amount += use.amount;
    resolved.values.forEach((value, i) => (entry.values[i]! += use.amount * value));
    if (use.input && !entry.inputs.some((i) => i.file === use.input!.file && i.line === use.input!.line)) entry.inputs.push(use.input);
  }
  return [...byFactor.values()];
}

/** An input a result scales with: a factor row, or a cell of a BOM line, activity, leg or site row. */
export interface InputContribution {
  kind: 'factor' | 'bom' | 'activity' | 'transport' | 'site';
  file: string;
  line: number;
  /** The cell varied: mass_kg, amount, distance_km; for a factor row, its indicator values. */
  column: string;
  /** The factor id, for a factor row. */
  factor?: string;
  /** The part of the result that scales with the input, per indicator. */
  values: Vec;
}

const KIND: Record<string, InputContribution['kind']> = { 'bom.csv': 'bom', 'activities.csv': 'activity', 'transport.csv': 'transport', 'site.csv': 'site' };

/**
 * Each input's contribution to the given modules: the part of the result proportional to it
 * (x·∂R/∂x, exact because every formula is linear in each input). For a factor row, every
 * use of it (processes opened); for an input cell, its share of every use it drives. Factor
 * rows and input cells overlap — the billet's kilograms appear under both the BOM line and
 * the ingot factor — so contributions of different kinds do not add up to the result; the
 * factor rows' do. Built-in greenhouse-gas values are constants, not inputs, and are left out.
 */
export function inputContributions(ctx: CalcContext, graph: FigureGraph, modules: readonly string[]): InputContribution[] {
  const byKey = new Map<string, InputContribution>();
  const indicatorCount = ctx.length;
  const add = (key: string, make: () => Omit<InputContribution, 'values'>, amount: number, values: Vec) => {
    let entry = byKey.get(key);
    if (!entry) byKey.set(key, (entry = { ...make(), values: new Array<number>(indicatorCount).fill(0) }));
    for (let i = 0; i < indicatorCount; i++) entry.values[i]! += amount * values[i]!;
  };
  for (const use of expandedUses(ctx, graph, modules)) {
    const resolved = ctx.factor(use.factor);
    if (!findGas(use.factor)) {
      const row = ctx.factorRow(use.factor);
      add(`factors.csv:${row.line}`, () => ({ kind: 'factor', file: ctx.project.factors.file, line: row.line, column: '', factor: use.factor }), use.amount, resolved.values);
    }
    for (const group of use.drivers) {
      for (const driver of group) add(`${driver.file}:${driver.line}:${driver.column}`, () => ({ kind: KIND[driver.file] ?? 'bom', file: driver.file, line: driver.line, column: driver.column }), use.amount * driver.share, resolved.values);
    }
  }
  return [...byKey.values()];
}
