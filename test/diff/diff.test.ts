import { afterAll, describe, expect, it } from 'vitest';
import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { ChangedCells } from '../../src/diff/attribute.ts';
import { compareProduct, relativeChange } from '../../src/diff/compare.ts';
import { changeReport, changeReportMarkdown } from '../../src/diff/report.ts';
import type { ResultsSet } from '../../src/diff/results-set.ts';
import type { ResultsJson, ResultsSummary } from '../../src/report/results.ts';
import { GraphReader, type GraphJson } from '../../src/trace/graph-json.ts';
import { figureMap } from '../figures.ts';
import { demoCopy, editFile, editLine, removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

function summary(a1: number | null, d: number, recycled = 0.5): ResultsSummary {
  return {
    format: 2,
    product_id: 'P1',
    declared_unit: '1 kg',
    indicators: [{ code: 'GWP-total', unit: 'kg CO2 eq.', name: 'Climate change – total', basis: 'factors' }],
    methods: { cutoff: { modules: { A1: { 'GWP-total': a1 }, 'A1-A3': { 'GWP-total': a1 }, D: { 'GWP-total': d } }, total: { 'GWP-total': a1 } } },
    flows: { recycled_content: { pre: 0, post: recycled, total: recycled }, biogenic_carbon_kg: { product: 0, packaging: 0 }, biogenic_co2_kg: { product: 0, packaging: 0 } },
  };
}

describe('which figures moved', () => {
  it('reports a figure whose relative change is beyond the threshold, with old, new, absolute and relative change', () => {
    // Relative change = (new − old) / |old|: 10 → 10.5 is +5 %, −2 → −1 is +50 % (arithmetic).
    const changes = compareProduct(summary(10, -2), summary(10.5, -1), 0.01);
    const a13 = changes.find((c) => c.figure === 'cutoff/A1-A3/GWP-total')!;
    expect(a13).toMatchObject({ old: 10, new: 10.5, absolute: 0.5, relative: 0.05, headline: true, method: 'cutoff', module: 'A1-A3', indicator: 'GWP-total', unit: 'kg CO2 eq.' });
    expect(changes.find((c) => c.figure === 'cutoff/D/GWP-total')).toMatchObject({ absolute: 1, relative: 0.5, headline: true });
    expect(changes.find((c) => c.figure === 'cutoff/A1/GWP-total')?.headline).toBe(false);
  });

  it('leaves out changes within the threshold and reports every change at threshold 0', () => {
    expect(compareProduct(summary(10, -2), summary(10.05, -2), 0.01)).toEqual([]);
    expect(compareProduct(summary(10, -2), summary(10.05, -2), 0).map((c) => c.figure)).toEqual(['cutoff/A1/GWP-total', 'cutoff/A1-A3/GWP-total', 'cutoff/total/GWP-total']);
  });

  it('counts a figure that became incomplete, and a zero that became non-zero, as beyond any threshold', () => {
    const changes = compareProduct(summary(10, -2, 0), summary(null, -2, 0.2), 0.5);
    expect(changes.find((c) => c.figure === 'cutoff/A1-A3/GWP-total')).toMatchObject({ old: 10, new: null, absolute: null, relative: null });
    expect(changes.find((c) => c.figure === 'flows/recycled_content/total')).toMatchObject({ old: 0, new: 0.2, relative: null, headline: true });
    expect(relativeChange(0, 0)).toBe(0);
    expect(relativeChange(null, null)).toBe(0);
  });
});

describe('the declared result first', () => {
  /** A product whose cut-off A1-A3 moves 2 % and whose CFF total (a comparison method) moves 20 %. */
  const withCff = (a1: number, cff: number): ResultsSummary => {
    const base = summary(a1, -2);
    return { ...base, methods: { ...base.methods, cff: { parts: { material: { 'GWP-total': cff } }, total: { 'GWP-total': cff } } } } as ResultsSummary;
  };
  const set = (label: string, s: ResultsSummary): ResultsSet => ({ label, products: new Map([['P1', s]]), graph: async () => undefined, rowKey: (file, line) => `${file}:${line}`, root: label });

  it('lists cut-off and D before the comparison methods, and --fail-over guards the declared result unless told otherwise', async () => {
    const old = set('old', withCff(10, 10));
    const now = set('new', withCff(10.2, 12));
    const declared = await changeReport(old, now, { threshold: 0.01, failOver: 0.05 });
    expect(declared.changes[0]!.method).toBe('cutoff');
    expect(declared.changes.findIndex((c) => c.method === 'cff')).toBeGreaterThan(declared.changes.findIndex((c) => c.figure === 'cutoff/total/GWP-total'));
    // 2 % on the declared result is within 5 %; the CFF's 20 % is a comparison, not the declaration.
    expect(declared.over).toEqual([]);
    expect(changeReportMarkdown(declared)).toContain('No declared headline figure moved more than 5 %');
    const markdownRows = changeReportMarkdown(declared).split('\n').filter((line) => line.startsWith('| '));
    expect(markdownRows[2]).toContain('cutoff');
    const all = await changeReport(old, now, { threshold: 0.01, failOver: 0.05, failOverMethods: 'all' });
    expect(all.over.map((o) => o.figure)).toEqual(['cff/total/GWP-total']);
  });
});

describe('which input cells changed underneath', () => {
  // A format-2 graph of three vector steps; the factor row's GWP-total cell is read from the build's input copy.
  const step = (id: string, terms: GraphJson['steps'][number]['terms']) => ({ id, formula: '', description: '', unit: null, values: [1], terms, symbols: terms.map(() => 'x') });
  const graph = (factorLine: number, gwp: string, mass: string): GraphReader => {
    const json: GraphJson = {
      steps: [step('cutoff/A1/line:L1', [{ cell: 0 }, { row: 0 }]), step('cutoff/A1/line:L2', [{ cell: 1 }]), step('cutoff/A1', ['cutoff/A1/line:L1', 'cutoff/A1/line:L2'])],
      cells: [{ file: 'bom.csv', line: 3, column: 'mass_kg', value: mass }, { file: 'bom.csv', line: 4, column: 'mass_kg', value: '2' }],
      rows: [{ file: 'factors.csv', line: factorLine, factor_id: 'steel' }],
    };
    return new GraphReader(json, [{ code: 'GWP-total', unit: 'kg CO2 eq.' }], (file, line, column) => (file === 'factors.csv' && line === factorLine && column === 'GWP-total' ? gwp : undefined));
  };
  const keys = (factorLine: number) => (file: string, line: number) => (file === 'factors.csv' && line === factorLine ? 'steel' : `${file}:${line}`);

  it('matches rows by key, so a row that only moved to another line is not a change', () => {
    const cells = new ChangedCells(graph(7, '2.1', '1'), graph(9, '2.1', '1'), keys(7), keys(9));
    expect(cells.cells).toEqual([]);
    expect(cells.under('cutoff/A1/GWP-total')).toEqual([]);
  });

  it('finds a changed cell under the figures that read it and not under the others', () => {
    const cells = new ChangedCells(graph(7, '2.1', '1'), graph(9, '2.4', '1.5'), keys(7), keys(9));
    expect(cells.cells).toEqual([
      { file: 'bom.csv', row: 'bom.csv:3', column: 'mass_kg', old: { line: 3, value: '1' }, new: { line: 3, value: '1.5' } },
      { file: 'factors.csv', row: 'steel', column: 'GWP-total', old: { line: 7, value: '2.1' }, new: { line: 9, value: '2.4' } },
    ]);
    expect(cells.under('cutoff/A1/GWP-total')).toEqual([0, 1]);
    expect(cells.under('cutoff/A1/line:L2/GWP-total')).toEqual([]);
  });
});

describe('loopsheet diff on two builds of the demo', () => {
  it('explains a change down to the factor cell and the BOM cell, and fails over the --fail-over share', async () => {
    const data = await demoCopy();
    const work = await tempDir();
    dirs.push(path.dirname(data), work);
    const oldOut = path.join(work, 'old');
    const newOut = path.join(work, 'new');
    expect((await runCli(['build', '--data', data, '--out', oldOut, '--no-pdf'])).code).toBe(0);
    // factors.csv line 4: al-remelted-ingot GWP-total 0.625 → 0.705 (read by two profiles; KV-EXT-6060-T22 reads its billet supplier's dataset); bom.csv line 3: recycled_post 45% → 55% (KV-EXT-6060 only).
    await editLine(path.join(data, 'factors.csv'), 4, 'al-remelted-ingot,Aluminium ingot remelted from pre- and post-consumer scrap,kg,loopsheet illustrative factor set demo-1,Invented for the demo (illustrative),0.625,', 'al-remelted-ingot,Aluminium ingot remelted from pre- and post-consumer scrap,kg,loopsheet illustrative factor set demo-1,Invented for the demo (illustrative),0.705,');
    await editLine(path.join(data, 'bom.csv'), 3, '30%,45%', '30%,55%');
    // A comment line above moves every factor row down one line: rows are matched by key, not line.
    await editFile(path.join(data, 'factors.csv'), (text) => text.replace('\nal-primary-ingot,', '\n# moved\nal-primary-ingot,'));
    expect((await runCli(['build', '--data', data, '--out', newOut, '--no-pdf'])).code).toBe(0);

    const md = await runCli(['diff', oldOut, newOut]);
    expect(md.code, md.stderr).toBe(0);
    expect(md.stdout).toContain('5 products compared; 2 with figures that moved more than 1 %; 0 added; 0 removed.');
    expect(md.stdout).toContain('#### `KV-EXT-6060`');
    expect(md.stdout).toContain("`factors.csv` line 5 (`al-remelted-ingot`) `GWP-total`: `0.625` → `0.705` (was line 4)");
    expect(md.stdout).toContain("`bom.csv` line 3 (`KV-EXT-6060 · L1`) `recycled_post`: `45%` → `55%`");
    expect(md.stdout).not.toContain('KV-BR-40');
    expect(md.stdout.split('\n').length).toBeLessThan(60);

    const json = await runCli(['diff', oldOut, newOut, '--format', 'json', '--threshold', '0']);
    expect(json.code).toBe(0);
    const report = JSON.parse(json.stdout) as { changes: Array<{ product_id: string; figure: string; old: number; new: number; absolute: number; relative: number; inputs: number[] }>; inputs: Array<{ file: string; column: string; row: string }> };
    const read = async (dir: string) => JSON.parse(await readFile(path.join(dir, 'KV-EXT-6060', 'results.json'), 'utf8')) as ResultsJson;
    const [before, after] = await Promise.all([read(oldOut), read(newOut)]);
    const a13 = report.changes.find((c) => c.product_id === 'KV-EXT-6060' && c.figure === 'cutoff/A1-A3/GWP-total')!;
    const oldValue = before.methods.cutoff.modules['A1-A3']!['GWP-total']!;
    const newValue = after.methods.cutoff.modules['A1-A3']!['GWP-total']!;
    // The report's numbers against the two results.json files, by plain arithmetic.
    expect(a13.old).toBe(oldValue);
    expect(a13.new).toBe(newValue);
    expect(a13.absolute).toBeCloseTo(newValue - oldValue, 12);
    expect(a13.relative).toBeCloseTo((newValue - oldValue) / Math.abs(oldValue), 12);
    expect(a13.inputs.map((k) => `${report.inputs[k]!.file} ${report.inputs[k]!.row} ${report.inputs[k]!.column}`).sort()).toEqual(['bom.csv KV-EXT-6060 · L1 recycled_post', 'factors.csv al-remelted-ingot GWP-total']);
    // Every published figure (method/module/indicator, flows) that differs between the two files is in the report at threshold 0.
    const published = (id: string) => /^(cutoff|cff|eol-recycling|fifty-fifty|flows)\/[^/]+\/[^/]+$/.test(id) && !id.includes('/line:');
    const [beforeFigures, afterFigures] = [figureMap(before), figureMap(after)];
    const moved = Object.keys(afterFigures).filter((id) => published(id) && afterFigures[id]!.value !== beforeFigures[id]?.value);
    expect(moved.length).toBeGreaterThan(20);
    for (const id of moved) expect(report.changes.some((c) => c.figure === id), id).toBe(true);

    const over = await runCli(['diff', oldOut, newOut, '--fail-over', '5%']);
    expect(over.code).toBe(1);
    expect(over.stderr).toContain('KV-EXT-6060 cutoff/A1-A3/GWP-total');
    expect((await runCli(['diff', oldOut, newOut, '--fail-over', '90%'])).code).toBe(0);
    expect((await runCli(['diff', oldOut, oldOut, '--fail-over', '0%'])).stdout).toContain('0 with figures that moved');
  });

  it('lists products added and removed, reads single results.json files, and refuses what it cannot read', async () => {
    const data = await demoCopy();
    const work = await tempDir();
    dirs.push(path.dirname(data), work);
    expect((await runCli(['build', '--data', data, '--out', path.join(work, 'old'), '--no-pdf'])).code).toBe(0);
    for (const file of ['products.csv', 'bom.csv', 'activities.csv', 'transport.csv']) await editFile(path.join(data, file), (text) => text.replaceAll('KV-BR-40', 'KV-BR-41'));
    expect((await runCli(['build', '--data', data, '--out', path.join(work, 'new'), '--no-pdf'])).code).toBe(0);
    const md = await runCli(['diff', path.join(work, 'old'), path.join(work, 'new')]);
    expect(md.stdout).toContain('4 products compared');
    expect(md.stdout).toContain('Added: `KV-BR-41`');
    expect(md.stdout).toContain('Removed: `KV-BR-40`');
    const single = await runCli(['diff', path.join(work, 'old', 'KV-CU-BB10', 'results.json'), path.join(work, 'new', 'KV-CU-BB10', 'results.json'), '--format', 'json']);
    expect(single.code, single.stderr).toBe(0);
    expect(JSON.parse(single.stdout).products).toEqual({ compared: 1, changed: [], added: [], removed: [] });
    const missing = await runCli(['diff', path.join(work, 'nowhere'), path.join(work, 'new')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('no such file or folder');
    expect((await runCli(['diff', path.join(work, 'old'), path.join(work, 'new'), '--threshold', 'lots'])).stderr).toContain('expected a percentage such as 1%');
    // A build of results format 1 (loopsheet 0.1: no "format", a "figures" map) is named as a build to redo.
    const current = JSON.parse(await readFile(path.join(work, 'old', 'KV-CU-BB10', 'results.json'), 'utf8')) as ResultsJson;
    const { graph: _graph, format: _format, ...rest } = current;
    const formatOne = path.join(work, 'format1.json');
    await writeFile(formatOne, JSON.stringify({ ...rest, figures: {} }));
    for (const sides of [[formatOne, path.join(work, 'new', 'KV-CU-BB10', 'results.json')], [path.join(work, 'old', 'KV-CU-BB10', 'results.json'), formatOne]]) {
      const old = await runCli(['diff', ...sides]);
      expect(old.code).toBe(2);
      expect(old.stderr).toContain('format1.json: results format 1 (an earlier loopsheet); expected results format 2: build that side again with this loopsheet');
    }
  });
});
