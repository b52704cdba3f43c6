import { chargeAhPerKg } from '../chem/electrochemistry.ts';
import { ChemError, molarMass, parseFormula } from '../chem/formula.ts';
import type { ParametersOf } from '../schema/process-kinds.ts';
import { positive, share, StepRecorder, type ProcessResult } from './steps.ts';

/**
 * Operating data of an electrowinning tank house, per tonne of cathode metal: its
 * process.csv parameters (src/schema/process-kinds.ts); `reagent` is kg per tonne by factor id.
 */
export type Electrowinning = ParametersOf<'electrowinning'>;

/**
 * Electrowinning from a leach or solvent-extraction electrolyte (bacterial leaching
 * included): DC energy by Faraday's law, E = z·F·m/M·U/η, plus auxiliaries; reagents as given.
 */
export function electrowinning(p: Electrowinning): ProcessResult {
  const rec = new StepRecorder();
  let mass: number | undefined;
  try {
    const formula = parseFormula(p.metal);
    if (formula.elements.size !== 1 || [...formula.elements.values()][0] !== 1 || formula.charge !== 0) throw new ChemError('is not a single element', p.metal, 0);
    mass = molarMass(formula);
  } catch (error) {
    if (!(error instanceof ChemError)) throw error;
    rec.problem('metal', p.metal, `is not an element: ${error.message}`, 'an element symbol such as Cu, Zn or Ni');
  }
  if (!Number.isInteger(p.charge) || p.charge < 1 || p.charge > 4) rec.problem('charge', p.charge, 'is not the charge of a metal ion', 'a whole number from 1 to 4 (2 for Cu²⁺)');
  const voltageOk = positive(rec, 'cell_voltage_v', p.cell_voltage_v);
  const efficiencyOk = share(rec, 'current_efficiency', p.current_efficiency);
  if (p.auxiliary_share !== undefined) share(rec, 'auxiliary_share', p.auxiliary_share, { allowZero: true });
  if (mass === undefined || !voltageOk || !efficiencyOk || rec.problems.length > 0) return rec.result();
  const charge = rec.step('charge_ah_per_t', chargeAhPerKg(p.charge, mass) * 1000, 'Ah/t', 'Q = z·F·1000 kg / M / 3600', `Charge to deposit a tonne of ${p.metal} from its ${p.charge}+ ion (Faraday's law).`, ['ref:F', 'param:metal', 'param:charge']);
  const dc = rec.step('dc_kwh_per_t', (charge * p.cell_voltage_v) / p.current_efficiency / 1000, 'kWh/t', 'E = Q·U / η / 1000', 'DC energy of the tank house.', ['charge_ah_per_t', 'param:cell_voltage_v', 'param:current_efficiency']);
  rec.step('electricity_kwh_per_t', dc * (1 + (p.auxiliary_share ?? 0)), 'kWh/t', 'E_total = E·(1 + aux)', 'Electricity including rectifier, pumping and auxiliary loads.', ['dc_kwh_per_t', ...(p.auxiliary_share !== undefined ? ['param:auxiliary_share'] : [])]);
  rec.flow('electricity', 'energy', 'electricity_kwh_per_t', 'kWh');
  for (const [factor, kg] of Object.entries(p.reagent ?? {})) {
    if (!(kg >= 0)) {
      rec.problem(`reagent:${factor}`, kg, 'must not be negative', 'kg per tonne of metal');
      continue;
    }
    rec.step(`reagent:${factor}`, kg, 'kg/t', 'reagent = measured', `Reagent ${factor} per tonne of metal.`, [`param:reagent:${factor}`]);
    rec.flow(factor, 'material', `reagent:${factor}`, 'kg');
  }
  return rec.result();
}
