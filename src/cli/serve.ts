import chokidar from 'chokidar';
import EleventyDevServer from '@11ty/eleventy-dev-server';
import { createHash } from 'node:crypto';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { formatCounted } from '../format.ts';
import { formatProblem, hasErrors, UsageError, type Problem } from '../problems.ts';
import { loadProject } from '../model/project.ts';
import { onInterrupt } from '../render/cleanup.ts';
import { runBuild } from './build.ts';
import type { Io } from './io.ts';

export interface ServeOptions {
  data: string;
  /** Where the preview is built; default: a folder of its own under the system's temporary folder. */
  out?: string;
  port: number;
}

const escapeHtml = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** The page shown for every page of the preview while the inputs have errors: each problem at its file, line and column. */
export function problemsPage(problems: readonly Problem[], dir: string): string {
  const errors = problems.filter((p) => p.severity === 'error');
  const items = problems.map((p) => `<li class="${p.severity}"><code>${escapeHtml(formatProblem(p, dir))}</code></li>`).join('\n');
  return `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><title>loopsheet: ${errors.length} input ${errors.length === 1 ? 'error' : 'errors'}</title>
<style>body{font-family:"DejaVu Sans",system-ui,sans-serif;margin:2rem;color:#17212b}li{margin:.4rem 0}li.error code{color:#a00000}code{white-space:pre-wrap;overflow-wrap:anywhere}</style></head>
<body>
<h1 id="problems">The inputs have ${errors.length === 1 ? 'an error' : `${errors.length} errors`}</h1>
<p>The preview shows no results until <code>loopsheet check</code> passes: fix what is listed below and save; this page reloads by itself.</p>
<ul>
${items}
</ul>
</body>
</html>
`;
}

/**
 * `loopsheet serve`: builds the site (no PDFs), serves it on localhost with Eleventy's dev
 * server, watches the data folder with chokidar, rebuilds only what changed (`build
 * --changed`) and reloads the open page. While the inputs have errors every page of the
 * preview is the list of problems, never stale results. Runs until it is stopped (Ctrl-C).
 */
/** Whether a port can be listened on (the dev server would throw from inside its own handler). */
function portFree(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const probe = createServer();
    probe.once('error', () => resolve(false));
    probe.listen(port, () => probe.close(() => resolve(true)));
  });
}

export async function runServe(options: ServeOptions, io: Io): Promise<number> {
  if (options.port !== 0 && !(await portFree(options.port))) throw new UsageError(`port ${options.port} is in use; choose another with --port N (0: any free port)`);
  const out = options.out ?? path.join(os.tmpdir(), `loopsheet-serve-${createHash('sha256').update(path.resolve(options.data)).digest('hex').slice(0, 12)}`);
  let problems: Problem[] | undefined;
  // Messages of each build go to stderr as usual; the preview keeps running whatever a build says.
  const quiet: Io = { out: io.err, err: io.err, isTty: false };
  const build = async (): Promise<void> => {
    const loaded = await loadProject(options.data);
    if (hasErrors(loaded.problems)) {
      problems = loaded.problems;
      io.err(`serve: ${formatCounted(problems.filter((p) => p.severity === 'error').length, 'input error', 'input errors')}; the preview shows them until they are fixed`);
      return;
    }
    problems = undefined;
    const code = await runBuild({ data: options.data, out, pdf: 'off', changed: true }, quiet, loaded);
    if (code !== 0) io.err(`serve: the build stopped (exit ${code}); the previous preview stays`);
  };
  await build();

  const server = EleventyDevServer.getServer('loopsheet', out, {
    liveReload: true,
    domDiff: false,
    showVersion: false,
    portReassignmentRetryCount: 0,
    messageOnStart: () => '',
    logger: { info: () => undefined, log: () => undefined, error: (message) => io.err(`serve: ${message}`) },
    onRequest: {
      // Any page while the inputs have errors: the problems, with the script that reloads it.
      '/:path*': ({ url }) => {
        if (!problems || !(url.pathname.endsWith('/') || url.pathname.endsWith('.html'))) return undefined;
        return { status: 200, headers: { 'Content-Type': 'text/html; charset=utf-8' }, body: server.augmentContentWithNotifier(problemsPage(problems, options.data), true) };
      },
    },
  });
  // getPort waits for the server's 'listening' event: asked before serve, so that it does not miss it.
  const listening = server.getPort();
  server.serve(options.port);
  const port = await listening;
  io.out(`serving ${options.data} at http://localhost:${port}/ (built in ${out}); watching for changes, Ctrl-C to stop`);

  let running: Promise<void> = Promise.resolve();
  let timer: NodeJS.Timeout | undefined;
  const watcher = chokidar.watch(path.resolve(options.data), { ignoreInitial: true, awaitWriteFinish: { stabilityThreshold: 100, pollInterval: 25 } });
  watcher.on('all', (_event, file) => {
    // Changes that come together (a spreadsheet saving several files) are one rebuild.
    clearTimeout(timer);
    timer = setTimeout(() => {
      running = running.then(async () => {
        io.err(`serve: ${path.relative(options.data, file)} changed; rebuilding`);
        await build();
        server.reload({ files: [] });
      });
    }, 150);
  });
  onInterrupt(() => {
    void watcher.close();
    void server.close();
    return undefined;
  });
  // Runs until stopped: the signal handler (src/cli/interrupt.ts) ends the process.
  await new Promise<never>(() => undefined);
  return 0;
}
