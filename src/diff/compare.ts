import { resultFigureId, type ResultsSummary } from '../report/results.ts';
import { flowResultStep, flowStep, type ResultMethod } from '../trace/ids.ts';
import { HEADLINE_INDICATOR, HEADLINE_MODULE, HEADLINE_MODULE_D } from '../reference/headline.ts';

/**
 * Which published figures moved between two builds: every product × method × module (or
 * part, or total) × indicator of the results contract, and the product flows. Pure: the
 * summaries in, the changes out.
 */
export interface SummaryFigure {
  /** The results.json figure id (`cutoff/A1-A3/GWP-total`, `flows/recycled_content/total`). */
  figure: string;
  method: string;
  /** The module, CFF part, `total`, or the flow group. */
  module: string;
  /** The indicator code, or the flow's key. */
  indicator: string;
  unit: string;
  value: number | null;
}

export interface FigureChange extends Omit<SummaryFigure, 'value'> {
  product_id: string;
  old: number | null;
  new: number | null;
  /** new − old; null when either side is null (a figure that became, or stopped being, incomplete). */
  absolute: number | null;
  /** (new − old) / |old|; null when old is 0 or either side is null. */
  relative: number | null;
  headline: boolean;
  /** A figure of the declared result (cut-off, with module D, and the product's flows), not of a method shown for comparison only. */
  declared: boolean;
}

/**
 * The figures a review looks at first and `--fail-over` guards: GWP-total under every
 * method's total, the cut-off A1-A3 and module D columns, and the recycled content, as the
 * catalogue shows them.
 */
export const HEADLINE_FIGURES: readonly string[] = [
  resultFigureId('cutoff', HEADLINE_MODULE, HEADLINE_INDICATOR),
  resultFigureId('cutoff', HEADLINE_MODULE_D, HEADLINE_INDICATOR),
  resultFigureId('cutoff', 'total', 'GWP-total'),
  resultFigureId('cff', 'total', 'GWP-total'),
  resultFigureId('eol-recycling', 'total', 'GWP-total'),
  resultFigureId('fifty-fifty', 'total', 'GWP-total'),
  flowStep.recycledContent('total'),
];

/** The methods whose figures are the declaration's own; the CFF, 0:100 and 50:50 are shown for comparison. */
export const DECLARED_METHODS: ReadonlySet<string> = new Set(['cutoff', 'flows']);

/** Declared figures first, then headline figures, then the largest move: the order a review reads. */
export const reviewOrder = (a: FigureChange, b: FigureChange): number =>
  Number(b.declared) - Number(a.declared) || Number(b.headline) - Number(a.headline) || relativeChange(b.old, b.new) - relativeChange(a.old, a.new) || (a.figure < b.figure ? -1 : 1);

const FLOW_UNITS: Record<string, string> = { recycled_content: 'share of gross input', biogenic_carbon_kg: 'kg C', biogenic_co2_kg: 'kg CO2' };

/** Every number of a product's results, in contract order, with its figure id. */
export function summaryFigures(summary: ResultsSummary): SummaryFigure[] {
  const units = new Map(summary.indicators.map((indicator) => [indicator.code, indicator.unit]));
  const figures: SummaryFigure[] = [];
  const add = (method: ResultMethod, module: string, values: Record<string, number | null>) => {
    for (const [indicator, value] of Object.entries(values)) figures.push({ figure: resultFigureId(method, module, indicator), method, module, indicator, unit: units.get(indicator) ?? '', value });
  };
  for (const [method, results] of Object.entries(summary.methods) as Array<[ResultMethod, ResultsSummary['methods']['cutoff'] | ResultsSummary['methods']['cff']]>) {
    if (!results) continue;
    const modules = 'modules' in results ? results.modules : results.parts;
    for (const [module, values] of Object.entries(modules)) add(method, module, values);
    add(method, 'total', results.total);
  }
  for (const [group, values] of Object.entries(summary.flows)) {
    for (const [key, value] of Object.entries(values as Record<string, number | null>)) figures.push({ figure: flowResultStep(group as 'recycled_content', key), method: 'flows', module: group, indicator: key, unit: FLOW_UNITS[group] ?? '', value });
  }
  return figures;
}

/** The relative change of a figure, as `--threshold` and `--fail-over` read it; Infinity when a zero became non-zero. */
export function relativeChange(old: number | null, now: number | null): number {
  if (old === now) return 0;
  if (old === null || now === null) return Infinity;
  if (old === 0) return Infinity;
  return Math.abs(now - old) / Math.abs(old);
}

/** The figures of one product whose relative change is beyond `threshold` (a share: 0.01 is 1 %). */
export function compareProduct(old: ResultsSummary, now: ResultsSummary, threshold: number): FigureChange[] {
  const before = new Map(summaryFigures(old).map((figure) => [figure.figure, figure]));
  const changes: FigureChange[] = [];
  const seen = new Set<string>();
  const consider = (figure: SummaryFigure, oldValue: number | null, newValue: number | null) => {
    seen.add(figure.figure);
    const moved = relativeChange(oldValue, newValue);
    if (!(moved > threshold)) return;
    const { value: _value, ...where } = figure;
    changes.push({
      product_id: now.product_id,
      ...where,
      old: oldValue,
      new: newValue,
      absolute: oldValue === null || newValue === null ? null : newValue - oldValue,
      relative: oldValue === null || newValue === null || oldValue === 0 ? null : (newValue - oldValue) / Math.abs(oldValue),
      headline: HEADLINE_FIGURES.includes(figure.figure),
      declared: DECLARED_METHODS.has(figure.method),
    });
  };
  for (const figure of summaryFigures(now)) consider(figure, before.get(figure.figure)?.value ?? null, figure.value);
  // A figure the new build no longer has (an indicator dropped from the factor table) is a change too.
  for (const figure of before.values()) if (!seen.has(figure.figure) && figure.value !== null) consider(figure, figure.value, null);
  return changes;
}
