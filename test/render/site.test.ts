import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { readdir, readFile, rm, stat } from 'node:fs/promises';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { findBrowser } from '../../src/render/browser.ts';
import { DEMO, ROOT, buildFresh, declaredNotation, demoCopy, editFile, hasCommand, missingTool, removeDir, runCli, tempDir } from '../helpers.ts';

const declared = declaredNotation;

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

describe('input text is escaped on every page', () => {
  it('renders <script>, attribute breakers and template syntax from the CSV as text', async () => {
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    const hostile = '<script>alert(1)</script> "><img src=x onerror=alert(2)> {{ 7*7 }} {% raw %}';
    await editFile(path.join(data, 'products.csv'), (t) => t.replace('"Angle bracket 40 mm, hot-dip galvanised steel"', `"${hostile.replace(/"/g, '""')}"`));
    await editFile(path.join(data, 'bom.csv'), (t) => t.replace('Steel blank', '<b onmouseover=alert(3)>Steel</b>'));
    const out = path.join(path.dirname(data), 'out');
    const result = await runCli(['build', '--data', data, '--out', out, '--no-pdf']);
    expect(result.code, result.stderr).toBe(0);
    for (const page of ['index.html', 'KV-BR-40/index.html']) {
      const html = await readFile(path.join(out, page), 'utf8');
      expect(html).not.toContain('<script>alert');
      expect(html).not.toContain('<img src=x');
      expect(html).not.toContain('<b onmouseover');
      expect(html).not.toMatch(/>\s*49\s*</);
      expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
      expect(html).toContain('{{ 7*7 }}');
    }
  });
});

describe('PDF in a real Chromium', async () => {
  const browser = !missingTool('Chromium or Chrome (PUPPETEER_EXECUTABLE_PATH, PATH or the puppeteer cache)', (await findBrowser()) !== undefined, 'apt-get install chromium, as .ci/run does.');
  const pdftotext = !missingTool('pdftotext (poppler-utils)', hasCommand('pdftotext'), 'apt-get install poppler-utils, as .ci/run does.');
  let out = '';
  let stderr = '';
  beforeAll(async () => {
    if (!browser) return;
    const dir = await tempDir();
    dirs.push(dir);
    out = path.join(dir, 'out');
    const result = await runCli(['build', '--data', DEMO, '--out', out, '--pdf']);
    expect(result.code, result.stderr).toBe(0);
    stderr = result.stderr;
  });

  it.skipIf(!browser)('writes a PDF per product and says which browser it used', async () => {
    expect(stderr).toMatch(/PDF: using .+ \(found via (PUPPETEER_EXECUTABLE_PATH|PATH|puppeteer cache)\)/);
    for (const id of ['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40']) {
      const pdf = await readFile(path.join(out, id, 'declaration.pdf'));
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
      expect((await stat(path.join(out, id, 'declaration.pdf'))).size).toBeGreaterThan(10_000);
    }
  });

  it.skipIf(!browser || !pdftotext)('the PDF has text, the draft banner and the illustrative label (read with poppler pdftotext)', () => {
    const text = execFileSync('pdftotext', ['-layout', path.join(out, 'KV-CU-BB10', 'declaration.pdf'), '-'], { encoding: 'utf8' });
    expect(text).toContain('Draft — not verified.');
    expect(text).toContain('Illustrative data.');
    expect(text).toContain('Copper busbar 10 × 100 mm');
    // The disclaimers EN 15804+A2 requires beside IRP and the high-uncertainty indicators are printed.
    expect(text.replace(/\s+/g, ' ')).toContain('shall be used with care, as the uncertainties on these results are high');
    expect(text.replace(/\s+/g, ' ')).toContain('low-dose ionising radiation on human health of the nuclear fuel cycle');
    // The printed results table is results.json rounded to three significant figures.
    const results = JSON.parse(readFileSync(path.join(out, 'KV-CU-BB10', 'results.json'), 'utf8'));
    const modules = results.methods.cutoff.modules as Record<string, Record<string, number | null>>;
    for (const [module, values] of Object.entries(modules)) {
      for (const [code, value] of Object.entries(values)) expect(text, `${module} ${code}`).toContain(value === null ? 'n/a' : declared(value));
    }
    // Row by row: the GWP-total line of the printed table carries the modules in order, A1 … D.
    // The unit wraps in print ("kg CO2" / "eqv."): the line holds the code, the first line of the unit and the values.
    const gwpLine = text.split('\n').find((line) => /^\s*GWP-total\s+kg CO2\s+-?\d/.test(line))!;
    expect(gwpLine.trim().split(/\s+/).slice(3)).toEqual(Object.values(modules).map((values) => declared(values['GWP-total']!)));
    expect(text).toMatch(/page 1 of \d/);
    // The draft status is in the running head of every page (pdftotext separates pages with form feeds).
    const pages = text.split('\f').filter((page) => page.trim() !== '');
    expect(pages.length).toBeGreaterThan(1);
    for (const page of pages) expect(page).toContain('DRAFT — not verified');
    // The inputs as the appendix, no navigation, and each caution once (the first words of the one on public claims).
    expect(text).toContain('Appendix: Inputs');
    expect(text).not.toContain('Catalogue ›');
    expect(text.match(/This is a public environmental/g)).toHaveLength(1);
    for (const page of pages) expect(page).toContain('Illustrative data: invented values, not a real dataset');
    // No link in the PDF points into the build folder (it would be a file:// path of this machine).
    expect(readFileSync(path.join(out, 'KV-CU-BB10', 'declaration.pdf'), 'latin1')).not.toContain('file://');
  });

  it.skipIf(!browser)('says where a default comes from on every page, never "from memory" (a public claim names its source or its setting)', async () => {
    const pages = (await readdir(out, { recursive: true })).filter((file) => file.endsWith('.html'));
    expect(pages.length).toBeGreaterThan(10);
    for (const page of pages) expect(await readFile(path.join(out, page), 'utf8'), page).not.toMatch(/from memory/i);
  });

  it.skipIf(!browser || !pdftotext)('heads every page of a verified declaration’s PDF with its date of verification (the demo’s record covers KV-EXT-6060-T19)', () => {
    const text = execFileSync('pdftotext', ['-layout', path.join(out, 'KV-EXT-6060-T19', 'declaration.pdf'), '-'], { encoding: 'utf8' });
    const pages = text.split('\f').filter((page) => page.trim() !== '');
    for (const page of pages) expect(page).toContain('verified 2026-11-30');
    expect(text).not.toContain('DRAFT — not verified');
  });

  it.skipIf(!browser || !pdftotext)('prints the family page with its weighted averages, the draft status on every page (poppler pdftotext)', async () => {
    const file = path.join(out, 'families', 'profiles-6060-mill', 'declaration.pdf');
    expect((await readFile(file)).subarray(0, 5).toString()).toBe('%PDF-');
    const text = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    const family = JSON.parse(readFileSync(path.join(out, 'families', 'profiles-6060-mill', 'results.json'), 'utf8'));
    expect(text).toContain('Extruded hollow profiles, EN AW-6060, mill finish');
    expect(text).toContain(declared(family.methods.cutoff.modules['A1-A3']['GWP-total'].mean));
    for (const page of text.split('\f').filter((p) => p.trim() !== '')) expect(page).toContain('DRAFT — not verified');
  });

  it.skipIf(!browser || !pdftotext)('prints every PDF at 8 pt or more (poppler pdftohtml reads each text run’s font size), the family’s results and the inputs on landscape pages', async () => {
    const pdfs = [...['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40'].map((id) => path.join(out, id, 'declaration.pdf')), path.join(out, 'families', 'profiles-6060-mill', 'declaration.pdf')];
    for (const pdf of pdfs) {
      // -zoom 1: sizes in points, rounded to whole points by pdftohtml (the browser test measures exactly).
      const xml = execFileSync('pdftohtml', ['-xml', '-i', '-stdout', '-zoom', '1', pdf], { encoding: 'utf8' });
      const sizes = [...xml.matchAll(/<fontspec [^>]*size="([\d.]+)"/g)].map((m) => Number(m[1]));
      expect(Math.min(...sizes), pdf).toBeGreaterThanOrEqual(8);
      // Not shrunk to fit: the title prints at the size the stylesheet gives it (1.6rem of 9 pt = 14.4 pt).
      expect(Math.max(...sizes), pdf).toBe(14);
    }
    // Page sizes in points (1/72 in): A4 (ISO 216, 210 × 297 mm) is 595 × 842 portrait.
    const sizes = (pdf: string) => [...execFileSync('pdfinfo', ['-f', '1', '-l', '99', pdf], { encoding: 'utf8' }).matchAll(/Page\s+\d+ size:\s+([\d.]+) x ([\d.]+)/g)].map((m) => (Number(m[1]) > Number(m[2]) ? 'landscape' : 'portrait'));
    const family = sizes(pdfs[3]!);
    expect(family[0]).toBe('portrait');
    expect(family).toContain('landscape');
    expect(sizes(pdfs[0]!).at(-1)).toBe('landscape');
    // PNGs of the family PDF for a person to look at (poppler pdftoppm).
    execFileSync('pdftoppm', ['-r', '80', '-png', pdfs[3]!, path.join(ROOT, 'test', 'artifacts', 'family-profiles-6060-mill-pdf')]);
    expect((await readdir(path.join(ROOT, 'test', 'artifacts'))).filter((name) => name.startsWith('family-profiles-6060-mill-pdf')).length).toBe(family.length);
  });
});

describe('declaration.json report settings', () => {
  it('prints the declared number of significant figures and compares the chosen indicators under every method', async () => {
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    await editFile(path.join(data, 'declaration.json'), (t) => t.replace('"illustrative": true', '"report": { "significant_figures": 4, "compare_indicators": ["GWP-total", "AP", "SM"] },\n  "illustrative": true'));
    const out = path.join(path.dirname(data), 'out');
    const result = await runCli(['build', '--data', data, '--out', out, '--no-pdf']);
    expect(result.code, result.stderr).toBe(0);
    // SM comes from mass flows, not factors: the comparison leaves it out, with a warning at its place in the file.
    expect(result.stderr).toMatch(/declaration\.json:\d+:\d+: report\.compare_indicators "SM": .*\[INDICATOR_NO_DATA\]/);
    const page = await readFile(path.join(out, 'KV-EXT-6060', 'index.html'), 'utf8');
    const results = JSON.parse(await readFile(path.join(out, 'KV-EXT-6060', 'results.json'), 'utf8'));
    // Four significant figures: toExponential(3) (ECMA-262 Number.prototype.toExponential), in the E notation.
    expect(page).toContain(`>${declared(results.methods.cutoff.modules.A1['GWP-total'], 4)}<`);
    expect(page).toContain('AP (mol H+ eqv.)');
    for (const method of ['cff', 'eol-recycling', 'fifty-fifty']) expect(page).toContain(`>${declared(results.methods[method].total.AP, 4)}<`);
  });
});

describe('a verified declaration', () => {
  it('drops the draft banner and names the verifier and the date, on the pages of the product its record covers', async () => {
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    const out = path.join(path.dirname(data), 'out');
    await rm(path.join(data, 'verification-record.json'));
    expect((await runCli(['build', '--data', data, '--out', out, '--no-pdf'])).code).toBe(0);
    // Signed with the fixtures' demo key (test/fixtures/verifier/README.md).
    const signed = await runCli(['verify', '--data', data, '--out', out, '--key', path.join(ROOT, 'test/fixtures/verifier/DEMO-ONLY-verifier.key.pem'), '--verifier', 'A. Verifier (fictional)', '--date', '2026-04-01', '--products', 'KV-EXT-6060', '--families', '']);
    expect(signed.code, signed.stderr).toBe(0);
    const result = await runCli(['build', '--data', data, '--out', out, '--no-pdf']);
    expect(result.code, result.stderr).toBe(0);
    for (const page of ['KV-EXT-6060/index.html', 'KV-EXT-6060/audit.html']) {
      const html = await readFile(path.join(out, page), 'utf8');
      expect(html, page).not.toContain('Draft — not verified');
      expect(html, page).toContain('Illustrative data.');
    }
    expect(await readFile(path.join(out, 'KV-EXT-6060', 'index.html'), 'utf8')).toContain('verified by A. Verifier (fictional) on 2026-04-01');
    // The catalogue stays a draft while any declaration is, and says how many are verified.
    const catalogue = await readFile(path.join(out, 'index.html'), 'utf8');
    expect(catalogue).toContain('Draft — not verified');
    expect(catalogue).toContain('1 declaration of 5 as verified');
    expect(await readFile(path.join(out, 'KV-CU-BB10', 'index.html'), 'utf8')).toContain('Draft — not verified');
  });
});

describe('the process model on a declaration', () => {
  it('shows each process the product rests on, its derivation, its factor and the regulatory caution', async () => {
    const { dir, out, result } = await buildFresh();
    dirs.push(dir);
    expect(result.code, result.stderr).toBe(0);
    const aluminium = await readFile(path.join(out, 'KV-EXT-6060', 'index.html'), 'utf8');
    expect(aluminium).toContain('<h2>Process model</h2>');
    expect(aluminium).toContain('glenmoor-potline (electrolysis-aluminium)');
    expect(aluminium).toContain('must follow the monitoring rules of the jurisdiction and be verified by an accredited body');
    expect(aluminium).toContain('href="audit.html#process/glenmoor-potline/factor/GWP-total"');
    expect(aluminium).toContain('IPCC 2006 Tier 2, prebake equation');
    // Its operating data are listed with the inputs, each row with its place in process.csv.
    expect(aluminium).toContain('process.csv:4');
    const copper = await readFile(path.join(out, 'KV-CU-BB10', 'index.html'), 'utf8');
    expect(copper).toContain('redcliff-tankhouse (electrowinning)');
    // The steel bracket rests on no process of its own.
    expect(await readFile(path.join(out, 'KV-BR-40', 'index.html'), 'utf8')).not.toContain('id="process-model"');
  });
});
