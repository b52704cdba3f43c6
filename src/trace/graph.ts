import { ToolError } from '../problems.ts';
/**
 * The figure graph: every reported number is a figure with a stable id, a formula, its
 * value and its terms — other figures or input cells. A node is either a vector (one
 * value per indicator, as the calculation is vectorised over indicators) or a scalar
 * (a mass, a share). Vector nodes expand to one figure per indicator (`cutoff/A1` →
 * `cutoff/A1/GWP-total`), so the graph stays one node per calculation step, not one per
 * step and indicator. Nodes refer to cells and to each other by id: shared, never copied.
 */

/**
 * Indicator vectors: one number per indicator, in the calculation's indicator order. A
 * value that was not available is NaN, which propagates through every sum and product, so
 * an incomplete input can never turn into a silent number; it is reported as null.
 * Plain arrays, not typed arrays: a product allocates hundreds of short vectors, and V8
 * allocates small plain arrays several times faster (measured in `npm run bench`).
 */
export type Vec = number[];

/** An input cell exactly as written. */
export interface CellRef {
  file: string;
  line: number;
  column: string;
  value: string;
}

/** A factor row as a term: it expands, per indicator, to that indicator's cell. */
export interface FactorRef {
  file: string;
  line: number;
  factorId: string;
  /** The row's cells as written, by column. */
  raw: Record<string, string>;
  /**
   * A supplier's dataset read as a factor: where each indicator's value is, element by
   * element (`file` is then the dataset, `line` its first element read). Absent for a
   * factors.csv row, whose indicator values are its own cells.
   */
  elements?: Record<string, { line: number; column: number; module: string; value: string }>;
}

export type Term =
  | { kind: 'figure'; id: string; symbol: string }
  | { kind: 'cell'; cell: CellRef; symbol: string }
  | { kind: 'factor'; factor: FactorRef; symbol: string };

interface NodeBase {
  id: string;
  /** In symbols: `G = m / (1 − s)`. */
  formula: string;
  /** In words, for a reader who does not know the symbols. */
  description: string;
  terms: Term[];
}

export interface VectorNode extends NodeBase {
  kind: 'vector';
  /** One value per indicator of the calculation; NaN where an input was not available. */
  values: Vec;
}

export interface ScalarNode extends NodeBase {
  kind: 'scalar';
  value: number;
  unit: string;
}

export type FigureNode = VectorNode | ScalarNode;

/**
 * One use of a factor by a leaf figure: how much of the factor's reference unit the figure
 * takes, and the input row that drives it. A leaf's value per indicator is Σ amount × F over
 * its uses, so a module's uses add up to the module (test/calc/contributions.test.ts): the
 * base of contribution analysis and of the contribution-weighted data quality.
 */
export interface FactorUse {
  /** The cut-off module the figure belongs to (A1, A2, A3, …, D). */
  module: string;
  figure: string;
  /** The factor id as the inputs name it (factors.csv id, ghg:…, process:…). */
  factor: string;
  amount: number;
  /** The input row behind the amount (a BOM line, an activity, a leg, a site row). */
  input?: { file: string; line: number };
  /**
   * The input cells the amount is proportional to: amount ∝ Π over the groups of
   * Σ share·(x / x₀) over a group's cells (a leg: its distance × the mass it carries, the
   * mass being one line's or shared among the product's lines). Every formula is linear in
   * each of these cells, so the part of a result that scales with a cell is its contribution,
   * and ±10 % on the cell moves the result by ±10 % of that part (src/calc/contributions.ts).
   */
  drivers: Driver[][];
}

/** An input cell a factor use scales with, and the share of the use's amount that does. */
export interface Driver {
  file: string;
  line: number;
  column: string;
  share: number;
}

export class FigureGraph {
  readonly nodes = new Map<string, FigureNode>();
  /** The factor uses of the leaf figures, in the order they were made. */
  readonly uses: FactorUse[] = [];

  constructor(
    /** Indicator codes, in the order of every vector's values. */
    readonly indicators: readonly string[],
  ) {}

  add<N extends FigureNode>(node: N): N {
    // Finite inputs can still overflow (1E+200 kg × 1E+200 kg CO2 eqv./kg): no figure may be
    // infinite, because no output can carry it (results.json has no Infinity).
    const values = node.kind === 'vector' ? node.values : [node.value];
    for (let k = 0; k < values.length; k++) {
      const value = values[k]!;
      if (value === Infinity || value === -Infinity) {
        const what = node.kind === 'vector' ? ` for ${this.indicators[k] ?? `indicator ${k + 1}`}` : '';
        throw new ToolError('input', `figure ${node.id} is ${value > 0 ? '' : '-'}infinite${what}: its inputs are too large for a number to hold (the largest is about 1.8E+308); check the units and magnitudes of the cells it reads`);
      }
    }
    const size = this.nodes.size;
    this.nodes.set(node.id, node);
    if (this.nodes.size === size) throw new Error(`figure ${node.id} defined twice`);
    return node;
  }

  get(id: string): FigureNode | undefined {
    return this.nodes.get(id);
  }

  vector(id: string): VectorNode {
    const node = this.nodes.get(id);
    if (!node || node.kind !== 'vector') throw new Error(`no vector figure ${id}`);
    return node;
  }

  scalar(id: string): ScalarNode {
    const node = this.nodes.get(id);
    if (!node || node.kind !== 'scalar') throw new Error(`no scalar figure ${id}`);
    return node;
  }
}

export const figureTerm = (id: string, symbol: string): Term => ({ kind: 'figure', id, symbol });
export const cellTerm = (cell: CellRef, symbol: string): Term => ({ kind: 'cell', cell, symbol });
export const factorTerm = (factor: FactorRef, symbol: string): Term => ({ kind: 'factor', factor, symbol });
