// One benchmark measurement in a fresh process, so peak memory belongs to it alone.
// usage: bench-one.ts DATA_DIR [--calc | --build OUT_DIR]   (BENCH_PDFS=N: also print N PDFs, tool vs floor)
import { readFile } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { loadProject } from '../src/model/project.ts';
import { CSV_FILES } from '../src/schema/index.ts';

const [dir, flag, out] = process.argv.slice(2);
const started = performance.now();
let floorMs = 0;
if (flag === undefined) {
  // Floor: csv-parse alone reading the same files, no schema, no checks.
  const floorStart = performance.now();
  for (const schema of CSV_FILES) {
    const file = path.join(dir!, schema.file);
    if (schema.optional && !existsSync(file)) continue;
    parse(await readFile(file, 'utf8'), { comment: '#', skip_empty_lines: true });
  }
  floorMs = performance.now() - floorStart;
}
const loadStart = performance.now();
const { project, problems } = await loadProject(dir!);
const loadMs = performance.now() - loadStart;
if (!project) throw new Error(`synthetic project has errors: ${JSON.stringify(problems.slice(0, 3))}`);
let calcMs = 0;
let calcPeakRssMb = 0;
let jsonMs = 0;
let nodes = 0;
let figures = 0;
let jsonBytes = 0;
if (flag === '--calc') {
  const { ProductPipeline } = await import('../src/pipeline/product.ts');
  const { figureIds } = await import('../src/trace/explain.ts');
  const calcStart = performance.now();
  const pipeline = new ProductPipeline(project);
  const all = pipeline.products();
  // The full figure graph of every product is built; each is dropped after its product, as the build does.
  for (const rows of all) nodes += pipeline.calculate(rows).graph.nodes.size;
  calcMs = performance.now() - calcStart;
  calcPeakRssMb = process.resourceUsage().maxRSS / 1024;
  // Serialising results.json (format 2: one entry per step), on the first 100 products.
  const jsonStart = performance.now();
  for (const rows of all.slice(0, 100)) {
    const computed = pipeline.compute(rows);
    figures += figureIds(computed.result.graph).length;
    // As the build writes it (src/render/results-files.ts).
    jsonBytes += Buffer.byteLength(JSON.stringify(pipeline.resultsJson(computed)));
  }
  jsonMs = (performance.now() - jsonStart) / Math.min(100, all.length);
}
let renderMs = 0;
let peakBeforePdf = 0;
let workerPeakRssMb = 0;
let outBytes = 0;
let auditBytesPerProduct = 0;
let pdf = { count: 0, toolMs: 0, floorMs: 0 };
if (flag === '--build') {
  const { buildSite } = await import('../src/render/build-site.ts');
  const { withStagedOutput } = await import('../src/render/output.ts');
  const renderStart = performance.now();
  // Calculation, results.json/csv, declaration and audit pages, catalogue: the build without PDFs.
  await withStagedOutput(out!, async (staging) => buildSite(project, problems, staging, { inputs: [], pdfs: false, onWorkerEnd: (mb) => (workerPeakRssMb = Math.max(workerPeakRssMb, mb)) }));
  renderMs = performance.now() - renderStart;
  peakBeforePdf = process.resourceUsage().maxRSS / 1024;
  const sizes = await outputSizes(out!);
  outBytes = sizes.total;
  auditBytesPerProduct = sizes.audit / project.products.rows.length;
  const pdfCount = Math.min(Number(process.env.BENCH_PDFS ?? 0), project.products.rows.length);
  if (pdfCount > 0) pdf = await measurePdfs(out!, project.products.rows.slice(0, pdfCount).map((row) => row.value.product_id));
}

/** Bytes of the whole output and of the audit pages. */
async function outputSizes(dir: string): Promise<{ total: number; audit: number }> {
  const { readdir, stat } = await import('node:fs/promises');
  let total = 0;
  let audit = 0;
  for (const entry of await readdir(dir, { withFileTypes: true, recursive: true })) {
    if (!entry.isFile()) continue;
    const size = (await stat(path.join(entry.parentPath, entry.name))).size;
    total += size;
    if (entry.name === 'audit.html') audit += size;
  }
  return { total, audit };
}

/**
 * PDF throughput: the tool's printer (one browser, page pool, network blocked, links
 * unwrapped, one retry) against a floor measured in the same run — the same HTML files
 * printed by a bare puppeteer loop with the same page settings and nothing else.
 */
async function measurePdfs(dir: string, ids: string[]): Promise<{ count: number; toolMs: number; floorMs: number }> {
  const { declarationPdfJobs } = await import('../src/render/pdf.ts');
  const { findBrowser, CHROMIUM_ARGS } = await import('../src/render/browser.ts');
  const { printPdfs } = await import('../src/render/pdf.ts');
  const puppeteer = (await import('puppeteer')).default;
  const { pathToFileURL } = await import('node:url');
  const found = await findBrowser();
  if (!found) return { count: 0, toolMs: 0, floorMs: 0 };
  const draft = { status: 'draft' as const, draft: true, text: 'draft — not verified', reasons: [], date: '' };
  const jobs = declarationPdfJobs(project!, dir, ids.map((id) => ({ id, name: id, verification: draft })));
  const toolStart = performance.now();
  await printPdfs(found, dir, jobs);
  const toolMs = performance.now() - toolStart;
  const floorStart = performance.now();
  const browser = await puppeteer.launch({ executablePath: found.executablePath, headless: true, args: CHROMIUM_ARGS });
  const page = await browser.newPage();
  for (const job of jobs) {
    await page.goto(pathToFileURL(job.html).href, { waitUntil: 'load' });
    await page.pdf({ path: `${job.pdf}.floor.pdf`, format: 'A4', printBackground: true, displayHeaderFooter: true, margin: { top: '16mm', bottom: '16mm', left: '12mm', right: '12mm' } });
  }
  await browser.close();
  const floorMs = performance.now() - floorStart;
  return { count: ids.length, toolMs, floorMs };
}
process.stdout.write(
  JSON.stringify({
    loadMs,
    floorMs,
    calcMs,
    calcPeakRssMb,
    jsonMsPerProduct: jsonMs,
    nodesPerProduct: nodes / project.products.rows.length,
    figuresPerProduct: figures / Math.min(100, project.products.rows.length),
    jsonBytesPerProduct: jsonBytes / Math.min(100, project.products.rows.length),
    renderMs,
    buildPeakRssMb: peakBeforePdf,
    workerPeakRssMb,
    outBytes,
    auditBytesPerProduct,
    pdf,
    totalMs: performance.now() - started,
    peakRssMb: process.resourceUsage().maxRSS / 1024,
    rows: project.bom.rows.length + project.products.rows.length + project.factors.rows.length,
  }),
);
