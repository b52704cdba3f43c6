import type { VerificationView } from '../report/verification-status.ts';
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Browser, Page } from 'puppeteer';
import { CHROMIUM_ARGS, type FoundBrowser } from './browser.ts';
import { onInterrupt } from './cleanup.ts';
import type { Project } from '../model/types.ts';
import { DECLARATION_PAGE, DECLARATION_PDF } from '../files.ts';

export interface PdfJob {
  /** The HTML page inside the build folder. */
  html: string;
  pdf: string;
  /** For the page header. */
  title: string;
  status: string;
  /** For the page footer of every page, e.g. that the data are illustrative. */
  footnote?: string;
  /** The PDF's creation and modification date (`YYYY-MM-DD`, from declaration.json), never the clock. */
  date: string;
}

/**
 * Chromium stamps the PDF's info dictionary with the time of printing. The stamps are rewritten with the given
 * date in the same PDF date form (ISO 32000-1 §7.9.4) and the same length, so the
 * cross-reference offsets stay valid; the same inputs then give the same PDF bytes.
 */
export function reproduciblePdf(pdf: Uint8Array, isoDate: string): Buffer {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!match) throw new Error(`PDF date ${isoDate}: expected YYYY-MM-DD`);
  const stamp = `D:${match[1]}${match[2]}${match[3]}000000+00'00'`;
  const text = Buffer.from(pdf).toString('latin1');
  // Tagged-PDF structure elements carry ids made from the browser's DOM node counter, which
  // runs on across the pages a pooled tab prints. They are renumbered from 1 in their own
  // order, at the same width, so the /IDTree stays sorted and every reference consistent.
  const nodeIds = [...new Set(text.match(/\(node\d{8}\)/g) ?? [])].sort();
  const renumbered = new Map(nodeIds.map((id, k) => [id, `(node${String(k + 1).padStart(8, '0')})`]));
  const stamped = text
    .replace(/\/(CreationDate|ModDate) \(D:\d{14}[+\-Z]\d{2}'\d{2}'\)/g, (_whole, key: string) => `/${key} (${stamp})`)
    .replace(/\(node\d{8}\)/g, (id) => renumbered.get(id)!);
  if (stamped.length !== text.length) throw new Error('PDF date stamp changed the file length');
  return Buffer.from(stamped, 'latin1');
}

/** One PDF per declaration page, with its running head (product, verification status) and footer. */
export function declarationPdfJobs(project: Project, outDir: string, products: ReadonlyArray<{ id: string; name: string; verification: VerificationView }>): PdfJob[] {
  return products.map((product) => pdfJob(project, path.join(outDir, product.id), `${product.name} (${product.id})`, product.verification));
}

/** The family declarations' PDFs, families/<family_id>/declaration.pdf. */
export function familyPdfJobs(project: Project, outDir: string, families: ReadonlyArray<{ id: string; name: string; verification: VerificationView }>): PdfJob[] {
  return families.map((family) => pdfJob(project, path.join(outDir, 'families', family.id), `Family ${family.name} (${family.id})`, family.verification));
}

/** The running head says verified (with the date) only for a declaration its verifier's record still covers. */
function pdfJob(project: Project, dir: string, title: string, verification: VerificationView): PdfJob {
  const { illustrative, issued } = project.declaration;
  return {
    html: path.join(dir, DECLARATION_PAGE),
    pdf: path.join(dir, DECLARATION_PDF),
    title,
    status: verification.status === 'verified' ? `verified ${verification.date}` : 'DRAFT — not verified',
    ...(illustrative ? { footnote: 'Illustrative data: invented values, not a real dataset' } : {}),
    date: issued,
  };
}

const PAGE_POOL = 2;
const TIMEOUT_MS = 60_000;

const escapeHtml = (text: string) => text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/**
 * Prints pages to PDF with one browser and a small pool of pages. Every request outside
 * the build folder is refused, so a PDF can never pull anything from the network.
 */
export async function printPdfs(browserInfo: FoundBrowser, buildDir: string, jobs: PdfJob[]): Promise<void> {
  // Loaded when PDFs are printed: a build without them does not pay for puppeteer's import.
  const { default: puppeteer } = await import('puppeteer');
  const browser: Browser = await puppeteer.launch({
    executablePath: browserInfo.executablePath,
    headless: true,
    args: CHROMIUM_ARGS,
    userDataDir: undefined,
    // Over a pipe, the browser sees its end close when this process dies, however it dies,
    // and quits: it never outlives the build. Stops by signal are the CLI's (src/cli/interrupt.ts).
    pipe: true,
    handleSIGINT: false,
    handleSIGTERM: false,
    handleSIGHUP: false,
  });
  const forget = onInterrupt(() => {
    killBrowser(browser);
    return undefined;
  });
  const root = pathToFileURL(path.resolve(buildDir)).href + '/';
  try {
    const queue = [...jobs];
    const worker = async () => {
      const page = await openPage(browser, root);
      try {
        for (let job = queue.shift(); job; job = queue.shift()) await printOne(page, job, browser, root);
      } finally {
        await page.close();
      }
    };
    await Promise.all(Array.from({ length: Math.min(PAGE_POOL, jobs.length) }, worker));
  } finally {
    forget();
    await browser.close();
  }
}

/** Kills the browser and every process it started (puppeteer starts it as a process group of its own). */
function killBrowser(browser: Browser): void {
  const child = browser.process();
  if (!child?.pid) return;
  try {
    process.kill(-child.pid, 'SIGKILL');
  } catch {
    child.kill('SIGKILL');
  }
}

async function openPage(browser: Browser, root: string): Promise<Page> {
  const page = await browser.newPage();
  await page.setRequestInterception(true);
  page.on('request', (request) => {
    if (request.url().startsWith(root) || request.url().startsWith('data:')) void request.continue();
    else void request.abort('blockedbyclient');
  });
  return page;
}

async function printOne(page: Page, job: PdfJob, browser: Browser, root: string): Promise<void> {
  const attempt = async (target: Page) => {
    await target.goto(pathToFileURL(job.html).href, { waitUntil: 'load', timeout: TIMEOUT_MS });
    // Links inside the build folder would become file:// links to the staging folder in the
    // PDF (broken once published, and not reproducible): the PDF keeps their text only. The
    // derivation of every figure is in the HTML audit trail, named by the same figure ids.
    await target.evaluate(() => {
      for (const link of Array.from(document.querySelectorAll('a[href]'))) {
        if (/^https?:/i.test(link.getAttribute('href') ?? '')) continue;
        const span = document.createElement('span');
        span.className = link.className;
        while (link.firstChild) span.appendChild(link.firstChild);
        link.replaceWith(span);
      }
    });
    const pdf = await target.pdf({
      format: 'A4',
      // The stylesheet's @page rules: A4 portrait, and landscape pages for wide tables (a family's results).
      preferCSSPageSize: true,
      printBackground: true,
      displayHeaderFooter: true,
      headerTemplate: `<div style="font-size:8pt;width:100%;padding:0 12mm;color:#4a5663;display:flex;justify-content:space-between"><span>${escapeHtml(job.title)}</span><span>${escapeHtml(job.status)}</span></div>`,
      footerTemplate: `<div style="font-size:8pt;width:100%;padding:0 12mm;color:#4a5663;display:flex;justify-content:space-between"><span>${escapeHtml(job.footnote ?? '')}</span><span>page <span class="pageNumber"></span> of <span class="totalPages"></span></span></div>`,
      margin: { top: '16mm', bottom: '16mm', left: '12mm', right: '12mm' },
      timeout: TIMEOUT_MS,
    });
    await writeFile(job.pdf, reproduciblePdf(pdf, job.date));
  };
  try {
    await attempt(page);
  } catch {
    // One retry on a fresh page: a renderer crash or time-out is usually transient.
    const fresh = await openPage(browser, root);
    try {
      await attempt(fresh);
    } catch (error) {
      throw new Error(`PDF for ${path.basename(path.dirname(job.pdf))} failed twice: ${(error as Error).message}`);
    } finally {
      await fresh.close();
    }
  }
}
