import { createHash } from 'node:crypto';
import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { UsageError } from '../problems.ts';
import { TOOL_VERSION } from '../reference/tool.ts';
import type { ProductOutcome } from './build-site.ts';
import type { HashedFile } from './verification.ts';

/**
 * A catalogue split over N CI jobs (`build --shard K/N`): each product belongs to one shard
 * by a stable hash of its product_id, so the split does not depend on the order of rows,
 * the machine or the run. A shard build writes its products' folders, the input copies and
 * this record; `loopsheet merge` joins the shards into the site a single build writes.
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

/** The shard (1-based) a product belongs to among n: the first 48 bits of SHA-256 of its id, modulo n. */
export function shardOf(productId: string, n: number): number {
  const head = createHash('sha256').update(productId, 'utf8').digest().readUIntBE(0, 6);
  return (head % n) + 1;
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
