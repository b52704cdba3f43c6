import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { resultsSchema } from '../../src/report/results-schema.ts';
import type { ResultsJson } from '../../src/report/results.ts';
import { GraphReader } from '../../src/trace/graph-json.ts';
import { execFileSync } from 'node:child_process';
import { ROOT, buildFresh, demoCopy, editLine, removeDir, runCli } from '../helpers.ts';

/**
 * Every figure id that any output names resolves in the product's published graph:
 * results.csv, results.json, every link into an audit trail on every page (declarations,
 * catalogue, factor table, verification pack, family pages), and diff's report. The demo is
 * built once for the file.
 */
const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

let out = '';
const graphs = new Map<string, GraphReader>();
const products: ResultsJson[] = [];

beforeAll(async () => {
  const built = await buildFresh();
  dirs.push(built.dir);
  expect(built.result.code, built.result.stderr).toBe(0);
  out = built.out;
  const catalogue = JSON.parse(await readFile(path.join(out, 'results.json'), 'utf8')) as { format: number; products: Array<{ product_id: string }> };
  expect(catalogue.format).toBe(2);
  for (const { product_id } of catalogue.products) {
    const json = JSON.parse(await readFile(path.join(out, product_id, 'results.json'), 'utf8')) as ResultsJson;
    products.push(json);
    graphs.set(product_id, new GraphReader(json.graph, json.indicators));
  }
});

const resolves = (productId: string, id: string): boolean => graphs.get(productId)?.figure(id) !== undefined;

const escapeHtml = (text: string) => text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');

/** Text of an HTML attribute as the browser reads it. */
const unescape = (text: string) => text.replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&amp;/g, '&');

async function htmlFiles(dir: string): Promise<string[]> {
  const found: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) found.push(...(await htmlFiles(full)));
    else if (entry.name.endsWith('.html')) found.push(full);
  }
  return found;
}

describe('every figure id an output names resolves in the graph', () => {
  it('results.json: is format 2 by its own schema, and every value of the methods and flows maps is the figure its id names', () => {
    for (const json of products) {
      // The zod schema that `loopsheet schema` publishes as results.schema.json.
      expect(() => resultsSchema.parse(json), json.product_id).not.toThrow();
      const graph = graphs.get(json.product_id)!;
      const check = (id: string, value: number | null | undefined) => expect(graph.figure(id)?.value, `${json.product_id} ${id}`).toBe(value ?? null);
      for (const [module, values] of Object.entries(json.methods.cutoff.modules)) for (const [code, value] of Object.entries(values)) check(`cutoff/${module}/${code}`, value);
      for (const [code, value] of Object.entries(json.methods.cutoff.total)) check(`cutoff/total/${code}`, value);
      for (const method of ['cff', 'eol-recycling', 'fifty-fifty'] as const) {
        const result = json.methods[method];
        expect(result, `${json.product_id} ${method}`).toBeDefined();
        for (const [part, values] of Object.entries(result!.parts)) for (const [code, value] of Object.entries(values)) check(`${method}/${part}/${code}`, value);
        for (const [code, value] of Object.entries(result!.total)) check(`${method}/total/${code}`, value);
      }
      for (const [group, values] of Object.entries(json.flows)) for (const [key, value] of Object.entries(values as Record<string, number | null>)) check(`flows/${group}/${key}`, value);
      // Every term names a step of the graph, or a cell or row stored once.
      const steps = new Set(json.graph.steps.map((s) => s.id));
      for (const step of json.graph.steps) {
        expect(step.symbols.length).toBe(step.terms.length);
        for (const term of step.terms) {
          if (typeof term === 'string') expect(steps.has(term), `${step.id} → ${term}`).toBe(true);
          else if ('cell' in term) expect(json.graph.cells[term.cell], step.id).toBeDefined();
          else expect(json.graph.rows[term.row], step.id).toBeDefined();
        }
      }
    }
  });

  it('results.csv: every figure_id of every product, and of the catalogue file (each row one figure with its value)', async () => {
    const rows = parse(await readFile(path.join(out, 'results.csv'), 'utf8'), { columns: true }) as Array<Record<string, string>>;
    expect(rows.length).toBeGreaterThan(1000);
    for (const row of rows) {
      const figure = graphs.get(row.product_id!)!.figure(row.figure_id!);
      expect(figure, `${row.product_id} ${row.figure_id}`).toBeDefined();
      expect(row.value === '' ? null : Number(row.value), `${row.product_id} ${row.figure_id}`).toBe(figure!.value);
    }
    // The shared energy and disposal parts are named under every method that reports them.
    expect(rows.some((row) => row.figure_id === 'eol-recycling/energy/GWP-total')).toBe(true);
    expect(rows.some((row) => row.figure_id === 'fifty-fifty/disposal/AP')).toBe(true);
  });

  it('every link into an audit trail, on every page, lands on an anchor of that page and, unless it is an input row, on a figure or step of the graph', async () => {
    const anchorsOf = new Map<string, Set<string>>();
    const anchors = async (file: string) => {
      let set = anchorsOf.get(file);
      if (!set) anchorsOf.set(file, (set = new Set([...(await readFile(file, 'utf8')).matchAll(/ id="([^"]*)"/g)].map((m) => unescape(m[1]!)))));
      return set;
    };
    let links = 0;
    for (const file of await htmlFiles(out)) {
      const html = await readFile(file, 'utf8');
      for (const match of html.matchAll(/href="([^"#]*audit\.html)?#([^"]*)"/g)) {
        const target = match[1] ? path.resolve(path.dirname(file), unescape(match[1])) : file;
        if (path.basename(target) !== 'audit.html') continue;
        const fragment = decodeURIComponent(unescape(match[2]!));
        const where = `${path.relative(out, file)} → ${path.relative(out, target)}#${fragment}`;
        expect((await anchors(target)).has(fragment), where).toBe(true);
        links++;
        if (/^(input:|i\d+$|values:|group-|main$|inputs$)/.test(fragment)) continue;
        const folder = path.basename(path.dirname(target));
        // s<k> and v<k>: step k of results.json graph.steps, and its values row; the page names the step it shows.
        const indexed = /^[sv](\d+)$/.exec(fragment);
        if (indexed) {
          const step = products.find((p) => p.product_id === folder)!.graph.steps[Number(indexed[1])];
          expect(step, where).toBeDefined();
          const page = await readFile(target, 'utf8');
          // A step entry, a row of a run's table (its head cell is what the step's id puts for the run pattern's `*`), or a values row.
          const key = /(?:line|packaging|material):([^/]+)/.exec(step!.id)?.[1];
          expect(fragment.startsWith('s')
            ? page.includes(`id="${fragment}"><h3><code>${escapeHtml(step!.id)}</code>`) || (key !== undefined && page.includes(`<tr id="${fragment}"><th>${escapeHtml(key)}<`) && page.includes(`<code>${escapeHtml(step!.id.replace(`:${key}`, ':*'))}</code>`))
            : page.includes(`id="${fragment}"><th><a href="#s${indexed[1]}">${escapeHtml(step!.id)}</a>`), where).toBe(true);
          continue;
        }
        // A family's figure has the id of its members' figures: it resolves in each member's graph.
        const owners = path.basename(path.dirname(path.dirname(target))) === 'families'
          ? (JSON.parse(await readFile(path.join(path.dirname(target), 'results.json'), 'utf8')) as { members: Array<{ product_id: string }> }).members.map((m) => m.product_id)
          : [folder];
        for (const owner of owners) expect(resolves(owner, fragment) || graphs.get(owner)!.step(fragment) !== undefined, `${where} in ${owner}`).toBe(true);
      }
    }
    expect(links).toBeGreaterThan(3000);
  });

  it('the reader in docs/results-format.md walks a figure down to its cells, as written in results.json', async () => {
    const doc = await readFile(path.join(ROOT, 'docs/results-format.md'), 'utf8');
    const code = /```js\n([\s\S]*?)```/.exec(doc)![1]!.replace("'out/KV-EXT-6060/results.json'", JSON.stringify(path.join(out, 'KV-EXT-6060', 'results.json')));
    const printed = execFileSync(process.execPath, ['--input-type=module', '-e', code], { encoding: 'utf8' });
    const json = products.find((p) => p.product_id === 'KV-EXT-6060')!;
    expect(printed.split('\n')[0]).toBe(`cutoff/A1-A3/GWP-total = ${json.methods.cutoff.modules['A1-A3']!['GWP-total']}   A1-A3 = A1 + A2 + A3`);
    expect(printed).toContain('bom.csv:3 mass_kg = "0.83"');
    expect(printed).toMatch(/factors\.csv:\d+ GWP-total \(factor /);
  });

  it('diff: every figure of the change report, and every input it names', async () => {
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    // factors.csv line 4: al-remelted-ingot, GWP-total 0.62 → 0.72 (read by two profiles).
    await editLine(path.join(data, 'factors.csv'), 4, ',0.62,', ',0.72,');
    const changed = await buildFresh(data);
    dirs.push(changed.dir);
    const diff = await runCli(['diff', out, changed.out, '--threshold', '0', '--format', 'json']);
    expect(diff.code, diff.stderr).toBe(0);
    const report = JSON.parse(diff.stdout) as { changes: Array<{ product_id: string; figure: string; inputs: number[] | null }> };
    expect(report.changes.length).toBeGreaterThan(10);
    for (const change of report.changes) expect(resolves(change.product_id, change.figure), `${change.product_id} ${change.figure}`).toBe(true);
    expect(report.changes.every((change) => change.inputs !== null && change.inputs.length > 0)).toBe(true);
  });
});
