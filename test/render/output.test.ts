import { afterAll, describe, expect, it } from 'vitest';
import { mkdir, readdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { OUTPUT_MARKER, withStagedOutput } from '../../src/render/output.ts';
import { hashTree, removeDir, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

describe('staged output', () => {
  it('keeps the previous output byte-identical when the build throws half-way, and leaves no staging folder', async () => {
    const parent = await tempDir();
    dirs.push(parent);
    const out = path.join(parent, 'out');
    await withStagedOutput(out, async (stage) => {
      await mkdir(path.join(stage, 'P1'));
      await writeFile(path.join(stage, 'P1', 'index.html'), 'first');
    });
    const before = await hashTree(out);
    await expect(
      withStagedOutput(out, async (stage) => {
        await writeFile(path.join(stage, 'index.html'), 'second, half written');
        throw new Error('renderer crashed');
      }),
    ).rejects.toThrow('renderer crashed');
    expect(await hashTree(out)).toEqual(before);
    expect(await readdir(parent)).toEqual(['out']);
  });

  it('replaces the output whole on success and marks it as loopsheet output', async () => {
    const parent = await tempDir();
    dirs.push(parent);
    const out = path.join(parent, 'out');
    await withStagedOutput(out, async (stage) => writeFile(path.join(stage, 'old.html'), 'old'));
    await withStagedOutput(out, async (stage) => writeFile(path.join(stage, 'new.html'), 'new'));
    expect((await readdir(out)).sort()).toEqual([OUTPUT_MARKER, 'new.html']);
    expect(await readdir(parent)).toEqual(['out']);
  });
});
