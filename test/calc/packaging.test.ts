import { describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/project.ts';
import { compute, writeFixture } from './fixture.ts';

/**
 * Packaging end of life in A5 (EN 15804+A2), hand-worked. P1 is 1 kg of metal packed in
 * 0.1 kg of cardboard (0.4 kg C per kg) whose scenario row sends 60 % to recycling and 40 %
 * to energy recovery (LHV 15 MJ/kg), 100 km to waste processing:
 *   transport  0.1 kg / 1000 · 100 km · 0.1 kg CO2/tkm = 0.001
 *   processing 0.1 · 0.6 · 0.02 = 0.0012
 *   incineration with energy recovery 0.1 · 0.4 · 0.05 = 0.002
 *   biogenic carbon released 0.1 · 0.4 · 44/12 = 0.146667 kg CO2 (GWP-biogenic and GWP-total)
 *   A5 GWP-total = 0.001 + 0.0012 + 0.002 + 0.146667 = 0.150867
 *   exported energy 0.1 · 0.4 · 15 = 0.6 MJ: EEE = 0.6 · 0.25 = 0.15 MJ, EET = 0.6 · 0.5 = 0.3 MJ
 *   D credit −(0.15 MJ / 3.6 MJ/kWh · 0.4 + 0.3 · 0.06) = −0.0346667
 * (1 kWh = 3.6 MJ, SI; 44/12 from the molar masses of CO2 and C.)
 */
const files = (declaration: Record<string, unknown>) =>
  writeFixture({
    bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,m1,product,1,test\nP1,P1,Box,board,packaging,0.1,test',
    materials: 'material,name,family,virgin,incineration,landfill,lhv_mj_per_kg,biogenic_c_kg_per_kg\nm1,Metal,metal,ev,,ed,,0\nboard,Cardboard,paper,board-made,inc,ed,15,0.4',
    eol: 'scenario,material,recycling,energy_recovery,landfill,recycling_yield,transport_km,transport_factor,processing_factor\ns1,*,0,0,1,1,0,,\ns1,board,0.6,0.4,0,0.9,100,truck,sorting',
    factors:
      'factor_id,name,unit,dataset,GWP-total,GWP-fossil,GWP-biogenic,GWP-luluc\nev,virgin,kg,test,2,2,0,0\ned,landfill,kg,test,0.01,0.01,0,0\nboard-made,board,kg,test,-1.2,0.27,-1.467,0\ninc,incineration,kg,test,0.05,0.05,0,0\ntruck,lorry,tkm,test,0.1,0.1,0,0\nsorting,sorting,kg,test,0.02,0.02,0,0\nelec,electricity,kWh,test,0.4,0.4,0,0\nheat,heat,MJ,test,0.06,0.06,0,0',
    declaration: { methods: ['cutoff'], energy_recovery: { electricity_efficiency: 0.25, heat_efficiency: 0.5, electricity_factor: 'elec', heat_factor: 'heat' }, ...declaration },
  });

describe('packaging end of life in A5 (hand-worked above)', async () => {
  const [declared] = await compute(await files({ declared_modules: ['A5'] }));
  const a5 = declared!.results.methods.cutoff.modules.A5!;

  it('sums transport, processing, energy recovery and the release of the biogenic carbon', () => {
    expect(a5['GWP-total']).toBeCloseTo(0.001 + 0.0012 + 0.002 + (0.1 * 0.4 * 44) / 12, 12);
    expect(a5['GWP-biogenic']).toBeCloseTo((0.1 * 0.4 * 44) / 12, 12);
  });

  it('reports the packaging’s output flows in A5: MFR 0.06 kg, MER 0.04 kg, EEE 0.15 MJ, EET 0.3 MJ', () => {
    expect(a5.MFR).toBeCloseTo(0.06, 12);
    expect(a5.MER).toBeCloseTo(0.04, 12);
    expect(a5.EEE).toBeCloseTo(0.15, 12);
    expect(a5.EET).toBeCloseTo(0.3, 12);
  });

  it('credits the exported energy in D', () => {
    expect(declared!.results.methods.cutoff.modules.D!['GWP-total']).toBeCloseTo(-((0.15 / 3.6) * 0.4 + 0.3 * 0.06), 12);
  });

  it('leaves A5 out, and says so once, where it is not declared', async () => {
    const dir = await files({});
    const [undeclared] = await compute(dir);
    expect(undeclared!.results.methods.cutoff.modules.A5).toBeUndefined();
    const { problems } = await loadProject(dir);
    expect(problems.filter((p) => p.code === 'PACKAGING_EOL_UNDECLARED')).toEqual([expect.objectContaining({ severity: 'warning', file: 'declaration.json', message: expect.stringContaining('1 product has packaging') })]);
  });
});
