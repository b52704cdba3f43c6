import { describe, expect, it } from 'vitest';
import { compute, writeFixture } from './fixture.ts';

/**
 * Hand-worked examples of the published formulas. One metal line, one indicator
 * (GWP-total), round numbers, every step of the arithmetic written out beside the check.
 *
 * Product P1, 1 kg: line L1, mass m = 1 kg, recycled_pre 0.1 + recycled_post 0.2 → R1 = 0.3,
 * scrap_rate s = 0.2 (recycled). Factors: Ev = 10, Erec = 2, ErecEoL = 1, ED = 0.1 per kg;
 * lorry 0.1 per tkm; electricity 0.5 per kWh; scrap processing 0.05 per kg.
 * End of life: recycling 0.8, landfill 0.2, yield 0.9, 100 km.
 */
const FACTORS = `factor_id,name,unit,dataset,GWP-total
ev,virgin,kg,test,10
erec,recycled,kg,test,2
eolrec,recycling after end of waste,kg,test,1
ed,landfill,kg,test,0.1
lorry,lorry,tkm,test,0.1
elec,electricity,kWh,test,0.5
proc,scrap processing,kg,test,0.05`;

const base = (options: { cffA?: string; pre?: string; post?: string; scrap?: string; recycling?: string; landfill?: string } = {}) => ({
  bom: `product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source
P1,L1,Part,m1,product,1,${options.pre ?? '0.1'},${options.post ?? '0.2'},${options.scrap ?? '0.2'},recycled,test`,
  materials: `material,name,family,virgin,recycled,eol_recycling,landfill,cff_a
m1,Metal,metal,ev,erec,eolrec,ed,${options.cffA ?? ''}`,
  eol: `scenario,material,recycling,landfill,recycling_yield,transport_km,transport_factor,processing_factor
s1,*,${options.recycling ?? '0.8'},${options.landfill ?? '0.2'},0.9,100,lorry,proc`,
  activities: `product_id,module,activity,factor,amount,unit,source
P1,A3,Press electricity,elec,3.6,MJ,test`,
  transport: `product_id,module,line_id,leg,factor,distance_km,source
P1,A2,L1,Inbound,lorry,200,test`,
  factors: FACTORS,
});

const gwp = (values: Record<string, number | null> | undefined) => values?.['GWP-total'];

describe('cut-off and module D (EN 15804+A2), hand-worked', async () => {
  const [{ results, figures }] = (await compute(await writeFixture(base()))) as [Awaited<ReturnType<typeof compute>>[number]];
  const m = results.methods.cutoff.modules;

  it('G = m / (1 − s) = 1 / 0.8 = 1.25 kg; A1 = G·[(1−R1)·Ev + R1·Erec] = 1.25·(0.7·10 + 0.3·2) = 9.5', () => {
    expect(figures['inventory/line:L1/G']?.value).toBeCloseTo(1.25, 12);
    expect(gwp(m.A1)).toBeCloseTo(9.5, 12);
  });

  it('A2 = (G/1000)·d·F = 0.00125 t · 200 km · 0.1 = 0.025', () => expect(gwp(m.A2)).toBeCloseTo(0.025, 12));

  it('A3 = 3.6 MJ = 1 kWh (1 kWh = 3.6 MJ, SI) · 0.5 = 0.5; recycled scrap carries no burden', () => expect(gwp(m.A3)).toBeCloseTo(0.5, 12));

  it('A1-A3 = A1 + A2 + A3 = 10.025', () => expect(gwp(m['A1-A3'])).toBeCloseTo(10.025, 12));

  it('C2 = M·km/1000·F = 1·0.1·0.1 = 0.01; C3 = M·recycling·F_proc = 0.8·0.05 = 0.04; C4 = M·landfill·ED = 0.2·0.1 = 0.02', () => {
    expect(gwp(m.C1)).toBe(0);
    expect(gwp(m.C2)).toBeCloseTo(0.01, 12);
    expect(gwp(m.C3)).toBeCloseTo(0.04, 12);
    expect(gwp(m.C4)).toBeCloseTo(0.02, 12);
  });

  it('D = (M_MR,out − M_MR,in)·(E_MR − E_VMSub·Q): out = (1·0.8 + 0.25)·0.9 = 0.945, in = 1.25·0.3 = 0.375, D = 0.57·(1 − 10) = −5.13', () => {
    expect(figures['inventory/material:m1/M_MR_out']?.value).toBeCloseTo(0.945, 12);
    expect(figures['inventory/material:m1/M_MR_in']?.value).toBeCloseTo(0.375, 12);
    expect(gwp(m.D)).toBeCloseTo(-5.13, 12);
  });

  it('total = A1…C4 = 10.095, module D not added', () => expect(gwp(results.methods.cutoff.total)).toBeCloseTo(10.095, 12));

  it('flows: SM = G·R1 = 0.375 (A1); MFR = scrap 0.25 (A3) and M·recycling 0.8 (C3)', () => {
    expect(m.A1?.SM).toBeCloseTo(0.375, 12);
    expect(m.A3?.MFR).toBeCloseTo(0.25, 12);
    expect(m.C3?.MFR).toBeCloseTo(0.8, 12);
    expect(m.C3?.CRU).toBe(0);
    expect(results.methods.cutoff.total.MFR).toBeCloseTo(1.05, 12);
  });

  it('recycled content (ISO 14021): pre 0.1, post 0.2, total 0.3 of the gross input', () => {
    expect(results.flows.recycled_content.pre).toBeCloseTo(0.1, 12);
    expect(results.flows.recycled_content.post).toBeCloseTo(0.2, 12);
    expect(results.flows.recycled_content.total).toBeCloseTo(0.3, 12);
  });
});

describe('Circular Footprint Formula (Recommendation (EU) 2021/2279), hand-worked', async () => {
  const [{ results }] = (await compute(await writeFixture(base()))) as [Awaited<ReturnType<typeof compute>>[number]];

  it('A = 0.2 (metal default): material = G·[(1−R1)·Ev + R1·(A·Erec + (1−A)·Ev)] + (M·R2 + scrap·yield)·(1−A)·(ErecEoL − Ev)', () => {
    // 1.25·[0.7·10 + 0.3·(0.2·2 + 0.8·10)] = 1.25·9.52 = 11.9; R2 = 0.8·0.9 = 0.72;
    // (0.72 + 0.25·0.9)·0.8·(1 − 10) = 0.945·0.8·(−9) = −6.804; material = 5.096
    expect(gwp(results.methods.cff?.parts.material)).toBeCloseTo(5.096, 12);
    // disposal = M·(1 − R2 − R3 − reuse)·ED = 1·(1 − 0.72)·0.1 = 0.028; energy = 0
    expect(gwp(results.methods.cff?.parts.disposal)).toBeCloseTo(0.028, 12);
    expect(gwp(results.methods.cff?.parts.energy)).toBe(0);
    // total = 5.096 + 0.028 + A2 0.025 + A3 0.5 + C2 0.01 + C3 processing 0.04 = 5.699
    expect(gwp(results.methods.cff?.total)).toBeCloseTo(5.699, 12);
  });

  it('0:100 is A = 0: material = 1.25·(0.7·10 + 0.3·10) + 0.945·(−9) = 12.5 − 8.505 = 3.995; total 4.598', () => {
    expect(gwp(results.methods['eol-recycling']?.parts.material)).toBeCloseTo(3.995, 12);
    expect(gwp(results.methods['eol-recycling']?.total)).toBeCloseTo(4.598, 12);
  });

  it('50:50 is A = 0.5: material = 1.25·(7 + 0.3·(1 + 5)) + 0.945·0.5·(−9) = 11 − 4.2525 = 6.7475; total 7.3505', () => {
    expect(gwp(results.methods['fifty-fifty']?.parts.material)).toBeCloseTo(6.7475, 12);
    expect(gwp(results.methods['fifty-fifty']?.total)).toBeCloseTo(7.3505, 12);
  });

  it('A = 1 reduces the material part to G·[(1−R1)·Ev + R1·Erec], the cut-off A1', async () => {
    const [{ results: a1 }] = (await compute(await writeFixture(base({ cffA: '1' })))) as [Awaited<ReturnType<typeof compute>>[number]];
    expect(gwp(a1.methods.cff?.parts.material)).toBeCloseTo(1.25 * (0.7 * 10 + 0.3 * 2), 12);
    expect(gwp(a1.methods.cff?.parts.material)).toBeCloseTo(gwp(a1.methods.cutoff.modules.A1)!, 12);
  });

  it('A = 0 with Q = 1 gives Ev + R2·(ErecEoL − E*v) per kg (no scrap: G = M = 1 kg)', async () => {
    const [{ results: a0 }] = (await compute(await writeFixture(base({ scrap: '0' })))) as [Awaited<ReturnType<typeof compute>>[number]];
    // 10 + 0.72·(1 − 10) = 3.52
    expect(gwp(a0.methods['eol-recycling']?.parts.material)).toBeCloseTo(10 + 0.72 * (1 - 10), 12);
  });
});

describe('module D charges a net inflow of secondary material (EN 15804+A2 Annex D)', () => {
  it('recycled content above the recycled output gives a positive load', async () => {
    // R1 = 0.9, no scrap; out = 1·0.1·0.9 = 0.09, in = 1·0.9 = 0.9, net −0.81; D = −0.81·(1 − 10) = +7.29
    const [{ results, figures }] = (await compute(await writeFixture(base({ pre: '0.4', post: '0.5', scrap: '0', recycling: '0.1', landfill: '0.9' })))) as [Awaited<ReturnType<typeof compute>>[number]];
    expect(figures['inventory/material:m1/M_MR_net']?.value).toBeCloseTo(-0.81, 12);
    expect(gwp(results.methods.cutoff.modules.D)).toBeCloseTo(7.29, 12);
    expect(gwp(results.methods.cutoff.modules.D)).toBeGreaterThan(0);
  });
});

describe('process scrap under the CFF, 0:100 and 50:50 (rule in DEVELOPERS.md)', () => {
  it('scrap to landfill is charged as in cut-off A3, and earns no recycling term', async () => {
    const fixture = base();
    fixture.bom = fixture.bom.replace(',0.2,recycled,test', ',0.2,landfill,test');
    const [{ results }] = (await compute(await writeFixture(fixture))) as [Awaited<ReturnType<typeof compute>>[number]];
    // A3 = 0.5 (electricity) + scrap 0.25 kg · ED 0.1 = 0.525
    expect(gwp(results.methods.cutoff.modules.A3)).toBeCloseTo(0.525, 12);
    // CFF material: 11.9 + (M·R2 only, no scrap) 0.72·0.8·(−9) = 11.9 − 5.184 = 6.716
    expect(gwp(results.methods.cff?.parts.material)).toBeCloseTo(6.716, 12);
    // total = 6.716 + 0.028 + 0.025 + 0.5 + 0.025 (scrap disposal) + 0.01 + 0.04 = 7.344
    expect(gwp(results.methods.cff?.total)).toBeCloseTo(7.344, 12);
    // module D: out = 0.8·0.9 = 0.72 (no scrap), in = 0.375; D = 0.345·(−9) = −3.105
    expect(gwp(results.methods.cutoff.modules.D)).toBeCloseTo(-3.105, 12);
  });
});
