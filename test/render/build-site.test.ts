import { afterAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import { mkdir } from 'node:fs/promises';
import { loadProject } from '../../src/model/project.ts';
import { buildSite } from '../../src/render/build-site.ts';
import { DEMO, demoCopy, hashTree, removeDir, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

describe('rendering the catalogue in shards', () => {
  it('writes the same site, byte for byte, whatever the shard size and the number of worker processes', async () => {
    const { project, problems } = await loadProject(DEMO);
    const dir = await tempDir();
    dirs.push(dir);
    const trees = [];
    const runs = [
      { shardSize: 25, workers: 1 },
      { shardSize: 1, workers: 1 },
      { shardSize: 2, workers: 1 },
      { shardSize: 1, workers: 2 },
      { shardSize: 1, workers: 3 },
    ];
    for (const { shardSize, workers } of runs) {
      const out = path.join(dir, `shard-${shardSize}-${workers}`);
      await mkdir(out);
      const progress: number[] = [];
      const built = await buildSite(project!, problems, out, { inputs: [], pdfs: false, shardSize, workers, onProgress: (done) => progress.push(done) });
      expect(built.outcomes.map((outcome) => outcome.entry.id)).toEqual(['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22']);
      // Progress counts products, shard by shard, up to all of them.
      expect(progress.at(-1)).toBe(5);
      expect(progress).toHaveLength(Math.ceil(5 / shardSize));
      trees.push(await hashTree(out));
    }
    expect(Object.keys(trees[0]!)).toContain(path.join('KV-BR-40', 'audit.html'));
    for (const tree of trees.slice(1)) expect(tree).toEqual(trees[0]);
  });

  it('fails, naming the worker and why, when a worker cannot build its shards', async () => {
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    const { project, problems } = await loadProject(data);
    // The workers load the data folder again: gone by then, the build must fail, not write a partial site silently.
    await removeDir(data);
    const out = path.join(path.dirname(data), 'out');
    await mkdir(out);
    await expect(buildSite(project!, problems, out, { inputs: [], pdfs: false, shardSize: 1, workers: 2 })).rejects.toThrow(/shard worker \d of 2 failed: the data folder changed during the build/);
  });
});
