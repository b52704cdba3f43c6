import { mkdir, readdir, rename, rm, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { UsageError } from '../problems.ts';

/** Marks a folder as loopsheet output, so a build only ever replaces its own output. */
export const OUTPUT_MARKER = '.loopsheet-output';

/** The build cache (src/render/incremental.ts): per product, the key of its inputs. */

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
 * Builds into a staging folder beside the output and swaps it in only when the whole
 * build succeeded; on any failure the previous output stays exactly as it was.
 */
export async function withStagedOutput<T>(outDir: string, build: (stagingDir: string) => Promise<T>): Promise<T> {
  const out = path.resolve(outDir);
  const parent = path.dirname(out);
  await mkdir(parent, { recursive: true });
  const stamp = `${process.pid}-${Date.now().toString(36)}`;
  const staging = path.join(parent, `.loopsheet-tmp-${path.basename(out)}-${stamp}`);
  const previous = path.join(parent, `.loopsheet-old-${path.basename(out)}-${stamp}`);
  await mkdir(staging, { recursive: true });
  let result: T;
  try {
    result = await build(staging);
    await writeFile(path.join(staging, OUTPUT_MARKER), 'This folder is written by loopsheet build and replaced whole on the next build.\n');
  } catch (error) {
    await rm(staging, { recursive: true, force: true });
    throw error;
  }
  const hadPrevious = await exists(out);
  if (hadPrevious) await rename(out, previous);
  try {
    await rename(staging, out);
  } catch (error) {
    if (hadPrevious) await rename(previous, out);
    await rm(staging, { recursive: true, force: true });
    throw error;
  }
  if (hadPrevious) await rm(previous, { recursive: true, force: true });
  return result;
}
