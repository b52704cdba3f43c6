import { describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/project.ts';
import { groupedTables } from '../../src/report/declaration-view.ts';
import { compute, writeFixture } from '../calc/fixture.ts';

/**
 * A programme's own indicator (GWP-GHG: GWP-total without biogenic carbon uptake and
 * release, a programme-specific indicator, not in EN 15804; field guide §2), declared in
 * declaration.json and read from a factors.csv column of its code. P1: 1 kg of metal at
 * GWP-GHG 1.8 per kg, landfilled at 0.01 → A1 1.8, C4 0.01 (hand-worked).
 */
const files = (factors: string, extra: unknown[] = [{ code: 'GWP-GHG', name: 'Climate change, GHG (programme)', unit: 'kg CO2 eqv.' }]) =>
  writeFixture({
    bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,m1,product,1,test',
    materials: 'material,name,family,virgin,landfill\nm1,Metal,metal,ev,ed',
    eol: 'scenario,material,recycling,landfill,recycling_yield,transport_km\ns1,*,0,1,1,0',
    factors,
    declaration: { methods: ['cutoff'], extra_indicators: extra },
  });

describe('a programme’s own indicators (declaration.json extra_indicators)', () => {
  it('reads them from factors.csv columns of their code and reports them after EN 15804+A2’s, in a table of their own', async () => {
    const [p1] = await compute(await files('factor_id,name,unit,dataset,GWP-total,gwp-ghg\nev,virgin,kg,test,2,1.8\ned,landfill,kg,test,0.01,0.01'));
    const results = p1!.results;
    expect(results.indicators.map((i) => i.code)).toEqual(expect.arrayContaining(['GWP-total', 'GWP-GHG']));
    expect(results.indicators.find((i) => i.code === 'GWP-GHG')).toMatchObject({ unit: 'kg CO2 eqv.', name: 'Climate change, GHG (programme)', basis: 'factors' });
    expect(results.methods.cutoff.modules.A1!['GWP-GHG']).toBeCloseTo(1.8, 12);
    expect(results.methods.cutoff.modules.C4!['GWP-GHG']).toBeCloseTo(0.01, 12);
    const tables = groupedTables(results.indicators, () => []);
    expect(tables.at(-2)!.title).toBe('Indicators of the programme');
    expect(tables.at(-2)!.rows.map((row) => row.code)).toEqual(['GWP-GHG']);
  });

  it('refuses a code EN 15804+A2 has, and warns of one without a column', async () => {
    const clash = await loadProject(await files('factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,2\ned,landfill,kg,test,0.01', [{ code: 'AP', name: 'x', unit: 'y' }]));
    expect(clash.problems).toContainEqual(expect.objectContaining({ file: 'declaration.json', code: 'DUPLICATE_ID', severity: 'error' }));
    const missing = await loadProject(await files('factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,2\ned,landfill,kg,test,0.01'));
    expect(missing.problems).toContainEqual(expect.objectContaining({ code: 'INDICATOR_NO_DATA', value: 'GWP-GHG', severity: 'warning' }));
  });
});
