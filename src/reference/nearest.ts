import { closest, distance } from 'fastest-levenshtein';

/**
 * The nearest known name to a misspelt one, for "did you mean" hints: a known name that
 * starts with the written one or the other way round (`mass` → `mass_kg`), else the
 * closest by edit distance, if that distance is at most a third of the length (common
 * practice for spelling suggestions). Undefined when nothing is plausibly meant.
 */
export function nearestName(name: string, known: readonly string[]): string | undefined {
  if (known.length === 0) return undefined;
  const lower = name.trim().toLowerCase();
  if (lower === '') return undefined;
  const lowered = known.map((k) => k.toLowerCase());
  if (lower.length >= 3) {
    const prefixed = lowered
      .map((k, index) => ({ k, index }))
      .filter(({ k }) => k.startsWith(lower) || lower.startsWith(k))
      .sort((a, b) => Math.abs(a.k.length - lower.length) - Math.abs(b.k.length - lower.length) || a.index - b.index)[0];
    if (prefixed) return known[prefixed.index];
  }
  const best = closest(lower, lowered);
  const limit = Math.max(2, Math.ceil(lower.length / 3));
  if (distance(lower, best) > limit) return undefined;
  return known[lowered.indexOf(best)];
}
