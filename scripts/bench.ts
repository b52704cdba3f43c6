/**
 * `npm run bench`: speed and memory figures, printed (never asserted in tests).
 * Seeded synthetic catalogues of 100, 1 000 and 10 000 products × 40 BOM lines × 25
 * indicators. Each measurement runs in its own process so its peak RSS is its own.
 */
import { execFileSync } from 'node:child_process';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { writeSyntheticProject } from './synthetic.ts';

const sizes = (process.env.BENCH_SIZES ?? '100,1000,10000').split(',').map(Number);
const renderSizes = new Set((process.env.BENCH_RENDER_SIZES ?? '100,1000').split(',').map(Number));
const root = await mkdtemp(path.join(os.tmpdir(), 'loopsheet-bench-'));
const runTs = path.resolve('bin/run-ts.js');

interface Measurement {
  loadMs: number;
  floorMs: number;
  renderMs: number;
  totalMs: number;
  peakRssMb: number;
  rows: number;
}

const measure = (args: string[]): Measurement => JSON.parse(execFileSync(process.execPath, [runTs, 'scripts/bench-one.ts', ...args], { encoding: 'utf8', maxBuffer: 1 << 20 })) as Measurement;

const rows: string[] = [];
try {
  for (const products of sizes) {
    const dir = path.join(root, `p${products}`);
    const genStart = performance.now();
    await writeSyntheticProject(dir, { products, linesPerProduct: 40, indicators: 25 });
    const genMs = performance.now() - genStart;
    const check = measure([dir]);
    let render = '—';
    let renderRss = '—';
    if (renderSizes.has(products)) {
      const built = measure([dir, '--build', path.join(root, `out${products}`)]);
      render = `${(built.renderMs / 1000).toFixed(2)} s`;
      renderRss = `${built.peakRssMb.toFixed(0)} MB`;
    }
    rows.push(
      `| ${products.toLocaleString('en')} | ${check.rows.toLocaleString('en')} | ${(check.loadMs / 1000).toFixed(2)} s | ${(check.floorMs / 1000).toFixed(2)} s | ${(check.loadMs / check.floorMs).toFixed(1)}× | ${check.peakRssMb.toFixed(0)} MB | ${render} | ${renderRss} |`,
    );
    process.stderr.write(`bench: ${products} products generated in ${(genMs / 1000).toFixed(1)} s, measured\n`);
  }
} finally {
  await rm(root, { recursive: true, force: true });
}

process.stdout.write(`
loopsheet bench — ${os.cpus().length} cores, Node ${process.version}, 40 BOM lines × 25 indicators per product

| products | rows read | load + validate | floor: csv-parse alone | ratio | peak RSS (check) | render inputs site (HTML) | peak RSS (build) |
|---:|---:|---:|---:|---:|---:|---:|---:|
${rows.join('\n')}
`);
