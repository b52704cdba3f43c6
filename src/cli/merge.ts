import path from 'node:path';
import { formatCounted } from '../format.ts';
import { loadProject } from '../model/project.ts';
import { hasErrors } from '../problems.ts';
import { findBrowser } from '../render/browser.ts';
import { writeCatalogue } from '../render/build-site.ts';
import { familyPdfJobs, printPdfs } from '../render/pdf.ts';
import { keepProduct } from '../render/incremental.ts';
import { checkOutputDir, recoverInterrupted, withStagedOutput } from '../render/output.ts';
import { readShardRecords } from '../render/shards.ts';
import { VERIFICATION_DIR } from '../files.ts';
import { CSV_FILES, DECLARATION_FILE } from '../schema/index.ts';
import { copyInputs, hashInputs, writeManifest, type HashedFile } from '../render/verification.ts';
import { EXIT, UsageError, type Io } from './io.ts';
import { printProblems } from './report-problems.ts';

/**
 * Joins the outputs of `build --shard K/N` into one site: every shard's product folders,
 * then the catalogue, the factor table, the verification pack and the manifest, written as
 * a single build writes them (the same bytes: test/render/shards.test.ts).
 */
export async function runMerge(options: { dirs: string[]; out: string }, io: Io): Promise<number> {
  const records = await readShardRecords(options.dirs);
  const out = path.resolve(options.out);
  for (const record of records) if (path.resolve(record.dir) === out) throw new UsageError(`--out ${options.out} is one of the shards; merge into a new folder`);
  // Every shard carries a copy of the inputs; the first one's is the project the catalogue is made from.
  const inputsDir = path.join(records[0]!.dir, VERIFICATION_DIR, 'inputs');
  // The other files the shards copied (supplier datasets, the verifier's record and key) are listed in their record.
  const known = new Set([DECLARATION_FILE, ...CSV_FILES.map((schema) => schema.file)]);
  const inputs = await hashInputs(inputsDir, records[0]!.inputs.map((input) => input.file).filter((file) => !known.has(file)));
  if (JSON.stringify(inputs) !== JSON.stringify(records[0]!.inputs)) throw new UsageError(`${inputsDir}: the input copies no longer match the shard's record`);
  for (const line of recoverInterrupted(options.out)) io.err(line);
  await checkOutputDir(options.out, inputsDir);
  const { project, problems } = await loadProject(inputsDir);
  if (!project || hasErrors(problems)) {
    printProblems(problems, inputsDir, io);
    return EXIT.input;
  }
  let count = 0;
  await withStagedOutput(options.out, async (staging) => {
    await copyInputs(inputsDir, staging, inputs);
    const outcomes = records.flatMap((record) => record.outcomes);
    for (const record of records) {
      for (const outcome of record.outcomes) {
        if (!(await keepProduct(record.dir, staging, outcome.entry.id))) throw new UsageError(`${record.dir} has no folder for ${outcome.entry.id}, which its record lists`);
      }
    }
    outcomes.sort((a, b) => a.index - b.index);
    const catalogue = await writeCatalogue(project, problems, staging, outcomes, { inputs, pdfs: records[0]!.pdfs, context: records[0]!.context });
    for (const warning of catalogue.warnings) io.err(`warning ${warning}`);
    // Family declarations are made here, from every shard's products: where the shards printed PDFs, so does the merge.
    if (records[0]!.pdfs && catalogue.families.length > 0) {
      const browser = await findBrowser();
      if (!browser) throw new UsageError('the shards printed PDFs, and the family declarations are printed by merge: no browser found (PUPPETEER_EXECUTABLE_PATH, chromium/chrome on the PATH, puppeteer’s cache)');
      await printPdfs(browser, staging, familyPdfJobs(project, staging, catalogue.families));
    }
    await writeManifest(staging, inputs, new Map(outcomes.flatMap((o) => o.hashes).map((h): [string, HashedFile] => [h.file, h])));
    count = outcomes.length;
  });
  io.out(`merged ${formatCounted(records.length, 'shard', 'shards')} (${formatCounted(count, 'product', 'products')}) into ${options.out}`);
  return EXIT.ok;
}
