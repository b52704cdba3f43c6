/**
 * PEF data quality rating (Commission Recommendation (EU) 2021/2279): per dataset,
 * DQR = (TeR + GeR + TiR + P) / 4 from pedigree scores 1 (best) to 5, and its band.
 */
export const DQR_BANDS: ReadonlyArray<{ upTo: number; rating: string }> = [
  { upTo: 1.5, rating: 'excellent' },
  { upTo: 2, rating: 'very good' },
  { upTo: 3, rating: 'good' },
  { upTo: 4, rating: 'fair' },
  { upTo: Number.POSITIVE_INFINITY, rating: 'poor' },
];

export const dqrRating = (dqr: number): string => DQR_BANDS.find((band) => dqr <= band.upTo)!.rating;

/** The bands as a reader sees them: "≤ 1.5 excellent, …, > 4 poor". */
export const dqrBandsText = (): string => DQR_BANDS.map((band, k) => `${band.upTo === Number.POSITIVE_INFINITY ? `> ${DQR_BANDS[k - 1]!.upTo}` : `≤ ${band.upTo}`} ${band.rating}`).join(', ');

/** A factor row's DQR, or null unless all four scores are given (a partial score is not averaged), with the scores missing. */
export function pedigreeDqr(scores: { ter?: number | null; ger?: number | null; tir?: number | null; p?: number | null }): { dqr: number | null; missing: string[] } {
  const entries = Object.entries({ ter: scores.ter, ger: scores.ger, tir: scores.tir, p: scores.p });
  const missing = entries.filter(([, v]) => v === null || v === undefined).map(([k]) => k.toUpperCase());
  return { dqr: missing.length === 0 ? entries.reduce((sum, [, v]) => sum + v!, 0) / 4 : null, missing };
}
