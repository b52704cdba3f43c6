import type { ParametersOf, ProcessKind } from '../schema/process-kinds.ts';
import { carbothermicReduction } from './carbothermic-reduction.ts';
import { aluminiumSmelter } from './electrolysis-aluminium.ts';
import { electrowinning } from './electrowinning.ts';
import { StepRecorder, type ProcessResult } from './steps.ts';

/** A process as process.csv gives it: its kind and its parameters, typed by the kind's schema (src/schema/process-kinds.ts). */
export type ProcessInput = { [K in ProcessKind]: { kind: K; values: ParametersOf<K> } }[ProcessKind];

/** Runs the calculator of the process's kind. */
export function runProcess(input: ProcessInput): ProcessResult {
  switch (input.kind) {
    case 'electrolysis-aluminium':
      return aluminiumSmelter(input.values);
    case 'electrowinning':
      return electrowinning(input.values);
    case 'carbothermic-reduction': {
      const values = input.values;
      const missing = new StepRecorder();
      const streams = (masses: Record<string, number>, carbon: 'reductant_carbon' | 'carbon_out_carbon', mass: string) =>
        Object.entries(masses).map(([name, massTPerT]) => {
          const share = values[carbon][name];
          if (share === undefined) missing.problem(`${carbon}:${name}`, undefined, `is required with ${mass}:${name}`, `a row ${carbon}:${name} with its carbon share`);
          return { name, mass_t_per_t: massTPerT, carbon_share: share ?? 0 };
        });
      const inputs = streams(values.reductant, 'reductant_carbon', 'reductant');
      const outputs = streams(values.carbon_out, 'carbon_out_carbon', 'carbon_out');
      if (missing.problems.length > 0) return missing.result();
      return carbothermicReduction({ metal: values.metal, inputs, outputs });
    }
  }
}

/** The factor-id parameter that charges each flow of a smelter's inventory. */
const SMELTER_FLOW_FACTORS = { electricity: 'electricity_factor', alumina: 'alumina_factor', 'aluminium fluoride': 'aluminium_fluoride_factor', anode: 'anode_factor' } as const;
const DIRECT_EMISSIONS = new Set(['CO2', 'CF4', 'C2F6']);

/**
 * The factor each inventory flow is charged with: the factor-id parameters of the process
 * (factors.csv rows), or a built-in greenhouse gas for direct emissions. Undefined where
 * the process names none: validation refuses that (FACTOR_REQUIRED).
 */
export function flowFactor(input: ProcessInput, flow: string): { factor?: string; parameter: string } {
  if (DIRECT_EMISSIONS.has(flow)) return { factor: `ghg:${flow}`, parameter: '' };
  switch (input.kind) {
    case 'electrolysis-aluminium': {
      const parameter = SMELTER_FLOW_FACTORS[flow as keyof typeof SMELTER_FLOW_FACTORS];
      return { parameter, factor: input.values[parameter] };
    }
    case 'electrowinning':
      return flow === 'electricity' ? { parameter: 'electricity_factor', factor: input.values.electricity_factor } : { factor: flow, parameter: `reagent:${flow}` };
    case 'carbothermic-reduction':
      return { parameter: `reductant_factor:${flow}`, factor: input.values.reductant_factor[flow] };
  }
}
