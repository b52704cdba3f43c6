import { verificationFiles } from '../model/verification-record.ts';
import { loadProject, type ProjectLoad } from '../model/project.ts';
import { hasErrors } from '../problems.ts';
import { findBrowser } from '../render/browser.ts';
import { buildSite } from '../render/build-site.ts';
import { keptHashes, readPreviousBuild } from '../render/incremental.ts';
import { checkOutputDir, recoverInterrupted, withStagedOutput } from '../render/output.ts';
import { declarationPdfJobs, familyPdfJobs, printPdfs } from '../render/pdf.ts';
import { shardAssignment, writeShardRecord, type ShardSpec } from '../render/shards.ts';
import { copyInputs, hashInputs, writeManifest, type HashedFile } from '../render/verification.ts';
import { EXIT, UsageError, type Io } from './io.ts';
import { createProgress } from './progress.ts';
import { printProblems } from './report-problems.ts';
import { formatCounted } from '../format.ts';

export interface BuildOptions {
  data: string;
  out: string;
  /** auto: PDFs when a browser is found; required: fail without one; off: none. */
  pdf: 'auto' | 'required' | 'off';
  /** Build only this share of the products (a CI matrix job); `loopsheet merge` joins the shards. */
  shard?: ShardSpec;
  /** Keep the files of every product whose inputs did not change since the build in `out`. */
  changed?: boolean;
  /** Run the Monte Carlo analysis even where declaration.json does not ask for it. */
  uncertainty?: boolean;
}

/** Products named in the --changed summary; the rest are counted. */
const LISTED = 20;

/** `loaded`: the project as the caller has just loaded it from `options.data` (serve), so it is not loaded twice. */
export async function runBuild(options: BuildOptions, io: Io, loaded?: ProjectLoad): Promise<number> {
  if (options.shard && options.changed) throw new UsageError('--changed and --shard do not go together: a shard build is joined by merge, which builds nothing');
  const progress = createProgress(io);
  for (const line of recoverInterrupted(options.out)) io.err(line);
  await checkOutputDir(options.out, options.data);
  progress.phase('load and validate');
  const { project, problems } = loaded ?? (await loadProject(options.data));
  if (problems.length > 0) printProblems(problems, options.data, io);
  if (!project || hasErrors(problems)) {
    io.err(`build stopped: nothing was written to ${options.out}`);
    return EXIT.input;
  }

  // The flag asks for what declaration.json `uncertainty` would: its settings, else the defaults.
  if (options.uncertainty) project.declaration.uncertainty ??= { iterations: 1000, seed: 1 };
  const browser = options.pdf === 'off' ? undefined : await findBrowser();
  if (options.pdf === 'required' && !browser) {
    io.err('no browser found for the PDFs (looked at PUPPETEER_EXECUTABLE_PATH, chromium/chrome on the PATH, puppeteer’s cache); nothing was written');
    return EXIT.input;
  }
  const previous = options.changed ? await readPreviousBuild(options.out) : undefined;
  if (options.changed && !previous) io.err(`build --changed: no earlier build of this tool version in ${options.out}; building every product`);
  const shard = options.shard;
  const assignment = shard ? shardAssignment(project.products.rows.map((row) => row.value.product_id), project.families, shard.n) : undefined;
  let missingPdfs: string[] = [];
  let summary = '';
  await withStagedOutput(options.out, async (staging) => {
    const inputs = await hashInputs(project.dir, [...[...project.suppliers.values()].map((supplier) => supplier.file), ...verificationFiles(project)]);
    await copyInputs(project.dir, staging, inputs);
    progress.phase(previous ? 'compare inputs, then calculate and render the changed products' : 'calculate and render');
    const built = await buildSite(project, problems, staging, {
      inputs,
      pdfs: browser !== undefined,
      ...(assignment ? { select: (id: string) => assignment.get(id) === shard!.k, catalogue: false } : {}),
      ...(previous ? { previous } : {}),
      onProgress: (done, total) => progress.products(done, total),
    });
    progress.stop();
    for (const warning of built.familyWarnings) io.err(`warning ${warning}`);
    const rebuilt = new Set(built.rebuilt.map((r) => r.id));
    const printed = built.outcomes.filter((o) => rebuilt.has(o.entry.id)).map((o) => ({ id: o.entry.id, name: o.entry.name, verification: o.entry.verification }));
    if (browser) {
      // Family pages are written again by every build (their members may have changed): so are their PDFs.
      const jobs = [...declarationPdfJobs(project, staging, printed), ...familyPdfJobs(project, staging, built.families)];
      progress.phase(`PDF (${jobs.length})`);
      io.err(`PDF: using ${browser.executablePath} (found via ${browser.how})`);
      await printPdfs(browser, staging, jobs);
    } else if (options.pdf === 'auto') {
      missingPdfs = [...printed.map((product) => `${product.id}/declaration.pdf`), ...built.families.map((family) => `families/${family.id}/declaration.pdf`)];
    }
    if (shard) {
      await writeShardRecord(staging, { shard, pdfs: browser !== undefined, context: built.context, inputs, outcomes: built.outcomes });
      summary = `built shard ${shard.k}/${shard.n}: ${formatCounted(built.outcomes.length, 'product', 'products')} into ${options.out}${options.pdf === 'off' ? ' (no PDFs: --no-pdf)' : ''}; join the shards with loopsheet merge`;
    } else {
      progress.phase('verification manifest');
      // Kept products' files keep their previous hashes; built ones were hashed as written.
      await writeManifest(staging, inputs, new Map([...keptHashes(previous, built.kept), ...built.outcomes.flatMap((o) => o.hashes).map((h): [string, HashedFile] => [h.file, h])]));
      summary = `built ${formatCounted(built.outcomes.length, 'product', 'products')} into ${options.out}${options.pdf === 'off' ? ' (no PDFs: --no-pdf)' : ''}`;
    }
    if (options.changed) {
      const lines = built.rebuilt.slice(0, LISTED).map(({ id, reasons }) => `  ${id}: ${reasons.length > 3 ? `${reasons.slice(0, 3).join(', ')} and ${reasons.length - 3} more` : reasons.join(', ') || 'new build'}`);
      if (built.rebuilt.length > LISTED) lines.push(`  …and ${built.rebuilt.length - LISTED} more`);
      summary += `\nrebuilt ${built.rebuilt.length} of ${formatCounted(built.outcomes.length, 'product', 'products')} (${built.kept.length} kept from the previous build)${lines.length > 0 ? `:\n${lines.join('\n')}` : ''}`;
    }
  });
  if (missingPdfs.length > 0) {
    io.err(`no browser found (PUPPETEER_EXECUTABLE_PATH, chromium/chrome on the PATH, puppeteer’s cache): HTML written, these PDFs were not:\n${missingPdfs.map((pdf) => `  ${pdf}`).join('\n')}`);
  }
  io.out(summary);
  return EXIT.ok;
}
