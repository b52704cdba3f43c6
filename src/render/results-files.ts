import { mkdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { CalcContext } from '../calc/context.ts';
import { calculateProduct } from '../calc/product.ts';
import type { ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import { RESULTS_CSV_HEADER, resultsCsv } from '../report/results-csv.ts';
import { FS_CONCURRENCY, mapLimit } from './each-limit.ts';
import { RESULTS_FORMAT, resultsJsonText, resultsSummary, type ResultsSummary } from '../report/results.ts';
import { auditView } from '../report/audit-view.ts';
import { declarationResultsView } from '../report/declaration-view.ts';
import type { ProductReport } from '../report/site-view.ts';
import { auditHtml } from './audit-html.ts';
import { renderChartSvg } from './charts.ts';
import { productInputKey, productReach, readsOutside } from './input-key.ts';


/**
 * Writes `<product_id>/results.json` (with its figure graph) and `results.csv` per product.
 * Products are computed one at a time and their graphs dropped once written and viewed, so
 * memory does not grow with the catalogue.
 */
export class ResultsWriter {
  private readonly ctx: CalcContext;

  constructor(
    project: Project,
    private readonly outDir: string,
    /** The project-wide part of the pages (`pageContextKey`), for each product's input key. */
    private readonly context: string,
  ) {
    this.ctx = new CalcContext(project);
  }

  /** Writes a product's results files and returns what its pages show, with its input key. */
  async product(rows: ProductRows): Promise<{ report: ProductReport; key: string }> {
    const ctx = this.ctx;
    const product = calculateProduct(ctx, rows);
    const summary = resultsSummary(ctx, product);
    const dir = path.join(this.outDir, summary.product_id);
    await mkdir(dir, { recursive: true });
    await writeFile(path.join(dir, 'results.json'), `${resultsJsonText(ctx, product, summary)}\n`);
    await writeFile(path.join(dir, 'results.csv'), resultsCsv([summary]));
    const view = declarationResultsView(ctx, rows, product, summary);
    for (const chart of [...view.charts, ...(view.sensitivity?.scopes.flatMap((scope) => scope.charts) ?? [])]) chart.svg = await renderChartSvg(chart);
    const outside = readsOutside(ctx.project, productReach(ctx.project, rows), product.graph);
    // A row the key does not cover would let `build --changed` keep a stale product: stop instead.
    if (outside) throw new Error(`internal: figure ${outside.figure} of ${summary.product_id} reads ${outside.file} line ${outside.line}, which its input key does not cover (src/render/input-key.ts productReach); please report this`);
    const audit = auditView(ctx.project, product);
    audit.html = auditHtml(audit);
    return { report: { summary, results: view, audit }, key: productInputKey(ctx.project, rows, this.context).key };
  }

}

/**
 * The catalogue-wide `results.json` (every product's results, without figure graphs) and
 * `results.csv`: the products' own `results.csv` files joined under one header, read back
 * from the output (the same rows `resultsCsv` would make from the summaries, without
 * formatting 400 000 numbers again when most products were kept by `build --changed`).
 */
export async function writeCatalogueResults(outDir: string, summaries: readonly ResultsSummary[]): Promise<void> {
  await writeFile(path.join(outDir, 'results.json'), `${JSON.stringify({ format: RESULTS_FORMAT, products: summaries }, null, 1)}\n`);
  const header = Buffer.from(`${RESULTS_CSV_HEADER.join(',')}\n`);
  const bodies = await mapLimit(summaries, FS_CONCURRENCY, async (summary) => {
    const file = path.join(outDir, summary.product_id, 'results.csv');
    const bytes = await readFile(file);
    if (!bytes.subarray(0, header.length).equals(header)) throw new Error(`internal: ${file} does not start with the results.csv header`);
    return bytes.subarray(header.length);
  });
  await writeFile(path.join(outDir, 'results.csv'), Buffer.concat([header, ...bodies]));
}
