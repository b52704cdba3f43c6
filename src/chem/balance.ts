import type { Reaction } from './reaction.ts';

/**
 * Balancing a reaction written without coefficients: the coefficients are the null space of
 * the matrix of atoms (and charge) per species, reactants counted positive and products
 * negative. Solved with exact rational arithmetic (BigInt numerators and denominators), so
 * a result is never a rounding artefact: one solution up to scale is scaled to the smallest
 * whole numbers; none, or more than one independent solution, is said as such.
 */
export type Balanced = { ok: true; coefficients: number[] } | { ok: false; reason: 'none' | 'not unique' | 'sign'; message: string };

const abs = (n: bigint) => (n < 0n ? -n : n);
const gcd = (a: bigint, b: bigint): bigint => {
  let [x, y] = [abs(a), abs(b)];
  while (y !== 0n) [x, y] = [y, x % y];
  return x;
};

/** A fraction in lowest terms, denominator positive. */
class Rational {
  readonly n: bigint;
  readonly d: bigint;
  constructor(n: bigint, d = 1n) {
    if (d === 0n) throw new Error('division by zero');
    const sign = d < 0n ? -1n : 1n;
    const g = gcd(n, d) || 1n;
    this.n = (sign * n) / g;
    this.d = (sign * d) / g;
  }
  static of(value: number): Rational {
    if (!Number.isInteger(value)) throw new Error(`${value} is not a whole number of atoms`);
    return new Rational(BigInt(value));
  }
  get zero(): boolean {
    return this.n === 0n;
  }
  minus(other: Rational): Rational {
    return new Rational(this.n * other.d - other.n * this.d, this.d * other.d);
  }
  times(other: Rational): Rational {
    return new Rational(this.n * other.n, this.d * other.d);
  }
  over(other: Rational): Rational {
    return new Rational(this.n * other.d, this.d * other.n);
  }
}

/** Reduced row echelon form, in place; returns the pivot column of each pivot row. */
function rowReduce(matrix: Rational[][], columns: number): number[] {
  const pivots: number[] = [];
  let row = 0;
  for (let column = 0; column < columns && row < matrix.length; column++) {
    const found = matrix.findIndex((r, i) => i >= row && !r[column]!.zero);
    if (found < 0) continue;
    [matrix[row], matrix[found]] = [matrix[found]!, matrix[row]!];
    const pivot = matrix[row]![column]!;
    matrix[row] = matrix[row]!.map((value) => value.over(pivot));
    for (let other = 0; other < matrix.length; other++) {
      if (other === row || matrix[other]![column]!.zero) continue;
      const factor = matrix[other]![column]!;
      matrix[other] = matrix[other]!.map((value, c) => value.minus(factor.times(matrix[row]![c]!)));
    }
    pivots.push(column);
    row++;
  }
  return pivots;
}

/** The smallest whole positive coefficients that balance every element and the charge, or why there are none. */
export function balanceReaction(reaction: Reaction): Balanced {
  const species = reaction.species;
  const what = [...new Set(species.flatMap((s) => [...s.formula.elements.keys()]))];
  const rows = [...what.map((element) => species.map((s) => (s.formula.elements.get(element) ?? 0) * (s.side === 'reactant' ? 1 : -1))), species.map((s) => s.formula.charge * (s.side === 'reactant' ? 1 : -1))];
  const matrix = rows.map((row) => row.map(Rational.of));
  const pivots = rowReduce(matrix, species.length);
  const free = species.map((_, column) => column).filter((column) => !pivots.includes(column));
  if (free.length === 0) return { ok: false, reason: 'none', message: 'no coefficients balance it: the species cannot make each other (check the formulas)' };
  if (free.length > 1) return { ok: false, reason: 'not unique', message: `it balances in ${free.length} independent ways (two or more reactions in one): write the coefficients` };
  // One free coefficient set to 1; each pivot's coefficient follows from its row.
  const freeColumn = free[0]!;
  const solution = species.map(() => new Rational(0n));
  solution[freeColumn] = new Rational(1n);
  pivots.forEach((column, row) => (solution[column] = new Rational(0n).minus(matrix[row]![freeColumn]!)));
  const lcm = solution.reduce((l, value) => (l * value.d) / gcd(l, value.d), 1n);
  let whole = solution.map((value) => (value.n * lcm) / value.d);
  if (whole.every((value) => value <= 0n)) whole = whole.map((value) => -value);
  if (whole.some((value) => value <= 0n)) return { ok: false, reason: 'sign', message: 'the only balance puts a species on the other side of the arrow (a coefficient of zero or below): check the sides' };
  const divisor = whole.reduce((g, value) => gcd(g, value), 0n);
  return { ok: true, coefficients: whole.map((value) => Number(value / divisor)) };
}
