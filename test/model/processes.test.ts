import { afterAll, describe, expect, it } from 'vitest';
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { loadProject } from '../../src/model/project.ts';
import type { Problem } from '../../src/problems.ts';
import { demoWithoutProcesses, removeDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((d) => removeDir(path.dirname(d)))));

/** The demo with a process.csv of these rows (header on line 1, rows from line 2). */
async function withProcess(rows: string[], delimiter = ','): Promise<Awaited<ReturnType<typeof loadProject>>> {
  const dir = await demoWithoutProcesses();
  dirs.push(dir);
  await writeFile(path.join(dir, 'process.csv'), [['process_id', 'kind', 'parameter', 'value', 'unit', 'source'].join(delimiter), ...rows].join('\n') + '\n');
  return loadProject(dir);
}
const processProblems = (problems: Problem[]) => problems.filter((p) => p.file === 'process.csv');

describe('process.csv', () => {
  it('is optional: a project without it loads', async () => {
    const dir = await demoWithoutProcesses();
    dirs.push(dir);
    const { project, problems } = await loadProject(dir);
    expect(problems.filter((p) => p.severity === 'error')).toEqual([]);
    expect(project?.processes).toEqual([]);
  });

  it('the demo has two invented plants, a smelter and a tank house', async () => {
    const { project } = await loadProject(path.resolve('data'));
    expect(project?.processes.map((p) => `${p.id} ${p.kind}`)).toEqual(['glenmoor-potline electrolysis-aluminium', 'redcliff-tankhouse electrowinning']);
  });

  it('reads each process with typed parameters: shares as 0.95 or 95 %, words, families by name', async () => {
    const { project, problems } = await withProcess([
      'potline-1,electrolysis-aluminium,technology,cwpb,,potline log 2025 (illustrative)',
      'potline-1,electrolysis-aluminium,cell_voltage_v,4.2,V,potline log',
      'potline-1,electrolysis-aluminium,current_efficiency,95%,%,potline log',
      'potline-1,electrolysis-aluminium,net_anode_consumption_t_per_t,0.42,t/t,carbon plant',
      'potline-1,electrolysis-aluminium,anode_sulphur_pct,2,%,lab',
      'potline-1,electrolysis-aluminium,anode_ash_pct,0.4,%,lab',
      'potline-1,electrolysis-aluminium,electricity_factor,grid-electricity,,',
      'potline-1,electrolysis-aluminium,alumina_factor,landfill-inert,,',
      'potline-1,electrolysis-aluminium,anode_factor,landfill-inert,,',
      'tankhouse,electrowinning,metal,Cu,,SX-EW log',
      'tankhouse,electrowinning,charge,2,,',
      'tankhouse,electrowinning,cell_voltage_v,2.0,V,SX-EW log',
      'tankhouse,electrowinning,current_efficiency,0.92,share,SX-EW log',
      'tankhouse,electrowinning,reagent:landfill-inert,25,kg/t,stores',
      'tankhouse,electrowinning,electricity_factor,grid-electricity,,',
    ]);
    expect(processProblems(problems)).toEqual([]);
    const [potline, tankhouse] = project!.processes;
    expect(potline).toMatchObject({ id: 'potline-1', kind: 'electrolysis-aluminium', values: { technology: 'CWPB', cell_voltage_v: 4.2, current_efficiency: 0.95, net_anode_consumption_t_per_t: 0.42 } });
    expect(potline!.rows.get('cell_voltage_v')!.line).toBe(3);
    expect(tankhouse).toMatchObject({ id: 'tankhouse', kind: 'electrowinning', values: { metal: 'Cu', charge: 2, reagent: { 'landfill-inert': 25 } } });
  });

  it('reads a semicolon file with decimal commas', async () => {
    const { project, problems } = await withProcess(['pl;electrolysis-aluminium;technology;VSS;;log', 'pl;electrolysis-aluminium;cell_voltage_v;4,5;V;log', 'pl;electrolysis-aluminium;current_efficiency;0,92;share;log', 'pl;electrolysis-aluminium;electricity_factor;grid-electricity;;', 'pl;electrolysis-aluminium;alumina_factor;landfill-inert;;'], ';');
    expect(processProblems(problems)).toEqual([]);
    expect(project!.processes[0]!.values).toMatchObject({ cell_voltage_v: 4.5, current_efficiency: 0.92 });
  });

  it.each([
    ['a wrong unit', ['pl,electrolysis-aluminium,technology,CWPB,,log', 'pl,electrolysis-aluminium,cell_voltage_v,4.2,mV,log'], { code: 'UNIT_MISMATCH', line: 3, column: 'unit', value: 'mV', expected: 'V' }],
    ['a missing required parameter, on the first row', ['pl,electrolysis-aluminium,technology,CWPB,,log'], { code: 'VALUE_REQUIRED', line: 2, column: 'parameter', value: 'cell_voltage_v' }],
    ['an unknown technology', ['pl,electrolysis-aluminium,technology,CWBP,,log', 'pl,electrolysis-aluminium,cell_voltage_v,4.2,V,log'], { code: 'BAD_CHOICE', line: 2, column: 'value', hint: 'did you mean "CWPB"?' }],
    ['a current efficiency of 120 %', ['pl,electrolysis-aluminium,technology,CWPB,,log', 'pl,electrolysis-aluminium,cell_voltage_v,4.2,V,log', 'pl,electrolysis-aluminium,current_efficiency,1.2,share,log'], { code: 'OUT_OF_RANGE', line: 4, column: 'value' }],
    ['a voltage of 0', ['pl,electrolysis-aluminium,technology,CWPB,,log', 'pl,electrolysis-aluminium,cell_voltage_v,0,V,log', 'pl,electrolysis-aluminium,current_efficiency,0.95,share,log'], { code: 'OUT_OF_RANGE', line: 3, column: 'value' }],
    ['a negative carbon consumption', ['pl,electrolysis-aluminium,technology,CWPB,,log', 'pl,electrolysis-aluminium,cell_voltage_v,4.2,V,log', 'pl,electrolysis-aluminium,net_anode_consumption_t_per_t,-0.4,t/t,log'], { code: 'NEGATIVE_VALUE', line: 4, column: 'value' }],
    ['a carbon consumption below the stoichiometric floor', ['pl,electrolysis-aluminium,technology,CWPB,,log', 'pl,electrolysis-aluminium,cell_voltage_v,4.2,V,log', 'pl,electrolysis-aluminium,current_efficiency,0.95,share,log', 'pl,electrolysis-aluminium,net_anode_consumption_t_per_t,0.3,t/t,log', 'pl,electrolysis-aluminium,anode_sulphur_pct,2,%,lab', 'pl,electrolysis-aluminium,anode_ash_pct,0.4,%,lab'], { code: 'PROCESS_INFEASIBLE', line: 5, column: 'value' }],
    ['aluminium sent to carbothermic reduction', ['f,carbothermic-reduction,metal,Al,,log', 'f,carbothermic-reduction,reductant:coke,1,t/t,log', 'f,carbothermic-reduction,reductant_carbon:coke,0.85,share,log'], { code: 'PROCESS_INFEASIBLE', line: 2, column: 'value', message: expect.stringContaining('won by electrolysis') }],
    ['a reductant without its carbon share', ['f,carbothermic-reduction,metal,Zn,,log', 'f,carbothermic-reduction,reductant:coke,0.5,t/t,log'], { code: 'VALUE_REQUIRED', line: 2, column: 'parameter', value: 'reductant_carbon:coke' }],
    ['a reagent that is not a factor id', ['t,electrowinning,metal,Cu,,log', 't,electrowinning,charge,2,,', 't,electrowinning,cell_voltage_v,2,V,log', 't,electrowinning,current_efficiency,0.92,share,log', 't,electrowinning,electricity_factor,grid-electricity,,', 't,electrowinning,reagent:acid,25,kg/t,stores'], { code: 'UNKNOWN_REFERENCE', line: 7, column: 'parameter', value: 'reagent:acid' }],
    ['a parameter given twice', ['pl,electrolysis-aluminium,technology,CWPB,,log', 'pl,electrolysis-aluminium,cell_voltage_v,4.2,V,log', 'pl,electrolysis-aluminium,cell_voltage_v,4.3,V,log'], { code: 'DUPLICATE_ID', line: 4, column: 'parameter', hint: 'line 3 has it already: change one, or delete the row that repeats it' }],
  ] as Array<[string, string[], Partial<Problem>]>)('refuses %s with a located problem', async (_what, rows, expected) => {
    const { project, problems } = await withProcess(rows);
    expect(processProblems(problems)).toContainEqual(expect.objectContaining({ file: 'process.csv', severity: 'error', ...expected }));
    expect(project).toBeUndefined();
  });
});
