import { copyFile, link, mkdir, readdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { Project } from '../model/types.ts';
import { TOOL_VERSION } from '../reference/tool.ts';
import type { CatalogueEntry } from '../report/site-view.ts';
import { physicalLines } from '../load/lines.ts';
import { contextChanges, type InputKey } from './input-key.ts';
import { suppliersReached } from '../model/supplier-datasets.ts';
import { inputTables } from '../model/reach.ts';

export { CACHE_FILE };
import { readCatalogueTexts, summaryProductId } from '../report/catalogue-results.ts';
import { RESULTS_FORMAT } from '../report/results.ts';
import { CACHE_FILE, MANIFEST_FILE, RESULTS_JSON, VERIFICATION_DIR } from '../files.ts';
import type { HashedFile } from './verification.ts';

/**
 * The build cache: per product, the key of its inputs (`productInputKey`) and its catalogue
 * row. Every build writes it beside the site (deterministically, so a clean and an
 * incremental build leave the same bytes); `build --changed` reads it back and keeps the
 * files of every product whose key is unchanged. The verification manifest leaves it out:
 * it describes the build, not the declarations.
 */
/** 2: catalogue entries carry their verification status (a cache of format 1 is not read: every product is built again). */
const CACHE_FORMAT = 2;

interface CacheFile {
  format: number;
  tool: string;
  context: string;
  products: Array<{ id: string; key: string; entry: CatalogueEntry }>;
}

export interface PreviousBuild {
  dir: string;
  context: string;
  products: Map<string, { key: string; entry: CatalogueEntry }>;
  /** Each product's results summary as JSON text, from the previous catalogue results.json. */
  summaries: Map<string, string>;
  /** The previous build's copies of its inputs, as lines (to say which rows changed). */
  inputs: Map<string, string[]>;
  /** The previous manifest's hashes of the outputs, by relative path. */
  hashes: Map<string, HashedFile>;
}

export async function writeBuildCache(outDir: string, context: string, outcomes: ReadonlyArray<{ entry: CatalogueEntry; key: string }>): Promise<void> {
  const cache: CacheFile = { format: CACHE_FORMAT, tool: TOOL_VERSION, context, products: outcomes.map((o) => ({ id: o.entry.id, key: o.key, entry: o.entry })) };
  await writeFile(path.join(outDir, CACHE_FILE), `${JSON.stringify(cache)}\n`);
}

const readJson = async <T>(file: string): Promise<T | undefined> => {
  try {
    return JSON.parse(await readFile(file, 'utf8')) as T;
  } catch {
    return undefined;
  }
};

/** The previous output's cache, results and input copies; undefined when there is no usable previous build (then every product is built). */
export async function readPreviousBuild(outDir: string): Promise<PreviousBuild | undefined> {
  const cache = await readJson<CacheFile>(path.join(outDir, CACHE_FILE));
  if (!cache || cache.format !== CACHE_FORMAT || cache.tool !== TOOL_VERSION) return undefined;
  const results = await readCatalogueTexts(path.join(outDir, RESULTS_JSON)).catch(() => undefined);
  if (!results?.products || results.format !== RESULTS_FORMAT) return undefined;
  const inputs = new Map<string, string[]>();
  const inputsDir = path.join(outDir, VERIFICATION_DIR, 'inputs');
  // The CSV and JSON inputs, by line (a supplier dataset, in a folder of its own, counts by its checksum in the input key).
  for (const entry of await readdir(inputsDir, { withFileTypes: true }).catch(() => [])) {
    if (entry.isFile()) inputs.set(entry.name, physicalLines({ text: await readFile(path.join(inputsDir, entry.name), 'utf8') }));
  }
  const manifest = await readJson<{ outputs: HashedFile[] }>(path.join(outDir, VERIFICATION_DIR, MANIFEST_FILE));
  return {
    dir: outDir,
    context: cache.context,
    products: new Map(cache.products.map((p) => [p.id, { key: p.key, entry: p.entry }])),
    summaries: new Map(results.products.map((text) => [summaryProductId(text), text])),
    inputs,
    hashes: new Map((manifest?.outputs ?? []).map((output) => [output.file, output])),
  };
}

/**
 * Keeps a product's files from the previous build: hard links where the file system allows
 * (no bytes copied, and the previous output stays untouched until the swap), copies
 * otherwise. False when the previous build has no files for it.
 */
export async function keepProduct(previousDir: string, outDir: string, productId: string): Promise<boolean> {
  const from = path.join(previousDir, productId);
  const entries = await readdir(from, { withFileTypes: true }).catch(() => undefined);
  if (!entries || entries.length === 0) return false;
  const to = path.join(outDir, productId);
  await mkdir(to, { recursive: true });
  for (const entry of entries) {
    if (!entry.isFile()) continue;
    const source = path.join(from, entry.name);
    const target = path.join(to, entry.name);
    await link(source, target).catch(() => copyFile(source, target));
  }
  return true;
}

/** Why a product is built again: what differs from the previous build, in a reader's words. */
export function changeReasons(project: Project, previous: PreviousBuild, productId: string, input: InputKey, context: string): string[] {
  const cached = previous.products.get(productId);
  if (!cached) return ['not in the previous build'];
  if (!previous.summaries.has(productId)) return ['no results in the previous build'];
  if (previous.context !== context) return contextChanges(previous.context, context);
  if (cached.key === input.key) return ['its files were missing from the previous build'];
  const reasons: string[] = [];
  const tables = inputTables(project);
  for (const [file, lines] of input.rows) {
    const table = tables.get(file);
    if (!table) continue;
    const now = physicalLines(table.csv);
    const before = previous.inputs.get(file);
    for (const line of lines) if (now[line - 1] !== before?.[line - 1]) reasons.push(`${file} line ${line}`);
  }
  if (reasons.length === 0) {
    const datasets = suppliersReached(project, new Map([...input.rows].map(([file, lines]) => [file, new Set(lines)])));
    return [datasets.length ? `a supplier dataset it reads (${datasets.map((s) => s.file).join(', ')}) changed, or an input row moved or a header changed` : 'an input row moved or a header changed'];
  }
  return reasons;
}

/** The previous manifest's hashes of the kept products' files (the same bytes: hard links or copies of them). */
export function keptHashes(previous: PreviousBuild | undefined, kept: readonly string[]): Map<string, HashedFile> {
  const known = new Map<string, HashedFile>();
  if (!previous) return known;
  const ids = new Set(kept);
  for (const [file, hashed] of previous.hashes) if (ids.has(file.slice(0, file.indexOf('/')))) known.set(file, hashed);
  return known;
}
