import { fork } from 'node:child_process';
import { mkdir, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { rowsByProduct, type ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import { ToolError, type Problem } from '../problems.ts';
import type { ResultsSummary } from '../report/results.ts';
import { familyResults, familyResultsCsv, type FamilyResults } from '../report/families.ts';
import { ilcdDatasets } from '../report/ilcd-export.ts';
import { familyExport } from '../report/ilcd-declaration.ts';
import { ilcdLink } from '../report/ilcd-link.ts';
import { ilcdArchive } from './ilcd-archive.ts';
import { familyDir, familyView, type FamilyView } from '../report/family-view.ts';
import { buildSiteView, catalogueEntry, type CatalogueEntry, type ProductReport, type SiteView } from '../report/site-view.ts';
import { FS_CONCURRENCY, mapLimit } from './each-limit.ts';
import { changeReasons, keepProduct, writeBuildCache, type PreviousBuild } from './incremental.ts';
import { pageContextKey, productInputKey } from './input-key.ts';
import { PACKAGE_ROOT } from './paths.ts';
import { ResultsWriter, writeCatalogueResults } from './results-files.ts';
import type { HashedFile } from './verification.ts';
import { renderSite } from './site.ts';
import { CHECKLIST_JSON, DECLARATION_ILCD, RESULTS_JSON, RESULTS_CSV, VERIFICATION_DIR } from '../files.ts';
import { CHECKS } from '../calc/checklist.ts';
import { familyStatus, resultsChanged } from '../model/verification-status.ts';
import { verificationView, type VerificationView } from '../report/verification-status.ts';
import { onInterrupt } from './cleanup.ts';

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
  /** Only the products this picks (one `--shard` of the catalogue). */
  select?: (productId: string) => boolean;
  /** A previous build whose products are kept where their inputs did not change (`--changed`). */
  previous?: PreviousBuild;
  /** Write the catalogue-wide pages and files (default true; a shard build leaves them to `merge`). */
  catalogue?: boolean;
  /** Called as products are done, with the number done and the number to build (progress). */
  onProgress?: (done: number, total: number) => void;
  /** Called as each worker process ends, with its peak resident memory (benchmark). */
  onWorkerEnd?: (peakRssMb: number) => void;
}

/** What a built product leaves for the catalogue: its catalogue row, results summary and input key. */
export interface ProductOutcome {
  index: number;
  entry: CatalogueEntry;
  /**
   * Its results without the graph, as JSON text: the catalogue files take it as it is, and a
   * process that holds 10 000 of them holds text, not object trees (parsed only for families).
   */
  summaryJson: string;
  /** The product's files hashed as they were written (none for a product kept from the previous build). */
  hashes: HashedFile[];
  key: string;
}

export interface SiteBuildResult {
  /** The products of this build (the selected ones), in catalogue order. */
  outcomes: ProductOutcome[];
  /** Products computed and rendered, with why (for `--changed`). */
  rebuilt: Array<{ id: string; reasons: string[] }>;
  /** Products whose files were kept from the previous build. */
  kept: string[];
  /** The project-wide part of the pages, as hashed into every input key. */
  context: string;
  /** Family members outside the grouping tolerance, one line each (empty for a shard build). */
  familyWarnings: string[];
  /** The family declarations written (empty for a shard build): their PDFs are printed with the products'. */
  families: Array<{ id: string; name: string; verification: VerificationView }>;
}

const chunk = <T>(items: T[], size: number): T[][] => Array.from({ length: Math.ceil(items.length / size) }, (_, i) => items.slice(i * size, (i + 1) * size));

/**
 * Computes the products, writes their results files and renders their declaration and audit
 * pages, a shard at a time, in `workers` processes side by side; then the catalogue-wide
 * results files and pages. With a previous build, a product whose input key is unchanged
 * keeps its files instead. The output does not depend on the shard size, the number of
 * workers or what was kept (test/render/build-site.test.ts, incremental.test.ts).
 */
export async function buildSite(project: Project, problems: readonly Problem[], outDir: string, options: SiteBuildOptions): Promise<SiteBuildResult> {
  const size = options.shardSize ?? SHARD_SIZE;
  const context = pageContextKey(project, options.pdfs);
  const selected = rowsByProduct(project)
    .map((rows, index) => ({ rows, index }))
    .filter(({ rows }) => options.select?.(rows.product.value.product_id) ?? true);

  const outcomes: ProductOutcome[] = [];
  const kept: string[] = [];
  const rebuilt: SiteBuildResult['rebuilt'] = [];
  let toBuild = selected;
  if (options.previous) {
    const previous = options.previous;
    const compared = selected.map((item) => {
      const id = item.rows.product.value.product_id;
      const input = productInputKey(project, item.rows, context);
      const cached = previous.products.get(id);
      const summary = previous.summaries.get(id);
      return { item, id, input, cached, summary, same: cached?.key === input.key && summary !== undefined };
    });
    // Keeping is file-system work only (hard links), done side by side.
    const keptFiles = await mapLimit(compared, FS_CONCURRENCY, async (c) => c.same && (await keepProduct(previous.dir, outDir, c.id)));
    toBuild = [];
    compared.forEach((c, k) => {
      if (keptFiles[k]) {
        outcomes.push({ index: c.item.index, entry: c.cached!.entry, summaryJson: c.summary!, key: c.input.key, hashes: [] });
        kept.push(c.id);
      } else {
        toBuild.push(c.item);
        rebuilt.push({ id: c.id, reasons: changeReasons(project, previous, c.id, c.input, context) });
      }
    });
  } else {
    for (const { rows } of selected) rebuilt.push({ id: rows.product.value.product_id, reasons: [] });
  }

  const shards = chunk(toBuild, size);
  const workers = Math.min(options.workers ?? defaultWorkers(), shards.length);
  let done = 0;
  const progress = (count: number) => {
    done += count;
    options.onProgress?.(done, toBuild.length);
  };
  if (workers <= 1) {
    for (const shard of shards) {
      outcomes.push(...(await buildShard(project, problems, outDir, shard, options.pdfs, context)));
      progress(shard.length);
    }
  } else {
    const tasks = Array.from({ length: workers }, (_, worker): WorkerTask => ({ shards: shards.filter((_, k) => k % workers === worker).map((shard) => shard.map((item) => item.index)), pdfs: options.pdfs, context, ...(project.declaration.uncertainty ? { uncertainty: project.declaration.uncertainty } : {}) }));
    const results = await Promise.all(tasks.map((task, worker) => runWorker(project.dir, outDir, task, `${worker + 1} of ${workers}`, progress, options.onWorkerEnd)));
    outcomes.push(...results.flat());
  }
  outcomes.sort((a, b) => a.index - b.index);
  const catalogue = options.catalogue ?? true ? await writeCatalogue(project, problems, outDir, outcomes, { inputs: options.inputs, pdfs: options.pdfs, context }) : { warnings: [], families: [] };
  return { outcomes, rebuilt, kept, context, familyWarnings: catalogue.warnings, families: catalogue.families };
}

/**
 * The catalogue-wide files and pages (catalogue, families, factor table, verification page)
 * and the build cache, from every product's outcome. Returns the family warnings (members
 * beyond the grouping tolerance) for the caller to print, and the families whose PDFs the
 * caller prints.
 */
export async function writeCatalogue(project: Project, problems: readonly Problem[], outDir: string, outcomes: readonly ProductOutcome[], options: { inputs: SiteView['verification']['inputs']; pdfs: boolean; context: string }): Promise<{ warnings: string[]; families: Array<{ id: string; name: string; verification: VerificationView }> }> {
  await writeCatalogueResults(outDir, outcomes.map((o) => ({ id: o.entry.id, summaryJson: o.summaryJson })));
  const catalogue = outcomes.map((o) => o.entry);
  const families = await writeFamilies(project, outDir, outcomes);
  await renderSite(buildSiteView(project, problems, { products: [], catalogue, pdfs: options.pdfs, inputs: options.inputs, families }), outDir);
  await writeChecklist(outDir, catalogue);
  await writeBuildCache(outDir, options.context, outcomes);
  return { warnings: families.flatMap((family) => family.warnings), families: families.map((family) => ({ id: family.id, name: family.name, verification: family.verification! })) };
}

/** Each family's results.json and results.csv under families/<id>/, and its page view. */
async function writeFamilies(project: Project, outDir: string, outcomes: readonly ProductOutcome[]): Promise<FamilyView[]> {
  const members = new Set(project.families.flatMap((family) => family.members.map((m) => m.productId)));
  const summaries = new Map(outcomes.filter((o) => members.has(o.entry.id)).map((o) => [o.entry.id, JSON.parse(o.summaryJson) as ResultsSummary]));
  const names = new Map(outcomes.map((o) => [o.entry.id, o.entry.name]));
  const entries = new Map(outcomes.map((o) => [o.entry.id, o.entry]));
  const views: FamilyView[] = [];
  for (const family of project.families) {
    if (!family.members.some((m) => summaries.has(m.productId))) continue;
    const results: FamilyResults = { ...familyResults(family, summaries, project.declaration.report.family_tolerance), ilcd_epd: ilcdLink(project.declaration, 'family', family.id) };
    const dir = path.join(outDir, familyDir(family.id));
    await mkdir(dir, { recursive: true });
    const members = results.members.map((m) => ({ product: project.lookups.products.get(m.product_id)!.value, summary: summaries.get(m.product_id)! }));
    const memberIds = results.members.map((m) => m.product_id);
    const status = familyStatus(project.verification.state, family.id, memberIds.map((id) => entries.get(id)?.verification ?? { status: 'draft' as const }), memberIds);
    const file = `${familyDir(family.id)}/${RESULTS_JSON}`;
    const json = `${JSON.stringify(results, null, 1)}\n`;
    const verification = resultsChanged(project.verification.state, file, json, status);
    await writeFile(path.join(dir, DECLARATION_ILCD), ilcdArchive(ilcdDatasets(project.declaration, familyExport(results, members, verification))));
    await writeFile(path.join(dir, RESULTS_JSON), json);
    await writeFile(path.join(dir, RESULTS_CSV), familyResultsCsv(results));
    views.push({ ...familyView(project, results, names), verification: verificationView(verification) });
  }
  return views;
}

/** One shard: each product computed, written and viewed, then one Eleventy run for the shard's pages. */
export async function buildShard(project: Project, problems: readonly Problem[], outDir: string, shard: Array<{ rows: ProductRows; index: number }>, pdfs: boolean, context: string): Promise<ProductOutcome[]> {
  const writer = new ResultsWriter(project, outDir, context);
  const products: Array<{ rows: ProductRows; report: ProductReport; key: string; hashes: HashedFile[] }> = [];
  for (const { rows } of shard) products.push({ rows, ...(await writer.product(rows)) });
  const view = buildSiteView(project, problems, { products, pdfs });
  // Each page hashed from the text written, by product folder.
  const pages = new Map<string, HashedFile[]>();
  for (const page of await renderSite(view, outDir)) {
    const folder = page.file.slice(0, page.file.indexOf('/'));
    let list = pages.get(folder);
    if (!list) pages.set(folder, (list = []));
    list.push(page);
  }
  return view.products.map((product, k) => ({ index: shard[k]!.index, entry: catalogueEntry(product), summaryJson: JSON.stringify(products[k]!.report.summary), key: products[k]!.key, hashes: [...products[k]!.hashes, ...(pages.get(products[k]!.report.summary.product_id) ?? [])] }));
}

export interface WorkerTask {
  /** The shards this worker builds, each as the products' catalogue indices. */
  shards: number[][];
  pdfs: boolean;
  context: string;
  /** The Monte Carlo settings when the build asked for them on the command line (build --uncertainty). */
  uncertainty?: { iterations: number; seed: number };
}

/** A worker sends each shard's outcomes as soon as the shard is built, and keeps none: its memory does not grow with the shards it builds. */
export type WorkerMessage = { kind: 'shard'; outcomes: ProductOutcome[] } | { kind: 'done'; peakRssMb: number } | { kind: 'failed'; message: string; input: boolean };

/** A shard worker: a process of its own that loads the project and builds the shards it is given. */
function runWorker(dataDir: string, outDir: string, task: WorkerTask, name: string, progress: (count: number) => void, onEnd?: (peakRssMb: number) => void): Promise<ProductOutcome[]> {
  return new Promise((resolve, reject) => {
    const child = fork(path.join(PACKAGE_ROOT, 'bin', 'run-ts.js'), [path.join(PACKAGE_ROOT, 'src', 'render', 'shard-worker.ts'), dataDir, outDir], {
      execArgv: ['--max-semi-space-size=64'],
      stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
    });
    const forget = onInterrupt(() => {
      child.kill('SIGKILL');
      return undefined;
    });
    const outcomes: ProductOutcome[] = [];
    let done = false;
    let failure: { message: string; input: boolean } | undefined;
    child.on('message', (message: WorkerMessage) => {
      if (message.kind === 'shard') {
        outcomes.push(...message.outcomes);
        progress(message.outcomes.length);
      } else if (message.kind === 'done') {
        done = true;
        onEnd?.(message.peakRssMb);
      } else failure = { message: message.message, input: message.input };
    });
    child.on('error', reject);
    child.on('exit', (code) => {
      forget();
      if (done && code === 0) resolve(outcomes);
      else if (failure?.input) reject(new ToolError('input', failure.message));
      else reject(new Error(`shard worker ${name} failed${failure ? `: ${failure.message}` : ` (exit ${code})`}`));
    });
    // The task goes over IPC: a long list of indices would not fit on a command line.
    child.send(task);
  });
}

/** verification/checklist.json: the checks, and each product's status per check (each product's results.json has the detail). */
async function writeChecklist(outDir: string, catalogue: readonly CatalogueEntry[]): Promise<void> {
  const checklist = { checks: CHECKS, products: catalogue.map((entry) => ({ product_id: entry.id, checks: Object.fromEntries(entry.checks.map((check) => [check.id, check.status])) })) };
  await mkdir(path.join(outDir, VERIFICATION_DIR), { recursive: true });
  await writeFile(path.join(outDir, VERIFICATION_DIR, CHECKLIST_JSON), `${JSON.stringify(checklist, null, 1)}\n`);
}
