import { createHash } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, renameSync, rmSync } from 'node:fs';
import { mkdir, readdir, rm, stat, writeFile } from 'node:fs/promises';
import { hostname } from 'node:os';
import path from 'node:path';
import { OUTPUT_MARKER } from '../files.ts';
import { UsageError } from '../problems.ts';
import { onInterrupt } from './cleanup.ts';

async function exists(file: string): Promise<boolean> {
  try {
    await stat(file);
    return true;
  } catch {
    return false;
  }
}

/**
 * Refuses output folders that would destroy something: the data folder itself, a parent
 * of it, or a non-empty folder that loopsheet did not write.
 */
export async function checkOutputDir(outDir: string, dataDir: string): Promise<void> {
  const out = path.resolve(outDir);
  const data = path.resolve(dataDir);
  if (out === data || data.startsWith(out + path.sep)) {
    throw new UsageError(`--out ${outDir} would replace the data folder ${dataDir}; choose another output folder`);
  }
  if (out === path.parse(out).root) throw new UsageError(`--out ${outDir} is a file-system root`);
  if (!(await exists(out))) return;
  const info = await stat(out);
  if (!info.isDirectory()) throw new UsageError(`--out ${outDir} is a file, not a folder`);
  const entries = await readdir(out);
  if (entries.length > 0 && !entries.includes(OUTPUT_MARKER)) {
    throw new UsageError(`--out ${outDir} has files that loopsheet did not write (no ${OUTPUT_MARKER}); choose an empty or new folder`);
  }
}

/**
 * The folders a build keeps beside the output while it runs: `tmp` is the build being
 * written, `old` the previous output moved aside for the swap. Their names say whose they
 * are (this machine, by a hash of its name, and the process id), so that a later build can
 * prove which leftovers of a killed build are its own to remove or restore.
 * `sideFolder` is exported for the tests that play a killed build.
 */
const HOST = createHash('sha256').update(hostname()).digest('hex').slice(0, 8);

export function sideFolder(kind: 'tmp' | 'old', out: string, pid: number, stamp: string): string {
  return path.join(path.dirname(out), `.loopsheet-${kind}-${path.basename(out)}-${HOST}-${pid}-${stamp}`);
}

interface Leftover {
  kind: 'tmp' | 'old';
  dir: string;
  stamp: number;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch (error) {
    // EPERM: a process of another user has that id; it is alive.
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
  // A killed process stays a zombie until its new parent collects it: it has ended (Linux's /proc says so).
  try {
    return !/^\d+ \(.*\) Z/s.test(readFileSync(`/proc/${pid}/stat`, 'utf8'));
  } catch {
    return true;
  }
}

/** Side folders of this output left by builds on this machine whose process has gone. */
function leftoversOf(out: string): Leftover[] {
  const base = path.basename(out).replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const pattern = new RegExp(`^\\.loopsheet-(tmp|old)-${base}-${HOST}-(\\d+)-([0-9a-z]+)$`);
  let names: string[];
  try {
    names = readdirSync(path.dirname(out));
  } catch {
    return [];
  }
  return names.flatMap((name) => {
    const match = pattern.exec(name);
    if (!match || Number(match[2]) === process.pid || alive(Number(match[2]))) return [];
    const dir = path.join(path.dirname(out), name);
    // A moved-aside output is loopsheet's only if it carries the output marker.
    if (match[1] === 'old' && !existsSync(path.join(dir, OUTPUT_MARKER))) return [];
    return [{ kind: match[1] as 'tmp' | 'old', dir, stamp: parseInt(match[3]!, 36) }];
  });
}

/**
 * Puts right what a killed build left: when the output folder is missing because a build was
 * killed between moving it aside and moving its successor in, the previous output goes back;
 * every other leftover of a dead build of this output on this machine is removed. Returns
 * what it did, in words.
 */
export function recoverInterrupted(outDir: string): string[] {
  const out = path.resolve(outDir);
  const leftovers = leftoversOf(out);
  const said: string[] = [];
  if (!existsSync(out)) {
    const newest = leftovers.filter((l) => l.kind === 'old').sort((a, b) => b.stamp - a.stamp)[0];
    if (newest) {
      renameSync(newest.dir, out);
      leftovers.splice(leftovers.indexOf(newest), 1);
      said.push(`restored ${outDir}: a build was killed while swapping it (the previous output was in ${path.basename(newest.dir)})`);
    }
  }
  for (const leftover of leftovers) rmSync(leftover.dir, { recursive: true, force: true });
  if (leftovers.length > 0) said.push(`removed ${leftovers.length === 1 ? 'the folder' : `${leftovers.length} folders`} a killed build left beside ${outDir}: ${leftovers.map((l) => path.basename(l.dir)).join(', ')}`);
  return said;
}

/**
 * Builds into a staging folder beside the output and swaps it in only when the whole
 * build succeeded; on any failure, or an interruption, the previous output stays exactly as
 * it was. The swap is two renames with nothing in between that a signal handler could
 * interrupt; a process killed outright between them leaves the previous output aside, where
 * the next build's `recoverInterrupted` finds it.
 */
export async function withStagedOutput<T>(outDir: string, build: (stagingDir: string) => Promise<T>): Promise<T> {
  const out = path.resolve(outDir);
  await mkdir(path.dirname(out), { recursive: true });
  const stamp = Date.now().toString(36);
  const staging = sideFolder('tmp', out, process.pid, stamp);
  const previous = sideFolder('old', out, process.pid, stamp);
  await mkdir(staging, { recursive: true });
  const forget = onInterrupt(() => {
    rmSync(staging, { recursive: true, force: true });
    return `removed the unfinished build; ${outDir} is as it was`;
  });
  let result: T;
  try {
    result = await build(staging);
    await writeFile(path.join(staging, OUTPUT_MARKER), 'This folder is written by loopsheet build and replaced whole on the next build.\n');
  } catch (error) {
    forget();
    await rm(staging, { recursive: true, force: true });
    throw error;
  }
  forget();
  const hadPrevious = existsSync(out);
  try {
    if (hadPrevious) renameSync(out, previous);
    renameSync(staging, out);
  } catch (error) {
    if (hadPrevious && !existsSync(out)) renameSync(previous, out);
    await rm(staging, { recursive: true, force: true });
    throw error;
  }
  if (hadPrevious) {
    const forgetPrevious = onInterrupt(() => {
      rmSync(previous, { recursive: true, force: true });
      return `the new build is in ${outDir}`;
    });
    await rm(previous, { recursive: true, force: true });
    forgetPrevious();
  }
  return result;
}
