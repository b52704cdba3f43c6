import { rowsByProduct } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import type { Problem } from '../problems.ts';
import { buildSiteView, catalogueEntry, type CatalogueEntry, type SiteView } from '../report/site-view.ts';
import { ResultsWriter, type ProductReport } from './results-files.ts';
import { renderSite } from './site.ts';

/**
 * Products per Eleventy render. Eleventy keeps every page of a run in memory; rendering the
 * catalogue in shards keeps the peak to one shard's pages (npm run bench measures it).
 */
export const SHARD_SIZE = 25;

export interface SiteBuildOptions {
  inputs: SiteView['verification']['inputs'];
  pdfs: boolean;
  shardSize?: number;
  /** Called after each shard, with the products done so far (progress). */
  onShard?: (done: number, total: number) => void;
}

/**
 * Computes every product, writes its results files and renders its declaration and audit
 * pages, a shard at a time; then the catalogue-wide results files and pages.
 */
export async function buildSite(project: Project, problems: readonly Problem[], outDir: string, options: SiteBuildOptions): Promise<CatalogueEntry[]> {
  const writer = new ResultsWriter(project, outDir);
  const all = rowsByProduct(project);
  const size = options.shardSize ?? SHARD_SIZE;
  const catalogue: CatalogueEntry[] = [];
  for (let start = 0; start < all.length; start += size) {
    const shard: Array<{ rows: (typeof all)[number]; report: ProductReport }> = [];
    for (const rows of all.slice(start, start + size)) shard.push({ rows, report: await writer.product(rows) });
    const view = buildSiteView(project, problems, { products: shard, pdfs: options.pdfs, inputs: options.inputs });
    catalogue.push(...view.products.map(catalogueEntry));
    await renderSite(view, outDir);
    options.onShard?.(Math.min(start + size, all.length), all.length);
  }
  await writer.finish();
  await renderSite(buildSiteView(project, problems, { products: [], catalogue, pdfs: options.pdfs, inputs: options.inputs }), outDir);
  return catalogue;
}
