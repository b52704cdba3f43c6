// One benchmark measurement in a fresh process, so peak memory belongs to it alone.
// usage: bench-one.ts DATA_DIR [--build OUT_DIR]
import { readFile } from 'node:fs/promises';
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
  for (const schema of CSV_FILES) parse(await readFile(path.join(dir!, schema.file), 'utf8'), { comment: '#', skip_empty_lines: true });
  floorMs = performance.now() - floorStart;
}
const loadStart = performance.now();
const { project, problems } = await loadProject(dir!);
const loadMs = performance.now() - loadStart;
if (!project) throw new Error(`synthetic project has errors: ${JSON.stringify(problems.slice(0, 3))}`);
let calcMs = 0;
let jsonMs = 0;
let nodes = 0;
let figures = 0;
let jsonBytes = 0;
if (flag === '--calc') {
  const { CalcContext } = await import('../src/calc/context.ts');
  const { calculateProduct } = await import('../src/calc/product.ts');
  const { rowsByProduct } = await import('../src/model/by-product.ts');
  const { resultsJson } = await import('../src/report/results.ts');
  const calcStart = performance.now();
  const ctx = new CalcContext(project);
  const all = rowsByProduct(project);
  // The full figure graph of every product is built; each is dropped after its product, as the build does.
  for (const rows of all) nodes += calculateProduct(ctx, rows).graph.nodes.size;
  calcMs = performance.now() - calcStart;
  // Serialising results.json (figures expanded per indicator), on the first 100 products.
  const jsonStart = performance.now();
  for (const rows of all.slice(0, 100)) {
    const json = resultsJson(ctx, calculateProduct(ctx, rows));
    figures += Object.keys(json.figures).length;
    jsonBytes += Buffer.byteLength(JSON.stringify(json));
  }
  jsonMs = (performance.now() - jsonStart) / Math.min(100, all.length);
}
let renderMs = 0;
if (flag === '--build') {
  const { buildSite } = await import('../src/render/build-site.ts');
  const { withStagedOutput } = await import('../src/render/output.ts');
  const renderStart = performance.now();
  // Calculation, results.json/csv, declaration and audit pages, catalogue: the build without PDFs.
  await withStagedOutput(out!, async (staging) => buildSite(project, problems, staging, { inputs: [], pdfs: false }));
  renderMs = performance.now() - renderStart;
}
process.stdout.write(
  JSON.stringify({
    loadMs,
    floorMs,
    calcMs,
    jsonMsPerProduct: jsonMs,
    nodesPerProduct: nodes / project.products.rows.length,
    figuresPerProduct: figures / Math.min(100, project.products.rows.length),
    jsonBytesPerProduct: jsonBytes / Math.min(100, project.products.rows.length),
    renderMs,
    totalMs: performance.now() - started,
    peakRssMb: process.resourceUsage().maxRSS / 1024,
    rows: project.bom.rows.length + project.products.rows.length + project.factors.rows.length,
  }),
);
