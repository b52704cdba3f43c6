import { molarMass, parseFormula } from '../chem/formula.ts';
import { ATOMIC_WEIGHTS_SOURCE } from '../reference/atomic-weights.ts';
import { CONSTANTS_SOURCE, FARADAY_C_PER_MOL } from '../reference/constants.ts';
import { CO2_PER_C } from '../reference/constants.ts';
import { PFC_SLOPE_DEFAULTS, SMELTING_SOURCE, TIER1_CO2_T_PER_T } from '../reference/smelting.ts';
import type { ProcessInput } from './run.ts';

export interface ProcessReference {
  value: number;
  unit: string;
  description: string;
}

const molar = (formula: string): ProcessReference => ({ value: molarMass(parseFormula(formula)), unit: 'g/mol', description: `Molar mass of ${formula}, ${ATOMIC_WEIGHTS_SOURCE}.` });

/** The reference value behind a calculator step's `ref:<name>` input, for this process's parameters. */
export function processReference(name: string, input: ProcessInput): ProcessReference | undefined {
  const technology = input.kind === 'electrolysis-aluminium' ? input.values.technology : undefined;
  switch (name) {
    case 'F':
      return { value: FARADAY_C_PER_MOL, unit: 'C/mol', description: `Faraday constant F = e·N_A, ${CONSTANTS_SOURCE}.` };
    case 'M_Al':
      return molar('Al');
    case 'M_C':
      return molar('C');
    case 'M_Al2O3':
      return molar('Al2O3');
    case 'CO2_per_C':
      return { value: CO2_PER_C, unit: 't CO2 per t C', description: 'CO2/C molar mass ratio as the IPCC 2006 Guidelines use it (44/12).' };
    case 'tier1':
      return technology ? { value: TIER1_CO2_T_PER_T[technology], unit: 't CO2/t Al', description: `IPCC Tier 1 default emission factor for ${technology}, ${SMELTING_SOURCE}, as transcribed in loopsheet: check it against the table.` } : undefined;
    case 'slope_cf4':
      return technology ? { value: PFC_SLOPE_DEFAULTS[technology].slopeCf4, unit: '(kg CF4/t Al) per (AE-min/cell-day)', description: `IPCC default CF4 slope for ${technology}, ${SMELTING_SOURCE}, as transcribed in loopsheet: check it against the table.` } : undefined;
    case 'c2f6_per_cf4':
      return technology ? { value: PFC_SLOPE_DEFAULTS[technology].c2f6PerCf4, unit: 'kg C2F6 per kg CF4', description: `IPCC default C2F6/CF4 weight fraction for ${technology}, ${SMELTING_SOURCE}, as transcribed in loopsheet: check it against the table.` } : undefined;
    default:
      return undefined;
  }
}
