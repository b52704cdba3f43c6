import { afterAll, describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Family } from '../../src/model/families.ts';
import { loadProject } from '../../src/model/project.ts';
import { familyResults, familyResultsCsv, familyWarnings } from '../../src/report/families.ts';
import type { ResultsSummary } from '../../src/report/results.ts';
import { demoCopy, editFile, editLine, removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

/** A member's summary with one indicator; module C4 only where given. */
function summary(id: string, a13: number | null, d: number, c4?: number): ResultsSummary {
  const modules: Record<string, Record<string, number | null>> = { 'A1-A3': { 'GWP-total': a13 }, D: { 'GWP-total': d } };
  if (c4 !== undefined) modules.C4 = { 'GWP-total': c4 };
  return {
    format: 2,
    product_id: id,
    declared_unit: '1 kg',
    indicators: [{ code: 'GWP-total', unit: 'kg CO2 eq.', name: 'Climate change', basis: 'factors' }],
    methods: { cutoff: { modules, total: { 'GWP-total': a13 } } },
    flows: { recycled_content: { pre: 0.1, post: 0.2, total: 0.3 }, biogenic_carbon_kg: { product: 0, packaging: 0 }, biogenic_co2_kg: { product: 0, packaging: 0 } },
  };
}

const family = (weights: Record<string, number>): Family => ({
  id: 'F',
  name: 'Family F',
  declaredUnit: '1 kg',
  members: Object.entries(weights).map(([productId, weight]) => ({ productId, weight, row: { line: 2, lineEnd: 2, value: {} as never, raw: {} }, weightCells: [] })),
});

// mean = Σ w·v / Σ w, the weighted arithmetic mean (common practice); deviations (v − mean)/|mean|.
describe('family results: weighted mean, range, grouping tolerance (hand-worked)', () => {
  const summaries = new Map([
    ['A', summary('A', 2, -1, 0.5)],
    ['B', summary('B', 6, -3, 0.7)],
    ['C', summary('C', null, -2)],
  ]);

  it('mean = Σ w·v / Σ w = (3·2 + 1·6) / 4 = 3, with the lowest (A, 2) and highest (B, 6) member', () => {
    const r = familyResults(family({ A: 3, B: 1 }), summaries, 0.1);
    expect(r.methods.cutoff.modules['A1-A3']!['GWP-total']).toEqual({ mean: 3, min: 2, max: 6, min_product: 'A', max_product: 'B' });
    // D: (3·−1 + 1·−3) / 4 = −1.5
    expect(r.methods.cutoff.modules.D!['GWP-total']!.mean).toBe(-1.5);
    expect(r.members.map((m) => m.share)).toEqual([0.75, 0.25]);
    expect(r.member_values.B!.cutoff!['A1-A3']!['GWP-total']).toBe(6);
  });

  it('flags a member beyond the tolerance: B lies (6 − 3)/3 = +100 % from the mean, A (2 − 3)/3 = −33 %', () => {
    const r = familyResults(family({ A: 3, B: 1 }), summaries, 0.1);
    expect(r.members.map((m) => [m.product_id, m.deviation, m.outside_tolerance])).toEqual([['A', -1 / 3, true], ['B', 1, true]]);
    expect(familyWarnings(r)[1]).toMatch(/^family F: B GWP-total A1-A3 6\.00E\+00 lies 100\.0 % above the family’s weighted average 3\.00E\+00 \(tolerance 10 %/);
    // The tolerance is a setting: at 100 % neither is beyond it (the rule is "more than").
    expect(familyWarnings(familyResults(family({ A: 3, B: 1 }), summaries, 1))).toEqual([]);
  });

  it('leaves a figure not available when a member’s is, and modules not every member declares undeclared', () => {
    const r = familyResults(family({ A: 1, B: 1, C: 1 }), summaries, 0.1);
    expect(r.methods.cutoff.modules['A1-A3']!['GWP-total']!.mean).toBeNull();
    expect(r.methods.cutoff.modules.D!['GWP-total']!.mean).toBe(-2);
    expect(Object.keys(r.methods.cutoff.modules)).toEqual(['A1-A3', 'D']);
    expect(r.modules_not_declared).toEqual([{ module: 'C4', declared_by: ['A', 'B'] }]);
    expect(r.members.every((m) => !m.outside_tolerance)).toBe(true);
  });

  it('writes one CSV row per method, module and indicator with mean, min and max', () => {
    const csv = familyResultsCsv(familyResults(family({ A: 3, B: 1 }), summaries, 0.1)).split('\n');
    expect(csv[0]).toBe('family_id,method,module,indicator,unit,mean,min,min_product,max,max_product');
    expect(csv).toContain('F,cutoff,A1-A3,GWP-total,kg CO2 eq.,3,2,A,6,B');
  });
});

describe('families.csv', () => {
  it('weights a member by its production.csv output, counted once: summed over parallel plants, the largest of its stages', async () => {
    const dir = await demoCopy();
    dirs.push(dir);
    await editFile(path.join(dir, 'site.csv'), (t) => `${t}ashby-mill,2025,A3,"Offices, electricity",grid-electricity,50000,kWh,mass,meter\n`);
    // Parallel plants: Norwick makes 1 200 000 m, a second press shop 100 000 m of the same profile.
    await editFile(path.join(dir, 'production.csv'), (t) => `${t.replace('site_id,period,product_id,output,source', 'site_id,period,product_id,output,source,site_role').replace('KV-EXT-6060,1200000,Norwick production records 2025 (illustrative)', 'KV-EXT-6060,1200000,Norwick production records 2025 (illustrative),parallel')}ashby-mill,2025,KV-EXT-6060,100000,records,parallel\nashby-mill,2025,KV-CU-BB10,400000,records,stage\n`);
    const { project, problems } = await loadProject(dir);
    expect(problems.filter((p) => p.severity === 'error')).toEqual([]);
    const member = project!.families[0]!.members.find((m) => m.productId === 'KV-EXT-6060')!;
    expect(member.weight).toBe(1_200_000 + 100_000);
    expect(member.weightCells.map((c) => `${c.file}:${c.line}`)).toEqual(['production.csv:3', 'production.csv:6']);
    // The new site's rows reach KV-EXT-6060 too: 50 000 kWh · (0.083 t / 0.483 t) / 1 300 000 m (its output at both plants).
    expect(project!.allocation.byProduct.get('KV-EXT-6060')!.map((a) => a.group.site)).toEqual(['norwick-press-shop', 'norwick-press-shop', 'norwick-press-shop', 'ashby-mill']);
    expect(project!.allocation.byProduct.get('KV-EXT-6060')!.at(-1)!.plants?.total).toBe(1_300_000);
    // As stages (the default) the same rows count the output once: the larger stage.
    const staged = await demoCopy();
    dirs.push(staged);
    await editFile(path.join(staged, 'production.csv'), (t) => `${t}ashby-mill,2025,KV-EXT-6060,100000,records\n`);
    await editFile(path.join(staged, 'site.csv'), (t) => `${t}ashby-mill,2025,A3,"Offices, electricity",grid-electricity,50000,kWh,mass,meter\n`);
    const { project: stages } = await loadProject(staged);
    expect(stages!.families[0]!.members.find((m) => m.productId === 'KV-EXT-6060')!.weight).toBe(1_200_000);
  });

  it('refuses a member without a weight or an output, and a second name for the family', async () => {
    const dir = await demoCopy();
    dirs.push(dir);
    await editFile(path.join(dir, 'families.csv'), (t) => `${t}profiles-6060-mill,Another name,KV-BR-40,,none\n`);
    // Keep the units alike so only the two planted problems are found.
    await editLine(path.join(dir, 'products.csv'), 5, ',1 piece,', ',1 m,');
    const { problems } = await loadProject(dir);
    expect(problems).toContainEqual(expect.objectContaining({ code: 'FAMILY_INCONSISTENT', file: 'families.csv', line: 6, column: 'name', value: 'Another name' }));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'VALUE_REQUIRED', file: 'families.csv', line: 6, column: 'weight', message: expect.stringContaining('production.csv has no output for KV-BR-40') }));
  });

  it('prints a member beyond the tolerance on stderr and on the family page, and says the tolerance is a setting', async () => {
    const data = await demoCopy();
    const work = await tempDir();
    dirs.push(data, work);
    // The demo's members lie −6.4 % and +9.2 % from the mean: beyond a 5 % tolerance.
    await editFile(path.join(data, 'declaration.json'), (t) => t.replace('"illustrative": true', '"report": { "family_tolerance": 0.05 },\n  "illustrative": true'));
    const out = path.join(work, 'out');
    const result = await runCli(['build', '--data', data, '--out', out, '--no-pdf']);
    expect(result.code, result.stderr).toBe(0);
    expect(result.stderr).toMatch(/warning family profiles-6060-mill: KV-EXT-6060-T19 GWP-total A1-A3 3\.51E\+00 lies 6\.4 % below/);
    expect(result.stderr).toMatch(/warning family profiles-6060-mill: KV-EXT-6060-T22 .* lies 9\.2 % above/);
    const page = await readFile(path.join(out, 'families', 'profiles-6060-mill', 'index.html'), 'utf8');
    expect(page).toContain('Spread beyond the grouping tolerance');
    expect(page).toContain('report.family_tolerance');
    const member = await readFile(path.join(out, 'KV-EXT-6060-T19', 'index.html'), 'utf8');
    expect(member).toContain('href="../families/profiles-6060-mill/index.html"');
  });
});
