import { spawn, spawnSync } from 'node:child_process';
import { cp, mkdtemp, readFile, writeFile, rm, readdir } from 'node:fs/promises';
import { createHash } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(fileURLToPath(new URL('..', import.meta.url)));
export const DEMO = path.join(ROOT, 'data');
export const BIN = path.join(ROOT, 'bin', 'loopsheet.js');

export async function tempDir(prefix = 'loopsheet-test-'): Promise<string> {
  return mkdtemp(path.join(os.tmpdir(), prefix));
}

/** A fresh copy of the demo project to break. */
export async function demoCopy(): Promise<string> {
  const dir = path.join(await tempDir(), 'data');
  await cp(DEMO, dir, { recursive: true });
  return dir;
}

/** A copy of the demo without its process.csv, its materials back on factors.csv rows (for tests that write their own). */
export async function demoWithoutProcesses(): Promise<string> {
  const dir = await demoCopy();
  await rm(path.join(dir, 'process.csv'));
  const materials = path.join(dir, 'materials.csv');
  await writeFile(materials, (await readFile(materials, 'utf8')).replace('process:glenmoor-potline', 'al-primary-ingot').replace('process:redcliff-tankhouse', 'cu-cathode-primary'));
  return dir;
}

/** Rewrites one physical line (1-based) of a file; fails loudly if the text to replace is not there. */
export async function editLine(file: string, line: number, from: string, to: string): Promise<void> {
  const text = await readFile(file, 'utf8');
  const lines = text.split('\n');
  const current = lines[line - 1];
  if (current === undefined || !current.includes(from)) throw new Error(`${path.basename(file)}:${line} has no "${from}": ${current}`);
  lines[line - 1] = current.replace(from, to);
  await writeFile(file, lines.join('\n'));
}

export async function editFile(file: string, edit: (text: string) => string): Promise<void> {
  const text = await readFile(file, 'utf8');
  const edited = edit(text);
  if (edited === text) throw new Error(`edit of ${path.basename(file)} changed nothing`);
  await writeFile(file, edited);
}

export interface CliResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Runs the real loopsheet binary, as a user or CI would. */
export function runCli(args: string[], options: { cwd?: string; env?: NodeJS.ProcessEnv } = {}): Promise<CliResult> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [BIN, ...args], {
      cwd: options.cwd ?? ROOT,
      env: { ...process.env, ...options.env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (chunk) => (stdout += chunk));
    child.stderr.on('data', (chunk) => (stderr += chunk));
    child.on('error', reject);
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

/** Builds a data folder (the demo by default) into a fresh output folder, as a user would; `dir` is for cleanup. */
export async function buildFresh(data = DEMO, extra: string[] = ['--no-pdf']): Promise<{ dir: string; out: string; result: CliResult }> {
  const dir = await tempDir();
  const out = path.join(dir, 'out');
  return { dir, out, result: await runCli(['build', '--data', data, '--out', out, ...extra]) };
}

/** SHA-256 of every file under a folder, by relative path. */
export async function hashTree(dir: string): Promise<Record<string, string>> {
  const result: Record<string, string> = {};
  const walk = async (current: string) => {
    for (const entry of await readdir(current, { withFileTypes: true })) {
      const full = path.join(current, entry.name);
      if (entry.isDirectory()) await walk(full);
      else result[path.relative(dir, full)] = createHash('sha256').update(await readFile(full)).digest('hex');
    }
  };
  await walk(dir);
  return result;
}

export const removeDir = (dir: string) => rm(dir, { recursive: true, force: true });

/**
 * Whether a test that needs a tool this machine lacks should be skipped: locally it is, with
 * a message naming the tool; in CI (CI=true) nothing skips, so a missing tool fails the run
 * (.ci/run installs every tool the tests use).
 */
export function missingTool(tool: string, present: boolean, install: string): boolean {
  if (present) return false;
  if (process.env.CI === 'true') throw new Error(`${tool} is required in CI and was not found: ${install}`);
  console.warn(`\n*** SKIPPING tests that need ${tool}: not found. ${install} ***\n`);
  return true;
}

/** Whether a command runs here (`pdftotext -v`, …). */
export function hasCommand(command: string, args: string[] = ['-v']): boolean {
  return spawnSync(command, args, { stdio: 'ignore' }).error === undefined;
}

/**
 * A result in the notation declarations print (1.35E+00: mantissa, E, sign, at least two exponent
 * digits), made here from ECMA-262 Number.prototype.toExponential, independently of src/format.ts.
 */
export function declaredNotation(value: number, significant = 3): string {
  const [mantissa, exponent] = value.toExponential(significant - 1).split('e');
  return `${mantissa}E${exponent![0]}${exponent!.slice(1).padStart(2, '0')}`;
}
