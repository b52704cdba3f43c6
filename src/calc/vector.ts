/** Arithmetic on indicator vectors (`Vec`, defined with the figure graph whose vector steps hold them). */
import type { Vec } from '../trace/graph.ts';

export type { Vec };

// Built with push so V8 keeps them packed arrays of doubles (new Array(n) would be holey, and slower).
export function zeros(length: number): Vec {
  const out: Vec = [];
  for (let i = 0; i < length; i++) out.push(0);
  return out;
}

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
  const out: Vec = [];
  for (let i = 0; i < source.length; i++) out.push(scale * source[i]!);
  return out;
}

export const toNullable = (value: number): number | null => (Number.isNaN(value) ? null : value);
