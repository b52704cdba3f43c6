import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { UsageError } from '../problems.ts';
import { TOOL_VERSION } from '../reference/tool.ts';
import type { ProductOutcome } from './build-site.ts';
import type { HashedFile } from './verification.ts';

/**
 * A catalogue split over N CI jobs (`build --shard K/N`): each product belongs to one shard
 * (`shardAssignment`: families kept together, the rest balanced by product count). A shard
 * build writes its products' folders, the input copies and this record; `loopsheet merge`
 * joins the shards into the site a single build writes.
 */
import { SHARD_RECORD } from '../files.ts';

export interface ShardSpec {
  /** 1-based. */
  k: number;
  n: number;
}

export function parseShard(text: string): ShardSpec {
  const match = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(text);
  const k = Number(match?.[1]);
  const n = Number(match?.[2]);
  if (!match || n < 1 || k < 1 || k > n) throw new UsageError(`--shard ${text}: expected K/N with 1 ≤ K ≤ N, e.g. 2/4`);
  return { k, n };
}

/**
 * The shard (1-based) of every product among n. A family's members go together (a product in
 * two families joins them), and the shards are balanced by product count: the groups, largest
 * first (ties: by their smallest product id), each go to the shard with the fewest products so
 * far (ties: the lowest K). The split depends only on the product ids and the families, not on
 * the order of rows, the machine or the run, so every job of a CI matrix computes the same one;
 * the largest shard has at most the largest group more products than the smallest.
 */
export function shardAssignment(productIds: readonly string[], families: ReadonlyArray<{ members: ReadonlyArray<{ productId: string }> }>, n: number): Map<string, number> {
  // Union-find over the families' members.
  const parent = new Map(productIds.map((id) => [id, id]));
  const root = (id: string): string => {
    let at = id;
    while (parent.get(at) !== at) at = parent.get(at)!;
    parent.set(id, at);
    return at;
  };
  for (const family of families) {
    const members = family.members.map((member) => member.productId).filter((id) => parent.has(id));
    for (const member of members.slice(1)) parent.set(root(member), root(members[0]!));
  }
  const groups = new Map<string, string[]>();
  for (const id of productIds) {
    const key = root(id);
    if (!groups.has(key)) groups.set(key, []);
    groups.get(key)!.push(id);
  }
  const byCode = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
  const ordered = [...groups.values()].map((ids) => ids.sort(byCode)).sort((a, b) => b.length - a.length || byCode(a[0]!, b[0]!));
  const counts = new Array<number>(n).fill(0);
  const shardOfProduct = new Map<string, number>();
  for (const ids of ordered) {
    const k = counts.indexOf(Math.min(...counts));
    counts[k]! += ids.length;
    for (const id of ids) shardOfProduct.set(id, k + 1);
  }
  return shardOfProduct;
}

export interface ShardRecord {
  format: 1;
  tool: string;
  shard: ShardSpec;
  pdfs: boolean;
  context: string;
  inputs: HashedFile[];
  outcomes: ProductOutcome[];
}

export async function writeShardRecord(outDir: string, record: Omit<ShardRecord, 'format' | 'tool'>): Promise<void> {
  await writeFile(path.join(outDir, SHARD_RECORD), `${JSON.stringify({ format: 1, tool: TOOL_VERSION, ...record })}\n`);
}

/**
 * Reads the records of the shard folders and checks that they belong together: same tool
 * version, same inputs, same N, each shard exactly once, all with PDFs or all without.
 */
export async function readShardRecords(dirs: readonly string[]): Promise<Array<ShardRecord & { dir: string }>> {
  const records: Array<ShardRecord & { dir: string }> = [];
  for (const dir of dirs) {
    let record: ShardRecord;
    try {
      record = JSON.parse(await readFile(path.join(dir, SHARD_RECORD), 'utf8')) as ShardRecord;
    } catch {
      throw new UsageError(`${dir}: no ${SHARD_RECORD}; expected the output of "loopsheet build --shard K/N"`);
    }
    records.push({ ...record, dir });
  }
  const first = records[0]!;
  const same = (what: string, get: (r: ShardRecord) => unknown) => {
    for (const r of records) if (JSON.stringify(get(r)) !== JSON.stringify(get(first))) throw new UsageError(`${r.dir} and ${first.dir} differ in ${what}; every shard must come from the same inputs and tool`);
  };
  same('tool version', (r) => r.tool);
  if (first.tool !== TOOL_VERSION) throw new UsageError(`${first.dir} was built by loopsheet ${first.tool}, this is ${TOOL_VERSION}`);
  same('inputs (SHA-256)', (r) => r.inputs);
  same('the number of shards', (r) => r.shard.n);
  same('whether PDFs were printed', (r) => r.pdfs);
  same('declaration settings', (r) => r.context);
  const seen = new Map<number, string>();
  for (const r of records) {
    if (seen.has(r.shard.k)) throw new UsageError(`${r.dir} and ${seen.get(r.shard.k)} are both shard ${r.shard.k}/${r.shard.n}`);
    seen.set(r.shard.k, r.dir);
  }
  const missing = Array.from({ length: first.shard.n }, (_, i) => i + 1).filter((k) => !seen.has(k));
  if (missing.length > 0) throw new UsageError(`shard${missing.length === 1 ? '' : 's'} ${missing.map((k) => `${k}/${first.shard.n}`).join(', ')} missing; merge needs every shard`);
  return records.sort((a, b) => a.shard.k - b.shard.k);
}
