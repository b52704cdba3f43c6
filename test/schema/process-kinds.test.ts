import { describe, expect, it } from 'vitest';
import { kindSchema, knownParameters, parameterMeta, parametersOf, PROCESS_KINDS } from '../../src/schema/process-kinds.ts';

describe('process kinds: one zod schema each', () => {
  it('reads a tank house as its calculator takes it: numbers, a share written as a percentage, a family by name', () => {
    const parsed = kindSchema('electrowinning', { decimalComma: false }).parse({ metal: 'Cu', charge: '2', cell_voltage_v: '2.0', current_efficiency: '92%', reagent: { 'sulphuric-acid': '25' } });
    expect(parsed).toEqual({ metal: 'Cu', charge: 2, cell_voltage_v: 2, current_efficiency: 0.92, reagent: { 'sulphuric-acid': 25 } });
  });

  it('reads decimal commas in a semicolon file, and gives an empty family when none is written', () => {
    const parsed = kindSchema('electrowinning', { decimalComma: true }).parse({ metal: 'Zn', charge: '2', cell_voltage_v: '3,3', current_efficiency: '0,9' });
    expect(parsed).toMatchObject({ cell_voltage_v: 3.3, current_efficiency: 0.9, reagent: {} });
  });

  it('refuses a missing required parameter, a fractional charge and an unknown name, each at its path', () => {
    const result = kindSchema('electrowinning', { decimalComma: false }).safeParse({ metal: 'Cu', charge: '2.5', current_efficiency: '0.9', colour: 'red' });
    expect(result.success).toBe(false);
    const paths = result.error!.issues.map((issue) => issue.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['charge', 'cell_voltage_v']));
    expect(result.error!.issues.some((issue) => issue.code === 'unrecognized_keys')).toBe(true);
  });

  it('knows each parameter’s unit, type and family, as process.csv names it', () => {
    expect(parameterMeta('electrolysis-aluminium', 'cell_voltage_v')).toMatchObject({ unit: 'V', type: 'number', required: true, family: false });
    expect(parameterMeta('electrolysis-aluminium', 'electricity_factor')).toMatchObject({ type: 'factor', required: false });
    expect(parameterMeta('electrowinning', 'reagent:sulphuric-acid')).toMatchObject({ unit: 'kg/t', family: true });
    // A family is named with its member; a named parameter is not.
    expect(parameterMeta('electrowinning', 'reagent')).toBeUndefined();
    expect(parameterMeta('electrowinning', 'cell_voltage_v:x')).toBeUndefined();
    expect(parameterMeta('carbothermic-reduction', 'cell_voltage_v')).toBeUndefined();
    expect(knownParameters('carbothermic-reduction')).toContain('reductant_carbon:<name>');
  });

  it('documents every parameter of every kind', () => {
    for (const kind of PROCESS_KINDS) {
      const parameters = parametersOf(kind);
      expect(parameters.length).toBeGreaterThan(0);
      for (const { meta } of parameters) expect(meta.description.length).toBeGreaterThan(10);
    }
  });
});
