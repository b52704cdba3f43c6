import { dataTypeOf } from '../model/rows.ts';
import { factorContributions } from './contributions.ts';
import type { CalcContext } from './context.ts';
import type { ProductResult } from './product.ts';
import { findGas } from '../reference/ghg.ts';
import { HEADLINE_INDICATOR } from '../reference/headline.ts';
import { dqrRating, pedigreeDqr } from '../reference/dqr.ts';

export type DataType = 'specific' | 'generic';

export interface FactorQuality {
  factor_id: string;
  /** factors.csv line, for a row of the table. */
  line: number | null;
  scores: { ter: number | null; ger: number | null; tir: number | null; p: number | null };
  /** Null unless all four scores are given: a partial score is not averaged. */
  dqr: number | null;
  rating: string | null;
  data_type: DataType | null;
  /** Why there is no DQR (not scored, partly scored, a built-in greenhouse gas). */
  unscored_reason: string | null;
}

/** The pedigree of one factor as the inputs give it. */
export function factorQuality(ctx: CalcContext, id: string): FactorQuality {
  if (findGas(id)) {
    // A direct emission the declarant reports from its own records, characterised with a built-in GWP-100 value.
    return { factor_id: id, line: null, scores: { ter: null, ger: null, tir: null, p: null }, dqr: null, rating: null, data_type: 'specific', unscored_reason: 'built-in greenhouse gas (the declarant’s own emission record; no dataset to score)' };
  }
  const row = ctx.factorRow(id);
  const { ter, ger, tir, p } = row.value;
  const { dqr, missing } = pedigreeDqr(row.value);
  return {
    factor_id: id,
    line: row.line,
    scores: { ter: ter ?? null, ger: ger ?? null, tir: tir ?? null, p: p ?? null },
    dqr,
    rating: dqr === null ? null : dqrRating(dqr),
    data_type: dataTypeOf(row.value),
    unscored_reason: missing.length === 0 ? null : missing.length === 4 ? 'not scored' : `partly scored (${missing.join(', ')} missing)`,
  };
}

/** results.json `data_quality`: the data quality of a product's cradle-to-gate result. */
export interface DataQualityJson {
  scope: string;
  /** Per indicator: Σ |c_f|·DQR_f / Σ |c_f| over the scored factors, and the share of Σ |c_f| they carry. */
  indicators: Record<string, { dqr: number | null; rating: string | null; scored_share: number | null }>;
  /** Shares of |GWP-total A1-A3| by the data type of the factors behind it. */
  gwp_total_by_data_type: { specific: number | null; generic: number | null; not_stated: number | null };
  /** Every factor behind A1-A3, largest share of GWP-total first. */
  factors: Array<FactorQuality & { share_of_gwp_total: number | null }>;
  /** Factors without a DQR, named. */
  unscored: string[];
}

const MODULES = ['A1', 'A2', 'A3'] as const;

/**
 * The contribution-weighted DQR of each indicator of cut-off A1-A3: every factor behind the
 * result (process factors opened into the factors of their flows) weighted by the absolute
 * value of what it adds, Σ |c_f|·DQR_f / Σ |c_f| over the scored factors. Factors without
 * scores are left out of the average, counted in `scored_share` and named — never guessed.
 */
export function productDataQuality(ctx: CalcContext, result: ProductResult): DataQualityJson {
  const contributions = factorContributions(ctx, result.graph, MODULES);
  const qualities = contributions.map((c) => factorQuality(ctx, c.factor));
  const weight = (k: number, i: number) => {
    const value = contributions[k]!.values[i]!;
    return Number.isFinite(value) ? Math.abs(value) : 0;
  };
  const indicators: DataQualityJson['indicators'] = {};
  const cradleToGate = result.graph.vector(result.cutoff.modules['A1-A3']!).values;
  ctx.indicators.forEach((code, i) => {
    // A result that is not available (an input it needs is empty) has no data quality either.
    if (Number.isNaN(cradleToGate[i]!)) {
      indicators[code] = { dqr: null, rating: null, scored_share: null };
      return;
    }
    let all = 0;
    let scored = 0;
    let weighted = 0;
    contributions.forEach((_, k) => {
      const part = weight(k, i);
      all += part;
      const dqr = qualities[k]!.dqr;
      if (dqr !== null) {
        scored += part;
        weighted += part * dqr;
      }
    });
    const dqr = scored > 0 ? weighted / scored : null;
    indicators[code] = { dqr, rating: dqr === null ? null : dqrRating(dqr), scored_share: all > 0 ? scored / all : null };
  });
  const gwp = ctx.indicators.indexOf(HEADLINE_INDICATOR);
  const shareOf = (k: number): number | null => {
    if (gwp < 0) return null;
    const total = contributions.reduce((sum, _, j) => sum + weight(j, gwp), 0);
    return total > 0 ? weight(k, gwp) / total : null;
  };
  const byType = (type: DataType | null): number | null => {
    if (gwp < 0) return null;
    const total = contributions.reduce((sum, _, j) => sum + weight(j, gwp), 0);
    if (total === 0) return null;
    return contributions.reduce((sum, _, j) => sum + (qualities[j]!.data_type === type ? weight(j, gwp) : 0), 0) / total;
  };
  const factors = qualities.map((q, k) => ({ ...q, share_of_gwp_total: shareOf(k) }));
  factors.sort((a, b) => (b.share_of_gwp_total ?? 0) - (a.share_of_gwp_total ?? 0) || a.factor_id.localeCompare(b.factor_id));
  return {
    scope: 'cut-off A1-A3',
    indicators,
    gwp_total_by_data_type: { specific: byType('specific'), generic: byType('generic'), not_stated: byType(null) },
    factors,
    unscored: factors.filter((f) => f.dqr === null).map((f) => f.factor_id),
  };
}
