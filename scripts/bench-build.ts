/**
 * The catalogue build as a user runs it (`loopsheet build`, CI=true), timed by phase from its
 * progress lines, with the peak resident memory of the whole process tree (the build and its
 * worker processes, sampled from /proc); then `build --changed` after one factor row that 1 %
 * of the products read has changed; and the floor: Eleventy alone writing the same number
 * of pages of the same size from precomputed strings, plus the same bytes of results files
 * written with fs, in as many processes as the build uses.
 */
import { spawn } from 'node:child_process';
import { readdir, readFile, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { RARE_FACTOR } from './synthetic.ts';

const runTs = path.resolve('bin/run-ts.js');
const bin = path.resolve('bin/loopsheet.js');

export interface BuildBench {
  phases: Record<string, number>;
  totalMs: number;
  peakTreeRssMb: number;
  /** The largest single process of the tree. */
  peakMainRssMb: number;
  outBytes: number;
  /** Average bytes per product of each file kind. */
  perProduct: Record<string, number>;
  /** The median of three `build --changed` runs, with the fastest and slowest. */
  incremental: { ms: number; rebuilt: number; of: number; range: [number, number] };
  floorMs: number;
}

/** Resident memory of a process and all its descendants, in MB (Linux /proc). */
async function treeRss(pid: number): Promise<{ total: number; largest: number }> {
  const rss = async (p: number) => {
    const status = await readFile(`/proc/${p}/status`, 'utf8').catch(() => '');
    return Number(/VmRSS:\s+(\d+)/.exec(status)?.[1] ?? 0) / 1024;
  };
  const children = async (p: number): Promise<number[]> => {
    const tasks = await readdir(`/proc/${p}/task`).catch(() => [] as string[]);
    const kids: number[] = [];
    for (const t of tasks) kids.push(...(await readFile(`/proc/${p}/task/${t}/children`, 'utf8').catch(() => '')).split(/\s+/).filter(Boolean).map(Number));
    return kids;
  };
  let total = await rss(pid);
  let largest = total;
  const queue = await children(pid);
  while (queue.length > 0) {
    const p = queue.shift()!;
    const own = await rss(p);
    total += own;
    largest = Math.max(largest, own);
    queue.push(...(await children(p)));
  }
  return { total, largest };
}

/** Runs the CLI, timing each "build: <phase>" line and sampling memory. */
export async function timedBuild(args: string[]): Promise<{ phases: Record<string, number>; totalMs: number; peakTree: number; peakMain: number; stdout: string }> {
  const start = performance.now();
  const child = spawn(process.execPath, [bin, ...args], { env: { ...process.env, CI: 'true' }, stdio: ['ignore', 'pipe', 'pipe'] });
  const phases: Record<string, number> = {};
  let current = '';
  let since = start;
  let stdout = '';
  let stderr = '';
  let peakTree = 0;
  let peakMain = 0;
  const sampler = setInterval(() => {
    void treeRss(child.pid!).then(({ total, largest }) => {
      peakTree = Math.max(peakTree, total);
      peakMain = Math.max(peakMain, largest);
    });
  }, 200);
  child.stdout.on('data', (chunk) => (stdout += chunk));
  child.stderr.on('data', (chunk: Buffer) => {
    stderr += chunk;
    for (const line of chunk.toString().split('\n')) {
      const phase = /^build: ([a-zA-Z].*)$/.exec(line)?.[1];
      if (!phase) continue;
      const now = performance.now();
      if (current) phases[current] = (phases[current] ?? 0) + (now - since);
      current = phase.replace(/ \(\d+\)$/, '');
      since = now;
    }
  });
  const code = await new Promise<number | null>((resolve) => child.on('close', resolve));
  clearInterval(sampler);
  const end = performance.now();
  if (current) phases[current] = (phases[current] ?? 0) + (end - since);
  if (code !== 0) throw new Error(`loopsheet ${args.join(' ')} failed (${code}):\n${stderr.slice(-2000)}`);
  return { phases, totalMs: end - start, peakTree, peakMain, stdout };
}

async function sizes(out: string, products: number): Promise<{ total: number; perProduct: Record<string, number> }> {
  let total = 0;
  const byName: Record<string, number> = {};
  for (const entry of await readdir(out, { withFileTypes: true, recursive: true })) {
    if (!entry.isFile()) continue;
    const size = (await stat(path.join(entry.parentPath, entry.name))).size;
    total += size;
    if (path.dirname(path.relative(out, path.join(entry.parentPath, entry.name))).startsWith('P')) byName[entry.name] = (byName[entry.name] ?? 0) + size;
  }
  for (const name of Object.keys(byName)) byName[name]! /= products;
  return { total, perProduct: byName };
}

export async function benchBuild(data: string, out: string, products: number, workers: number): Promise<BuildBench> {
  const full = await timedBuild(['build', '--data', data, '--out', out, '--no-pdf']);
  const { total, perProduct } = await sizes(out, products);

  // One factor row read by 1 % of the products changes; the incremental build follows. Three
  // times (changed, changed back, changed again), each rebuilding the same products: one run
  // of a few seconds moves by ±10 % on this machine, so the median is reported with the range.
  const factors = path.join(data, 'factors.csv');
  const text = await readFile(factors, 'utf8');
  const edited = text.replace(new RegExp(`^(${RARE_FACTOR},[^,]*,[^,]*,[^,]*,[^,]*,)([^,\\n]+)`, 'm'), (_all, head: string, value: string) => `${head}${Number(value) * 1.1}`);
  if (edited === text) throw new Error(`no ${RARE_FACTOR} row to change`);
  const runs: Array<{ ms: number; rebuilt: number; of: number }> = [];
  for (const version of [edited, text, edited]) {
    await writeFile(factors, version);
    const changed = await timedBuild(['build', '--data', data, '--out', out, '--no-pdf', '--changed']);
    const match = /rebuilt (\d+) of ([\d,]+) products?/.exec(changed.stdout);
    runs.push({ ms: changed.totalMs, rebuilt: Number(match?.[1] ?? NaN), of: Number((match?.[2] ?? '').replace(/,/g, '') || NaN) });
  }
  const sorted = [...runs].sort((a, b) => a.ms - b.ms);

  const floorOut = `${out}-floor`;
  const floorStart = performance.now();
  await Promise.all(
    Array.from({ length: workers }, (_, worker) =>
      new Promise<void>((resolve, reject) => {
        const child = spawn(process.execPath, [runTs, 'scripts/bench-floor.ts', floorOut, String(products), JSON.stringify(perProduct), String(worker), String(workers)], { stdio: ['ignore', 'inherit', 'inherit'] });
        child.on('close', (code) => (code === 0 ? resolve() : reject(new Error(`floor worker failed (${code})`))));
      }),
    ),
  );
  const floorMs = performance.now() - floorStart;
  await rm(floorOut, { recursive: true, force: true });
  return {
    phases: full.phases,
    totalMs: full.totalMs,
    peakTreeRssMb: full.peakTree,
    peakMainRssMb: full.peakMain,
    outBytes: total,
    perProduct,
    incremental: { ...sorted[1]!, range: [sorted[0]!.ms, sorted[2]!.ms] },
    floorMs,
  };
}
