import { fork } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import { rowsByProduct, type ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import type { Problem } from '../problems.ts';
import type { ResultsSummary } from '../report/results.ts';
import { buildSiteView, catalogueEntry, type CatalogueEntry, type ProductReport, type SiteView } from '../report/site-view.ts';
import { PACKAGE_ROOT } from './paths.ts';
import { ResultsWriter, writeCatalogueResults } from './results-files.ts';
import { renderSite } from './site.ts';

/**
 * Products per Eleventy render. Eleventy keeps every page of a run in memory; rendering the
 * catalogue in shards keeps the peak to one shard's pages (npm run bench measures it).
 */
export const SHARD_SIZE = 25;

/** Processes that build shards side by side: one per core, at most four; `LOOPSHEET_WORKERS` overrides. */
export function defaultWorkers(env: NodeJS.ProcessEnv = process.env): number {
  const asked = Number(env.LOOPSHEET_WORKERS);
  if (Number.isInteger(asked) && asked >= 1) return asked;
  return Math.max(1, Math.min(4, os.availableParallelism()));
}

export interface SiteBuildOptions {
  inputs: SiteView['verification']['inputs'];
  pdfs: boolean;
  shardSize?: number;
  /** Processes building shards side by side (default: `defaultWorkers()`). */
  workers?: number;
  /** Called after each shard, with the products done so far (progress). */
  onShard?: (done: number, total: number) => void;
  /** Called as each worker process ends, with its peak resident memory (benchmark). */
  onWorkerEnd?: (peakRssMb: number) => void;
}

/** What a shard leaves for the catalogue: per product, its catalogue row and results summary. */
export interface ShardOutcome {
  index: number;
  entry: CatalogueEntry;
  summary: ResultsSummary;
}

const chunk = <T>(items: T[], size: number): T[][] => Array.from({ length: Math.ceil(items.length / size) }, (_, i) => items.slice(i * size, (i + 1) * size));

/**
 * Computes every product, writes its results files and renders its declaration and audit
 * pages, a shard at a time, in `workers` processes side by side; then the catalogue-wide
 * results files and pages. The output does not depend on the shard size or the number of
 * workers (test/render/build-site.test.ts).
 */
export async function buildSite(project: Project, problems: readonly Problem[], outDir: string, options: SiteBuildOptions): Promise<CatalogueEntry[]> {
  const size = options.shardSize ?? SHARD_SIZE;
  const all = rowsByProduct(project);
  const shards = chunk(all.map((rows, index) => ({ rows, index })), size);
  const workers = Math.min(options.workers ?? defaultWorkers(), shards.length);
  const outcomes: ShardOutcome[] = [];
  let done = 0;
  const progress = (count: number) => {
    done += count;
    options.onShard?.(done, all.length);
  };
  if (workers <= 1) {
    for (const shard of shards) {
      outcomes.push(...(await buildShard(project, problems, outDir, shard, options.pdfs)));
      progress(shard.length);
    }
  } else {
    const results = await Promise.all(
      Array.from({ length: workers }, (_, worker) => runWorker(project.dir, outDir, { shardSize: size, worker, workers, pdfs: options.pdfs }, progress, options.onWorkerEnd)),
    );
    outcomes.push(...results.flat());
  }
  outcomes.sort((a, b) => a.index - b.index);
  await writeCatalogueResults(outDir, outcomes.map((o) => o.summary));
  const catalogue = outcomes.map((o) => o.entry);
  await renderSite(buildSiteView(project, problems, { products: [], catalogue, pdfs: options.pdfs, inputs: options.inputs }), outDir);
  return catalogue;
}

/** One shard: each product computed, written and viewed, then one Eleventy run for the shard's pages. */
export async function buildShard(project: Project, problems: readonly Problem[], outDir: string, shard: Array<{ rows: ProductRows; index: number }>, pdfs: boolean): Promise<ShardOutcome[]> {
  const writer = new ResultsWriter(project, outDir);
  const products: Array<{ rows: ProductRows; report: ProductReport }> = [];
  for (const { rows } of shard) products.push({ rows, report: await writer.product(rows) });
  const view = buildSiteView(project, problems, { products, pdfs });
  await renderSite(view, outDir);
  return view.products.map((product, k) => ({ index: shard[k]!.index, entry: catalogueEntry(product), summary: products[k]!.report.summary }));
}

export interface WorkerTask {
  shardSize: number;
  worker: number;
  workers: number;
  pdfs: boolean;
}

export type WorkerMessage = { kind: 'shard'; products: number } | { kind: 'done'; outcomes: ShardOutcome[]; peakRssMb: number } | { kind: 'failed'; message: string };

/** A shard worker: a process of its own that loads the project and builds every `workers`-th shard. */
function runWorker(dataDir: string, outDir: string, task: WorkerTask, progress: (count: number) => void, onEnd?: (peakRssMb: number) => void): Promise<ShardOutcome[]> {
  return new Promise((resolve, reject) => {
    const child = fork(path.join(PACKAGE_ROOT, 'bin', 'run-ts.js'), [path.join(PACKAGE_ROOT, 'src', 'render', 'shard-worker.ts'), dataDir, outDir, JSON.stringify(task)], {
      execArgv: ['--max-semi-space-size=64'],
      stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
    });
    let outcomes: ShardOutcome[] | undefined;
    let failure: string | undefined;
    child.on('message', (message: WorkerMessage) => {
      if (message.kind === 'shard') progress(message.products);
      else if (message.kind === 'done') {
        outcomes = message.outcomes;
        onEnd?.(message.peakRssMb);
      }
      else failure = message.message;
    });
    child.on('error', reject);
    child.on('exit', (code) => {
      if (outcomes && code === 0) resolve(outcomes);
      else reject(new Error(`shard worker ${task.worker + 1} of ${task.workers} failed${failure ? `: ${failure}` : ` (exit ${code})`}`));
    });
  });
}
