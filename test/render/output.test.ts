import { afterAll, describe, expect, it } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import { mkdir, readdir, readFile, rename, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { recoverInterrupted, sideFolder, withStagedOutput } from '../../src/render/output.ts';
import { OUTPUT_MARKER } from '../../src/files.ts';
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

/** The id of a process that has ended (a killed build's). */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(child.stdout);
}

describe('what a killed build leaves', () => {
  async function previousBuild(): Promise<{ parent: string; out: string }> {
    const parent = await tempDir();
    dirs.push(parent);
    const out = path.join(parent, 'out');
    await withStagedOutput(out, async (stage) => writeFile(path.join(stage, 'index.html'), 'previous'));
    return { parent, out };
  }

  it('puts the previous output back when a build was killed between the two renames of the swap', async () => {
    const { parent, out } = await previousBuild();
    const pid = deadPid();
    // The state SIGKILL leaves after `out` is moved aside and before the new build is moved in.
    await rename(out, sideFolder('old', out, pid, 'mx1'));
    await mkdir(sideFolder('tmp', out, pid, 'mx1'));
    const said = recoverInterrupted(out);
    expect(said[0]).toMatch(/^restored .*out: a build was killed while swapping it/);
    expect(said[1]).toMatch(/^removed the folder a killed build left beside/);
    expect(await readFile(path.join(out, 'index.html'), 'utf8')).toBe('previous');
    expect(await readdir(parent)).toEqual(['out']);
  });

  it('removes only what it can prove is a dead build’s of this output on this machine', async () => {
    const { parent, out } = await previousBuild();
    const sleeper = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 60000)']);
    try {
      const dead = deadPid();
      const running = sideFolder('tmp', out, sleeper.pid!, 'mx2');
      const otherOutput = sideFolder('tmp', path.join(parent, 'other'), dead, 'mx2');
      const notOurs = sideFolder('old', out, dead, 'mx3');
      const otherMachine = path.join(parent, `.loopsheet-tmp-out-00000000-${dead}-mx2`);
      for (const dir of [running, otherOutput, notOurs, otherMachine, sideFolder('tmp', out, dead, 'mx4')]) await mkdir(dir);
      await mkdir(sideFolder('old', out, dead, 'mx5'));
      await writeFile(path.join(sideFolder('old', out, dead, 'mx5'), OUTPUT_MARKER), '');
      const said = recoverInterrupted(out);
      expect(said).toEqual([expect.stringMatching(/^removed 2 folders a killed build left beside/)]);
      // Kept: a running build's, another output's, a folder without the output marker, another machine's.
      expect((await readdir(parent)).sort()).toEqual([running, otherOutput, notOurs, otherMachine, out].map((dir) => path.basename(dir)).sort());
      expect(await readFile(path.join(out, 'index.html'), 'utf8')).toBe('previous');
    } finally {
      sleeper.kill();
    }
  });
});
