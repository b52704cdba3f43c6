import { describe, expect, it } from 'vitest';
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { compute, writeFixture } from './fixture.ts';
import { DEMO } from '../helpers.ts';
import { loadProject } from '../../src/model/project.ts';
import { productOutput } from '../../src/model/families.ts';
import { ProductPipeline } from '../../src/pipeline/product.ts';
import { productReach } from '../../src/model/reach.ts';
import { readsOutside } from '../../src/render/input-key.ts';

/**
 * Site-level data allocated to products (ISO 14044 §4.3.4: partition by a physical
 * relationship — mass — or by another key). Hand-worked with round numbers:
 *
 * Site S, 2025: 10 000 kWh of electricity (0.5 kg CO2 eq./kWh) and 2 000 MJ of gas
 * (0.1 kg CO2 eq./MJ). Products: P1, 1 kg declared unit, 1 kg each, 6 000 made;
 * P2, 1 m declared unit, 2 kg per m, 2 000 made.
 *   mass keys: P1 6 000 kg, P2 4 000 kg, Σ 10 000 kg → shares 0.6 and 0.4
 *   P1 electricity per kg = 10 000 · 0.6 / 6 000 = 1 kWh → 0.5 kg CO2 eq.
 *   P2 electricity per m  = 10 000 · 0.4 / 2 000 = 2 kWh → 1.0 kg CO2 eq.
 *   declared_unit keys: 6 000 and 2 000 → shares 0.75 and 0.25; P2 gas = 2 000 · 0.25 / 2 000 = 0.25 MJ
 *   own key press_hours: 300 and 700 → shares 0.3 and 0.7; P1 gas = 2 000 · 0.3 / 6 000 = 0.1 MJ
 */
const FACTORS = `factor_id,name,unit,dataset,GWP-total
ev,virgin,kg,test,10
ed,landfill,kg,test,0.1
elec,electricity,kWh,test,0.5
gas,heat from gas,MJ,test,0.1`;

async function site(options: { gasKey?: string; production?: string; site?: string } = {}) {
  const dir = await writeFixture({
    products: `product_id,name,declared_unit,unit_mass_kg,eol_scenario
P1,Sheet,1 kg,1,s1
P2,Profile,1 m,2,s1`,
    bom: `product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source
P1,L1,Part,m1,product,1,0,0,0,recycled,test
P2,L1,Part,m1,product,2,0,0,0,recycled,test`,
    materials: `material,name,family,virgin,landfill
m1,Metal,metal,ev,ed`,
    eol: `scenario,material,recycling,landfill,recycling_yield,transport_km
s1,*,0,1,1,0`,
    activities: `product_id,module,activity,factor,amount,unit,source
P1,A3,Own press,elec,1,kWh,test`,
    factors: FACTORS,
    declaration: { methods: ['cutoff'] },
  });
  await writeFile(
    path.join(dir, 'site.csv'),
    options.site ??
      `site_id,period,module,activity,factor,amount,unit,allocation,source
S,2025,A3,Site electricity,elec,10000,kWh,,meter
S,2025,A3,Site gas,gas,2,GJ,${options.gasKey ?? 'mass'},invoices\n`,
  );
  await writeFile(
    path.join(dir, 'production.csv'),
    options.production ??
      `site_id,period,product_id,output,source,press_hours
S,2025,P1,6000,records,300
S,2025,P2,2000,records,700\n`,
  );
  return dir;
}

const gwp = (figures: Record<string, { value: number | null }>, id: string) => figures[`${id}/GWP-total`]?.value;

describe('site data allocated by mass (ISO 14044 §4.3.4), hand-worked', async () => {
  const [p1, p2] = await compute(await site());

  it('shares 6 000 kg / 10 000 kg = 0.6 and 4 000 / 10 000 = 0.4, with the keys and their sum as figures', () => {
    const f1 = p1!.figures;
    expect(f1['allocation/S/2025/mass/key']?.value).toBe(6000);
    expect(f1['allocation/S/2025/mass/total']?.value).toBe(10000);
    expect(f1['allocation/S/2025/mass/share']?.value).toBeCloseTo(0.6, 15);
    expect(p2!.figures['allocation/S/2025/mass/share']?.value).toBeCloseTo(0.4, 15);
  });

  it('electricity: P1 10 000·0.6/6 000 = 1 kWh → 0.5; P2 10 000·0.4/2 000 = 2 kWh → 1.0 kg CO2 eq.', () => {
    expect(gwp(p1!.figures, 'cutoff/A3/site:2')).toBeCloseTo(0.5, 12);
    expect(gwp(p2!.figures, 'cutoff/A3/site:2')).toBeCloseTo(1.0, 12);
  });

  it('gas in GJ: P1 2 GJ = 2 000 MJ (SI) · 0.6 / 6 000 = 0.2 MJ → 0.02 kg CO2 eq.', () => {
    expect(gwp(p1!.figures, 'cutoff/A3/site:3')).toBeCloseTo(0.02, 12);
  });

  it('the allocated rows join the product’s own activities: P1 A3 = 1 kWh own · 0.5 + 0.5 + 0.02 = 1.02', () => {
    expect(p1!.results.methods.cutoff.modules.A3!['GWP-total']).toBeCloseTo(1.02, 12);
    expect(p2!.results.methods.cutoff.modules.A3!['GWP-total']).toBeCloseTo(1.0 + (2000 * 0.4 / 2000) * 0.1, 12);
  });

  it('traces the share down to the annual cell, each product’s output and unit-mass cells', () => {
    const node = p1!.result.graph.get('allocation/S/2025/mass/total');
    const cells = node!.terms.map((t) => (t.kind === 'cell' ? `${t.cell.file}:${t.cell.line} ${t.cell.column}` : t.kind));
    expect(cells).toEqual(['production.csv:2 output', 'products.csv:2 unit_mass_kg', 'production.csv:3 output', 'products.csv:3 unit_mass_kg']);
    const row = p1!.result.graph.get('cutoff/A3/site:2');
    expect(row!.terms.map((t) => (t.kind === 'cell' ? `${t.cell.file}:${t.cell.line} ${t.cell.column}` : t.kind === 'figure' ? t.id : 'factor'))).toEqual([
      'site.csv:2 amount', 'site.csv:2 unit', 'allocation/S/2025/mass/share', 'production.csv:2 output', 'factor',
    ]);
  });
});

describe('other keys', () => {
  it('declared_unit: shares 6 000/8 000 = 0.75 and 2 000/8 000 = 0.25; P2 gas 2 000 MJ·0.25/2 000 = 0.25 MJ → 0.025', async () => {
    const [p1, p2] = await compute(await site({ gasKey: 'declared_unit' }));
    expect(p1!.figures['allocation/S/2025/declared_unit/share']?.value).toBeCloseTo(0.75, 15);
    expect(gwp(p2!.figures, 'cutoff/A3/site:3')).toBeCloseTo(0.025, 12);
  });

  it('a production.csv column of the user’s own: press_hours 300 and 700 → P1 gas 2 000·0.3/6 000 = 0.1 MJ → 0.01', async () => {
    const [p1, p2] = await compute(await site({ gasKey: 'press_hours' }));
    expect(p1!.figures['allocation/S/2025/press_hours/share']?.value).toBeCloseTo(0.3, 15);
    expect(gwp(p1!.figures, 'cutoff/A3/site:3')).toBeCloseTo(0.01, 12);
    expect(gwp(p2!.figures, 'cutoff/A3/site:3')).toBeCloseTo((2000 * 0.7 / 2000) * 0.1, 12);
    const cell = p1!.result.graph.get('allocation/S/2025/press_hours/key')!.terms[0]!;
    expect(cell.kind === 'cell' && `${cell.cell.file}:${cell.cell.line} ${cell.cell.column} ${cell.cell.value}`).toBe('production.csv:2 press_hours 300');
  });

  it('refuses a key cell that is not a number, naming the file, line, column and value', async () => {
    const { problems } = await loadProject(await site({ gasKey: 'press_hours', production: 'site_id,period,product_id,output,source,press_hours\nS,2025,P1,6000,records,three hundred\nS,2025,P2,2000,records,700\n' }));
    expect(problems).toContainEqual(expect.objectContaining({ severity: 'error', code: 'NOT_A_NUMBER', file: 'production.csv', line: 2, column: 'press_hours', value: 'three hundred' }));
  });

  it('refuses an output of zero at its cell', async () => {
    const { problems } = await loadProject(await site({ production: 'site_id,period,product_id,output,source\nS,2025,P1,0,records\nS,2025,P2,2000,records\n' }));
    expect(problems).toContainEqual(expect.objectContaining({ severity: 'error', code: 'OUT_OF_RANGE', file: 'production.csv', line: 2, column: 'output', value: '0' }));
  });
});

/**
 * One product made at two sites, hand-worked (ISO 14044 §4.3.4; the amounts are per period,
 * divided by the product's output). P1 is the only product of S1 and S2.
 *   stages (a billet cast at S1, extruded at S2; 100 units through each):
 *     1 000 kWh / 100 + 500 kWh / 100 = 15 kWh per unit, 7.5 kg CO2 eq.
 *   parallel plants (the whole product pressed at S1, 60 units, and at S2, 40 units):
 *     (600 kWh + 800 kWh) / 100 units = 14 kWh per unit = 10 kWh · 0.6 + 20 kWh · 0.4, 7 kg CO2 eq.
 *     (read as stages it would be 600/60 + 800/40 = 30 kWh: double the output-weighted mean).
 */
describe('a product made at two sites: stages add, parallel plants weigh by output', async () => {
  const twoSites = (role: string, amounts: [number, number], outputs: [number, number]) =>
    site({
      site: `site_id,period,module,activity,factor,amount,unit,allocation,source
S1,2025,A3,Electricity S1,elec,${amounts[0]},kWh,declared_unit,meter
S2,2025,A3,Electricity S2,elec,${amounts[1]},kWh,declared_unit,meter\n`,
      production: `site_id,period,product_id,output,source,site_role
S1,2025,P1,${outputs[0]},records,${role}
S2,2025,P1,${outputs[1]},records,${role}\n`,
    });
  const siteGwp = (p: Awaited<ReturnType<typeof compute>>[number]) => (gwp(p.figures, 'cutoff/A3/site:2') ?? NaN) + (gwp(p.figures, 'cutoff/A3/site:3') ?? NaN);

  it('stages: 1 000/100 + 500/100 = 15 kWh per unit (7.5 kg CO2 eq.)', async () => {
    const [p1] = await compute(await twoSites('stage', [1000, 500], [100, 100]));
    expect(siteGwp(p1!)).toBeCloseTo(7.5, 12);
  });

  it('parallel plants: (600 + 800)/(60 + 40) = 14 kWh per unit (7 kg CO2 eq.), with the plants’ output as a figure', async () => {
    const [p1] = await compute(await twoSites('parallel', [600, 800], [60, 40]));
    expect(siteGwp(p1!)).toBeCloseTo(7, 12);
    expect(p1!.figures['allocation/parallel-plants:P1/output']?.value).toBe(100);
    // Every output cell the figure reads is in the product's input key (build --changed).
    const { project } = await loadProject(await twoSites('parallel', [600, 800], [60, 40]));
    const pipeline = new ProductPipeline(project!);
    const rows = pipeline.products()[0]!;
    expect(readsOutside(project!, productReach(project!, rows), pipeline.calculate(rows).graph)).toBeUndefined();
  });

  it('counts a product’s output once for family weights: the sum over parallel plants, the largest stage', async () => {
    const { project } = await loadProject(await twoSites('parallel', [600, 800], [60, 40]));
    expect(productOutput(project!.production.rows).map((row) => row.value.output)).toEqual([60, 40]);
    const { project: staged } = await loadProject(await twoSites('stage', [600, 800], [100, 98]));
    expect(productOutput(staged!.production.rows).map((row) => row.value.output)).toEqual([100]);
  });
});

describe('the demo site (Norwick press shop, 2025, by mass)', async () => {
  const demo = await compute(DEMO);
  const { project } = await loadProject(DEMO);
  const profiles = demo.filter((d) => project!.allocation.byProduct.has(d.results.product_id));

  it('gives its three profiles shares that add up to 1', () => {
    expect(profiles.map((d) => d.results.product_id).sort()).toEqual(['KV-EXT-6060', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22']);
    const shares = profiles.map((d) => d.figures['allocation/norwick-press-shop/2025/mass/share']!.value ?? NaN);
    expect(shares.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
  });

  it('conserves every metered amount: Σ over the products of (figure per declared unit × output) = amount × factor', () => {
    for (const row of project!.site.rows) {
      const factor = project!.factors.rows.find((f) => f.value.factor_id === row.value.factor)!;
      // GJ → MJ where the factor is per MJ (1 GJ = 1 000 MJ, SI prefixes).
      const amount = row.value.amount * (row.value.unit === 'GJ' && factor.value.unit === 'MJ' ? 1000 : 1);
      const expected = amount * (factor.value as unknown as Record<string, number>)['GWP-total']!;
      const allocated = profiles.reduce((sum, d) => {
        const output = project!.production.rows.find((p) => p.value.product_id === d.results.product_id)!.value.output;
        return sum + (d.figures[`cutoff/A3/site:${row.line}/GWP-total`]!.value ?? NaN) * output;
      }, 0);
      expect(allocated).toBeCloseTo(expected, 6);
    }
  });
});
