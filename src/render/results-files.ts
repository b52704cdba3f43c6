import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { CalcContext } from '../calc/context.ts';
import { calculateProduct } from '../calc/product.ts';
import { rowsByProduct } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import { resultsCsv } from '../report/results-csv.ts';
import { resultsJson, type ResultsSummary } from '../report/results.ts';

/**
 * Writes `<product_id>/results.json` (with its figure graph) and `results.csv` per product,
 * then `results.json` and `results.csv` for the whole catalogue. Products are computed one
 * at a time and their graphs dropped once written, so memory does not grow with the
 * catalogue; the catalogue-wide JSON carries the results without the figure graphs.
 */
export async function writeResults(project: Project, outDir: string): Promise<ResultsSummary[]> {
  const ctx = new CalcContext(project);
  const summaries: ResultsSummary[] = [];
  for (const rows of rowsByProduct(project)) {
    const results = resultsJson(ctx, calculateProduct(ctx, rows));
    const dir = path.join(outDir, results.product_id);
    await mkdir(dir, { recursive: true });
    // Compact: a product's figure graph runs to thousands of figures (see docs/performance.md).
    await writeFile(path.join(dir, 'results.json'), `${JSON.stringify(results)}\n`);
    await writeFile(path.join(dir, 'results.csv'), resultsCsv([results]));
    const { figures: _figures, ...summary } = results;
    summaries.push(summary);
  }
  await writeFile(path.join(outDir, 'results.json'), `${JSON.stringify({ products: summaries }, null, 1)}\n`);
  await writeFile(path.join(outDir, 'results.csv'), resultsCsv(summaries));
  return summaries;
}
