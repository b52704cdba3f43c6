import { accessSync, constants, existsSync } from 'node:fs';
import { homedir } from 'node:os';
import path from 'node:path';

/** A browser loopsheet found, and how, so the build can say which it used. */
export interface FoundBrowser {
  executablePath: string;
  how: 'PUPPETEER_EXECUTABLE_PATH' | 'PATH' | 'puppeteer cache';
}

/** Chromium flags for a headless, offline, GPU-less print run. */
export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
  '--disable-extensions',
];

const PATH_NAMES = ['chromium', 'chromium-browser', 'google-chrome', 'google-chrome-stable', 'chrome'];

function isExecutable(file: string): boolean {
  try {
    accessSync(file, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

/**
 * Finds a browser without ever downloading one: PUPPETEER_EXECUTABLE_PATH first, then a
 * Chromium or Chrome on the PATH, then a browser already in puppeteer's cache. Everything is
 * read from `env`: puppeteer's own `executablePath()` reads the process's environment as it
 * was when puppeteer was loaded (its PUPPETEER_EXECUTABLE_PATH and cache folder), so the
 * cache is looked up here, in the folder `env` names (the newest Chrome installed there).
 */
export async function findBrowser(env: NodeJS.ProcessEnv = process.env): Promise<FoundBrowser | undefined> {
  const fromEnv = env.PUPPETEER_EXECUTABLE_PATH;
  if (fromEnv && isExecutable(fromEnv)) return { executablePath: fromEnv, how: 'PUPPETEER_EXECUTABLE_PATH' };
  for (const dir of (env.PATH ?? '').split(path.delimiter).filter(Boolean)) {
    for (const name of PATH_NAMES) {
      const candidate = path.join(dir, name);
      if (isExecutable(candidate)) return { executablePath: candidate, how: 'PATH' };
    }
  }
  const { Browser, Cache } = await import('@puppeteer/browsers');
  // puppeteer's default cache folder (its getConfiguration): ~/.cache/puppeteer.
  const cacheDir = env.PUPPETEER_CACHE_DIR ?? path.join(homedir(), '.cache', 'puppeteer');
  const cached = new Cache(cacheDir)
    .getInstalledBrowsers()
    .filter((installed) => installed.browser === Browser.CHROME && existsSync(installed.executablePath) && isExecutable(installed.executablePath))
    .sort((a, b) => (a.buildId < b.buildId ? 1 : -1))[0];
  return cached ? { executablePath: cached.executablePath, how: 'puppeteer cache' } : undefined;
}
