import { inputContributions, type InputContribution } from './contributions.ts';
import type { CalcContext } from './context.ts';
import type { ProductResult } from './product.ts';
import type { Project } from '../model/types.ts';
import { HEADLINE_INDICATOR } from '../reference/headline.ts';

/** How many inputs the contribution and sensitivity tables show, per result. */
export const TOP_INPUTS = 10;
const INDICATOR = HEADLINE_INDICATOR;

export interface SensitivityInput {
  kind: InputContribution['kind'];
  file: string;
  line: number;
  column: string;
  label: string;
  /** The part of the result that scales with the input. */
  contribution: number;
  /** contribution / result. */
  share: number | null;
  /** The result with the input at (1 − step) and (1 + step): result ∓ step·contribution. */
  minus: number;
  plus: number;
}

/** results.json `sensitivity`: the top inputs of GWP-total A1-A3 and of module D, and one-at-a-time ±step. */
export interface SensitivityJson {
  step: number;
  indicator: string;
  scopes: Array<{ module: 'A1-A3' | 'D'; value: number | null; inputs: SensitivityInput[] }>;
}

const SCOPES = [
  { module: 'A1-A3', modules: ['A1', 'A2', 'A3'] },
  { module: 'D', modules: ['D'] },
] as const;

/**
 * Contribution analysis and one-at-a-time sensitivity of GWP-total in A1-A3 and in module D:
 * the ten inputs with the largest contribution (|x·∂R/∂x|), and the result with each moved
 * by ±step. Every formula is linear in each input, so the result at (1 ± step)·x is exactly
 * R ± step·contribution (a test recomputes it with the input changed).
 */
export function productSensitivity(ctx: CalcContext, result: ProductResult, step: number): SensitivityJson | undefined {
  const index = ctx.indicators.indexOf(INDICATOR);
  if (index < 0) return undefined;
  const labels = labeller(ctx.project);
  return {
    step,
    indicator: INDICATOR,
    scopes: SCOPES.map(({ module, modules }) => {
      const id = result.cutoff.modules[module];
      const value = id ? result.graph.vector(id).values[index]! : null;
      const inputs = inputContributions(ctx, result.graph, modules)
        .map((c) => ({ c, v: c.values[index]! }))
        .filter(({ v }) => Number.isFinite(v) && v !== 0)
        .sort((a, b) => Math.abs(b.v) - Math.abs(a.v) || a.c.file.localeCompare(b.c.file) || a.c.line - b.c.line)
        .slice(0, TOP_INPUTS)
        .map(({ c, v }) => ({
          kind: c.kind,
          file: c.file,
          line: c.line,
          column: c.column,
          label: labels(c),
          contribution: v,
          share: value === null || value === 0 ? null : v / value,
          minus: (value ?? 0) - step * v,
          plus: (value ?? 0) + step * v,
        }));
      return { module, value: value !== null && Number.isFinite(value) ? value : null, inputs };
    }),
  };
}

/** A reader's name for an input: the factor id, or the row's own words. */
function labeller(project: Project): (c: InputContribution) => string {
  const { bom, activities, transport, site } = project.lookups.byLine;
  return (c) => {
    switch (c.kind) {
      case 'factor':
        return `factor ${c.factor}`;
      case 'bom': {
        const bomRow = bom.get(c.line)?.value;
        return bomRow ? `${bomRow.line_id} ${bomRow.component}, mass` : `bom.csv line ${c.line}`;
      }
      case 'activity': {
        const activityRow = activities.get(c.line)?.value;
        return activityRow ? `${activityRow.activity}, amount` : `activities.csv line ${c.line}`;
      }
      case 'transport': {
        const leg = transport.get(c.line)?.value;
        return leg ? `${leg.leg}, distance` : `transport.csv line ${c.line}`;
      }
      case 'site': {
        const siteRow = site.get(c.line)?.value;
        return siteRow ? `${siteRow.activity} (${siteRow.site_id}), amount` : `site.csv line ${c.line}`;
      }
    }
  };
}
