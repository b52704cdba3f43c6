import { loadProject } from '../model/project.ts';
import { hasErrors } from '../problems.ts';
import { findBrowser } from '../render/browser.ts';
import { checkOutputDir, withStagedOutput } from '../render/output.ts';
import { declarationPdfJobs, printPdfs } from '../render/pdf.ts';
import { buildSite } from '../render/build-site.ts';
import { EXIT, type Io } from './io.ts';
import { printProblems } from './report-problems.ts';
import { copyInputs, hashInputs, writeManifest } from '../render/verification.ts';

export interface BuildOptions {
  data: string;
  out: string;
  /** auto: PDFs when a browser is found; required: fail without one; off: none. */
  pdf: 'auto' | 'required' | 'off';
}

export async function runBuild(options: BuildOptions, io: Io): Promise<number> {
  await checkOutputDir(options.out, options.data);
  const { project, problems } = await loadProject(options.data);
  if (problems.length > 0) printProblems(problems, options.data, io);
  if (!project || hasErrors(problems)) {
    io.err(`build stopped: nothing was written to ${options.out}`);
    return EXIT.input;
  }

  const browser = options.pdf === 'off' ? undefined : await findBrowser();
  if (options.pdf === 'required' && !browser) {
    io.err('no browser found for the PDFs (looked at PUPPETEER_EXECUTABLE_PATH, chromium/chrome on the PATH, puppeteer’s cache); nothing was written');
    return EXIT.input;
  }
  let missingPdfs: string[] = [];
  let productCount = 0;
  await withStagedOutput(options.out, async (staging) => {
    const inputs = await hashInputs(project.dir);
    await copyInputs(project.dir, staging, inputs);
    const catalogue = await buildSite(project, problems, staging, { inputs, pdfs: browser !== undefined });
    productCount = catalogue.length;
    const jobs = declarationPdfJobs(project, staging, catalogue);
    if (browser) {
      io.err(`PDF: using ${browser.executablePath} (found via ${browser.how})`);
      await printPdfs(browser, staging, jobs);
    } else if (options.pdf === 'auto') {
      missingPdfs = catalogue.map((product) => `${product.id}/declaration.pdf`);
    }
    await writeManifest(staging, inputs);
  });
  if (missingPdfs.length > 0) {
    io.err(`no browser found (PUPPETEER_EXECUTABLE_PATH, chromium/chrome on the PATH, puppeteer’s cache): HTML written, these PDFs were not:\n${missingPdfs.map((pdf) => `  ${pdf}`).join('\n')}`);
  }
  io.out(`built ${productCount} products into ${options.out}${options.pdf === 'off' ? ' (no PDFs: --no-pdf)' : ''}`);
  return EXIT.ok;
}
