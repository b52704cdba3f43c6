import { closest, distance } from 'fastest-levenshtein';

/**
 * The nearest known name to a misspelt one, for "did you mean" hints; undefined when
 * nothing is close enough to be a plausible typo (edit distance above a third of the
 * length, common practice for spelling suggestions).
 */
export function nearestName(name: string, known: readonly string[]): string | undefined {
  if (known.length === 0) return undefined;
  const lower = name.toLowerCase();
  const lowered = known.map((k) => k.toLowerCase());
  const best = closest(lower, lowered);
  const limit = Math.max(2, Math.ceil(lower.length / 3));
  if (distance(lower, best) > limit) return undefined;
  return known[lowered.indexOf(best)];
}
