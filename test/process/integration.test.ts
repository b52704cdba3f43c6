import { afterAll, describe, expect, it } from 'vitest';
import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { CalcContext } from '../../src/calc/context.ts';
import { calculateProduct } from '../../src/calc/product.ts';
import { rowsByProduct } from '../../src/model/by-product.ts';
import { loadProject } from '../../src/model/project.ts';
import { indicatorValue } from '../../src/model/types.ts';
import { resultsJson } from '../../src/report/results.ts';
import { figureMap, writtenFrom, type FlatFigure } from '../figures.ts';
import { demoWithoutProcesses, editFile, removeDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((d) => removeDir(path.dirname(d)))));

const POTLINE = [
  'process_id,kind,parameter,value,unit,source',
  'potline-1,electrolysis-aluminium,technology,CWPB,,Potline log 2025 (illustrative)',
  'potline-1,electrolysis-aluminium,cell_voltage_v,4.2,V,Potline log 2025 (illustrative)',
  'potline-1,electrolysis-aluminium,current_efficiency,95%,%,Potline log 2025 (illustrative)',
  'potline-1,electrolysis-aluminium,net_anode_consumption_t_per_t,0.42,t/t,Carbon plant (illustrative)',
  'potline-1,electrolysis-aluminium,anode_sulphur_pct,2,%,Lab (illustrative)',
  'potline-1,electrolysis-aluminium,anode_ash_pct,0.4,%,Lab (illustrative)',
  'potline-1,electrolysis-aluminium,anode_effect_minutes_per_cell_day,0.1,min/cell-day,Potline log (illustrative)',
  'potline-1,electrolysis-aluminium,electricity_factor,grid-electricity,,',
  'potline-1,electrolysis-aluminium,alumina_factor,alumina-test,,',
  'potline-1,electrolysis-aluminium,anode_factor,anode-test,,',
];

/** The demo with a smelter whose aluminium is the virgin input of al-6060. */
async function smelterProject() {
  const dir = await demoWithoutProcesses();
  dirs.push(dir);
  await writeFile(path.join(dir, 'process.csv'), `${POTLINE.join('\n')}\n`);
  // Two more factor rows: copies of an existing mass factor under new ids (values illustrative).
  const factors = await readFile(path.join(dir, 'factors.csv'), 'utf8');
  const landfill = factors.split('\n').find((line) => line.startsWith('landfill-inert,'))!;
  await writeFile(path.join(dir, 'factors.csv'), `${factors.trimEnd()}\n${landfill.replace('landfill-inert,', 'alumina-test,')}\n${landfill.replace('landfill-inert,', 'anode-test,')}\n`);
  await editFile(path.join(dir, 'materials.csv'), (t) => t.replace(',al-primary-ingot,al-remelted-ingot,', ',process:potline-1,al-remelted-ingot,'));
  return loadProject(dir);
}

describe('a process of process.csv as a factor', () => {
  it('charges the smelter’s flows with their factors, per kg of aluminium, and feeds A1', async () => {
    const { project, problems } = await smelterProject();
    expect(problems.filter((p) => p.severity === 'error')).toEqual([]);
    const ctx = new CalcContext(project!);
    const rows = rowsByProduct(project!).find((r) => r.product.value.product_id === 'KV-EXT-6060')!;
    const results = resultsJson(ctx, calculateProduct(ctx, rows));

    const gwp = (id: string) => indicatorValue(project!.factors.rows.find((r) => r.value.factor_id === id)!.value, 'GWP-total')!;
    // Hand-worked, per kg Al (field guide §4; IPCC 2006 Eq. 4.21 and slope method; GWP-100 from IPCC AR6 WG1 Table 7.15):
    const F = 96485.33212; // C/mol, CODATA 2018
    const mAl = 26.9815384; // g/mol, IUPAC
    const mAl2O3 = 2 * mAl + 3 * 15.999;
    const electricityKwhPerKg = ((3 * F) / mAl / 3.6) * 4.2 / 0.95 / 1000; // Ah/kg × V / η → kWh/kg
    const aluminaKgPerKg = (2 * mAl2O3) / (4 * mAl);
    const co2KgPerKg = 0.42 * ((100 - 2 - 0.4) / 100) * (44 / 12);
    const cf4KgPerKg = (0.143 * 0.1) / 1000;
    const c2f6KgPerKg = cf4KgPerKg * 0.121;
    const expected = electricityKwhPerKg * gwp('grid-electricity') + aluminaKgPerKg * gwp('alumina-test') + 0.42 * gwp('anode-test') + co2KgPerKg + cf4KgPerKg * 7380 + c2f6KgPerKg * 12400;

    const figures = figureMap(results);
    const factor = figures['process/potline-1/factor/GWP-total']!;
    expect(factor.value! / expected).toBeCloseTo(1, 9);
    // A1 of the profile's line uses it as the virgin factor Ev.
    const a1 = figures['cutoff/A1/line:L1/GWP-total']!;
    expect(a1.terms).toContain('process/potline-1/factor/GWP-total');
  });

  it('traces the factor down to the process.csv cells', async () => {
    const { project } = await smelterProject();
    const ctx = new CalcContext(project!);
    const rows = rowsByProduct(project!).find((r) => r.product.value.product_id === 'KV-EXT-6060')!;
    const figures = figureMap(resultsJson(ctx, calculateProduct(ctx, rows)), writtenFrom(project!));
    const cells: Array<Exclude<FlatFigure['terms'][number], string>> = [];
    const seen = new Set<string>();
    const walk = (id: string) => {
      if (seen.has(id)) return;
      seen.add(id);
      const figure = figures[id];
      expect(figure, id).toBeDefined();
      for (const term of figure!.terms) typeof term === 'string' ? walk(term) : cells.push(term);
    };
    walk('process/potline-1/factor/GWP-total');
    // process.csv lines 3 (cell_voltage_v) and 4 (current_efficiency), as written.
    expect(cells).toContainEqual({ file: 'process.csv', line: 3, column: 'value', value: '4.2' });
    expect(cells).toContainEqual({ file: 'process.csv', line: 4, column: 'value', value: '95%' });
    expect(cells).toContainEqual(expect.objectContaining({ file: 'factors.csv', column: 'GWP-total' }));
  });

  it('refuses a process that names no factor for a flow, and a factor id that does not exist', async () => {
    const dir = await demoWithoutProcesses();
    dirs.push(dir);
    await writeFile(path.join(dir, 'process.csv'), `${POTLINE.slice(0, 8).join('\n')}\npotline-1,electrolysis-aluminium,electricity_factor,grid-electricty,,\n`);
    const { problems } = await loadProject(dir);
    expect(problems).toContainEqual(expect.objectContaining({ code: 'FACTOR_REQUIRED', file: 'process.csv', line: 2, value: 'alumina_factor' }));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'UNKNOWN_REFERENCE', file: 'process.csv', line: 9, column: 'value', hint: 'did you mean "grid-electricity"?' }));
  });
});
