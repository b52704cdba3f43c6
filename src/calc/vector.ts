/**
 * Indicator vectors: one Float64 per indicator. A value that was not available is NaN,
 * which propagates through every sum and product, so an incomplete input can never turn
 * into a silent number; it is reported as null.
 */
export type Vec = Float64Array;

export const zeros = (length: number): Vec => new Float64Array(length);

/** target += scale · source */
export function addScaled(target: Vec, source: Vec, scale: number): Vec {
  for (let i = 0; i < target.length; i++) target[i]! += scale * source[i]!;
  return target;
}

export function add(target: Vec, source: Vec): Vec {
  for (let i = 0; i < target.length; i++) target[i]! += source[i]!;
  return target;
}

export function scaled(source: Vec, scale: number): Vec {
  const out = new Float64Array(source.length);
  for (let i = 0; i < source.length; i++) out[i] = scale * source[i]!;
  return out;
}

/** a − scale · b */
export function minusScaled(a: Vec, b: Vec, scale: number): Vec {
  const out = new Float64Array(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i]! - scale * b[i]!;
  return out;
}

export function sum(vectors: readonly Vec[], length: number): Vec {
  const out = zeros(length);
  for (const v of vectors) add(out, v);
  return out;
}

export const toNullable = (value: number): number | null => (Number.isNaN(value) ? null : value);
