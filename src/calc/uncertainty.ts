import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { findGas } from '../reference/ghg.ts';
import type { Driver } from '../trace/graph.ts';
import { expandedUses } from './contributions.ts';
import type { CalcContext } from './context.ts';
import type { ProductResult } from './product.ts';
import { HEADLINE_INDICATOR } from '../reference/headline.ts';

/**
 * Monte Carlo uncertainty of a product's headline results (GWP-total A1-A3, D and the A1–C4 total). Inputs with a `gsd` column —
 * factor rows (one draw scales every indicator of the row), BOM line masses and activity
 * amounts — vary as lognormals whose median is the value written, ln X ~ N(ln x, (ln gsd)²)
 * (the common pedigree-matrix convention); the rest stay fixed. The results are sums over
 * the factor uses of amount × F × (the draws of the factor and of the cells the amount is
 * proportional to), computed for all iterations at once, one array per input: no
 * recalculation per iteration.
 */
export interface UncertaintySettings {
  iterations: number;
  seed: number;
}

export interface UncertaintyFigure {
  module: string;
  indicator: string;
  deterministic: number | null;
  mean: number | null;
  median: number | null;
  p2_5: number | null;
  p97_5: number | null;
}

export interface UncertaintyJson {
  iterations: number;
  seed: number;
  /** The inputs behind these results that varied, by kind, and how many stayed fixed. */
  varied: { factors: string[]; bom: number[]; activities: number[] };
  fixed: number;
  figures: UncertaintyFigure[];
}

/** The headline results: cradle to gate, module D, and the A1–C4 total (D not added). */
const SCOPES = [
  { module: 'A1-A3', modules: ['A1', 'A2', 'A3'] },
  { module: 'D', modules: ['D'] },
  { module: 'total', modules: ['A1', 'A2', 'A3', 'A4', 'A5', 'C1', 'C2', 'C3', 'C4'] },
] as const;
const INDICATOR = HEADLINE_INDICATOR;

/** A seeded stream of standard normal numbers (Box & Muller 1958 on pure-rand's xoroshiro128+). */
export function normalStream(seed: number): () => number {
  const rng = xoroshiro128plus(seed);
  // The generator's first outputs after seeding are poorly mixed; skip a few.
  for (let k = 0; k < 8; k++) uniformFloat64(rng);
  let spare: number | undefined;
  return () => {
    if (spare !== undefined) {
      const value = spare;
      spare = undefined;
      return value;
    }
    // 1 − u is in (0, 1]: the logarithm stays finite.
    const u = 1 - uniformFloat64(rng);
    const v = uniformFloat64(rng);
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}

/** n draws of a lognormal with median 1 and geometric standard deviation gsd. */
export function lognormalMultipliers(normal: () => number, gsd: number, n: number): Float64Array {
  const sigma = Math.log(gsd);
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = Math.exp(sigma * normal());
  return out;
}

/** The p-quantile of sorted values, linear between order statistics (Hyndman & Fan 1996, type 7). */
export function quantile(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const low = Math.floor(h);
  const high = Math.min(low + 1, sorted.length - 1);
  return sorted[low]! + (h - low) * (sorted[high]! - sorted[low]!);
}

/** FNV-1a of a text, so each product has its own stream whatever the build's order or sharding. */
function hash32(text: string): number {
  let hash = 0x811c9dc5;
  for (let k = 0; k < text.length; k++) {
    hash ^= text.charCodeAt(k);
    hash = Math.imul(hash, 0x01000193) >>> 0;
  }
  return hash;
}

export function productUncertainty(ctx: CalcContext, result: ProductResult, settings: UncertaintySettings): UncertaintyJson | undefined {
  const index = ctx.indicators.indexOf(INDICATOR);
  if (index < 0) return undefined;
  const iterations = settings.iterations;
  const project = ctx.project;
  const bomGsd = gsdByLine(project.bom.rows);
  const activityGsd = gsdByLine(project.activities.rows);

  const scopes = SCOPES.map(({ module, modules }) => ({ module, uses: expandedUses(ctx, result.graph, modules) }));
  // Every input behind the results, and the ones that vary, in a fixed order.
  const inputs = new Map<string, number | null>();
  for (const { uses } of scopes) {
    for (const use of uses) {
      if (!findGas(use.factor)) inputs.set(`factor:${use.factor}`, ctx.factorRow(use.factor).value.gsd ?? null);
      for (const group of use.drivers) for (const driver of group) inputs.set(driverKey(driver), driver.file === project.bom.file ? (bomGsd.get(driver.line) ?? null) : driver.file === project.activities.file ? (activityGsd.get(driver.line) ?? null) : null);
    }
  }
  const varying = [...inputs.entries()].filter(([, gsd]) => gsd !== null && gsd > 1).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  const normal = normalStream((hash32(result.productId) ^ settings.seed) >>> 0);
  const draws = new Map(varying.map(([key, gsd]) => [key, lognormalMultipliers(normal, gsd!, iterations)]));

  const figures = scopes.map(({ module, uses }) => {
    const id = module === 'total' ? result.cutoff.total : result.cutoff.modules[module];
    const deterministic = id ? result.graph.vector(id).values[index]! : null;
    const out = new Float64Array(iterations);
    const scratch = new Float64Array(iterations);
    for (const use of uses) {
      const base = use.amount * ctx.factor(use.factor).values[index]!;
      if (base === 0) continue;
      scratch.fill(base);
      const factorDraws = draws.get(`factor:${use.factor}`);
      if (factorDraws) for (let k = 0; k < iterations; k++) scratch[k]! *= factorDraws[k]!;
      for (const group of use.drivers) {
        const varied = group.filter((d) => draws.has(driverKey(d)));
        if (varied.length === 0) continue;
        // Σ share·r over the group, the fixed cells at r = 1.
        const fixedShare = group.filter((d) => !draws.has(driverKey(d))).reduce((sum, d) => sum + d.share, 0);
        const shares = varied.map((d) => d.share);
        const arrays = varied.map((d) => draws.get(driverKey(d))!);
        for (let k = 0; k < iterations; k++) {
          let factor = fixedShare;
          for (let j = 0; j < arrays.length; j++) factor += shares[j]! * arrays[j]![k]!;
          scratch[k]! *= factor;
        }
      }
      for (let k = 0; k < iterations; k++) out[k]! += scratch[k]!;
    }
    return summarise(module, deterministic, out);
  });
  const varied = varying.map(([key]) => key);
  return {
    iterations,
    seed: settings.seed,
    varied: {
      factors: varied.filter((k) => k.startsWith('factor:')).map((k) => k.slice('factor:'.length)),
      bom: varied.filter((k) => k.startsWith(`${project.bom.file}:`)).map((k) => Number(k.split(':')[1])),
      activities: varied.filter((k) => k.startsWith(`${project.activities.file}:`)).map((k) => Number(k.split(':')[1])),
    },
    fixed: inputs.size - varying.length,
    figures,
  };
}

const driverKey = (d: Driver) => `${d.file}:${d.line}`;

function gsdByLine(rows: ReadonlyArray<{ line: number; value: { gsd?: number | null } }>): Map<number, number | null> {
  return new Map(rows.map((row) => [row.line, row.value.gsd ?? null]));
}

function summarise(module: string, deterministic: number | null, values: Float64Array): UncertaintyFigure {
  if (deterministic === null || !values.every(Number.isFinite)) return { module, indicator: INDICATOR, deterministic, mean: null, median: null, p2_5: null, p97_5: null };
  const sorted = Float64Array.from(values).sort();
  const mean = values.reduce((sum, v) => sum + v, 0) / values.length;
  return { module, indicator: INDICATOR, deterministic, mean, median: quantile(sorted, 0.5), p2_5: quantile(sorted, 0.025), p97_5: quantile(sorted, 0.975) };
}
