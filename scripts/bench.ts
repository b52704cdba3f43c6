/**
 * `npm run bench`: speed and memory figures, printed (never asserted in tests).
 * Seeded synthetic catalogues of 100, 1 000 and 10 000 products × 40 BOM lines × 25
 * indicators. Each measurement runs in its own process so its peak RSS is its own.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { cp, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { writeSyntheticProject } from './synthetic.ts';
import { defaultWorkers } from '../src/render/build-site.ts';
import { benchBuild, type BuildBench } from './bench-build.ts';

const workers = defaultWorkers();

const sizes = (process.env.BENCH_SIZES ?? '100,1000,10000').split(',').filter(Boolean).map(Number);
const renderSizes = new Set((process.env.BENCH_RENDER_SIZES ?? '100,1000,10000').split(',').map(Number));
const root = await mkdtemp(path.join(os.tmpdir(), 'loopsheet-bench-'));
const runTs = path.resolve('bin/run-ts.js');

interface Measurement {
  calcMs: number;
  calcPeakRssMb: number;
  jsonMsPerProduct: number;
  nodesPerProduct: number;
  figuresPerProduct: number;
  jsonBytesPerProduct: number;
  loadMs: number;
  floorMs: number;
  renderMs: number;
  buildPeakRssMb: number;
  workerPeakRssMb: number;
  outBytes: number;
  auditBytesPerProduct: number;
  pdf: { count: number; toolMs: number; floorMs: number };
  totalMs: number;
  peakRssMb: number;
  rows: number;
}

// With the V8 flags bin/loopsheet.js runs the tool with.
const once = (args: string[], env: NodeJS.ProcessEnv = {}): Measurement =>
  JSON.parse(execFileSync(process.execPath, ['--max-semi-space-size=64', runTs, 'scripts/bench-one.ts', ...args], { encoding: 'utf8', maxBuffer: 1 << 20, env: { ...process.env, ...env } })) as Measurement;
/** PDFs printed in the build measurement of the smallest rendered size (tool against the bare-loop floor). */
const pdfCount = Number(process.env.BENCH_PDFS ?? 40);

/**
 * Allocation-heavy phases vary between runs on this machine (the same load of 10 000
 * products takes 5.5 s or 8.5 s, with a stable CPU), so each measurement runs `repeat`
 * times; the table shows the fastest run and the range.
 */
const repeat = Number(process.env.BENCH_REPEAT ?? 3);
interface Ranged extends Measurement {
  range: Record<'loadMs' | 'calcMs', [number, number]>;
}
function measure(args: string[]): Ranged {
  const runs = Array.from({ length: repeat }, () => once(args));
  const key: 'loadMs' | 'calcMs' = args.includes('--calc') ? 'calcMs' : 'loadMs';
  const best = runs.reduce((a, b) => (b[key] < a[key] ? b : a));
  const span = (k: 'loadMs' | 'calcMs'): [number, number] => [Math.min(...runs.map((r) => r[k])), Math.max(...runs.map((r) => r[k]))];
  return { ...best, peakRssMb: Math.max(...runs.map((r) => r.peakRssMb)), calcPeakRssMb: Math.max(...runs.map((r) => r.calcPeakRssMb)), range: { loadMs: span('loadMs'), calcMs: span('calcMs') } };
}
const seconds = (ms: number) => `${(ms / 1000).toFixed(2)} s`;
const range = ([a, b]: [number, number]) => `${(a / 1000).toFixed(1)}–${(b / 1000).toFixed(1)} s`;

/** Inputs that once made `check` run for minutes or run out of memory (each planted in a copy of the demo). */
const bomLine = (dir: string, line: number, edit: (text: string) => string) =>
  readFile(path.join(dir, 'bom.csv'), 'utf8').then((text) => {
    const lines = text.split('\n');
    lines[line - 1] = edit(lines[line - 1]!);
    return writeFile(path.join(dir, 'bom.csv'), lines.join('\n'));
  });
const HOSTILE: Array<[string, (dir: string) => Promise<void>]> = [
  ['a mass cell of 1 000 000 digits', (dir) => bomLine(dir, 6, (line) => line.replace(',0.995,', `,${'1'.repeat(1_000_000)},`))],
  ['a mass cell of 9 999 digits and a letter (under the cell limit)', (dir) => bomLine(dir, 6, (line) => line.replace(',0.995,', `,${'1'.repeat(9_999)}x,`))],
  ['a share cell of 300 000 spaces and a letter', (dir) => bomLine(dir, 6, (line) => line.replace(',0.04,', `,${' '.repeat(300_000)}x%,`))],
  ['a source cell of 1 MB', (dir) => bomLine(dir, 6, (line) => line.replace('Mill yield report 2025 (illustrative)', 'x'.repeat(1_000_000)))],
  ['bom.csv of 1 000 000 valid lines (10 000 products × 100)', async (dir) => {
    await rm(dir, { recursive: true });
    await writeSyntheticProject(dir, { products: 10_000, linesPerProduct: 100, indicators: 25 });
  }],
];
const hostileRows: string[] = [];
const hostileMs: number[] = [];

const rows: string[] = [];
const calcRows: string[] = [];
const buildRows: string[] = [];
const pdfRows: string[] = [];
let pdfMeasured = false;
let pdfRate = 0;
const sizeRows: string[] = [];
const mcRows: string[] = [];
/** What each rendered size measured, for the targets table. */
const built = new Map<number, { totalMs: number; floorMs: number; peakTreeMb: number; outBytes: number; incrementalShare: number }>();
let pdfFloorRatio = NaN;
try {
  for (const products of sizes) {
    const dir = path.join(root, `p${products}`);
    const genStart = performance.now();
    await writeSyntheticProject(dir, { products, linesPerProduct: 40, indicators: 25 });
    const genMs = performance.now() - genStart;
    const check = measure([dir]);
    const calc = measure([dir, '--calc']);
    calcRows.push(
      `| ${products.toLocaleString('en')} | ${seconds(calc.calcMs)} (${range(calc.range.calcMs)}) | ${calc.calcPeakRssMb.toFixed(0)} MB | ${calc.peakRssMb.toFixed(0)} MB | ${calc.nodesPerProduct.toFixed(0)} | ${calc.figuresPerProduct.toFixed(0)} | ${(calc.jsonBytesPerProduct / 1e6).toFixed(2)} MB | ${calc.jsonMsPerProduct.toFixed(1)} ms |`,
    );
    if (renderSizes.has(products)) {
      if (!pdfMeasured && pdfCount > 0) {
        // PDF throughput on this catalogue's first declarations (tool against the bare-loop floor).
        const built = once([dir, '--build', path.join(root, `pdf${products}`)], { BENCH_PDFS: String(pdfCount) });
        await rm(path.join(root, `pdf${products}`), { recursive: true, force: true });
        if (built.pdf.count > 0) {
          pdfMeasured = true;
          pdfRate = built.pdf.count / (built.pdf.toolMs / 1000);
          pdfFloorRatio = built.pdf.toolMs / built.pdf.floorMs;
          const rate = (ms: number) => (built.pdf.count / (ms / 1000)).toFixed(2);
          pdfRows.push(`| ${built.pdf.count} | ${seconds(built.pdf.toolMs)} | ${rate(built.pdf.toolMs)} /s | ${seconds(built.pdf.floorMs)} | ${rate(built.pdf.floorMs)} /s | ${(built.pdf.toolMs / built.pdf.floorMs).toFixed(2)}× |`);
        }
      }
      const out = path.join(root, `out${products}`);
      const b: BuildBench = await benchBuild(dir, out, products, workers);
      await rm(out, { recursive: true, force: true });
      const phase = (name: string) => b.phases[name] ?? 0;
      const floor = check.floorMs + b.floorMs;
      const noPdf = b.totalMs;
      const pdfMs = pdfRate > 0 ? (products / pdfRate) * 1000 : NaN;
      built.set(products, { totalMs: noPdf, floorMs: floor, peakTreeMb: b.peakTreeRssMb, outBytes: b.outBytes, incrementalShare: b.incremental.ms / noPdf });
      buildRows.push(
        `| ${products.toLocaleString('en')} | ${seconds(phase('load and validate'))} | ${seconds(phase('calculate and render'))} | ${seconds(phase('verification manifest'))} | **${seconds(noPdf)}** | ${Number.isNaN(pdfMs) ? '—' : seconds(pdfMs)} | ${(b.peakTreeRssMb / 1024).toFixed(2)} GB | ${(b.peakMainRssMb / 1024).toFixed(2)} GB | ${(b.outBytes / 1e9).toFixed(2)} GB | ${seconds(floor)} | ${(noPdf / floor).toFixed(1)}× | ${seconds(b.incremental.ms)} (${range(b.incremental.range)}; ${b.incremental.rebuilt} of ${b.incremental.of} rebuilt) | ${((100 * b.incremental.ms) / noPdf).toFixed(1)} % |`,
      );
      sizeRows.push(`| ${products.toLocaleString('en')} | ${Object.entries(b.perProduct).sort().map(([name, bytes]) => `${name} ${(bytes / 1e6).toFixed(2)} MB`).join(', ')} | csv-parse ${seconds(check.floorMs)} + Eleventy and fs ${seconds(b.floorMs)} |`);
    }
    rows.push(
      `| ${products.toLocaleString('en')} | ${check.rows.toLocaleString('en')} | ${seconds(check.loadMs)} (${range(check.range.loadMs)}) | ${(check.floorMs / 1000).toFixed(2)} s | ${(check.loadMs / check.floorMs).toFixed(1)}× | ${check.peakRssMb.toFixed(0)} MB |`,
    );
    process.stderr.write(`bench: ${products} products generated in ${(genMs / 1000).toFixed(1)} s, measured\n`);
  }
  // Monte Carlo: only when asked for in a build, so measured apart — per product, at N = 1 000,
  // on 200 products of a catalogue where every factor, BOM mass and electricity amount has a gsd.
  const mcDir = path.join(root, 'mc');
  await writeSyntheticProject(mcDir, { products: 200, linesPerProduct: 40, indicators: 25, gsd: true });
  const mc = JSON.parse(execFileSync(process.execPath, ['--max-semi-space-size=64', runTs, 'scripts/bench-uncertainty.ts', mcDir, '200', '1000'], { encoding: 'utf8' })) as { calcMs: number; qualityMs: number; sensitivityMs: number; mcMs: number; variedPerProduct: number };
  mcRows.push(`| ${mc.calcMs.toFixed(2)} ms | ${mc.qualityMs.toFixed(2)} ms | ${mc.sensitivityMs.toFixed(2)} ms | ${mc.mcMs.toFixed(2)} ms | ${mc.variedPerProduct.toFixed(0)} |`);
  // Hostile input: `check` on cells and files no one should write, timed as a user runs it.
  if (process.env.BENCH_HOSTILE !== '0') {
    for (const [name, plant] of HOSTILE) {
      const dir = path.join(root, `hostile-${hostileRows.length}`);
      await cp('data', dir, { recursive: true });
      await plant(dir);
      const started = performance.now();
      const run = spawnSync('/usr/bin/time', ['-f', '%M', process.execPath, 'bin/loopsheet.js', 'check', '--data', dir], { encoding: 'utf8', maxBuffer: 1 << 26 });
      const ms = performance.now() - started;
      const peakKb = Number(run.stderr.trim().split('\n').at(-1));
      const codes = [...new Set(run.stderr.match(/\[[A-Z_]+\]$/gm) ?? [])].join(' ');
      hostileRows.push(`| ${name} | ${seconds(ms)} | ${Number.isFinite(peakKb) ? `${(peakKb / 1024 / 1024).toFixed(2)} GB` : '—'} | exit ${run.status} ${codes} |`);
      hostileMs.push(ms);
    }
  }
} finally {
  await rm(root, { recursive: true, force: true });
}

// The targets of the catalogue build (40 lines × 25 indicators, 2 cores, no PDF), each beside what this run measured.
const targetRows: string[] = [];
const target = (name: string, goal: string, value: string, met: boolean | undefined) => targetRows.push(`| ${name} | ${goal} | ${value} | ${met === undefined ? 'not measured' : met ? 'met' : '**not met**'} |`);
const at = (n: number) => built.get(n);
const largest = Math.max(...built.keys());
if (at(largest)) target('out/ per product', '≤ 0.6 MB', `${(at(largest)!.outBytes / largest / 1e6).toFixed(2)} MB (${largest.toLocaleString('en')} products)`, at(largest)!.outBytes / largest <= 0.6e6);
if (at(1000)) target('1 000 products', '≤ 10 s', seconds(at(1000)!.totalMs), at(1000)!.totalMs <= 10_000);
if (at(10000)) target('10 000 products', '≤ 60 s and ≤ 2 GB (all processes)', `${seconds(at(10000)!.totalMs)}, ${(at(10000)!.peakTreeMb / 1024).toFixed(2)} GB`, at(10000)!.totalMs <= 60_000 && at(10000)!.peakTreeMb <= 2048);
for (const [n, b] of [...built].sort(([a], [c]) => a - c)) target(`build / floor, ${n.toLocaleString('en')} products`, '≤ 1.5×', `${(b.totalMs / b.floorMs).toFixed(1)}× (floor ${seconds(b.floorMs)})`, b.totalMs / b.floorMs <= 1.5);
if (at(1000)) target('build --changed, 1 000 products', '< 5 % of the full build', `${(100 * at(1000)!.incrementalShare).toFixed(1)} %`, at(1000)!.incrementalShare < 0.05);
if (hostileMs.length > 0) target('check on each hostile input', '≤ 10 s', `${seconds(Math.max(...hostileMs))} at most`, Math.max(...hostileMs) <= 10_000);
target('PDF', '≥ 1 declaration/s, ≤ 1.3× the bare-Chromium floor', Number.isNaN(pdfFloorRatio) ? '—' : `${pdfRate.toFixed(2)} /s, ${pdfFloorRatio.toFixed(2)}×`, Number.isNaN(pdfFloorRatio) ? undefined : pdfRate >= 1 && pdfFloorRatio <= 1.3);

process.stdout.write(`
loopsheet bench — ${os.cpus().length} cores, Node ${process.version}, 40 BOM lines × 25 indicators per product, best of ${repeat} runs (range)

| products | rows read | load + validate | floor: csv-parse alone | ratio | peak RSS (check) |
|---:|---:|---:|---:|---:|---:|
${rows.join('\n')}

Calculation (all methods, every indicator, full figure graph per product; peak RSS includes load; the highest of the runs):

| products | calc | peak RSS after calc | peak RSS after writing 100 results.json | graph nodes / product | figures / product | results.json / product | results.json text / product |
|---:|---:|---:|---:|---:|---:|---:|---:|
${calcRows.join('\n')}

Catalogue build as a user runs it (\`loopsheet build --no-pdf\`, CI=true; phases timed from its progress lines; ${workers} worker processes). PDF: projected from the measured throughput below. Peak RSS: the build and its workers together (sampled from /proc every 200 ms), and the largest single process. Floor: csv-parse reading the inputs + Eleventy alone writing the same pages (same number, same sizes, from precomputed strings, runs of 25, ${workers} processes) and fs writing the same results-file bytes. Incremental: \`build --changed\` after one factor row read by 1 % of the products changed, the median of three runs (range).

| products | load + validate | calculate + render (HTML, JSON, catalogue) | manifest | total without PDF | PDF (projected) | peak RSS (all) | peak RSS (largest process) | out/ | floor | total / floor | incremental | incremental / full |
|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|
${buildRows.join('\n')}

| products | output per product | floor parts |
|---:|---|---|
${sizeRows.join('\n')}

PDF throughput (declarations of the smallest rendered catalogue; tool: one browser, page pool of 2, network blocked, links unwrapped; floor: the same HTML printed by a bare sequential puppeteer loop):

| PDFs | tool | tool rate | floor | floor rate | tool / floor |
|---:|---:|---:|---:|---:|---:|
${pdfRows.join('\n')}

Per product (200 products × 40 lines × 25 indicators; every factor, BOM mass and electricity amount with a gsd): the calculation, the data quality and the sensitivity every build adds, and the Monte Carlo analysis at N = 1 000 that runs only when asked (build --uncertainty or declaration.json uncertainty):

| calculation | data quality | contributions and sensitivity | Monte Carlo, N = 1 000 | inputs varied per product |
|---:|---:|---:|---:|---:|
${mcRows.join('\n')}

Hostile input (\`loopsheet check\` on a copy of the demo with one planted cell, or a synthetic catalogue too large to build; wall time and peak RSS from /usr/bin/time):

| input | check | peak RSS | result |
|---|---:|---:|---|
${hostileRows.join('\n')}

Targets (measured in this run):

| target | goal | measured | |
|---|---|---:|---|
${targetRows.join('\n')}
`);
