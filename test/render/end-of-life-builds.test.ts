import { afterAll, describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { loadProject } from '../../src/model/project.ts';
import { ProductPipeline } from '../../src/pipeline/product.ts';
import { productReach } from '../../src/model/reach.ts';
import { readsOutside } from '../../src/render/input-key.ts';
import { writeFixture } from '../calc/fixture.ts';
import { editFile, removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

/**
 * A polymer part half incinerated with energy recovery: module D credits the electricity and
 * heat it exports with the factors declaration.json names. Those rows are inputs of the
 * product like any other: in its input key, so that `build --changed` sees an edit to them.
 */
const energyRecovery = () =>
  writeFixture({
    bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,pl,product,1,test',
    materials: 'material,name,family,virgin,incineration,landfill,lhv_mj_per_kg\npl,Polymer,polymer,ev,inc,ed,40',
    eol: 'scenario,material,energy_recovery,landfill\ns1,*,0.5,0.5',
    factors: 'factor_id,name,unit,dataset,GWP-total\nev,virgin,kg,test,3\ninc,incineration,kg,test,2.5\ned,landfill,kg,test,0.1\nelec,electricity,kWh,test,0.5\nheat,heat,MJ,test,0.07',
    declaration: { energy_recovery: { electricity_efficiency: 0.2, heat_efficiency: 0.3, electricity_factor: 'elec', heat_factor: 'heat' } },
  });

describe('a product whose end of life includes energy recovery', () => {
  it('reads the substituted electricity and heat rows, and its input key covers them', async () => {
    const dir = await energyRecovery();
    dirs.push(dir);
    const { project } = await loadProject(dir);
    const pipeline = new ProductPipeline(project!);
    const rows = pipeline.products()[0]!;
    const { graph } = pipeline.calculate(rows);
    const reach = productReach(project!, rows);
    expect(readsOutside(project!, reach, graph)).toBeUndefined();
    const heat = project!.factors.rows.find((row) => row.value.factor_id === 'heat')!;
    expect(reach.get('factors.csv')?.has(heat.line)).toBe(true);
  });

  it('builds end to end, and build --changed rebuilds it when the heat factor changes', async () => {
    const data = await energyRecovery();
    dirs.push(data);
    const work = await tempDir();
    dirs.push(work);
    const out = path.join(work, 'out');
    const first = await runCli(['build', '--data', data, '--out', out, '--no-pdf']);
    expect(first.code, first.stderr).toBe(0);
    expect(first.stdout).toContain('built 1 product into');
    const results = JSON.parse(await readFile(path.join(out, 'P1', 'results.json'), 'utf8')) as { methods: { cutoff: { modules: Record<string, Record<string, number>> } } };
    // D's energy part: −0.5 kg · 40 MJ/kg · (0.2 · 0.5 kg CO2/kWh / 3.6 MJ/kWh + 0.3 · 0.07 kg CO2/MJ) = −0.9756 kg CO2 eq. (1 kWh = 3.6 MJ, SI)
    expect(results.methods.cutoff.modules.D!['GWP-total']).toBeCloseTo(-0.5 * 40 * ((0.2 * 0.5) / 3.6 + 0.3 * 0.07), 9);
    // EN 15804+A2 output flows of its own energy recovery, in C3: EEE = 1 kg · 0.5 · 40 MJ/kg · 0.2 = 4 MJ, EET = … · 0.3 = 6 MJ.
    expect(results.methods.cutoff.modules.C3!.EEE).toBeCloseTo(4, 12);
    expect(results.methods.cutoff.modules.C3!.EET).toBeCloseTo(6, 12);
    expect(results.methods.cutoff.modules.C3!.MER).toBeCloseTo(0.5, 12);
    expect(results.methods.cutoff.modules['A1-A3']!.EEE).toBe(0);
    await editFile(path.join(data, 'factors.csv'), (text) => text.replace('heat,heat,MJ,test,0.07', 'heat,heat,MJ,test,0.08'));
    const changed = await runCli(['build', '--data', data, '--out', out, '--no-pdf', '--changed']);
    expect(changed.code, changed.stderr).toBe(0);
    expect(changed.stdout).toContain('rebuilt 1 of 1 product');
    expect(changed.stdout).toMatch(/P1: factors\.csv line 6/);
  });
});

/** A metal part in a cardboard box (0.4 kg C per kg) sent to recycling by the scenario. */
const packed = (declaration: Record<string, unknown>) =>
  writeFixture({
    bom: 'product_id,line_id,component,material,role,mass_kg,source\nP1,L1,Part,m1,product,1,test\nP1,P1,Box,board,packaging,0.1,test',
    materials: 'material,name,family,virgin,landfill,biogenic_c_kg_per_kg\nm1,Metal,metal,ev,ed,0\nboard,Cardboard,paper,board-made,ed,0.4',
    eol: 'scenario,material,recycling,landfill,recycling_yield,transport_km,processing_factor\ns1,*,0,1,1,0,\ns1,board,1,0,0.9,0,sorting',
    factors: 'factor_id,name,unit,dataset,GWP-total,GWP-fossil,GWP-biogenic,GWP-luluc\nev,virgin,kg,test,2,2,0,0\ned,landfill,kg,test,0.01,0.01,0,0\nboard-made,board,kg,test,-1.2,0.27,-1.467,0\nsorting,sorting,kg,test,0.02,0.02,0,0',
    declaration: { methods: ['cutoff'], ...declaration },
  });

describe('a product with packaging, end to end', () => {
  it('declares A5 with the packaging’s end of life and the release of its biogenic carbon, on the page and in results.json', async () => {
    const data = await packed({ declared_modules: ['A5'] });
    dirs.push(data);
    const out = path.join(await tempDir(), 'out');
    dirs.push(path.dirname(out));
    const built = await runCli(['build', '--data', data, '--out', out, '--no-pdf']);
    expect(built.code, built.stderr).toBe(0);
    const results = JSON.parse(await readFile(path.join(out, 'P1', 'results.json'), 'utf8')) as { methods: { cutoff: { modules: Record<string, Record<string, number>> } } };
    // 0.1 kg · 1 · 0.02 processing + 0.1 · 0.4 · 44/12 biogenic CO2 released (−1/+1).
    expect(results.methods.cutoff.modules.A5!['GWP-total']).toBeCloseTo(0.002 + (0.1 * 0.4 * 44) / 12, 12);
    expect(results.methods.cutoff.modules.A5!.MFR).toBeCloseTo(0.1, 12);
    const page = await readFile(path.join(out, 'P1', 'index.html'), 'utf8');
    expect(page).toContain('>A5<');
    expect(page).not.toContain('A5 is not declared');
  });

  it('says on the page and in check what is left out where A5 is not declared', async () => {
    const data = await packed({});
    dirs.push(data);
    const check = await runCli(['check', '--data', data]);
    expect(check.stdout + check.stderr).toContain('PACKAGING_EOL_UNDECLARED');
    const out = path.join(await tempDir(), 'out');
    dirs.push(path.dirname(out));
    expect((await runCli(['build', '--data', data, '--out', out, '--no-pdf'])).code).toBe(0);
    const page = await readFile(path.join(out, 'P1', 'index.html'), 'utf8');
    expect(page).toContain('A5 is not declared, so the end of life of this product’s packaging (Box, 0.1 kg) is left out');
  });
});

