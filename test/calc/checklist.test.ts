import { describe, expect, it } from 'vitest';
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { compute, writeFixture } from './fixture.ts';
import { DEMO } from '../helpers.ts';

const statusOf = (results: { checklist?: { items: Array<{ id: string; status: string; detail: string }> } }, id: string) => results.checklist!.items.find((item) => item.id === id)!;

describe('the verifier’s checklist, answered per product', async () => {
  const demo = await compute(DEMO);

  it('holds on the demo but for the bracket, whose pallet timber has no ODP (a mandatory indicator not available in A3)', () => {
    for (const d of demo) {
      const failing = d.results.checklist!.items.filter((item) => item.status !== 'holds').map((item) => item.id);
      expect(failing, d.results.product_id).toEqual(d.results.product_id === 'KV-BR-40' ? ['mandatory'] : []);
    }
    expect(statusOf(demo.find((d) => d.results.product_id === 'KV-BR-40')!.results, 'mandatory').detail).toContain('ODP in A3, A1-A3');
  });

  it('names figures of the product’s graph as evidence', () => {
    for (const d of demo) for (const item of d.results.checklist!.items) for (const id of (item as unknown as { figures: string[] }).figures) expect(d.results.graph.steps.some((step) => step.id === id), `${item.id}: ${id}`).toBe(true);
  });

  // A factor whose GWP-total is not the sum of its parts (2 ≠ 1.5 + 0 + 0), packaging of paper
  // (0.4 kg C per kg) without A5, and a validity of six years.
  const [odd] = await compute(
    await writeFixture({
      bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,m1,product,1,test\nP1,P1,Box,board,packaging,0.1,test',
      materials: 'material,name,family,virgin,landfill,biogenic_c_kg_per_kg\nm1,Metal,metal,ev,ed,0\nboard,Cardboard,paper,board-made,ed,0.4',
      eol: 'scenario,material,recycling,landfill,recycling_yield,transport_km\ns1,*,0,1,1,0',
      factors: 'factor_id,name,unit,dataset,GWP-total,GWP-fossil,GWP-biogenic,GWP-luluc\nev,virgin,kg,test,2,1.5,0,0\ned,landfill,kg,test,0.01,0.01,0,0\nboard-made,board,kg,test,-1.2,0.27,-1.467,0',
      declaration: { methods: ['cutoff'], issued: '2026-01-01', valid_until: '2032-01-01' },
    }),
  );

  it('fails GWP-total ≠ fossil + biogenic + luluc beyond 0.1 % (EN 15804+A2), naming the modules', () => {
    const gwp = statusOf(odd!.results, 'gwp-sum');
    expect(gwp.status).toBe('fails');
    expect(gwp.detail).toMatch(/A1/);
  });

  it('warns where packaging’s biogenic carbon is not released in any declared module (A5 not declared)', () => {
    const biogenic = statusOf(odd!.results, 'biogenic-balance');
    expect(biogenic.status).toBe('warning');
    expect(biogenic.detail).toContain('A5 is not declared');
  });

  it('fails a validity longer than five years from issue (EN 15804+A2 / ISO 14025 practice)', () => {
    expect(statusOf(odd!.results, 'validity').status).toBe('fails');
  });

  it('holds the data’s age to the reference year: specific at most 5, generic at most 10 years older (common practice)', async () => {
    const dir = await writeFixture({
      bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,m1,product,1,test',
      materials: 'material,name,family,virgin,landfill\nm1,Metal,metal,ev,ed',
      eol: 'scenario,material,recycling,landfill,recycling_yield,transport_km\ns1,*,0,1,1,0',
      activities: 'product_id,module,activity,factor,amount,unit,source,reference_year\nP1,A3,Press,elec,1,kWh,meter,2019',
      factors: 'factor_id,name,unit,dataset,GWP-total,data_type,reference_year\nev,virgin,kg,test,2,generic,2016\ned,landfill,kg,test,0.01,generic,\nelec,electricity,kWh,test,0.5,specific,2024',
      declaration: { methods: ['cutoff'], reference_year: 2025 },
    });
    const [aged] = await compute(dir);
    const age = statusOf(aged!.results, 'data-age');
    // ev: 2025 − 2016 = 9 ≤ 10 (generic); the press: 2025 − 2019 = 6 > 5 (own data, specific).
    expect(age.status).toBe('fails');
    expect(age.detail).toContain('activities.csv line 2 (2019, specific: 6 years)');
    expect(age.detail).not.toContain('factor ev');
  });

  it('holds the flows left out to 1 % each and 5 % per module (EN 15804+A2 cut-off), and warns when none are listed', async () => {
    const files = {
      bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,m1,product,1,test',
      materials: 'material,name,family,virgin,landfill\nm1,Metal,metal,ev,ed',
      eol: 'scenario,material,recycling,landfill,recycling_yield,transport_km\ns1,*,0,1,1,0',
      factors: 'factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,2\ned,landfill,kg,test,0.01',
      declaration: { methods: ['cutoff'] },
    };
    const [unlisted] = await compute(await writeFixture(files));
    expect(statusOf(unlisted!.results, 'cut-off').status).toBe('warning');
    const dir = await writeFixture(files);
    // 0.8 % + 0.9 % + 3.5 % = 5.2 % of A3's mass together; the last is 3.5 % on its own.
    await writeFile(path.join(dir, 'excluded.csv'), 'product_id,module,flow,mass_share,energy_share,source\nP1,A3,Oil,0.8%,,log\n*,A3,Gloves,0.9%,,log\nP1,A3,Packing tape,3.5%,,log\n');
    const [listed] = await compute(dir);
    const cut = statusOf(listed!.results, 'cut-off');
    expect(cut.status).toBe('fails');
    expect(cut.detail).toContain('Packing tape (A3) carries 3.5 % of the mass');
    expect(cut.detail).toContain('the flows left out of A3 carry 5.2 % of its mass together');
  });
});

