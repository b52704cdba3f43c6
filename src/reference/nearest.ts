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

/**
 * Up to `count` known names a written one may mean, nearest first: those that contain it or
 * that it contains (`cutoff/D` → the figures of module D; `D/GWP-total` → that figure under each
 * method), closest in length, else those within the edit distance `nearestName` allows.
 */
export function nearestNames(name: string, known: readonly string[], count: number): string[] {
  const lower = name.trim().toLowerCase();
  if (lower === '' || known.length === 0) return [];
  const scored = known.map((k, index) => ({ k, index, lowered: k.toLowerCase() }));
  const containing = lower.length >= 3 ? scored.filter(({ lowered }) => lowered.includes(lower) || lower.includes(lowered)) : [];
  const limit = Math.max(2, Math.ceil(lower.length / 3));
  const ranked =
    containing.length > 0
      ? containing.sort((a, b) => Math.abs(a.k.length - lower.length) - Math.abs(b.k.length - lower.length) || a.index - b.index)
      : scored
          .map((entry) => ({ ...entry, d: distance(lower, entry.lowered) }))
          .filter((entry) => entry.d <= limit)
          .sort((a, b) => a.d - b.d || a.index - b.index);
  return ranked.slice(0, count).map(({ k }) => k);
}
