import { describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/project.ts';
import { writeFixture } from '../calc/fixture.ts';

const polymer = (declaration: Record<string, unknown> = {}) =>
  writeFixture({
    bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,pl,product,1,test',
    materials: 'material,name,family,virgin,incineration,landfill,lhv_mj_per_kg\npl,Polymer,polymer,ev,inc,ed,40',
    eol: 'scenario,material,energy_recovery,landfill\ns1,*,0.5,0.5',
    factors: 'factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,3\ninc,incineration,kg,test,2.5\ned,landfill,kg,test,0.1\nelec,electricity,kWh,test,0.5',
    declaration,
  });

describe('energy recovery needs its declaration', () => {
  it('is an error when a product material with a heating value goes to energy recovery and declaration.json has no energy_recovery', async () => {
    const { problems } = await loadProject(await polymer());
    expect(problems).toContainEqual(expect.objectContaining({ code: 'VALUE_REQUIRED', file: 'declaration.json', column: 'energy_recovery', severity: 'error' }));
  });

  it('names a substituted-energy factor that does not exist, or is not per unit of energy', async () => {
    const { problems } = await loadProject(await polymer({ energy_recovery: { electricity_efficiency: 0.2, heat_efficiency: 0.3, electricity_factor: 'elec-grid', heat_factor: 'ev' } }));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'UNKNOWN_REFERENCE', column: 'energy_recovery.electricity_factor', hint: 'did you mean "elec"?' }));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'UNIT_MISMATCH', column: 'energy_recovery.heat_factor', value: 'ev' }));
  });
});

describe('factors a use needs', () => {
  it('recycled content needs an eol_recycling factor: module D charges its net flow', async () => {
    const dir = await writeFixture({
      bom: 'product_id,line_id,component,material,role,mass_kg,recycled_post,source\nP1,L1,Part,m1,product,1,0.5,test',
      materials: 'material,name,family,virgin,recycled,landfill\nm1,Metal,metal,ev,erec,ed',
      eol: 'scenario,material,landfill\ns1,*,1',
      factors: 'factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,3\nerec,recycled,kg,test,1\ned,landfill,kg,test,0.1',
    });
    const { problems } = await loadProject(dir);
    expect(problems).toContainEqual(expect.objectContaining({ code: 'FACTOR_REQUIRED', file: 'materials.csv', line: 2, column: 'eol_recycling' }));
  });
});

describe('declaration.json problems in one run', () => {
  it('reports the rules between keys with the schema errors, not after them, and the nearest key for an unknown one', async () => {
    const { problems } = await loadProject(await polymer({ issued: '2026-13-02', verification: { status: 'verified' }, gwp_sett: 'x' }));
    const codes = problems.filter((p) => p.file === 'declaration.json').map((p) => [p.code, p.column]);
    expect(codes).toEqual(expect.arrayContaining([['BAD_DATE', 'issued'], ['VERIFICATION_INCOMPLETE', 'verification.verifier'], ['VERIFICATION_INCOMPLETE', 'verification.date'], ['KEY_UNKNOWN', 'gwp_sett']]));
    expect(problems.find((p) => p.code === 'KEY_UNKNOWN')?.hint).toBe('did you mean "gwp_set"?');
  });
});
