import { afterAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { createServer, type AddressInfo } from 'node:net';
import path from 'node:path';
import type { Browser, Page } from 'puppeteer';
import { CHROMIUM_ARGS, findBrowser } from '../../src/render/browser.ts';
import { BIN, declaredNotation, DEMO, demoCopy, editLine, missingTool, removeDir, ROOT, runCli } from '../helpers.ts';

/**
 * The live preview as a practitioner uses it: `loopsheet serve` on a copy of the demo, the
 * declaration open in a real Chromium, and the data edited in place: the figure on the open
 * page changes, a broken cell turns the page into the list of problems, the fix brings the
 * results back — each time without touching the browser.
 */
const found = await findBrowser();
const skip = missingTool('Chromium or Chrome (PUPPETEER_EXECUTABLE_PATH, PATH or the puppeteer cache)', found !== undefined, 'apt-get install chromium, as .ci/run does.');

let server: ChildProcess | undefined;
let browser: Browser | undefined;
const dirs: string[] = [];
afterAll(async () => {
  await browser?.close();
  if (server?.pid) {
    try {
      process.kill(-server.pid, 'SIGTERM');
    } catch {
      // Already gone.
    }
  }
  await Promise.all(dirs.map(removeDir));
});

/** Starts the preview on a free port and returns its address. */
async function serve(data: string, out: string): Promise<string> {
  server = spawn(process.execPath, [BIN, 'serve', '--data', data, '--port', '0', '--out', out], { cwd: ROOT, detached: true, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, CI: 'true' } });
  let stdout = '';
  let stderr = '';
  server.stdout!.on('data', (chunk) => (stdout += chunk));
  server.stderr!.on('data', (chunk) => (stderr += chunk));
  const started = Date.now();
  for (;;) {
    const port = /localhost:(\d+)\//.exec(stdout)?.[1];
    if (port) return `http://127.0.0.1:${port}`;
    if (Date.now() - started > 40_000) throw new Error(`serve did not start:\n${stdout}\n${stderr}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** Edits a line of the data and waits for the open page to reload itself. */
async function editAndReload(page: Page, file: string, line: number, from: string, to: string): Promise<void> {
  const reloaded = page.waitForNavigation({ timeout: 40_000, waitUntil: 'load' });
  await editLine(file, line, from, to);
  await reloaded;
}

const figure = (page: Page) => page.$eval('a.fig[href="audit.html#cutoff/A1/GWP-total"]', (a) => a.textContent!.trim()).catch(() => undefined);

describe.skipIf(skip)('loopsheet serve', () => {
  it('rebuilds and reloads the open page as the data change, and shows the problems of a broken cell instead of stale results', async () => {
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    const base = await serve(data, path.join(path.dirname(data), 'preview'));
    const { default: puppeteer } = await import('puppeteer');
    // The PDF flags answer every host "not found"; this browser may reach the preview on the loopback address.
    const args = CHROMIUM_ARGS.map((arg) => (arg.startsWith('--host-resolver-rules=') ? `${arg}, EXCLUDE 127.0.0.1` : arg));
    browser = await puppeteer.launch({ executablePath: found!.executablePath, headless: true, args });
    const page = await browser.newPage();
    await page.goto(`${base}/KV-CU-BB10/index.html`, { waitUntil: 'load' });
    const before = await figure(page);
    expect(before).toMatch(/^\d\.\d\dE[+-]\d\d$/);

    // More post-consumer content in the busbar strip: A1 changes, and the page shows the rebuilt results.json.
    const bom = path.join(data, 'bom.csv');
    await editAndReload(page, bom, 6, '0.995,5%,7%,', '0.995,5%,60%,');
    const after = await figure(page);
    expect(after).not.toBe(before);
    const rebuilt = JSON.parse(await readFile(path.join(path.dirname(data), 'preview', 'KV-CU-BB10', 'results.json'), 'utf8'));
    expect(after).toBe(declaredNotation(rebuilt.methods.cutoff.modules.A1['GWP-total'] as number));

    // A broken cell: the page lists the problem at its file, line and column.
    await editAndReload(page, bom, 6, ',0.995,', ',0.995kg,');
    expect(await page.$eval('h1', (h) => h.textContent)).toBe('The inputs have an error');
    expect(await page.$eval('body', (b) => b.textContent)).toMatch(/bom\.csv:6:6: mass_kg "0\.995kg": .*\[NOT_A_NUMBER\]/);
    expect(await figure(page)).toBeUndefined();

    // Fixed: the results are back, with the edit before the break.
    await editAndReload(page, bom, 6, ',0.995kg,', ',0.995,');
    expect(await figure(page)).toBe(after);
    await page.close();
  }, 90_000);

  it('a port in use is a usage error (exit 2) that says how to choose another', async () => {
    const busy = createServer();
    await new Promise<void>((resolve) => busy.listen(0, '127.0.0.1', () => resolve()));
    const port = (busy.address() as AddressInfo).port;
    const result = await runCli(['serve', '--data', DEMO, '--port', String(port)]);
    busy.close();
    expect(result.code).toBe(2);
    expect(result.stderr).toBe(`loopsheet serve: port ${port} is in use; choose another with --port N (0: any free port)\n`);
  });
});
