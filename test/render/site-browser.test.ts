import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parse as parseCsv } from 'csv-parse/sync';
import { mkdir, readdir, readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import puppeteer, { type Browser, type Page } from 'puppeteer';
import { CHROMIUM_ARGS, findBrowser } from '../../src/render/browser.ts';
import { DEMO, ROOT, declaredNotation, demoCopy, editFile, missingTool, removeDir, runCli, tempDir } from '../helpers.ts';
import { figureMap } from '../figures.ts';
import type { ResultsJson } from '../../src/report/results.ts';

/**
 * The built site in a real Chromium: every page opens without console errors or failed
 * requests, every number on a declaration page leads to its figure in the audit trail and
 * shows results.json rounded as declared, the audit trail has no dangling link, axe-core
 * finds no serious or critical accessibility violation, and hostile input text stays text.
 */
const axeSource = (createRequire(import.meta.url)('axe-core') as { source: string }).source;
const PRODUCTS = ['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22'];
const ARTIFACTS = path.join(ROOT, 'test', 'artifacts');

const found = await findBrowser();
const skip = missingTool('Chromium or Chrome (PUPPETEER_EXECUTABLE_PATH, PATH or the puppeteer cache)', found !== undefined, 'apt-get install chromium, as .ci/run does.');

const dirs: string[] = [];
let browser: Browser | undefined;
let out = '';

beforeAll(async () => {
  if (!found) return;
  const dir = await tempDir();
  dirs.push(dir);
  out = path.join(dir, 'out');
  const result = await runCli(['build', '--data', DEMO, '--out', out, '--pdf']);
  expect(result.code, result.stderr).toBe(0);
  browser = await puppeteer.launch({ executablePath: found.executablePath, headless: true, args: CHROMIUM_ARGS });
  await mkdir(ARTIFACTS, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await Promise.all(dirs.map(removeDir));
});

interface Opened {
  page: Page;
  errors: string[];
}

/** Opens a page of the build from disk, recording console errors, page errors and failed requests. */
async function open(file: string, root = out): Promise<Opened> {
  const page = await browser!.newPage();
  const errors: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error') errors.push(`console: ${message.text()}`);
  });
  page.on('pageerror', (error) => errors.push(`page error: ${(error as Error).message}`));
  page.on('requestfailed', (request) => errors.push(`request failed: ${request.url()} ${request.failure()?.errorText ?? ''}`));
  page.on('dialog', (dialog) => {
    errors.push(`dialog: ${dialog.message()}`);
    void dialog.dismiss();
  });
  await page.setViewport({ width: 1200, height: 900 });
  await page.goto(pathToFileURL(path.join(root, file)).href, { waitUntil: 'load' });
  return { page, errors };
}

async function htmlPages(root: string): Promise<string[]> {
  const pages: string[] = [];
  const walk = async (dir: string) => {
    for (const entry of await readdir(path.join(root, dir), { withFileTypes: true })) {
      const relative = dir ? `${dir}/${entry.name}` : entry.name;
      if (entry.isDirectory()) await walk(relative);
      else if (entry.name.endsWith('.html')) pages.push(relative);
    }
  };
  await walk('');
  return pages.sort();
}

/** Three significant figures, as the declaration prints by default (declaration.json report.significant_figures). */
const declared = (value: number | null): string => (value === null ? 'n/a' : declaredNotation(value));

describe.skipIf(skip)('the site in a real Chromium', () => {
  it('opens every page with no console error, page error or failed request', async () => {
    const pages = await htmlPages(out);
    // catalogue, factor table, verification pack, and a declaration and an audit trail per product
    expect(pages).toEqual(['KV-BR-40/audit.html', 'KV-BR-40/index.html', 'KV-CU-BB10/audit.html', 'KV-CU-BB10/index.html', 'KV-EXT-6060-T19/audit.html', 'KV-EXT-6060-T19/index.html', 'KV-EXT-6060-T22/audit.html', 'KV-EXT-6060-T22/index.html', 'KV-EXT-6060/audit.html', 'KV-EXT-6060/index.html', 'factors/index.html', 'families/profiles-6060-mill/audit.html', 'families/profiles-6060-mill/index.html', 'index.html', 'verification/checklist.html', 'verification/index.html']);
    for (const file of pages) {
      const { page, errors } = await open(file);
      // Every link inside the build points at a file that exists.
      const targets = await page.$$eval('a[href]', (links) => links.map((a) => (a as HTMLAnchorElement).href).filter((href) => href.startsWith('file:')));
      for (const target of new Set(targets.map((t) => decodeURIComponent(new URL(t).pathname)))) {
        await expect(readFile(target), `${file} links to ${target}`).resolves.toBeDefined();
      }
      await page.close();
      expect(errors, file).toEqual([]);
    }
  });

  it.each(PRODUCTS)('every number on the %s declaration links to its figure in the audit trail and equals results.json as rounded', async (id) => {
    const figures = figureMap(JSON.parse(await readFile(path.join(out, id, 'results.json'), 'utf8')) as ResultsJson);
    const { page } = await open(`${id}/index.html`);
    const links = await page.$$eval('a.fig', (anchors) => anchors.map((a) => ({ href: a.getAttribute('href')!, text: a.textContent!.trim(), precise: a.classList.contains('precise') })));
    await page.close();
    expect(links.length).toBeGreaterThan(100);
    const audit = await open(`${id}/audit.html`);
    for (const link of links) {
      const [file, hash] = link.href.split('#');
      expect(file).toBe('audit.html');
      const figureId = decodeURIComponent(hash!);
      const figure = figures[figureId];
      expect(figure, `${figureId} is in results.json`).toBeDefined();
      const anchored = await audit.page.evaluate((anchor) => document.getElementById(anchor) !== null, figureId);
      expect(anchored, `${figureId} has an anchor in the audit trail`).toBe(true);
      // Shares print as percentages (ISO 14021 recycled content); the steps of a process model with six significant
      // figures (they are operating quantities, not declared results); everything else in scientific notation.
      const expected = link.text.endsWith('%') ? `${(figure!.value! * 100).toFixed(1)} %` : link.precise ? String(Number(figure!.value!.toPrecision(6))) : declared(figure!.value);
      expect(link.text, figureId).toBe(expected);
    }
    await audit.page.close();
  });

  it.each(PRODUCTS)('the %s audit trail has no dangling link and walks from A1-A3 down to a CSV cell', async (id) => {
    const { page, errors } = await open(`${id}/audit.html`);
    const dangling = await page.$$eval('a[href^="#"]', (links) => links.map((a) => decodeURIComponent(a.getAttribute('href')!.slice(1))).filter((anchor) => document.getElementById(anchor) === null));
    expect(dangling).toEqual([]);
    // Follow the links down from A1-A3: from the value's cell in its values table to its step, then the step's terms, depth first, until an input row is reached.
    const walked = await page.evaluate((start) => {
      const down = (anchor: string): string[] => {
        const element = document.getElementById(anchor)!;
        const row = element.closest('tr');
        const links = row && !row.closest('table.run') && element.tagName === 'TD'
          ? Array.from(row.querySelectorAll('th a'))
          : row && row.closest('table.run')
            ? [...Array.from(row.closest('div.run')!.querySelectorAll('p.shared a')), ...Array.from(row.querySelectorAll('td a'))]
            : Array.from(element.querySelectorAll('ul.terms a, table.terms td a'));
        return links.map((a) => decodeURIComponent(a.getAttribute('href')!.slice(1)));
      };
      const seen = new Set<string>();
      const search = (anchor: string, depth: number): string[] | undefined => {
        const input = document.getElementById(anchor)?.closest('.input-row');
        if (input) return [input.id];
        if (depth > 14 || seen.has(anchor)) return undefined;
        seen.add(anchor);
        for (const next of down(anchor)) {
          const path = search(next, depth + 1);
          if (path) return [anchor, ...path];
        }
        return undefined;
      };
      return search(start, 0) ?? [start];
    }, 'cutoff/A1-A3/GWP-total');
    const anchor = walked.at(-1)!;
    expect(anchor, walked.join(' → ')).toMatch(/^input:(bom|factors|activities|transport|eol|materials|products|process)\.csv:\d+$/);
    // A CSV row is shown cell by cell: the cells of the demo file's line, as csv-parse reads it.
    const row = await page.evaluate((current) => [...(document.getElementById(current) as HTMLTableRowElement).cells].slice(1).map((cell) => cell.textContent), anchor);
    const [, file, line] = /^input:(.+):(\d+)$/.exec(anchor)!;
    const written = (await readFile(path.join(DEMO, file!), 'utf8')).split(/\r?\n/)[Number(line) - 1]!;
    expect(row).toEqual(parseCsv(written)[0]);
    await page.close();
    expect(errors).toEqual([]);
  });

  it('the audit trail leads back up from an input row and a step, and takes any figure id as an address', async () => {
    const id = 'KV-EXT-6060';
    const json = JSON.parse(await readFile(path.join(out, id, 'results.json'), 'utf8')) as ResultsJson;
    const figures = figureMap(json);
    const { page, errors } = await open(`${id}/audit.html`);
    // bom.csv line 3 (line L1) is read by the steps whose terms link to it; the page's script lists them.
    const readBy = await page.$eval('#input\\:bom\\.csv\\:3 .used-by', (p) => ({ text: p.textContent!, links: Array.from(p.querySelectorAll('a')).map((a) => a.textContent!) }));
    expect(readBy.text).toMatch(/^Read by \d+ steps: /);
    expect(readBy.links).toContain('inventory/line:L1/G');
    // Exactly the steps of results.json whose terms are cells of that row.
    const cells = new Set(json.graph.cells.flatMap((cell, k) => (cell.file === 'bom.csv' && cell.line === 3 ? [k] : [])));
    const expected = json.graph.steps.filter((step) => step.terms.some((t) => typeof t === 'object' && 'cell' in t && cells.has(t.cell))).map((step) => step.id);
    expect([...readBy.links].sort()).toEqual([...expected].sort());
    // A value whose step has no anchor of its own: the script finds it in its values table.
    const figure = 'cutoff/A1/line:L1/GWP-total';
    await page.goto(`${page.url().split('#')[0]}#${figure}`);
    const addressed = await page.$eval('.addressed', (cell) => ({ text: cell.textContent, tag: cell.tagName, row: cell.closest('tr')!.querySelector('th')!.textContent }));
    expect(addressed).toEqual({ text: String(Number(figures[figure]!.value!.toPrecision(6))), tag: 'TD', row: 'cutoff/A1/line:L1' });
    await page.close();
    expect(errors).toEqual([]);
  });

  it('the family page shows the output-weighted mean of its members’ own results.json, each linked to its derivation and on to the member’s audit trail', async () => {
    const family = 'families/profiles-6060-mill';
    // Weights read here from production.csv itself (the demo's family leaves its weight cells empty).
    const production = (await readFile(path.join(DEMO, 'production.csv'), 'utf8')).split('\n').filter((line) => line.startsWith('norwick-press-shop,'));
    const weights = new Map(production.map((line) => [line.split(',')[2]!, Number(line.split(',')[3])]));
    expect([...weights.keys()]).toEqual(['KV-EXT-6060', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22']);
    const members = await Promise.all([...weights.keys()].map(async (id) => [id, JSON.parse(await readFile(path.join(out, id, 'results.json'), 'utf8'))] as const));
    // Weighted arithmetic mean, Σ w·v / Σ w (any statistics text).
    const mean = (module: string, code: string) => {
      const values = members.map(([id, r]) => [weights.get(id)!, r.methods.cutoff.modules[module][code] as number | null] as const);
      if (values.some(([, v]) => v === null)) return null;
      return values.reduce((sum, [w, v]) => sum + w * v!, 0) / values.reduce((sum, [w]) => sum + w, 0);
    };
    const { page, errors } = await open(`${family}/index.html`);
    const cells = await page.$$eval('table.family a.fig', (anchors) => anchors.map((a) => ({ href: a.getAttribute('href')!, text: a.textContent!.trim() })));
    await page.close();
    expect(cells.length).toBeGreaterThan(100);
    const audit = await open(`${family}/audit.html`);
    for (const cell of cells) {
      const [file, hash] = cell.href.split('#');
      expect(file).toBe('audit.html');
      const [method, module, code] = decodeURIComponent(hash!).split('/');
      expect(method).toBe('cutoff');
      expect(cell.text, `${module} ${code}`).toBe(declared(mean(module!, code!)));
      expect(await audit.page.evaluate((anchor) => document.getElementById(anchor) !== null, decodeURIComponent(hash!))).toBe(true);
    }
    // From a family figure on to the members' own derivations.
    const memberLinks = await audit.page.$$eval('[id="cutoff/A1-A3/GWP-total"] td a', (anchors) => anchors.map((a) => a.getAttribute('href')!));
    expect(memberLinks).toHaveLength(3);
    for (const link of memberLinks) {
      const [file, hash] = link.split('#');
      const member = await open(path.join(family, file!));
      expect(await member.page.evaluate((anchor) => document.getElementById(anchor) !== null, decodeURIComponent(hash!)), link).toBe(true);
      await member.page.close();
    }
    await audit.page.close();
    expect([...errors, ...audit.errors]).toEqual([]);
  });

  it('the factor table names, per row, the products that read it, each link landing on the row in that audit trail', async () => {
    const { page } = await open('factors/index.html');
    const links = await page.$$eval('a[href*="audit.html#input:factors.csv:"]', (anchors) => anchors.map((a) => a.getAttribute('href')!));
    const rows = await page.$$eval('#main tbody tr', (trs) => trs.length);
    await page.close();
    // The demo's factor rows are read by at least one product each, bar the unused ones (count from the file).
    expect(links.length).toBeGreaterThan(rows / 2);
    for (const href of links) {
      const [file, hash] = href.split('#');
      const audit = await open(path.posix.join('factors', file!));
      const line = Number(/:(\d+)$/.exec(hash!)![1]);
      const cells = await audit.page.evaluate((anchor) => [...((document.getElementById(anchor) as HTMLTableRowElement | null)?.cells ?? [])].slice(1).map((cell) => cell.textContent), decodeURIComponent(hash!));
      await audit.page.close();
      expect(cells, href).toEqual(parseCsv((await readFile(path.join(DEMO, 'factors.csv'), 'utf8')).split(/\r?\n/)[line - 1]!)[0]);
    }
  });

  it.each(['index.html', 'KV-CU-BB10/index.html', 'KV-CU-BB10/audit.html', 'factors/index.html', 'verification/index.html', 'verification/checklist.html', 'families/profiles-6060-mill/index.html', 'families/profiles-6060-mill/audit.html'])('axe-core finds no serious or critical violation on %s', async (file) => {
    const { page } = await open(file);
    await page.addScriptTag({ content: axeSource });
    const violations = await page.evaluate(async () => {
      const axe = (window as unknown as { axe: { run: (context: Document, options: object) => Promise<{ violations: Array<{ id: string; impact: string; nodes: unknown[] }> }> } }).axe;
      const result = await axe.run(document, { resultTypes: ['violations'] });
      return result.violations.map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.length }));
    });
    await page.close();
    expect(violations.filter((v) => v.impact === 'serious' || v.impact === 'critical')).toEqual([]);
  });

  it('charts are SVG in the HTML with a text alternative and their data as a table', async () => {
    const { page } = await open('KV-EXT-6060/index.html');
    const charts = await page.$$eval('figure.chart', (figures) =>
      figures.map((f) => ({ svg: f.querySelector('.chart-svg > svg') !== null, alt: f.querySelector('.chart-svg')!.getAttribute('aria-label') ?? '', rows: f.querySelectorAll('.chart-data tbody tr').length, bars: f.querySelectorAll('.chart-svg svg .mark-rect path').length })),
    );
    await page.close();
    // By module, by BOM line and step, by method; the largest contributions and the tornado for A1-A3 and for D.
    expect(charts).toHaveLength(7);
    for (const chart of charts) {
      expect(chart.svg).toBe(true);
      expect(chart.alt.length).toBeGreaterThan(40);
      expect(chart.rows).toBeGreaterThan(1);
      expect(chart.bars).toBe(chart.rows);
    }
  });

  it('the catalogue sorts and filters with its script, and is a complete table without it', async () => {
    const { page, errors } = await open('index.html');
    await page.screenshot({ path: path.join(ARTIFACTS, 'catalogue.png'), fullPage: true });
    const order = () => page.$$eval('#catalogue tbody tr:not([hidden]) td:first-child', (cells) => cells.map((c) => c.textContent!.trim()));
    const gwp = () => page.$$eval('#catalogue tbody tr td:nth-child(4)', (cells) => cells.map((c) => Number(c.getAttribute('data-sort'))));
    await page.click('#catalogue thead th:nth-child(4) button');
    const ascending = await gwp();
    expect(ascending).toEqual([...ascending].sort((a, b) => a - b));
    await page.click('#catalogue thead th:nth-child(4) button');
    const descending = await gwp();
    expect(descending).toEqual([...ascending].reverse());
    await page.type('#catalogue-filter', 'busbar');
    expect(await order()).toEqual(['KV-CU-BB10']);
    await page.close();
    expect(errors).toEqual([]);

    const plain = await browser!.newPage();
    await plain.setJavaScriptEnabled(false);
    await plain.goto(pathToFileURL(path.join(out, 'index.html')).href);
    expect(await plain.$$eval('#catalogue tbody tr', (rows) => rows.length)).toBe(5);
    expect(await plain.$eval('#catalogue-tools', (tools) => (tools as HTMLElement).hidden)).toBe(true);
    await plain.close();
  });

  it('writes screenshots of the catalogue, a declaration and the family page (1280 px wide) for a person to look at', async () => {
    const { page } = await open('KV-EXT-6060/index.html');
    await page.screenshot({ path: path.join(ARTIFACTS, 'declaration-KV-EXT-6060.png'), fullPage: true });
    await page.close();
    const family = await open('families/profiles-6060-mill/index.html');
    await family.page.setViewport({ width: 1280, height: 900 });
    await family.page.screenshot({ path: path.join(ARTIFACTS, 'family-profiles-6060-mill.png'), fullPage: true });
    // Every column of the family's results, A1 to module D, is on a 1280 px screen: no table scrolls sideways.
    const hidden = await family.page.$$eval('table.family', (tables) => tables.filter((t) => t.parentElement!.scrollWidth > t.parentElement!.clientWidth + 1).length);
    expect(hidden).toBe(0);
    await family.page.close();
    for (const name of ['catalogue.png', 'declaration-KV-EXT-6060.png', 'family-profiles-6060-mill.png']) expect((await readFile(path.join(ARTIFACTS, name))).subarray(1, 4).toString()).toBe('PNG');
  });

  it('lays out the factor table with margins at both edges and ids that do not break inside', async () => {
    const { page } = await open('factors/index.html');
    await page.setViewport({ width: 1280, height: 900 });
    const layout = await page.evaluate(() => {
      const main = document.querySelector('main')!;
      const ids = [...document.querySelectorAll('table.grid tbody tr')].map((row) => (row as HTMLTableRowElement).cells[0]!);
      // The lines an id's text is laid out on: one box per line.
      const lines = (cell: Element) => {
        const range = document.createRange();
        range.selectNodeContents(cell);
        return new Set([...range.getClientRects()].map((rect) => Math.round(rect.top))).size;
      };
      return { padding: parseFloat(getComputedStyle(main).paddingLeft), notice: document.querySelector('.notice')!.getBoundingClientRect().left, broken: ids.filter((cell) => lines(cell) > 1).map((cell) => cell.textContent) };
    });
    await page.close();
    expect(layout.padding).toBeGreaterThanOrEqual(16);
    expect(layout.notice).toBeGreaterThanOrEqual(16);
    // One line per id (al-primary-ingot, not al-primary- / ingot).
    expect(layout.broken).toEqual([]);
  });

  it('links each input row of a declaration ("Read from bom.csv:3") to that row on the audit trail, shown cell by cell under its file’s header', async () => {
    const { page } = await open('KV-EXT-6060/index.html');
    const links = await page.$$eval('#inputs a.src', (anchors) => anchors.map((a) => ({ href: a.getAttribute('href')!, label: a.textContent!.trim() })));
    await page.close();
    expect(links.length).toBeGreaterThan(20);
    const audit = await open('KV-EXT-6060/audit.html');
    for (const link of links) {
      const [file, hash] = link.href.split('#');
      expect(file).toBe('audit.html');
      const landed = await audit.page.evaluate((id) => document.getElementById(id)?.querySelector('code.loc')?.textContent ?? null, decodeURIComponent(hash!));
      expect(landed, link.href).toBe(link.label);
    }
    // The bom.csv rows under the demo file's own header, one cell per column.
    const header = (await readFile(path.join(DEMO, 'bom.csv'), 'utf8')).split('\n')[1]!.split(',');
    const table = await audit.page.evaluate(() => {
      const row = document.getElementById('input:bom.csv:3') as HTMLTableRowElement;
      const head = row.closest('table')!.tHead!.rows[0]!;
      return { header: [...head.cells].slice(1).map((c) => c.textContent), cells: [...row.cells].slice(1).map((c) => c.textContent) };
    });
    expect(table.header).toEqual(header);
    expect(table.cells.slice(0, 6)).toEqual(['KV-EXT-6060', 'L1', 'Extrusion billet', 'al-6060', 'product', '0.83']);
    await audit.page.close();
  });

  it.each(['KV-EXT-6060/index.html', 'KV-CU-BB10/index.html', 'families/profiles-6060-mill/index.html'])('prints %s with every character at 8 pt or more, and every table and chart within the page (never shrunk to fit)', async (file) => {
    // A4 is 210 × 297 mm (ISO 216); style.css @page leaves 12 mm left and right; CSS has 96 px to the inch (CSS Values and Units, absolute lengths); 1 pt = 1/72 in.
    const between = (paperMm: number) => ((paperMm - 2 * 12) / 25.4) * 96;
    const { page } = await open(file);
    await page.emulateMediaType('print');
    const problems: string[] = [];
    for (const [width, orientation] of [[between(210), 'portrait'], [between(297), 'landscape']] as const) {
      await page.setViewport({ width: Math.floor(width), height: 1000 });
      problems.push(
        ...(await page.evaluate(
          ({ width, orientation }) => {
            const found: string[] = [];
            const minimum = (8 * 96) / 72; // 8 pt in CSS px
            const pageOf = (el: Element) => (el.closest('section') && getComputedStyle(el.closest('section')!).getPropertyValue('page') === 'landscape' ? 'landscape' : 'portrait');
            const shown = (el: Element) => el.getClientRects().length > 0;
            const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
            for (let node = walker.nextNode(); node; node = walker.nextNode()) {
              const el = node.parentElement!;
              if (!node.textContent!.trim() || !shown(el) || pageOf(el) !== orientation) continue;
              // Chart text: its size as drawn, the SVG's scale included.
              const svg = el.closest('svg');
              const scale = svg ? svg.getBoundingClientRect().width / svg.width.baseVal.value : 1;
              const px = parseFloat(getComputedStyle(el).fontSize) * scale;
              if (px < minimum - 0.01) found.push(`${orientation}: "${node.textContent!.trim().slice(0, 30)}" at ${((px * 72) / 96).toFixed(2)} pt (${el.tagName.toLowerCase()}.${el.getAttribute('class') ?? ''})`);
            }
            for (const el of document.querySelectorAll('table, figure, svg, pre')) {
              if (!shown(el) || pageOf(el) !== orientation) continue;
              const right = el.getBoundingClientRect().right;
              if (right > width + 0.5) found.push(`${orientation}: ${el.tagName.toLowerCase()}.${el.getAttribute('class') ?? ''} reaches ${Math.round(right)} px of ${Math.floor(width)}`);
            }
            return found;
          },
          { width, orientation },
        )),
      );
    }
    await page.close();
    expect(problems).toEqual([]);
  });

  it('hostile input text stays text on the declaration, its charts and its audit trail (nothing runs)', async () => {
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    await editFile(path.join(data, 'products.csv'), (t) => t.replace('"Angle bracket 40 mm, hot-dip galvanised steel"', '"<script>alert(1)</script> ""><img src=x onerror=alert(2)> {{ 7*7 }}"'));
    await editFile(path.join(data, 'bom.csv'), (t) => t.replace('Steel blank', '<img src=x onerror=alert(3)>'));
    const hostileOut = path.join(path.dirname(data), 'out');
    const result = await runCli(['build', '--data', data, '--out', hostileOut, '--no-pdf']);
    expect(result.code, result.stderr).toBe(0);
    for (const file of ['index.html', 'KV-BR-40/index.html', 'KV-BR-40/audit.html']) {
      const { page, errors } = await open(file, hostileOut);
      const injected = await page.evaluate(() => document.querySelectorAll('script:not([src]), img').length);
      await page.close();
      expect(injected, file).toBe(0);
      expect(errors, file).toEqual([]);
    }
    const { page } = await open('KV-BR-40/index.html', hostileOut);
    expect(await page.$eval('h1', (h) => h.textContent)).toBe('<script>alert(1)</script> "><img src=x onerror=alert(2)> {{ 7*7 }}');
    // The chart label is the text, cut to the label width (vega-lite labelLimit), never an element.
    expect(await page.$eval('#chart-contributions svg', (svg) => svg.textContent)).toContain('<img src=x onerror=');
    expect(await page.$$eval('#chart-contributions svg img', (images) => images.length)).toBe(0);
    await page.close();
  });
});
