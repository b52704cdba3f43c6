import { CELL_TECHNOLOGIES } from '../reference/smelting.ts';
import type { ProcessKind } from './process.ts';

/**
 * The parameters of each process kind in process.csv, with the unit each is written in.
 * `families` are parameters named `<family>:<name>` (a reagent by its factor id, a
 * reductant by its name). A share may be written 0.95 (unit `share`) or 95% (unit `%`).
 */
export interface ParameterSpec {
  description: string;
  /** The unit the value must be written in; `share` accepts `share` or `%`; empty for words. */
  unit: string;
  type: 'number' | 'share' | 'percent' | 'choice' | 'element' | 'integer' | 'factor';
  required?: boolean;
  choices?: readonly string[];
}

export interface KindSpec {
  description: string;
  parameters: Record<string, ParameterSpec>;
  families?: Record<string, ParameterSpec>;
}

const num = (description: string, unit: string, required = false): ParameterSpec => ({ description, unit, type: 'number', required });
const pct = (description: string): ParameterSpec => ({ description, unit: '%', type: 'percent' });
const shareOf = (description: string, required = false): ParameterSpec => ({ description, unit: 'share', type: 'share', required });
const factor = (description: string): ParameterSpec => ({ description, unit: '', type: 'factor' });

export const PROCESS_PARAMETERS: Record<ProcessKind, KindSpec> = {
  'electrolysis-aluminium': {
    description: 'A Hall–Héroult cell line making primary aluminium.',
    parameters: {
      technology: { description: 'Cell technology: CWPB, SWPB (prebake), VSS, HSS (Søderberg).', unit: '', type: 'choice', choices: CELL_TECHNOLOGIES, required: true },
      cell_voltage_v: num('Average cell voltage.', 'V', true),
      current_efficiency: shareOf('Current efficiency (needed unless electricity_kwh_per_t is measured).'),
      electricity_kwh_per_t: num('Measured DC energy per tonne of aluminium (instead of the Faraday-law value).', 'kWh/t'),
      auxiliary_share: shareOf('Rectifier and auxiliary losses on top of the DC energy.'),
      net_anode_consumption_t_per_t: num('Net carbon anode consumption (prebake, IPCC Tier 2).', 't/t'),
      anode_sulphur_pct: pct('Sulphur content of the baked anodes.'),
      anode_ash_pct: pct('Ash content of the baked anodes.'),
      paste_consumption_t_per_t: num('Søderberg paste consumption (IPCC Tier 2).', 't/t'),
      csm_kg_per_t: num('Emissions of cyclohexane-soluble matter.', 'kg/t'),
      binder_pct: pct('Binder (pitch) content of the paste.'),
      pitch_sulphur_pct: pct('Sulphur content of the pitch.'),
      pitch_ash_pct: pct('Ash content of the pitch.'),
      pitch_hydrogen_pct: pct('Hydrogen content of the pitch.'),
      coke_sulphur_pct: pct('Sulphur content of the calcined coke.'),
      coke_ash_pct: pct('Ash content of the calcined coke.'),
      skimmed_dust_carbon_t_per_t: num('Carbon in skimmed dust.', 't/t'),
      anode_effect_minutes_per_cell_day: num('Anode-effect minutes per cell-day (PFC slope method).', 'min/cell-day'),
      slope_cf4: num('Measured CF4 slope, instead of the IPCC default for the technology.', 'kg/t per min/cell-day'),
      c2f6_per_cf4: num('Measured C2F6/CF4 weight fraction, instead of the IPCC default.', 'kg/kg'),
      alumina_t_per_t: num('Measured alumina consumption (at least the stoichiometric 1.889).', 't/t'),
      alumina_loss_share: shareOf('Alumina lost in handling, on top of the stoichiometric need.'),
      aluminium_fluoride_t_per_t: num('Aluminium fluoride added to the bath.', 't/t'),
      electricity_factor: factor('Factor id (factors.csv) of the electricity supplied.'),
      alumina_factor: factor('Factor id of the alumina.'),
      aluminium_fluoride_factor: factor('Factor id of the aluminium fluoride.'),
      anode_factor: factor('Factor id of anode production.'),
    },
  },
  electrowinning: {
    description: 'An electrowinning tank house (leach or solvent-extraction electrolyte, bacterial leaching included).',
    parameters: {
      metal: { description: 'Element symbol of the metal won (Cu, Zn, Ni, Co, …).', unit: '', type: 'element', required: true },
      charge: { description: 'Charge of its ion in the electrolyte (2 for Cu²⁺, Zn²⁺, Ni²⁺).', unit: '', type: 'integer', required: true },
      cell_voltage_v: num('Average cell voltage.', 'V', true),
      current_efficiency: shareOf('Current efficiency.', true),
      auxiliary_share: shareOf('Rectifier, pumping and auxiliary loads on top of the DC energy.'),
      electricity_factor: factor('Factor id (factors.csv) of the electricity supplied.'),
    },
    families: { reagent: num('A reagent per tonne of metal, named reagent:<factor id>.', 'kg/t') },
  },
  'carbothermic-reduction': {
    description: 'A furnace reducing an oxide with carbon (zinc, iron, tin, lead, ferroalloys).',
    parameters: {
      metal: { description: 'Element symbol of the metal made.', unit: '', type: 'element', required: true },
    },
    families: {
      reductant: num('A reductant or fuel charged per tonne of metal, named reductant:<name>.', 't/t'),
      reductant_carbon: shareOf('Carbon content of reductant <name>, named reductant_carbon:<name>.'),
      carbon_out: num('A product or by-product carrying carbon out, named carbon_out:<name>.', 't/t'),
      carbon_out_carbon: shareOf('Carbon content of carbon_out <name>, named carbon_out_carbon:<name>.'),
      reductant_factor: factor('Factor id (factors.csv, per mass) of producing reductant <name>, named reductant_factor:<name>.'),
    },
  },
};

/** How a process is named where a factor id is accepted: `process:<process_id>`. */
export const PROCESS_PREFIX = 'process:';

/** The spec of a parameter of a kind, a family member's included (`reagent:acid` → reagent). */
export function parameterSpec(kind: ProcessKind, parameter: string): ParameterSpec | undefined {
  const spec = PROCESS_PARAMETERS[kind];
  const colon = parameter.indexOf(':');
  return (colon > 0 ? spec.families?.[parameter.slice(0, colon)] : undefined) ?? spec.parameters[parameter];
}
