/**
 * The Circular Footprint Formula's default allocation factor A, where materials.csv leaves
 * `cff_a` empty: 0.2 for metals (PEF method, Annex C, Recommendation (EU) 2021/2279), else 0.5
 * (from memory: the default where no Annex C value applies).
 */
export const CFF_DEFAULT_A = { metal: 0.2, other: 0.5 } as const;

export const defaultA = (family: string): number => (family === 'metal' ? CFF_DEFAULT_A.metal : CFF_DEFAULT_A.other);
