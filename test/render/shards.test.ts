import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { parseShard, shardOf } from '../../src/render/shards.ts';
import { DEMO, hashTree, removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

describe('--shard K/N and merge', () => {
  it('puts each product in one shard by a stable hash of its id', () => {
    // Independent of the implementation: SHA-256 (node:crypto) of the id, first six bytes big-endian, modulo N, plus one.
    const expected = (id: string, n: number) => (Number(BigInt(`0x${createHash('sha256').update(id).digest('hex').slice(0, 12)}`) % BigInt(n)) + 1);
    for (const id of ['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40', 'P000123', 'Ünïcode-id']) for (const n of [1, 2, 3, 7]) expect(shardOf(id, n)).toBe(expected(id, n));
    const counts = [0, 0, 0, 0];
    for (let p = 0; p < 4000; p++) counts[shardOf(`P${String(p).padStart(6, '0')}`, 4) - 1]! += 1;
    // A uniform hash spreads 4 000 ids over 4 shards within a few standard deviations (√(4000·¼·¾) ≈ 27) of 1 000.
    for (const count of counts) expect(Math.abs(count - 1000)).toBeLessThan(120);
    expect(parseShard('2/4')).toEqual({ k: 2, n: 4 });
    for (const bad of ['0/3', '4/3', '1/0', 'two/three', '1']) expect(() => parseShard(bad)).toThrow(/expected K\/N/);
  });

  it('merges the shards of a CI matrix into the site a single build writes, byte for byte', async () => {
    const work = await tempDir();
    dirs.push(work);
    const single = path.join(work, 'single');
    expect((await runCli(['build', '--data', DEMO, '--out', single, '--no-pdf'])).code).toBe(0);
    const shardDirs: string[] = [];
    let products = 0;
    for (const k of [1, 2, 3]) {
      const dir = path.join(work, `shard-${k}`);
      const result = await runCli(['build', '--data', DEMO, '--out', dir, '--no-pdf', '--shard', `${k}/3`]);
      expect(result.code, result.stderr).toBe(0);
      products += (await readdir(dir)).filter((name) => name.startsWith('KV-')).length;
      shardDirs.push(dir);
    }
    expect(products).toBe(5);
    // Merged in any order of arguments.
    const merged = path.join(work, 'merged');
    const merge = await runCli(['merge', shardDirs[2]!, shardDirs[0]!, shardDirs[1]!, '--out', merged]);
    expect(merge.code, merge.stderr).toBe(0);
    expect(merge.stdout).toContain('merged 3 shards (5 products)');
    expect(await hashTree(merged)).toEqual(await hashTree(single));

    const missing = await runCli(['merge', shardDirs[0]!, shardDirs[1]!, '--out', path.join(work, 'partial')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('shard 3/3 missing');
    const twice = await runCli(['merge', shardDirs[0]!, shardDirs[0]!, shardDirs[1]!, '--out', path.join(work, 'twice')]);
    expect(twice.stderr).toContain('are both shard 1/3');
    const notShard = await runCli(['merge', single, '--out', path.join(work, 'x')]);
    expect(notShard.stderr).toContain('no loopsheet-shard.json');
  });
});
