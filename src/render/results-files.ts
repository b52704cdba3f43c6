import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { CalcContext } from '../calc/context.ts';
import { calculateProduct } from '../calc/product.ts';
import { rowsByProduct } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import { resultsCsv } from '../report/results-csv.ts';
import { resultsJson, type ResultsSummary } from '../report/results.ts';
import { auditView, type AuditView } from '../report/audit-view.ts';
import { declarationResultsView, type DeclarationResultsView } from '../report/declaration-view.ts';
import { renderChartSvg } from './charts.ts';

/** What the site shows of one product's results, taken while its figure graph is alive. */
export interface ProductReport {
  summary: ResultsSummary;
  results: DeclarationResultsView;
  audit: AuditView;
}

/**
 * Writes `<product_id>/results.json` (with its figure graph) and `results.csv` per product,
 * then `results.json` and `results.csv` for the whole catalogue. Products are computed one
 * at a time and their graphs dropped once written, so memory does not grow with the
 * catalogue; the catalogue-wide JSON carries the results without the figure graphs.
 */
export async function writeResults(project: Project, outDir: string): Promise<ProductReport[]> {
  const ctx = new CalcContext(project);
  const summaries: ResultsSummary[] = [];
  const reports: ProductReport[] = [];
  for (const rows of rowsByProduct(project)) {
    const product = calculateProduct(ctx, rows);
    const results = resultsJson(ctx, product);
    const dir = path.join(outDir, results.product_id);
    await mkdir(dir, { recursive: true });
    // Compact: a product's figure graph runs to thousands of figures (see docs/performance.md).
    await writeFile(path.join(dir, 'results.json'), `${JSON.stringify(results)}\n`);
    await writeFile(path.join(dir, 'results.csv'), resultsCsv([results]));
    const { figures: _figures, ...summary } = results;
    summaries.push(summary);
    const view = declarationResultsView(ctx, rows, product, results);
    for (const chart of view.charts) chart.svg = await renderChartSvg(chart);
    reports.push({ summary, results: view, audit: auditView(project, product) });
  }
  await writeFile(path.join(outDir, 'results.json'), `${JSON.stringify({ products: summaries }, null, 1)}\n`);
  await writeFile(path.join(outDir, 'results.csv'), resultsCsv(summaries));
  return reports;
}
