import { mkdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { ProductPipeline } from '../pipeline/product.ts';
import type { ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import { RESULTS_CSV_HEADER, resultsCsv } from '../report/results-csv.ts';
import { FS_CONCURRENCY, mapLimit } from './each-limit.ts';
import { writeCatalogueJson } from '../report/catalogue-results.ts';
import { auditView } from '../report/audit-view.ts';
import { declarationResultsView } from '../report/declaration-view.ts';
import type { ProductReport } from '../report/site-view.ts';
import { auditHtml } from './audit-html.ts';
import { hashBytes, hashText, type HashedFile } from './verification.ts';
import { ilcdArchive } from './ilcd-archive.ts';
import { ilcdDatasets } from '../report/ilcd-export.ts';
import { productExport } from '../report/ilcd-declaration.ts';
import { renderChartSvg } from './charts.ts';
import { productInputKey, readsOutside } from './input-key.ts';
import { productReach } from '../model/reach.ts';
import { DECLARATION_ILCD, RESULTS_JSON, RESULTS_CSV } from '../files.ts';
import { ToolError } from '../problems.ts';
import { productStatus, resultsChanged } from '../model/verification-status.ts';


/**
 * Writes `<product_id>/results.json` (with its figure graph) and `results.csv` per product.
 * Products are computed one at a time and their graphs dropped once written and viewed, so
 * memory does not grow with the catalogue.
 */
export class ResultsWriter {
  private readonly pipeline: ProductPipeline;

  constructor(
    project: Project,
    private readonly outDir: string,
    /** The project-wide part of the pages (`pageContextKey`), for each product's input key. */
    private readonly context: string,
  ) {
    this.pipeline = new ProductPipeline(project);
  }

  /** Writes a product's results files and returns what its pages show, with its input key. */
  async product(rows: ProductRows): Promise<{ report: ProductReport; key: string; hashes: HashedFile[] }> {
    const ctx = this.pipeline.ctx;
    const computed = this.pipeline.compute(rows);
    const { result: product, summary } = computed;
    const dir = path.join(this.outDir, summary.product_id);
    await mkdir(dir, { recursive: true });
    const json = `${JSON.stringify(this.pipeline.resultsJson(computed))}\n`;
    const csv = resultsCsv([summary]);
    await writeFile(path.join(dir, RESULTS_JSON), json);
    await writeFile(path.join(dir, RESULTS_CSV), csv);
    // The reach, found once: the verification status, the check against the figure graph and the input key read it.
    const reach = productReach(ctx.project, rows);
    const verification = resultsChanged(ctx.project.verification.state, `${summary.product_id}/${RESULTS_JSON}`, json, productStatus(ctx.project, rows, reach));
    const archive = ilcdArchive(ilcdDatasets(ctx.project.declaration, productExport(rows.product.value, summary, verification)));
    await writeFile(path.join(dir, DECLARATION_ILCD), archive);
    // Hashed as written, for the verification manifest.
    const hashes = [hashText(`${summary.product_id}/results.json`, json), hashText(`${summary.product_id}/results.csv`, csv), hashBytes(`${summary.product_id}/${DECLARATION_ILCD}`, archive)];
    const view = declarationResultsView(ctx, rows, product, summary);
    for (const chart of [...view.charts, ...(view.sensitivity?.scopes.flatMap((scope) => scope.charts) ?? [])]) chart.svg = await renderChartSvg(chart);
    const outside = readsOutside(ctx.project, reach, product.graph);
    // A row the key does not cover would let `build --changed` keep a stale product: stop instead.
    if (outside) throw new ToolError('internal', `figure ${outside.figure} of ${summary.product_id} reads ${outside.file} line ${outside.line}, which its input key does not cover (src/model/reach.ts productReach); please report this`);
    const audit = auditView(ctx.project, product, rows.bom);
    audit.html = auditHtml(audit);
    return { report: { summary, results: view, audit, verification }, key: productInputKey(ctx.project, rows, this.context, reach).key, hashes };
  }

}

/**
 * The catalogue-wide `results.json` (every product's results, without figure graphs) and
 * `results.csv`: the products' own `results.csv` files joined under one header, read back
 * from the output (the same rows `resultsCsv` would make from the summaries, without
 * formatting 400 000 numbers again when most products were kept by `build --changed`).
 */
export async function writeCatalogueResults(outDir: string, products: ReadonlyArray<{ id: string; summaryJson: string }>): Promise<void> {
  await writeCatalogueJson(path.join(outDir, RESULTS_JSON), products.map((p) => p.summaryJson));
  const header = Buffer.from(`${RESULTS_CSV_HEADER.join(',')}\n`);
  const bodies = await mapLimit(products, FS_CONCURRENCY, async (product) => {
    const file = path.join(outDir, product.id, RESULTS_CSV);
    const bytes = await readFile(file);
    if (!bytes.subarray(0, header.length).equals(header)) throw new ToolError('internal', `${file} does not start with the results.csv header`);
    return bytes.subarray(header.length);
  });
  await writeFile(path.join(outDir, RESULTS_CSV), Buffer.concat([header, ...bodies]));
}
