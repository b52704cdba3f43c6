import { describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/project.ts';
import { eolRowFor } from '../../src/model/lookups.ts';
import { writeFixture } from '../calc/fixture.ts';

describe('the project lookups, built once when the project is read', () => {
  it('find rows by id, and a material’s end-of-life row: its own in the scenario, else the scenario’s *', async () => {
    const dir = await writeFixture({
      bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,m1,product,1,test\nP1,L2,Pallet,m2,packaging,0.1,test',
      materials: 'material,name,family,virgin,landfill\nm1,Metal,metal,ev,ed\nm2,Wood,wood,ev,ed',
      eol: 'scenario,material,recycling,landfill,recycling_yield,transport_km\ns1,*,0,1,1,0\ns1,m1,0,1,0.9,0',
      factors: 'factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,2\ned,landfill,kg,test,0.1',
    });
    const { project, problems } = await loadProject(dir);
    expect(problems.filter((p) => p.severity === 'error')).toEqual([]);
    const lookups = project!.lookups;
    expect(lookups.products.get('P1')?.value.product_id).toBe('P1');
    expect(lookups.factors.get('ed')?.line).toBeGreaterThan(0);
    expect(lookups.scenarios.get('s1')!.map((row) => row.value.material)).toEqual(['*', 'm1']);
    expect(eolRowFor(lookups, 's1', 'm1')?.value.recycling_yield).toBe(0.9);
    expect(eolRowFor(lookups, 's1', 'm2')?.value.material).toBe('*');
    expect(eolRowFor(lookups, 'unknown', 'm1')).toBeUndefined();
    const line = project!.bom.rows[1]!;
    expect(lookups.byLine.bom.get(line.line)).toBe(line);
  });
});
