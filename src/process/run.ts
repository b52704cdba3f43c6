import type { CellTechnology } from '../reference/smelting.ts';
import { carbothermicReduction } from './carbothermic-reduction.ts';
import { aluminiumSmelter, type AluminiumSmelter } from './electrolysis-aluminium.ts';
import { electrowinning } from './electrowinning.ts';
import { StepRecorder, type ProcessResult } from './steps.ts';

/** The kinds of process a calculator exists for: process.csv `kind` takes exactly these (src/schema/process.ts). */
export const PROCESS_KINDS = ['electrolysis-aluminium', 'electrowinning', 'carbothermic-reduction'] as const;
export type ProcessKind = (typeof PROCESS_KINDS)[number];

/** A process as process.csv gives it: its kind, named values and family values (`reagent:<factor>`). */
export interface ProcessInput {
  kind: ProcessKind;
  values: Record<string, number | string>;
  families: Record<string, Record<string, number | string>>;
}

const numberOf = (values: ProcessInput['values'], name: string): number | undefined => (typeof values[name] === 'number' ? (values[name] as number) : undefined);

/** Runs the calculator of the process's kind. */
export function runProcess(input: ProcessInput): ProcessResult {
  const v = input.values;
  switch (input.kind) {
    case 'electrolysis-aluminium': {
      const params: Record<string, unknown> = { technology: v.technology as CellTechnology };
      for (const [name, value] of Object.entries(v)) if (typeof value === 'number') params[name] = value;
      return aluminiumSmelter(params as unknown as AluminiumSmelter);
    }
    case 'electrowinning':
      return electrowinning({
        metal: String(v.metal),
        charge: numberOf(v, 'charge') ?? Number.NaN,
        cell_voltage_v: numberOf(v, 'cell_voltage_v') ?? Number.NaN,
        current_efficiency: numberOf(v, 'current_efficiency') ?? Number.NaN,
        ...(numberOf(v, 'auxiliary_share') === undefined ? {} : { auxiliary_share: numberOf(v, 'auxiliary_share')! }),
        reagents: (input.families.reagent ?? {}) as Record<string, number>,
      });
    case 'carbothermic-reduction': {
      const missing = new StepRecorder();
      const streams = (mass: string, carbon: string) =>
        Object.entries((input.families[mass] ?? {}) as Record<string, number>).map(([name, massTPerT]) => {
          const share = input.families[carbon]?.[name] as number | undefined;
          if (share === undefined) missing.problem(`${carbon}:${name}`, undefined, `is required with ${mass}:${name}`, `a row ${carbon}:${name} with its carbon share`);
          return { name, mass_t_per_t: massTPerT, carbon_share: share ?? 0 };
        });
      const inputs = streams('reductant', 'reductant_carbon');
      const outputs = streams('carbon_out', 'carbon_out_carbon');
      if (missing.problems.length > 0) return missing.result();
      return carbothermicReduction({ metal: String(v.metal), inputs, outputs });
    }
  }
}

/**
 * The factor each inventory flow is charged with: the factor-id parameters of the process
 * (factors.csv rows), or a built-in greenhouse gas for direct emissions. Undefined where
 * the process names none: validation refuses that (FACTOR_REQUIRED).
 */
export function flowFactor(input: ProcessInput, flow: string): { factor?: string; parameter: string } {
  const v = input.values;
  const named = (parameter: string) => ({ parameter, ...(typeof v[parameter] === 'string' ? { factor: v[parameter] as string } : {}) });
  switch (flow) {
    case 'electricity':
      return named('electricity_factor');
    case 'alumina':
      return named('alumina_factor');
    case 'aluminium fluoride':
      return named('aluminium_fluoride_factor');
    case 'anode':
      return named('anode_factor');
    case 'CO2':
    case 'CF4':
    case 'C2F6':
      return { factor: `ghg:${flow}`, parameter: '' };
  }
  if (input.kind === 'electrowinning') return { factor: flow, parameter: `reagent:${flow}` };
  const factor = input.families.reductant_factor?.[flow];
  return { parameter: `reductant_factor:${flow}`, ...(typeof factor === 'string' ? { factor } : {}) };
}
