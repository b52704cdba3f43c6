import type { FigureGraph, Term } from './graph.ts';
import { figureId, parseFigureId, type FigureAddress } from './ids.ts';

/**
 * The figure graph as results.json format 2 publishes it (`graph`): one entry per
 * calculation step, in the order the calculation made them (terms before the steps that
 * use them), with a value per indicator where the step is a vector. Input cells and factor
 * rows are stored once, in `cells` and `rows`, and terms refer to them by index.
 * docs/results-format.md is the reader's account of it.
 */
export interface CellJson {
  file: string;
  line: number;
  column: string;
  value: string;
}

/** A factor row: it stands for the row's cell of whichever indicator is read (its `factor_id` cell for a scalar step). */
export interface RowJson {
  file: string;
  line: number;
  factor_id: string;
  /**
   * A supplier's ILCD+EPD dataset read as a factor: `file` is the dataset (`archive.zip!ILCD/processes/<uuid>.xml`
   * inside an archive) and each indicator's value is the element at `line` and `column` (its module, its text as written).
   */
  elements?: Record<string, { line: number; column: number; module: string; value: string }>;
}

/** A cell of an input file as written, where the reader has the inputs (a build's copies in its verification pack). */
export type WrittenCell = (file: string, line: number, column: string) => string | undefined;

/** A term: another step's id, an input cell (`{cell: index into cells}`) or a factor row (`{row: index into rows}`). */
export type StepTermJson = string | { cell: number } | { row: number };

export interface StepJson {
  id: string;
  formula: string;
  description: string;
  /** A scalar step's unit; null for a vector step, whose values are in each indicator's unit. */
  unit: string | null;
  /** A scalar step's value (null where not available). */
  value?: number | null;
  /** A vector step's values, one per indicator in the order of `indicators`, null where not available. */
  values?: Array<number | null>;
  terms: StepTermJson[];
  /** The symbol each term stands for in the formula, in the order of `terms`. */
  symbols: string[];
}

export interface GraphJson {
  steps: StepJson[];
  cells: CellJson[];
  rows: RowJson[];
}

const nullable = (value: number): number | null => (Number.isFinite(value) ? value : null);

/**
 * A graph as format 2 writes it. `indicators` are the codes of results.json `indicators`:
 * the graph's own (factor-based) indicators first, then the flow indicators, which are
 * steps of their own (`cutoff/A1/SM`) and so null in a vector step's values.
 */
export function graphJson(graph: FigureGraph, indicators: readonly string[]): GraphJson {
  const cells: CellJson[] = [];
  const rows: RowJson[] = [];
  const cellIndex = new Map<string, number>();
  const rowIndex = new Map<string, number>();
  const position = indicators.map((code) => graph.indicators.indexOf(code));
  const term = (t: Term): StepTermJson => {
    switch (t.kind) {
      case 'figure':
        return t.id;
      case 'cell': {
        const key = `${t.cell.file}\u0000${t.cell.line}\u0000${t.cell.column}`;
        let index = cellIndex.get(key);
        if (index === undefined) {
          cellIndex.set(key, (index = cells.length));
          cells.push({ file: t.cell.file, line: t.cell.line, column: t.cell.column, value: t.cell.value });
        }
        return { cell: index };
      }
      case 'factor': {
        const key = `${t.factor.file}\u0000${t.factor.line}`;
        let index = rowIndex.get(key);
        if (index === undefined) {
          rowIndex.set(key, (index = rows.length));
          rows.push({ file: t.factor.file, line: t.factor.line, factor_id: t.factor.factorId, ...(t.factor.elements ? { elements: t.factor.elements } : {}) });
        }
        return { row: index };
      }
    }
  };
  const steps: StepJson[] = [];
  for (const node of graph.nodes.values()) {
    const head = { id: node.id, formula: node.formula, description: node.description };
    const terms = node.terms.map(term);
    const symbols = node.terms.map((t) => t.symbol);
    if (node.kind === 'scalar') steps.push({ ...head, unit: node.unit, value: nullable(node.value), terms, symbols });
    else steps.push({ ...head, unit: null, values: position.map((p) => (p < 0 ? null : nullable(node.values[p]!))), terms, symbols });
  }
  return { steps, cells, rows };
}

/** One figure as a reader sees it: its value and what it was computed from, for one indicator where the step is a vector. */
export interface FigureView {
  id: string;
  value: number | null;
  unit: string;
  formula: string;
  description: string;
  /** Figure ids (a vector step's term read at the same indicator) or input cells (a factor row read as that indicator's cell, its value as written where the reader has the inputs, else undefined). */
  terms: Array<{ symbol: string; figure: string } | { symbol: string; cell: Omit<CellJson, 'value'> & { value: string | undefined } }>;
}

/**
 * Reads a published graph: resolves any figure id (a step, or `step/indicator`) and walks it
 * down to its cells. Used by `diff`, by the tests, and as the example in the format's docs.
 */
export class GraphReader {
  private readonly steps = new Map<string, StepJson>();
  private readonly units: string[];

  /** The indicators a step with values has a figure for (basis `factors`; flow indicators are steps of their own). */
  private readonly vectorCodes: string[];

  constructor(
    readonly graph: GraphJson,
    readonly indicators: ReadonlyArray<{ code: string; unit: string; basis?: string }>,
    /** Where the reader has the inputs: the cells of factor rows, which the graph names by row. */
    readonly written: WrittenCell = () => undefined,
  ) {
    for (const step of graph.steps) this.steps.set(step.id, step);
    this.units = indicators.map((i) => i.unit);
    this.vectorCodes = indicators.filter((i) => i.basis !== 'flows').map((i) => i.code);
  }

  step(id: string): StepJson | undefined {
    return this.steps.get(id);
  }

  resolve(id: string): FigureAddress | undefined {
    return parseFigureId(
      id,
      (step) => this.steps.get(step)?.values !== undefined,
      (step) => this.steps.has(step),
      this.vectorCodes,
    );
  }

  /** Every figure id the graph holds: each scalar step, and each vector step at each indicator. */
  figureIds(): string[] {
    const ids: string[] = [];
    for (const step of this.graph.steps) {
      if (step.values === undefined) ids.push(step.id);
      else {
        for (const code of this.vectorCodes) ids.push(figureId(step.id, code));
      }
    }
    return ids;
  }

  figure(id: string): FigureView | undefined {
    const address = this.resolve(id);
    if (!address) return undefined;
    const step = this.steps.get(address.step)!;
    // A vector step is a figure only at an indicator.
    if (step.values !== undefined && address.indicator === undefined) return undefined;
    const i = address.indicator === undefined ? -1 : this.indicators.findIndex((x) => x.code === address.indicator);
    const terms = step.terms.map((term, k): FigureView['terms'][number] => {
      const symbol = step.symbols[k]!;
      if (typeof term === 'string') {
        const target = this.steps.get(term);
        return { symbol, figure: target?.values !== undefined && address.indicator !== undefined ? figureId(term, address.indicator) : term };
      }
      if ('cell' in term) return { symbol, cell: this.graph.cells[term.cell]! };
      const row = this.graph.rows[term.row]!;
      if (row.elements) {
        // A supplier's dataset: the indicator's own element, its module and the text written there.
        const element = address.indicator === undefined ? undefined : row.elements[address.indicator];
        if (!element) return { symbol, cell: { file: row.file, line: row.line, column: address.indicator === undefined ? 'factor_id' : `${address.indicator} (not in the dataset)`, value: i < 0 ? row.factor_id : '' } };
        return { symbol, cell: { file: row.file, line: element.line, column: `${element.module} ${address.indicator}`, value: element.value } };
      }
      const column = address.indicator ?? 'factor_id';
      return { symbol, cell: { file: row.file, line: row.line, column, value: i < 0 ? row.factor_id : this.written(row.file, row.line, column) } };
    });
    return {
      id,
      value: i < 0 ? (step.value ?? null) : (step.values![i] ?? null),
      unit: i < 0 ? (step.unit ?? '') : this.units[i]!,
      formula: step.formula,
      description: step.description,
      terms,
    };
  }
}
