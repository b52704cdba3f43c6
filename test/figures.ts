import type { Project } from '../src/model/types.ts';
import type { ResultsJson } from '../src/report/results.ts';
import { GraphReader, type WrittenCell } from '../src/trace/graph-json.ts';

/** A figure with its terms flattened as tests compare them: a figure id, or a cell `{file, line, column, value}`. */
export interface FlatFigure {
  value: number | null;
  unit: string;
  formula: string;
  terms: Array<string | { file: string; line: number; column: string; value: string | undefined }>;
  symbols: string[];
}

/** Factor rows' cells as written, from the loaded project (the graph names factor rows by row). */
export const writtenFrom = (project: Project): WrittenCell => {
  const rows = new Map(project.factors.rows.map((row) => [row.line, row.raw]));
  return (file, line, column) => (file === project.factors.file ? rows.get(line)?.[column] : undefined);
};

/** Every figure of a results.json, by figure id, read through the format's own reader (src/trace/graph-json.ts). */
export function figureMap(results: ResultsJson, written?: WrittenCell): Record<string, FlatFigure> {
  const reader = new GraphReader(results.graph, results.indicators, written);
  const out: Record<string, FlatFigure> = {};
  for (const id of reader.figureIds()) {
    const f = reader.figure(id)!;
    out[id] = { value: f.value, unit: f.unit, formula: f.formula, terms: f.terms.map((t) => ('figure' in t ? t.figure : t.cell)), symbols: f.terms.map((t) => t.symbol) };
  }
  return out;
}
