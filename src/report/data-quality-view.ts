import { findIndicator } from '../reference/indicators.ts';
import { dqrBandsText } from '../reference/dqr.ts';
import type { DataQualityJson } from '../calc/data-quality.ts';
import { formatFixed, formatShare, NOT_AVAILABLE, NOT_GIVEN } from '../format.ts';

export interface DataQualityView {
  scope: string;
  dataTypes: string;
  bands: string;
  indicators: Array<{ code: string; dqr: string; rating: string; scored: string }>;
  factors: Array<{ id: string; href: string | null; source: string; ter: string; ger: string; tir: string; p: string; dqr: string; rating: string; type: string; share: string }>;
  unscored: string;
}

const score = (value: number | null) => (value === null ? NOT_GIVEN : String(value));
const share = (value: number | null) => (value === null ? NOT_AVAILABLE : formatShare(value));

/** The data-quality section of a declaration page, from results.json `data_quality`. */
export function dataQualityView(dq: DataQualityJson, factorHref: (id: string) => string): DataQualityView {
  const t = dq.gwp_total_by_data_type;
  const unscored = dq.factors.filter((f) => f.dqr === null);
  return {
    scope: dq.scope,
    dataTypes:
      t.specific === null
        ? 'GWP-total is not reported, so the share of specific data is not computed.'
        : `Of GWP-total A1-A3 (absolute contributions), ${share(t.specific)} rests on specific data (own or supplier-specific), ${share(t.generic)} on generic database data${t.not_stated ? ` and ${share(t.not_stated)} on factors whose data type factors.csv does not state` : ''}.`,
    bands: dqrBandsText(),
    indicators: Object.entries(dq.indicators).map(([code, q]) => ({
      code: findIndicator(code)?.code ?? code,
      dqr: formatFixed(q.dqr, 2),
      rating: q.rating ?? 'not rated',
      scored: share(q.scored_share),
    })),
    factors: dq.factors.map((f) => ({
      id: f.factor_id,
      href: f.line === null ? null : factorHref(f.factor_id),
      source: f.line === null ? 'built-in' : `factors.csv:${f.line}`,
      ter: score(f.scores.ter),
      ger: score(f.scores.ger),
      tir: score(f.scores.tir),
      p: score(f.scores.p),
      dqr: formatFixed(f.dqr, 2),
      rating: f.rating ?? (f.line === null ? 'built-in, not scored' : f.unscored_reason ?? ''),
      type: f.data_type ?? 'not stated',
      share: share(f.share_of_gwp_total),
    })),
    unscored:
      unscored.length === 0
        ? 'Every factor behind this result is scored.'
        : `${unscored.length} factor${unscored.length === 1 ? '' : 's'} behind this result ${unscored.length === 1 ? 'has' : 'have'} no DQR and ${unscored.length === 1 ? 'is' : 'are'} left out of the average, not guessed: ${unscored.map((f) => `${f.factor_id} (${f.unscored_reason}; ${share(f.share_of_gwp_total)} of GWP-total A1-A3)`).join('; ')}.`,
  };
}
