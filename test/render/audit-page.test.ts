import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import puppeteer, { type Browser, type Page } from 'puppeteer';
import { CHROMIUM_ARGS, findBrowser } from '../../src/render/browser.ts';
import type { ResultsJson } from '../../src/report/results.ts';
import { writeSyntheticProject } from '../../scripts/synthetic.ts';
import { missingTool, removeDir, runCli, tempDir } from '../helpers.ts';

/**
 * The audit page of a product with many lines (a synthetic project: 2 products × 8 BOM lines ×
 * 25 indicators), where steps of one kind are laid out as runs, one table each: read in a real
 * Chromium, every step of results.json is on the page under its id and links to exactly its
 * terms (other steps, input rows), every figure id reaches its value, and each input row lists
 * exactly the steps that read it. The demo (two lines a product) has no runs; this is where
 * they are checked.
 */
const found = await findBrowser();
const skip = missingTool('Chromium or Chrome (PUPPETEER_EXECUTABLE_PATH, PATH or the puppeteer cache)', found !== undefined, 'apt-get install chromium, as .ci/run does.');

let dir = '';
let browser: Browser | undefined;
let page: Page;
let json: ResultsJson;
const errors: string[] = [];

beforeAll(async () => {
  if (!found) return;
  dir = await tempDir();
  const data = path.join(dir, 'data');
  await writeSyntheticProject(data, { products: 2, linesPerProduct: 8, indicators: 25 });
  const result = await runCli(['build', '--data', data, '--out', path.join(dir, 'out'), '--no-pdf']);
  expect(result.code, result.stderr).toBe(0);
  const product = 'P000001';
  json = JSON.parse(await readFile(path.join(dir, 'out', product, 'results.json'), 'utf8')) as ResultsJson;
  browser = await puppeteer.launch({ executablePath: found.executablePath, headless: true, args: CHROMIUM_ARGS });
  page = await browser.newPage();
  page.on('pageerror', (error) => errors.push((error as Error).message));
  page.on('console', (message) => {
    if (message.type() === 'error') errors.push(message.text());
  });
  await page.goto(pathToFileURL(path.join(dir, 'out', product, 'audit.html')).href, { waitUntil: 'load' });
}, 60_000);
afterAll(async () => {
  await browser?.close();
  if (dir) await removeDir(dir);
});

describe.skipIf(skip)('an audit page with runs of steps, in a real Chromium', () => {
  it('shows every step of results.json under its id, linked to exactly its terms', async () => {
    expect(await page.$$eval('div.run', (runs) => runs.length)).toBeGreaterThan(8);
    // What the page shows for each step: its id and the targets of its term links (a step id, or input:<file>:<line>).
    const shown = await page.evaluate((ids: string[]) => {
      const idOf = (element: Element): string => {
        const input = element.closest('.input-row');
        if (input) return input.id;
        const k = /^s(\d+)$/.exec(element.id);
        return k ? ids[Number(k[1])]! : element.id;
      };
      return ids.map((id, k) => {
        const element = document.getElementById(`s${k}`) ?? document.getElementById(id);
        if (!element) return undefined;
        let name: string;
        let links: Element[];
        if (element.tagName === 'TR') {
          const run = element.closest('div.run')!;
          name = run.querySelector('h3 code')!.textContent!.replace('*', (element as HTMLTableRowElement).cells[0]!.firstChild!.textContent!);
          links = [...Array.from(run.querySelectorAll('p.shared a')), ...Array.from(element.querySelectorAll('td a'))];
        } else {
          name = element.querySelector('h3 code')!.textContent!;
          links = Array.from(element.querySelectorAll('ul.terms a, table.terms td a'));
        }
        return { name, targets: [...new Set(links.map((a) => idOf(document.getElementById(decodeURIComponent(a.getAttribute('href')!.slice(1)))!)))].sort() };
      });
    }, json.graph.steps.map((step) => step.id));
    const input = (ref: { file: string; line: number }) => `input:${ref.file}:${ref.line}`;
    json.graph.steps.forEach((step, k) => {
      const expected = [...new Set(step.terms.map((t) => (typeof t === 'string' ? t : 'cell' in t ? input(json.graph.cells[t.cell]!) : input(json.graph.rows[t.row]!))))].sort();
      expect(shown[k], step.id).toEqual({ name: step.id, targets: expected });
    });
  });

  it('reaches every figure id step/indicator of a step with a value per indicator, and shows its value to six significant figures', async () => {
    const codes = json.indicators.map((i) => i.code);
    // Values of flow indicators (basis flows) are null on a step with values: they are steps of their own.
    const factors = json.indicators.flatMap((indicator, i) => (indicator.basis === 'factors' ? [i] : []));
    expect(factors).toHaveLength(25);
    let checked = 0;
    for (const step of json.graph.steps) {
      if (!('values' in step) || !step.values) continue;
      for (const i of [factors[0]!, factors[12]!, factors.at(-1)!]) {
        const figure = `${step.id}/${codes[i]}`;
        const text = await page.evaluate(async (hash) => {
          const changed = new Promise((resolve) => window.addEventListener('hashchange', resolve, { once: true }));
          location.hash = hash;
          await changed;
          const cell = document.getElementById(hash) ?? document.querySelector('.addressed');
          return cell ? { text: cell.textContent!, code: cell.getAttribute('data-code') } : undefined;
        }, figure);
        const value = step.values[i]!;
        expect(text, figure).toBeDefined();
        expect(text!.code, figure).toBe(codes[i]);
        // Six significant figures: within half a unit of the sixth digit (relative 5e-6).
        expect(Math.abs(Number(text!.text) - value), `${figure}: ${text!.text} for ${value}`).toBeLessThanOrEqual(Math.abs(value) * 5e-6 + 1e-300);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(200);
  });

  it('lists under an input row exactly the steps that read it, rows of runs included', async () => {
    const bom = json.graph.cells.find((cell) => cell.file === 'bom.csv')!;
    const readBy = await page.evaluate((anchor) => Array.from(document.getElementById(anchor)!.querySelectorAll('.used-by a')).map((a) => a.textContent!), `input:bom.csv:${bom.line}`);
    const cells = new Set(json.graph.cells.flatMap((cell, k) => (cell.file === 'bom.csv' && cell.line === bom.line ? [k] : [])));
    const expected = json.graph.steps.filter((step) => step.terms.some((t) => typeof t === 'object' && 'cell' in t && cells.has(t.cell))).map((step) => step.id);
    expect(expected.length).toBeGreaterThan(3);
    expect([...readBy].sort()).toEqual([...expected].sort());
    expect(errors).toEqual([]);
  });
});
