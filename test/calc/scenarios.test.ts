import { describe, expect, it } from 'vitest';
import { compute, writeFixture } from './fixture.ts';

/**
 * Scenario information beside C1–C4 and D (EN 15804+A2), hand-worked: 2 kg of metal whose
 * scenario row recycles 90 % (yield 0.95) and landfills 10 %, 50 km to processing; its input
 * is 25 % post-consumer recycled.
 *   collected separately: not written, so what is re-used and recycled: 2 · 0.9 = 1.8 kg; mixed 0.2 kg
 *   recycling 1.8 kg, landfill 0.2 kg, re-use, energy recovery and incineration 0
 *   D: M_MR,out = 1.8 · 0.95 = 1.71 kg, M_MR,in = 2 · 0.25 = 0.5 kg, net 1.21 kg, substituting ev (Q_out 1)
 */
const fixture = (separate = '') =>
  writeFixture({
    products: 'product_id,name,declared_unit,unit_mass_kg,eol_scenario\nP1,Part,1 piece,2,s1',
    bom: 'product_id,line_id,component,material,role,mass_kg,recycled_post,source\nP1,L1,Part,m1,product,2,0.25,test',
    materials: 'material,name,family,virgin,recycled,eol_recycling,landfill\nm1,Metal,metal,ev,er,erec,ed',
    eol: `scenario,material,recycling,landfill,recycling_yield,transport_km,transport_factor,processing_factor,separate_collection\ns1,*,0.9,0.1,0.95,50,truck,sorting,${separate}`,
    factors: 'factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,10\ner,recycled,kg,test,1\nerec,remelting,kg,test,0.5\ned,landfill,kg,test,0.01\ntruck,lorry,tkm,test,0.1\nsorting,sorting,kg,test,0.02',
    declaration: { methods: ['cutoff'] },
  });

describe('scenario information beside C1–C4 and D (hand-worked above)', async () => {
  const [product] = await compute(await fixture());
  const scenarios = product!.results.scenarios!;

  it('gives each material’s end of life in kg, collected separately by default what is re-used and recycled', () => {
    expect(scenarios.end_of_life).toHaveLength(1);
    const row = scenarios.end_of_life[0]!;
    expect(row).toMatchObject({ material: 'm1', stage: 'C1-C4', mass_kg: 2, reuse_kg: 0, energy_recovery_kg: 0, incineration_kg: 0, transport_km: 50, transport_factor: 'truck', processing_factor: 'sorting', recycling_yield: 0.95 });
    expect(row.recycling_kg).toBeCloseTo(1.8, 12);
    expect(row.landfill_kg).toBeCloseTo(0.2, 12);
    expect(row.collected_separately_kg).toBeCloseTo(1.8, 12);
    expect(row.collected_with_mixed_waste_kg).toBeCloseTo(0.2, 12);
    // Every number names its figure, which the results' own reader resolves to the same value.
    for (const [key, id] of Object.entries(row.figures)) expect(product!.figures[id]?.value, key).toBeCloseTo(row[key as 'mass_kg'], 12);
  });

  it('takes separate collection as written where eol.csv gives it', async () => {
    const [written] = await compute(await fixture('0.95'));
    expect(written!.results.scenarios!.end_of_life[0]!.collected_separately_kg).toBeCloseTo(1.9, 12);
    expect(written!.results.scenarios!.end_of_life[0]!.collected_with_mixed_waste_kg).toBeCloseTo(0.1, 12);
  });

  it('gives module D’s net flows and what they substitute: 1.71 − 0.5 = 1.21 kg of ev', () => {
    const d = scenarios.module_d[0]!;
    expect(d).toMatchObject({ material: 'm1', substituted_factor: 'ev', q_out: 1 });
    expect(d.m_mr_out_kg).toBeCloseTo(1.71, 12);
    expect(d.m_mr_in_kg).toBeCloseTo(0.5, 12);
    expect(d.net_kg).toBeCloseTo(1.21, 12);
  });
});
