import { describe, expect, it } from 'vitest';
import { compute, writeFixture } from './fixture.ts';
import { loadProject } from '../../src/model/project.ts';
import { dqrRating } from '../../src/reference/dqr.ts';

/**
 * The PEF data quality rating (Commission Recommendation (EU) 2021/2279): DQR = (TeR + GeR +
 * TiR + P) / 4 per dataset; bands ≤ 1.5 excellent, ≤ 2 very good, ≤ 3 good, ≤ 4 fair, > 4
 * poor (the bands from memory, as the field guide gives them). Hand-worked:
 *
 * P1, 1 kg: 1 kg of metal, virgin factor ev (GWP 2 per kg; scores 1,2,1,2 → DQR 1.5),
 * 1 kWh electricity (GWP 0.5 per kWh; scores 4,3,3,4 → DQR 3.5) and 0.1 kWh of an unscored
 * electricity (GWP 0.5) in A3.
 *   contributions to GWP-total A1-A3: ev 2, elec 0.5, unscored 0.05; Σ 2.55
 *   DQR = (2·1.5 + 0.5·3.5) / (2 + 0.5) = 4.75 / 2.5 = 1.9 → very good
 *   scored share = 2.5 / 2.55; specific share (ev is supplier-specific) = 2 / 2.55
 */
const fixture = (scores: { ev?: string; elec?: string } = {}, replace: { activities?: string; factors?: string } = {}) =>
  writeFixture({
    bom: `product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source
P1,L1,Part,m1,product,1,0,0,0,recycled,test`,
    materials: `material,name,family,virgin,landfill
m1,Metal,metal,ev,ed`,
    eol: `scenario,material,recycling,landfill,recycling_yield,transport_km
s1,*,0,1,1,0`,
    activities:
      replace.activities ??
      `product_id,module,activity,factor,amount,unit,source
P1,A3,Press,elec,1,kWh,test
P1,A3,Lights,elec2,0.1,kWh,test`,
    factors:
      replace.factors ??
      `factor_id,name,unit,dataset,GWP-total,ter,ger,tir,p,data_type
ev,virgin,kg,test,2,${scores.ev ?? '1,2,1,2,specific'}
ed,landfill,kg,test,0.1,2,2,2,2,generic
elec,electricity,kWh,test,0.5,${scores.elec ?? '4,3,3,4,generic'}
elec2,electricity unscored,kWh,test,0.5,,,,,`,
    declaration: { methods: ['cutoff'] },
  });

describe('data quality (PEF DQR), hand-worked', async () => {
  const [p1] = await compute(await fixture());
  const dq = p1!.results.data_quality!;

  it('rates each factor (TeR + GeR + TiR + P) / 4: ev (1+2+1+2)/4 = 1.5 excellent, elec (4+3+3+4)/4 = 3.5 fair', () => {
    const byId = Object.fromEntries(dq.factors.map((f) => [f.factor_id, f]));
    expect(byId.ev).toMatchObject({ dqr: 1.5, rating: 'excellent', data_type: 'specific' });
    expect(byId.elec).toMatchObject({ dqr: 3.5, rating: 'fair', data_type: 'generic' });
    expect(byId.elec2).toMatchObject({ dqr: null, rating: null, unscored_reason: 'not scored' });
  });

  it('weights by contribution: (2·1.5 + 0.5·3.5) / 2.5 = 1.9, very good; the unscored 0.05 left out and counted', () => {
    expect(dq.indicators['GWP-total']!.dqr).toBeCloseTo(1.9, 12);
    expect(dq.indicators['GWP-total']!.rating).toBe('very good');
    expect(dq.indicators['GWP-total']!.scored_share).toBeCloseTo(2.5 / 2.55, 12);
    expect(dq.unscored).toEqual(['elec2']);
  });

  it('says how much of GWP-total A1-A3 rests on specific data: 2 / 2.55', () => {
    expect(dq.gwp_total_by_data_type.specific).toBeCloseTo(2 / 2.55, 12);
    expect(dq.gwp_total_by_data_type.generic).toBeCloseTo(0.5 / 2.55, 12);
    expect(dq.gwp_total_by_data_type.not_stated).toBeCloseTo(0.05 / 2.55, 12);
  });

  it('puts the band edges where the bands say (≤ 1.5 excellent … > 4 poor)', () => {
    expect([1, 1.5, 1.75, 2, 2.25, 3, 3.25, 4, 4.25, 5].map(dqrRating)).toEqual(['excellent', 'excellent', 'very good', 'very good', 'good', 'good', 'fair', 'fair', 'poor', 'poor']);
  });

  it('does not average a partly scored factor', async () => {
    const [partly] = await compute(await fixture({ elec: '4,3,,4,generic' }));
    const elec = partly!.results.data_quality!.factors.find((f) => f.factor_id === 'elec')!;
    expect(elec.dqr).toBeNull();
    expect(elec.unscored_reason).toBe('partly scored (TIR missing)');
    expect(partly!.results.data_quality!.indicators['GWP-total']!.dqr).toBe(1.5);
  });

  it('refuses scores outside 1–5, non-numbers and unknown data types at their cells', async () => {
    const { problems } = await loadProject(await fixture({ ev: '0,2,1,x,own' }));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'OUT_OF_RANGE', file: 'factors.csv', line: 2, column: 'ter', value: '0' }));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'NOT_A_NUMBER', file: 'factors.csv', line: 2, column: 'p', value: 'x' }));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'BAD_CHOICE', file: 'factors.csv', line: 2, column: 'data_type', value: 'own' }));
  });

  it('gives no rating to an indicator whose result is not available (a factor behind it has no value)', async () => {
    // No activities; ev has no AP, so AP of A1-A3 is not available.
    const dir = await fixture({}, {
      activities: 'product_id,module,activity,factor,amount,unit,source',
      factors: `factor_id,name,unit,dataset,GWP-total,AP,ter,ger,tir,p,data_type
ev,virgin,kg,test,2,,1,2,1,2,specific
ed,landfill,kg,test,0.1,0.001,2,2,2,2,generic`,
    });
    const [product] = await compute(dir);
    expect(product!.results.methods.cutoff.modules['A1-A3']!.AP).toBeNull();
    expect(product!.results.data_quality!.indicators.AP).toEqual({ dqr: null, rating: null, scored_share: null });
    expect(product!.results.data_quality!.indicators['GWP-total']!.dqr).toBe(1.5);
  });
});
