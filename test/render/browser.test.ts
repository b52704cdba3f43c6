import { afterAll, describe, expect, it } from 'vitest';
import { chmod, mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { findBrowser } from '../../src/render/browser.ts';
import { removeDir, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

async function fakeExecutable(dir: string, name: string): Promise<string> {
  await mkdir(dir, { recursive: true });
  const file = path.join(dir, name);
  await writeFile(file, '#!/bin/sh\nexit 0\n');
  await chmod(file, 0o755);
  return file;
}

describe('finding a browser without downloading one', () => {
  it('prefers PUPPETEER_EXECUTABLE_PATH, then a chromium or chrome on the PATH', async () => {
    const dir = await tempDir();
    dirs.push(dir);
    const explicit = await fakeExecutable(path.join(dir, 'custom'), 'my-chrome');
    const onPath = await fakeExecutable(path.join(dir, 'bin'), 'chromium');
    expect(await findBrowser({ PUPPETEER_EXECUTABLE_PATH: explicit, PATH: path.join(dir, 'bin') })).toEqual({ executablePath: explicit, how: 'PUPPETEER_EXECUTABLE_PATH' });
    expect(await findBrowser({ PATH: `/nonexistent:${path.join(dir, 'bin')}` })).toEqual({ executablePath: onPath, how: 'PATH' });
    const chrome = await fakeExecutable(path.join(dir, 'other'), 'google-chrome');
    expect(await findBrowser({ PUPPETEER_EXECUTABLE_PATH: path.join(dir, 'missing'), PATH: path.join(dir, 'other') })).toEqual({ executablePath: chrome, how: 'PATH' });
  });

  it('finds a Chrome in the puppeteer cache that the given environment names, whatever this process was started with', async () => {
    const dir = await tempDir();
    dirs.push(dir);
    // The layout @puppeteer/browsers installs into: <cache>/chrome/<platform>-<build>/chrome-linux64/chrome.
    const chrome = await fakeExecutable(path.join(dir, 'chrome', 'linux-148.0.7778.97', 'chrome-linux64'), 'chrome');
    expect(await findBrowser({ PATH: '/nonexistent', PUPPETEER_CACHE_DIR: dir })).toEqual({ executablePath: chrome, how: 'puppeteer cache' });
  });

  it('finds nothing where there is nothing (it never downloads)', async () => {
    const dir = await tempDir();
    dirs.push(dir);
    // Only the given environment counts: a PUPPETEER_EXECUTABLE_PATH of this process (as CI may set) is not looked at.
    expect(await findBrowser({ PATH: '/nonexistent', PUPPETEER_CACHE_DIR: dir })).toBeUndefined();
  });
});
