import { afterAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import { mkdir } from 'node:fs/promises';
import { loadProject } from '../../src/model/project.ts';
import { buildSite } from '../../src/render/build-site.ts';
import { DEMO, hashTree, removeDir, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

describe('rendering the catalogue in shards', () => {
  it('writes the same site, byte for byte, whatever the shard size', async () => {
    const { project, problems } = await loadProject(DEMO);
    const dir = await tempDir();
    dirs.push(dir);
    const trees = [];
    for (const shardSize of [1, 2, 25]) {
      const out = path.join(dir, `shard-${shardSize}`);
      await mkdir(out);
      const progress: number[] = [];
      const catalogue = await buildSite(project!, problems, out, { inputs: [], pdfs: false, shardSize, onShard: (done) => progress.push(done) });
      expect(catalogue.map((entry) => entry.id)).toEqual(['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40']);
      expect(progress).toEqual(shardSize === 1 ? [1, 2, 3] : shardSize === 2 ? [2, 3] : [3]);
      trees.push(await hashTree(out));
    }
    expect(Object.keys(trees[0]!)).toContain(path.join('KV-BR-40', 'audit.html'));
    expect(trees[1]).toEqual(trees[0]);
    expect(trees[2]).toEqual(trees[0]);
  });
});
