import { accessSync, constants, existsSync } from 'node:fs';
import { homedir } from 'node:os';
import path from 'node:path';

/** A browser loopsheet found, and how, so the build can say which it used. */
export interface FoundBrowser {
  executablePath: string;
  how: 'PUPPETEER_EXECUTABLE_PATH' | 'PATH' | 'puppeteer cache';
}

/**
 * Chromium flags for a headless, offline, GPU-less print run. The pages load nothing from
 * outside (pdf.ts refuses every request outside the build folder), but the browser's own
 * services would still look up their hosts and probe the network at start: these switch them
 * off, and `--host-resolver-rules` answers every host name "not found" inside the browser, so
 * no lookup leaves it (test/render/no-network.test.ts traces the PDF build's system calls and
 * finds no internet socket).
 */
export const CHROMIUM_ARGS = [
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
  '--disable-extensions',
  '--disable-default-apps',
  '--disable-domain-reliability',
  '--disable-client-side-phishing-detection',
  '--disable-breakpad',
  '--disable-field-trial-config',
  '--no-pings',
  '--no-service-autorun',
  '--metrics-recording-only',
  '--dns-prefetch-disable',
  '--host-resolver-rules=MAP * ~NOTFOUND',
  '--disable-features=OptimizationHints,MediaRouter,DialMediaRouteProvider,Translate,AutofillServerCommunication,CertificateTransparencyComponentUpdater,InterestFeedContentSuggestions,NetworkTimeServiceQuerying,SafeBrowsing,PrivacySandboxSettings4',
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
