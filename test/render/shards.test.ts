import { afterAll, describe, expect, it } from 'vitest';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { parseShard, shardAssignment } from '../../src/render/shards.ts';
import { DEMO, hashTree, removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

describe('--shard K/N and merge', () => {
  it('keeps a family in one shard and balances the rest by product count, whatever the order of rows', () => {
    const ids = Array.from({ length: 103 }, (_, p) => `P${String(p).padStart(4, '0')}`);
    // Two families of 20 and 7 joined by a product in both (27 together), and a family of 5.
    const family = (from: number, count: number) => ({ members: ids.slice(from, from + count).map((productId) => ({ productId })) });
    const families = [family(0, 20), family(20, 7), { members: [{ productId: 'P0019' }, { productId: 'P0020' }] }, family(40, 5)];
    for (const order of [ids, [...ids].reverse()]) {
      const split = shardAssignment(order, families, 4);
      expect(split.size).toBe(103);
      // Together: the joined group (P0000–P0026) and the family of 5.
      expect(new Set(ids.slice(0, 27).map((id) => split.get(id))).size).toBe(1);
      expect(new Set(ids.slice(40, 45).map((id) => split.get(id))).size).toBe(1);
      const counts = [1, 2, 3, 4].map((k) => [...split.values()].filter((s) => s === k).length);
      // Largest group first, each to the emptiest shard (Graham's LPT rule): 27 | 5 | 0 | 0, then the 71 singles
      // fill the emptiest: 27 | 25 | 25 | 26 (worked by hand). No shard exceeds the smallest by more than the largest group.
      expect(counts.sort((a, b) => a - b)).toEqual([25, 25, 26, 27]);
      expect(shardAssignment(order, families, 4)).toEqual(split);
    }
    // The same split from either order.
    expect([...shardAssignment([...ids].reverse(), families, 4)].sort()).toEqual([...shardAssignment(ids, families, 4)].sort());
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
