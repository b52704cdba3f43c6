import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { readFile, writeFile } from 'node:fs/promises';
import { compute, writeFixture } from './fixture.ts';
import { DEMO, demoCopy } from '../helpers.ts';
import { resultFigureId, type ResultsJson } from '../../src/report/results.ts';

const demo = await compute(DEMO);
const byId = Object.fromEntries(demo.map((d) => [d.results.product_id, d]));
const codes = (r: ResultsJson) => r.indicators.map((i) => i.code);

describe('consistency rules on the demo', () => {
  it.each(demo.map((d) => [d.results.product_id, d.results] as const))('%s: A1-A3 = A1 + A2 + A3 for every indicator', (_id, r) => {
    const m = r.methods.cutoff.modules;
    for (const code of codes(r)) {
      const parts = [m.A1![code], m.A2![code], m.A3![code]];
      if (parts.some((v) => v === null)) expect(m['A1-A3']![code]).toBeNull();
      else expect(m['A1-A3']![code]).toBeCloseTo((parts as number[]).reduce((a, b) => a + b, 0), 12);
    }
  });

  it.each(demo.map((d) => [d.results.product_id, d] as const))('%s: every sum figure equals the sum of its children', (_id, d) => {
    const { graph } = d.result;
    let checked = 0;
    for (const node of graph.nodes.values()) {
      if (node.kind !== 'vector' || !node.formula.includes('Σ') || !node.terms.every((t) => t.kind === 'figure' && graph.get(t.id)?.kind === 'vector')) continue;
      node.values.forEach((value, i) => {
        const sum = node.terms.reduce((total, t) => total + graph.vector((t as { id: string }).id).values[i]!, 0);
        if (Number.isNaN(value)) expect(Number.isNaN(sum)).toBe(true);
        else expect(value).toBeCloseTo(sum, 12);
      });
      checked++;
    }
    expect(checked).toBeGreaterThan(10);
  });

  it.each(demo.map((d) => [d.results.product_id, d.results] as const))('%s: GWP-total = GWP-fossil + GWP-biogenic + GWP-luluc in every module (EN 15804+A2)', (_id, r) => {
    for (const values of [...Object.values(r.methods.cutoff.modules), r.methods.cutoff.total, r.methods.cff!.total]) {
      expect(values['GWP-total']).toBeCloseTo(values['GWP-fossil']! + values['GWP-biogenic']! + values['GWP-luluc']!, 9);
    }
  });

  it('module D is reported beside A–C and not added into the total', () => {
    const r = byId['KV-EXT-6060']!.results;
    const m = r.methods.cutoff.modules;
    // The demo declares A5 (its packaging's end of life); A4 where a product has rows for it.
    expect(m.A5).toBeDefined();
    const sum = ['A1', 'A2', 'A3', 'A4', 'A5', 'C1', 'C2', 'C3', 'C4'].filter((k) => m[k]).reduce((t, k) => t + m[k]!['GWP-total']!, 0);
    expect(r.methods.cutoff.total['GWP-total']).toBeCloseTo(sum, 12);
    expect(m.D!['GWP-total']).toBeLessThan(0);
  });

  it('an indicator a factor lacks is null (incomplete), never 0: ODP of the bracket, whose pallet timber has no ODP', () => {
    const r = byId['KV-BR-40']!.results;
    expect(r.methods.cutoff.modules.A3!.ODP).toBeNull();
    expect(r.methods.cutoff.modules.A1!.ODP).not.toBeNull();
    expect(byId['KV-BR-40']!.figures['cutoff/A3/ODP']?.value).toBeNull();
  });
});

describe('mass balances', () => {
  it.each(demo.map((d) => [d.results.product_id, d] as const))('%s: SM + virgin input = Σ G; M_eol·(shares) = M_eol', (_id, d) => {
    const { graph } = d.result;
    const lines = [...graph.nodes.values()].filter((n) => n.kind === 'scalar' && /^inventory\/(line|packaging):[^/]+\/G$/.test(n.id));
    const sumG = lines.reduce((t, n) => t + (n.kind === 'scalar' ? n.value : 0), 0);
    const sm = d.results.methods.cutoff.modules['A1-A3']!.SM!;
    const virgin = lines.reduce((t, n) => t + (n.kind === 'scalar' ? n.value * (1 - graph.scalar(n.id.replace(/\/G$/, '/R1')).value) : 0), 0);
    expect(sm + virgin).toBeCloseTo(sumG, 12);
    const product = d.ctx.project.products.rows.find((p) => p.value.product_id === d.results.product_id)!.value;
    let eolTotal = 0;
    let routed = 0;
    for (const node of graph.nodes.values()) {
      const match = /^inventory\/material:(.+)\/M_eol$/.exec(node.id);
      if (!match || node.kind !== 'scalar') continue;
      const e = d.ctx.eolRow(product.eol_scenario, match[1]!).value;
      // M_eol · (reuse + recycling + energy_recovery + incineration + landfill) = M_eol
      expect(node.value * (e.reuse + e.recycling + e.energy_recovery + e.incineration + e.landfill)).toBeCloseTo(node.value, 12);
      eolTotal += node.value;
      routed += node.value * (e.recycling + e.energy_recovery + e.reuse);
    }
    const c3 = d.results.methods.cutoff.modules.C3!;
    expect(c3.MFR! + c3.MER! + c3.CRU!).toBeCloseTo(routed, 12);
    expect(eolTotal).toBeCloseTo(graph.scalar('inventory/product/M').value, 12);
    // The product-role lines add up to the declared unit's mass (validated within 1 %; the demo exactly).
    expect(eolTotal).toBeCloseTo(product.unit_mass_kg, 9);
  });
});

describe('built-in greenhouse gases', () => {
  it('0.02 g HFC-134a in A3 of the extrusion = 2e-5 kg · 1530 = 0.0306 kg CO2 eq. (IPCC AR6 WG1 Table 7.15)', () => {
    const figures = byId['KV-EXT-6060']!.figures;
    expect(figures['cutoff/A3/activity:5/GWP-total']?.value).toBeCloseTo(0.02e-3 * 1530, 12);
    expect(figures['cutoff/A3/activity:5/GWP-fossil']?.value).toBeCloseTo(0.02e-3 * 1530, 12);
    expect(figures['cutoff/A3/activity:5/AP']?.value).toBe(0);
    expect(figures['reference/gwp/AR6/HFC-134a']?.value).toBe(1530);
  });

  it('with gwp_set AR5 the same emission counts 2e-5 kg · 1300 = 0.026 (IPCC AR5 WG1 Table 8.A.1)', async () => {
    const dir = await demoCopy();
    const file = path.join(dir, 'declaration.json');
    await writeFile(file, (await readFile(file, 'utf8')).replace('"gwp_set": "AR6"', '"gwp_set": "AR5"'));
    const ar5 = (await compute(dir)).find((d) => d.results.product_id === 'KV-EXT-6060')!;
    expect(ar5.figures['cutoff/A3/activity:5/GWP-total']?.value).toBeCloseTo(0.02e-3 * 1300, 12);
  });
});

describe('the figure graph', () => {
  it.each(demo.map((d) => [d.results.product_id, d] as const))('%s: every figure resolves down to input cells or reference data (no dangling terms)', (_id, d) => {
    const r = d.results;
    const figures = d.figures;
    const ids = new Set(Object.keys(figures));
    const reachesCell = new Map<string, boolean>();
    const leafOk = (id: string): boolean => {
      const cached = reachesCell.get(id);
      if (cached !== undefined) return cached;
      reachesCell.set(id, true);
      const figure = figures[id]!;
      const ok = figure.terms.length === 0
        ? id.startsWith('reference/') || figure.value === 0
        : figure.terms.every((t) => (typeof t === 'string' ? ids.has(t) && leafOk(t) : typeof t.file === 'string' && t.line > 0 && typeof t.column === 'string'));
      reachesCell.set(id, ok);
      return ok;
    };
    for (const id of ids) expect(leafOk(id), id).toBe(true);
    for (const [module, values] of Object.entries(r.methods.cutoff.modules)) {
      for (const [code, value] of Object.entries(values)) expect(figures[resultFigureId('cutoff', module, code)]?.value, `cutoff/${module}/${code}`).toBe(value);
    }
  });

  it('cells in the trail are the cells as written in the file', async () => {
    const r = byId['KV-EXT-6060']!;
    const g = r.figures['inventory/line:L1/G']!;
    expect(g.terms).toEqual([
      { file: 'bom.csv', line: 3, column: 'mass_kg', value: '0.83' },
      { file: 'bom.csv', line: 3, column: 'scrap_rate', value: '0.15' },
    ]);
    const bom = (await readFile(path.join(DEMO, 'bom.csv'), 'utf8')).split('\n')[2];
    expect(bom).toContain(',0.83,30%,45%,0.15,');
    const a1 = r.figures['cutoff/A1/line:L1/GWP-total']!;
    // Recycled share at al-remelted-ingot (factors.csv line 4); the virgin share comes from the demo smelter in process.csv.
    expect(a1.terms).toContainEqual({ file: 'factors.csv', line: 4, column: 'GWP-total', value: (await readFile(path.join(DEMO, 'factors.csv'), 'utf8')).split('\n')[3]!.split(',')[5] });
    expect(a1.terms).toContain('process/glenmoor-potline/factor/GWP-total');
    expect(r.figures['process/glenmoor-potline/cell_voltage_v'] ?? r.figures['process/glenmoor-potline/dc_floor_kwh_per_t']!.terms).toContainEqual({ file: 'process.csv', line: 4, column: 'value', value: '4.25' });
  });
});

describe('energy recovery (module D and the CFF energy part)', () => {
  it('D = −M·R3·LHV·(η_el·E_el + η_heat·E_heat); CFF energy = M·R3·(EER − LHV·(…)), hand-worked', async () => {
    const dir = await writeFixture({
      bom: 'product_id,line_id,component,material,role,mass_kg\nP1,L1,Part,pl,product,1',
      materials: 'material,name,family,virgin,incineration,landfill,lhv_mj_per_kg,cff_a\npl,Polymer,polymer,ev,inc,ed,40,0.5',
      eol: 'scenario,material,energy_recovery,landfill,recycling_yield\ns1,*,0.5,0.5,1',
      factors: 'factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,3\ninc,incineration,kg,test,2.5\ned,landfill,kg,test,0.1\nelec,electricity,kWh,test,0.5\nheat,heat,MJ,test,0.08',
      declaration: { energy_recovery: { electricity_efficiency: 0.2, heat_efficiency: 0.3, electricity_factor: 'elec', heat_factor: 'heat' } },
    });
    const [{ results }] = (await compute(dir)) as [Awaited<ReturnType<typeof compute>>[number]];
    // 1 kg · 0.5 · 40 MJ/kg = 20 MJ; 20·(0.2·0.5/3.6 + 0.3·0.08) = 20·0.0517778 = 1.0355556
    const credit = 20 * (0.2 * (0.5 / 3.6) + 0.3 * 0.08);
    expect(results.methods.cutoff.modules.D!['GWP-total']).toBeCloseTo(-credit, 12);
    expect(results.methods.cutoff.modules.C3!['GWP-total']).toBeCloseTo(0.5 * 2.5, 12);
    expect(results.methods.cutoff.modules.C3!.MER).toBeCloseTo(0.5, 12);
    expect(results.methods.cff!.parts.energy!['GWP-total']).toBeCloseTo(0.5 * 2.5 - credit, 12);
    // disposal: 1·(1 − 0 − 0.5 − 0)·0.1 = 0.05
    expect(results.methods.cff!.parts.disposal!['GWP-total']).toBeCloseTo(0.05, 12);
  });
});
