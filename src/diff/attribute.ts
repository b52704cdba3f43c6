import type { CellJson, GraphReader } from '../trace/graph-json.ts';

/**
 * Which input cells changed underneath a figure, found through the figure graphs of the two
 * builds. A cell is identified by its file, its row's key (the file's key columns, so a row
 * that moved to another line is still the same row) and its column; it changed when its
 * value as written differs, or when it is under the figure in only one of the builds (a row
 * added, removed or no longer read). Pure: graphs and row keys in, cells out.
 */
export interface CellSide {
  line: number;
  value: string;
}

export interface CellChange {
  file: string;
  /** The row's key as written (`al-primary-ingot`, `KV-EXT-6060 · L1`); `line N` where the file's rows could not be keyed. */
  row: string;
  column: string;
  old: CellSide | null;
  new: CellSide | null;
}

/** The key of the row at a physical line of an input file. */
export type RowKeyOf = (file: string, line: number) => string;


const cellId = (file: string, row: string, column: string) => `${file}\u0000${row}\u0000${column}`;

export class ChangedCells {
  /** The cells that changed between the builds, in the order first met. */
  readonly cells: CellChange[] = [];
  private readonly index = new Map<string, number>();
  private readonly underOld = new Map<string, readonly number[]>();
  private readonly underNew = new Map<string, readonly number[]>();

  constructor(
    private readonly oldGraph: GraphReader,
    private readonly newGraph: GraphReader,
    private readonly oldRow: RowKeyOf,
    private readonly newRow: RowKeyOf,
  ) {
    const before = new Map<string, { file: string; row: string; column: string; side: CellSide }>();
    forEachCell(oldGraph, (cell) => {
      const row = oldRow(cell.file, cell.line);
      before.set(cellId(cell.file, row, cell.column), { file: cell.file, row, column: cell.column, side: { line: cell.line, value: cell.value } });
    });
    const after = new Set<string>();
    forEachCell(newGraph, (cell) => {
      const row = newRow(cell.file, cell.line);
      const id = cellId(cell.file, row, cell.column);
      if (after.has(id)) return;
      after.add(id);
      const old = before.get(id);
      if (old?.side.value === cell.value) return;
      this.add(id, { file: cell.file, row, column: cell.column, old: old?.side ?? null, new: { line: cell.line, value: cell.value } });
    });
    for (const [id, old] of before) if (!after.has(id)) this.add(id, { file: old.file, row: old.row, column: old.column, old: old.side, new: null });
  }

  private add(id: string, change: CellChange): void {
    this.index.set(id, this.cells.length);
    this.cells.push(change);
  }

  /** Indices into `cells` of the changed cells under a figure, in either build. */
  under(figure: string): number[] {
    if (this.cells.length === 0) return [];
    const found = new Set([...this.walk(figure, this.newGraph, this.newRow, this.underNew), ...this.walk(figure, this.oldGraph, this.oldRow, this.underOld)]);
    return [...found].sort((a, b) => a - b);
  }

  /** Depth-first, each figure once (the graph shares nodes), remembering what lies under each. */
  private walk(figure: string, graph: GraphReader, rowOf: RowKeyOf, memo: Map<string, readonly number[]>): readonly number[] {
    const known = memo.get(figure);
    if (known) return known;
    memo.set(figure, []);
    const node = graph.figure(figure);
    if (!node) return [];
    const found = new Set<number>();
    for (const term of node.terms) {
      if ('figure' in term) {
        for (const k of this.walk(term.figure, graph, rowOf, memo)) found.add(k);
        continue;
      }
      const { cell } = term;
      const k = this.index.get(cellId(cell.file, rowOf(cell.file, cell.line), cell.column));
      if (k !== undefined) found.add(k);
    }
    const list = [...found];
    memo.set(figure, list);
    return list;
  }
}

/** Every cell a graph reads: its input cells, and each factor row's cell of every indicator (what a vector figure reads of it), where the reader has the inputs. */
function forEachCell(graph: GraphReader, visit: (cell: CellJson) => void): void {
  for (const cell of graph.graph.cells) visit(cell);
  for (const row of graph.graph.rows) {
    // A supplier's dataset: each indicator's element, named by its module and indicator (as GraphReader.figure names it).
    if (row.elements) {
      for (const [code, element] of Object.entries(row.elements)) visit({ file: row.file, line: element.line, column: `${element.module} ${code}`, value: element.value });
      continue;
    }
    for (const { code } of graph.indicators) {
      const value = graph.written(row.file, row.line, code);
      if (value !== undefined) visit({ file: row.file, line: row.line, column: code, value });
    }
  }
}
