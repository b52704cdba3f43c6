import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFile } from 'node:child_process';
import { cp, mkdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { promisify } from 'node:util';
import { DEMO, hashTree, removeDir, ROOT, runCli, tempDir } from '../helpers.ts';

/**
 * loopsheet installed the way users install a command-line tool: `npm pack` makes the
 * tarball, and a data repository installs it as a devDependency (or `npm install -g`), with no
 * checkout in sight. npm comes from the cache that `npm ci` filled; install scripts are off
 * (nothing downloads a browser).
 */
const run = promisify(execFile);
const npm = (args: string[], cwd: string) => run('npm', [...args, '--no-audit', '--no-fund', '--ignore-scripts', '--prefer-offline'], { cwd, env: { ...process.env, npm_config_update_notifier: 'false' }, maxBuffer: 1 << 24 });

let dir = '';
let tarball = '';
beforeAll(async () => {
  dir = await tempDir();
  const { stdout } = await run('npm', ['pack', '--pack-destination', dir, '--ignore-scripts'], { cwd: ROOT });
  tarball = path.join(dir, stdout.trim().split('\n').at(-1)!);
}, 60_000);
afterAll(() => removeDir(dir));

describe('the packed tarball', () => {
  it('holds what the command runs on, and not the tests, the demo or the benchmarks', async () => {
    const { stdout } = await run('tar', ['-tzf', tarball]);
    const files = stdout.split('\n').filter(Boolean);
    for (const needed of ['package/bin/loopsheet.js', 'package/src/cli/main.ts', 'package/templates/product.njk', 'package/.eleventy.js', 'package/reference-data/ilcd-epd/identifiers/EN15804+A2_EF3.1_indicators.csv', 'package/README.md']) expect(files).toContain(needed);
    expect(files.filter((file) => /^package\/(test|scripts|data|out)\//.test(file))).toEqual([]);
  });

  it('installs into a data repository as a devDependency; npx loopsheet runs init, check and build there', async () => {
    const repo = path.join(dir, 'repo');
    await mkdir(repo);
    await writeFile(path.join(repo, 'package.json'), '{ "name": "my-declarations", "private": true }\n');
    await npm(['install', '--save-dev', tarball], repo);
    const npx = (args: string[]) => run('npx', ['--no-install', 'loopsheet', ...args], { cwd: repo }).catch((error: { code: number; stdout: string; stderr: string }) => error);
    const init = await npx(['init', 'mine']);
    expect(init.stdout).toMatch(/^initialised mine: wrote products\.csv/);
    // A fresh project has empty files: check runs and reports them (exit 1), nothing crashes.
    const check = (await npx(['check', '--data', 'mine'])) as { code?: number; stderr: string };
    expect(check.code).toBe(1);
    expect(check.stderr).toMatch(/mine\/products\.csv:3: products\.csv has a header but no rows; expected at least one row \[NO_ROWS\]/);
    await cp(DEMO, path.join(repo, 'demo'), { recursive: true });
    const build = await npx(['build', '--data', 'demo', '--out', 'site', '--no-pdf']);
    expect(build.stdout).toMatch(/^built 5 products into site/);
    // The same site as a build from the checkout.
    const fromCheckout = path.join(dir, 'checkout-site');
    expect((await runCli(['build', '--data', DEMO, '--out', fromCheckout, '--no-pdf'])).code).toBe(0);
    expect(await hashTree(path.join(repo, 'site'))).toEqual(await hashTree(fromCheckout));
  }, 60_000);

  it('installs globally (npm install -g, here into a prefix of its own) as the loopsheet command', async () => {
    const prefix = path.join(dir, 'global');
    await npm(['install', '--global', '--prefix', prefix, tarball], dir);
    const bin = path.join(prefix, 'bin', 'loopsheet');
    const version = await run(bin, ['--version']);
    expect(version.stdout.trim()).toBe(JSON.parse(await readFile(path.join(ROOT, 'package.json'), 'utf8')).version);
    const check = await run(bin, ['check', '--data', DEMO], { cwd: dir });
    expect(check.stderr).toMatch(/0 errors/);
  }, 60_000);
});
