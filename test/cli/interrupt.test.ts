import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { readdirSync, readFileSync } from 'node:fs';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { findBrowser } from '../../src/render/browser.ts';
import { BIN, DEMO, hashTree, missingTool, removeDir, ROOT, runCli, tempDir } from '../helpers.ts';

/**
 * A build stopped from outside: by SIGTERM (a CI runner cancelling a job), by Ctrl-C (SIGINT
 * to the process group), by SIGKILL of the command, and by SIGKILL of its process group. The
 * build is stopped while it prints PDFs, when the browser and its helpers are running.
 */
const found = await findBrowser();
const skip = missingTool('Chromium or Chrome (PUPPETEER_EXECUTABLE_PATH, PATH or the puppeteer cache)', found !== undefined, 'apt-get install chromium, as .ci/run does.');

let dir = '';
let out = '';
let previous: Record<string, string> = {};
beforeAll(async () => {
  dir = await tempDir();
  out = path.join(dir, 'out');
  const first = await runCli(['build', '--data', DEMO, '--out', out, '--no-pdf']);
  expect(first.code, first.stderr).toBe(0);
  previous = await hashTree(out);
});
afterAll(() => removeDir(dir));

interface Running {
  child: ChildProcess;
  stderr: () => string;
  exit: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

/** Starts `loopsheet build` with PDFs in a process group of its own and waits until it prints them. */
async function buildUntilPdf(): Promise<Running> {
  const child = spawn(process.execPath, [BIN, 'build', '--data', DEMO, '--out', out], { cwd: ROOT, detached: true, stdio: ['ignore', 'ignore', 'pipe'], env: { ...process.env, CI: 'true' } });
  let stderr = '';
  child.stderr!.on('data', (chunk) => (stderr += chunk));
  const exit = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('exit', (code, signal) => resolve({ code, signal })));
  const started = Date.now();
  while (!stderr.includes('PDF: using')) {
    if (Date.now() - started > 40_000) throw new Error(`the build never reached its PDFs:\n${stderr}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  // Wait until the browser has started a renderer (under load that takes a while): then every kind of process is running.
  while (!descendants(child.pid!).some((pid) => commandLine(pid).includes('--type=renderer'))) {
    if (Date.now() - started > 40_000) throw new Error(`the browser never started a renderer:\n${stderr}`);
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  running.push(child);
  return { child, stderr: () => stderr, exit };
}

/** Builds still running when a test ends (it failed half-way) are killed, so that they cannot swap in a new output under the next test. */
const running: ChildProcess[] = [];
afterEach(() => {
  for (const child of running.splice(0)) {
    try {
      process.kill(-child.pid!, 'SIGKILL');
    } catch {
      // Already gone.
    }
  }
});

function commandLine(pid: number): string {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').replaceAll('\0', ' ');
  } catch {
    return '';
  }
}

/** Every process descended from `pid`, read from /proc (Linux). */
function descendants(pid: number): number[] {
  const parentOf = new Map<number, number>();
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      // The parent id is the 4th field, after the command name in parentheses.
      const stat = readFileSync(`/proc/${name}/stat`, 'utf8');
      parentOf.set(Number(name), Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]));
    } catch {
      // The process ended while we looked.
    }
  }
  const found: number[] = [];
  const walk = (parent: number) => {
    for (const [child, of] of parentOf) if (of === parent) found.push(child), walk(child);
  };
  walk(pid);
  return found;
}

const isAlive = (pid: number) => {
  try {
    // A zombie has ended; it only waits for its parent to read its status.
    return !/^\d+ \(.*\) Z/.test(readFileSync(`/proc/${pid}/stat`, 'utf8'));
  } catch {
    return false;
  }
};

async function allGone(pids: number[], withinMs: number): Promise<number[]> {
  const until = Date.now() + withinMs;
  let alive = pids.filter(isAlive);
  while (alive.length > 0 && Date.now() < until) {
    await new Promise((resolve) => setTimeout(resolve, 100));
    alive = alive.filter(isAlive);
  }
  return alive;
}

const sideFolders = async () => (await readdir(dir)).filter((name) => name.startsWith('.loopsheet-'));

/** What every stop must leave: none of the build's processes, no side folder, the previous output as it was. */
async function expectCleanStop(tree: number[]): Promise<void> {
  expect(await allGone(tree, 10_000)).toEqual([]);
  expect(await sideFolders()).toEqual([]);
  expect(await hashTree(out)).toEqual(previous);
}

// Exit codes: 128 + the signal's number, as POSIX shells report a process a signal ended (common practice); SIGINT 2, SIGTERM 15 (POSIX signal.h).

describe.skipIf(skip)('a build stopped from outside', () => {
  it('SIGTERM: says it was interrupted, exits 143 (128 + 15), leaves the previous output and no staging folder, and no browser', async () => {
    const build = await buildUntilPdf();
    const tree = descendants(build.child.pid!);
    expect(tree.length).toBeGreaterThan(3);
    build.child.kill('SIGTERM');
    expect(await build.exit).toEqual({ code: 143, signal: null });
    expect(build.stderr()).toMatch(/loopsheet build: interrupted \(SIGTERM\)\n {2}removed the unfinished build; .*out is as it was/);
    await expectCleanStop(tree);
  }, 60_000);

  it('Ctrl-C (SIGINT to the process group): exits 130 (128 + 2), once, the same way', async () => {
    const build = await buildUntilPdf();
    const tree = descendants(build.child.pid!);
    process.kill(-build.child.pid!, 'SIGINT');
    expect(await build.exit).toEqual({ code: 130, signal: null });
    expect(build.stderr().match(/interrupted/g)).toHaveLength(1);
    await expectCleanStop(tree);
  }, 60_000);

  it('SIGKILL of the command: the process it started stops too and cleans up; nothing swaps in later', async () => {
    const build = await buildUntilPdf();
    const tree = descendants(build.child.pid!);
    build.child.kill('SIGKILL');
    expect(await build.exit).toEqual({ code: null, signal: 'SIGKILL' });
    // The child says so once it has noticed, after the launcher's exit: its processes are gone first.
    await expectCleanStop(tree);
    expect(build.stderr()).toMatch(/interrupted \(the loopsheet process that started it has gone\)/);
  }, 60_000);

  it('SIGKILL of the process group: the browser quits with it, and the next build removes the staging folder left', async () => {
    const build = await buildUntilPdf();
    const tree = descendants(build.child.pid!);
    process.kill(-build.child.pid!, 'SIGKILL');
    await build.exit;
    // The browser is in a group of its own; it quits when its pipe to the killed build closes.
    expect(await allGone(tree, 10_000)).toEqual([]);
    expect(await hashTree(out)).toEqual(previous);
    const left = await sideFolders();
    expect(left).toHaveLength(1);
    const next = await runCli(['build', '--data', DEMO, '--out', out, '--no-pdf']);
    expect(next.code, next.stderr).toBe(0);
    expect(next.stderr).toContain(`removed the folder a killed build left beside ${out}: ${left[0]}`);
    expect(await sideFolders()).toEqual([]);
  }, 60_000);
});
