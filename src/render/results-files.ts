import { createReadStream } from 'node:fs';
import { mkdir, open, readFile, writeFile } from 'node:fs/promises';
import { createInterface } from 'node:readline';
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
import { hashText, type HashedFile } from './verification.ts';
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
  async product(rows: ProductRows): Promise<{ report: ProductReport; key: string; hashes: HashedFile[] }> {
    const ctx = this.ctx;
    const product = calculateProduct(ctx, rows);
    const summary = resultsSummary(ctx, product);
    const dir = path.join(this.outDir, summary.product_id);
    await mkdir(dir, { recursive: true });
    const json = `${resultsJsonText(ctx, product, summary)}\n`;
    const csv = resultsCsv([summary]);
    await writeFile(path.join(dir, 'results.json'), json);
    await writeFile(path.join(dir, 'results.csv'), csv);
    // Hashed as written, for the verification manifest.
    const hashes = [hashText(`${summary.product_id}/results.json`, json), hashText(`${summary.product_id}/results.csv`, csv)];
    const view = declarationResultsView(ctx, rows, product, summary);
    for (const chart of [...view.charts, ...(view.sensitivity?.scopes.flatMap((scope) => scope.charts) ?? [])]) chart.svg = await renderChartSvg(chart);
    const outside = readsOutside(ctx.project, productReach(ctx.project, rows), product.graph);
    // A row the key does not cover would let `build --changed` keep a stale product: stop instead.
    if (outside) throw new Error(`internal: figure ${outside.figure} of ${summary.product_id} reads ${outside.file} line ${outside.line}, which its input key does not cover (src/render/input-key.ts productReach); please report this`);
    const audit = auditView(ctx.project, product, rows.bom);
    audit.html = auditHtml(audit);
    return { report: { summary, results: view, audit }, key: productInputKey(ctx.project, rows, this.context).key, hashes };
  }

}

/** The first line of the catalogue-wide results.json; then one product per line. */
const CATALOGUE_HEAD = `{"format":${RESULTS_FORMAT},"products":[`;

/**
 * `{"format":2,"products":[…]}` with one product per line, written a product at a time: at
 * 10 000 products the file is some hundreds of megabytes, beyond what one JavaScript string
 * may hold (JSON.stringify of the whole failed there), and a reader can take it a line at a
 * time (`readCatalogueSummaries`).
 */
async function writeCatalogueJson(file: string, summaries: readonly string[]): Promise<void> {
  const handle = await open(file, 'w');
  try {
    let chunk = `${CATALOGUE_HEAD}\n`;
    for (let i = 0; i < summaries.length; i++) {
      chunk += `${summaries[i]}${i < summaries.length - 1 ? ',' : ''}\n`;
      if (chunk.length > 1 << 20) {
        await handle.write(chunk);
        chunk = '';
      }
    }
    await handle.write(`${chunk}]}\n`);
  } finally {
    await handle.close();
  }
}

/**
 * Reads a catalogue-wide results.json a product at a time, as `writeCatalogueJson` lays it
 * out; a file laid out otherwise (edited by hand, or small) is parsed whole. `format` is
 * undefined for a file of results format 1.
 */
export async function readCatalogueSummaries(file: string): Promise<{ format: unknown; products: ResultsSummary[] }> {
  const texts = await readCatalogueTexts(file);
  return Array.isArray(texts.products) ? { format: texts.format, products: texts.products.map((text) => JSON.parse(text) as ResultsSummary) } : (texts.whole as { format: unknown; products: ResultsSummary[] });
}

/** The product id of a summary's JSON text (it opens with format and product_id), without parsing the rest. */
export function summaryProductId(text: string): string {
  const match = /^\{"format":\d+,"product_id":("(?:[^"\\]|\\.)*")/.exec(text);
  return match ? (JSON.parse(match[1]!) as string) : (JSON.parse(text) as ResultsSummary).product_id;
}

/** The products of a catalogue-wide results.json as JSON text, a line each; a file laid out otherwise is returned parsed whole. */
export async function readCatalogueTexts(file: string): Promise<{ format: unknown; products?: string[]; whole?: unknown }> {
  const lines = createInterface({ input: createReadStream(file, 'utf8'), crlfDelay: Infinity });
  const products: string[] = [];
  let first = true;
  for await (const line of lines) {
    if (first) {
      first = false;
      if (line !== CATALOGUE_HEAD) {
        lines.close();
        const whole = JSON.parse(await readFile(file, 'utf8')) as { format: unknown };
        return { format: whole.format, whole };
      }
      continue;
    }
    if (line === ']}' || line === '') continue;
    products.push(line.endsWith(',') ? line.slice(0, -1) : line);
  }
  return { format: RESULTS_FORMAT, products };
}

/**
 * The catalogue-wide `results.json` (every product's results, without figure graphs) and
 * `results.csv`: the products' own `results.csv` files joined under one header, read back
 * from the output (the same rows `resultsCsv` would make from the summaries, without
 * formatting 400 000 numbers again when most products were kept by `build --changed`).
 */
export async function writeCatalogueResults(outDir: string, products: ReadonlyArray<{ id: string; summaryJson: string }>): Promise<void> {
  await writeCatalogueJson(path.join(outDir, 'results.json'), products.map((p) => p.summaryJson));
  const header = Buffer.from(`${RESULTS_CSV_HEADER.join(',')}\n`);
  const bodies = await mapLimit(products, FS_CONCURRENCY, async (product) => {
    const file = path.join(outDir, product.id, 'results.csv');
    const bytes = await readFile(file);
    if (!bytes.subarray(0, header.length).equals(header)) throw new Error(`internal: ${file} does not start with the results.csv header`);
    return bytes.subarray(header.length);
  });
  await writeFile(path.join(outDir, 'results.csv'), Buffer.concat([header, ...bodies]));
}
