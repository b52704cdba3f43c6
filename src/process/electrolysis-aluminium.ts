import { chargeAhPerKg } from '../chem/electrochemistry.ts';
import { molarMass, parseFormula } from '../chem/formula.ts';
import { findSpecies, massRatios, parseReaction } from '../chem/reaction.ts';
import { CO2_PER_C } from '../reference/constants.ts';
import { ALUMINA_DECOMPOSITION_V, isPrebake, PFC_SLOPE_DEFAULTS, TIER1_CO2_T_PER_T } from '../reference/smelting.ts';
import type { ParametersOf } from '../schema/process-kinds.ts';
import { nonNegative, positive, share, StepRecorder, type ProcessResult } from './steps.ts';
import { formatFixed } from '../format.ts';

/** Operating data of a Hall–Héroult cell line, per tonne of aluminium: its process.csv parameters (src/schema/process-kinds.ts). */
export type AluminiumSmelter = ParametersOf<'electrolysis-aluminium'>;

/** The cell reaction the floors come from: carbon anodes burnt by the oxygen of the alumina. */
export const HALL_HEROULT = '2Al2O3 + 3C -> 4Al + 3CO2';

/**
 * Primary aluminium per tonne: DC electricity by Faraday's law (z = 3) or as measured, with
 * the Faraday value at 100 % current efficiency as its floor; anode CO2 by the IPCC 2006
 * Tier 2 equations (prebake Eq. 4.21; Søderberg Eq. 4.22) or Tier 1; CF4 and C2F6 by the
 * slope method; alumina with its stoichiometric floor. All floors from the cell reaction,
 * the cell voltage's included: its decomposition voltage.
 */
export function aluminiumSmelter(p: AluminiumSmelter): ProcessResult {
  const rec = new StepRecorder();
  const reaction = parseReaction(HALL_HEROULT);
  const ratios = massRatios(reaction, findSpecies(reaction, 'Al'));
  const carbonFloor = ratios[findSpecies(reaction, 'C')]!;
  const aluminaFloor = ratios[findSpecies(reaction, 'Al2O3')]!;
  const mAl = molarMass(parseFormula('Al'));

  // Electricity
  const charge = rec.step('charge_ah_per_t', chargeAhPerKg(3, mAl) * 1000, 'Ah/t', 'Q = z·F·1000 kg / M_Al / 3600, z = 3', "Charge to deposit a tonne of aluminium (Faraday's law).", ['ref:F', 'ref:M_Al']);
  let voltageOk = positive(rec, 'cell_voltage_v', p.cell_voltage_v);
  if (voltageOk && p.cell_voltage_v! < ALUMINA_DECOMPOSITION_V) {
    rec.problem('cell_voltage_v', p.cell_voltage_v, `${p.cell_voltage_v} V is below the decomposition voltage of alumina with a carbon anode (about ${ALUMINA_DECOMPOSITION_V} V at 960 °C): no cell can run at it`, `at least ${ALUMINA_DECOMPOSITION_V} V (cell lines run at about 4.0–4.5 V)`);
    voltageOk = false;
  }
  const efficiencyOk = share(rec, 'current_efficiency', p.current_efficiency);
  const measuredOk = positive(rec, 'electricity_kwh_per_t', p.electricity_kwh_per_t);
  if (p.cell_voltage_v === undefined) rec.problem('cell_voltage_v', undefined, 'is required (it sets the Faraday-law energy, or the floor of a measured one)', 'the average cell voltage in V');
  if (voltageOk) {
    const floor = rec.step('dc_floor_kwh_per_t', (charge * p.cell_voltage_v!) / 1000, 'kWh/t', 'E_min = Q·U / 1000', 'DC energy at the stated voltage and 100 % current efficiency: no cell line can use less.', ['charge_ah_per_t', 'param:cell_voltage_v']);
    if (measuredOk) {
      if (p.electricity_kwh_per_t! < floor) rec.problem('electricity_kwh_per_t', p.electricity_kwh_per_t, `${p.electricity_kwh_per_t} kWh/t is below the Faraday-law floor of ${formatFixed(floor, 0)} kWh/t at ${p.cell_voltage_v} V and 100 % current efficiency`, `at least ${formatFixed(floor, 0)} kWh/t`);
      rec.step('dc_kwh_per_t', p.electricity_kwh_per_t!, 'kWh/t', 'E = measured', 'DC energy as measured at the rectifiers.', ['param:electricity_kwh_per_t']);
    } else if (efficiencyOk) {
      rec.step('dc_kwh_per_t', floor / p.current_efficiency!, 'kWh/t', 'E = E_min / η', 'DC energy at the stated current efficiency.', ['dc_floor_kwh_per_t', 'param:current_efficiency']);
    } else if (p.current_efficiency === undefined) {
      rec.problem('current_efficiency', undefined, 'is required unless electricity_kwh_per_t is measured', 'the current efficiency as a share (e.g. 0.95 or 95 %)');
    }
  }
  const auxiliary = p.auxiliary_share ?? 0;
  if (p.auxiliary_share !== undefined) share(rec, 'auxiliary_share', p.auxiliary_share, { allowZero: true });
  const dc = rec.steps.find((s) => s.id === 'dc_kwh_per_t')?.value;
  if (dc !== undefined) rec.step('electricity_kwh_per_t', dc * (1 + auxiliary), 'kWh/t', 'E_total = E·(1 + aux)', 'Electricity including rectifier and auxiliary losses.', ['dc_kwh_per_t', ...(p.auxiliary_share !== undefined ? ['param:auxiliary_share'] : [])]);
  rec.flow('electricity', 'energy', 'electricity_kwh_per_t', 'kWh');

  // Anode CO2
  rec.step('carbon_floor_t_per_t', carbonFloor, 't C/t Al', 'C_min = 3·M_C / (4·M_Al)', `Stoichiometric carbon of ${HALL_HEROULT}.`, ['ref:M_C', 'ref:M_Al']);
  if (isPrebake(p.technology) && p.net_anode_consumption_t_per_t !== undefined) {
    const nac = p.net_anode_consumption_t_per_t;
    const sulphur = p.anode_sulphur_pct ?? Number.NaN;
    const ash = p.anode_ash_pct ?? Number.NaN;
    if (nonNegative(rec, 'net_anode_consumption_t_per_t', nac) && nac < carbonFloor) rec.problem('net_anode_consumption_t_per_t', nac, `${nac} t C/t Al is below the stoichiometric floor of ${formatFixed(carbonFloor, 3)} t C/t Al (${HALL_HEROULT})`, `at least ${formatFixed(carbonFloor, 3)}`);
    if (p.anode_sulphur_pct === undefined) rec.problem('anode_sulphur_pct', undefined, 'is required with net_anode_consumption_t_per_t (IPCC Tier 2, prebake)', 'the sulphur content of the anodes, %');
    if (p.anode_ash_pct === undefined) rec.problem('anode_ash_pct', undefined, 'is required with net_anode_consumption_t_per_t (IPCC Tier 2, prebake)', 'the ash content of the anodes, %');
    percent(rec, 'anode_sulphur_pct', p.anode_sulphur_pct);
    percent(rec, 'anode_ash_pct', p.anode_ash_pct);
    rec.step('anode_co2_t_per_t', nac * ((100 - sulphur - ash) / 100) * CO2_PER_C, 't CO2/t Al', 'E_CO2 = NAC·(100 − S_a − Ash_a)/100·44/12', 'Anode CO2, IPCC 2006 Vol. 3 Eq. 4.21 (prebake, Tier 2).', ['param:net_anode_consumption_t_per_t', 'param:anode_sulphur_pct', 'param:anode_ash_pct', 'ref:CO2_per_C']);
    rec.notes.push('Anode CO2: IPCC 2006 Tier 2, prebake equation (Eq. 4.21).');
  } else if (!isPrebake(p.technology) && p.paste_consumption_t_per_t !== undefined) {
    soderberg(rec, p, carbonFloor);
  } else {
    rec.step('anode_co2_t_per_t', TIER1_CO2_T_PER_T[p.technology], 't CO2/t Al', 'E_CO2 = EF_Tier1(technology)', `Anode CO2, IPCC 2006 Tier 1 default for ${p.technology}: no anode data given.`, ['param:technology', 'ref:tier1']);
    rec.notes.push(`Anode CO2: IPCC 2006 Tier 1 default for ${p.technology} (${TIER1_CO2_T_PER_T[p.technology]} t CO2/t Al); give the anode data for Tier 2.`);
  }
  rec.flow('CO2', 'emission', 'anode_co2_t_per_t', 't');

  // PFCs, slope method
  if (p.anode_effect_minutes_per_cell_day !== undefined && nonNegative(rec, 'anode_effect_minutes_per_cell_day', p.anode_effect_minutes_per_cell_day)) {
    const defaults = PFC_SLOPE_DEFAULTS[p.technology];
    if (p.slope_cf4 !== undefined) nonNegative(rec, 'slope_cf4', p.slope_cf4);
    if (p.c2f6_per_cf4 !== undefined) nonNegative(rec, 'c2f6_per_cf4', p.c2f6_per_cf4);
    const slope = p.slope_cf4 ?? defaults.slopeCf4;
    const ratio = p.c2f6_per_cf4 ?? defaults.c2f6PerCf4;
    rec.step('cf4_kg_per_t', slope * p.anode_effect_minutes_per_cell_day, 'kg CF4/t Al', 'CF4 = S_CF4·AEM', 'CF4 from anode effects, IPCC 2006 slope method (Eq. 4.25), per tonne.', [p.slope_cf4 !== undefined ? 'param:slope_cf4' : 'ref:slope_cf4', 'param:anode_effect_minutes_per_cell_day']);
    rec.step('c2f6_kg_per_t', slope * p.anode_effect_minutes_per_cell_day * ratio, 'kg C2F6/t Al', 'C2F6 = CF4·F_C2F6/CF4', 'C2F6 from anode effects, as a weight fraction of CF4.', ['cf4_kg_per_t', p.c2f6_per_cf4 !== undefined ? 'param:c2f6_per_cf4' : 'ref:c2f6_per_cf4']);
    rec.flow('CF4', 'emission', 'cf4_kg_per_t', 'kg');
    rec.flow('C2F6', 'emission', 'c2f6_kg_per_t', 'kg');
    rec.notes.push(p.slope_cf4 !== undefined ? 'PFCs: slope method with the measured slope.' : `PFCs: slope method with the IPCC default slope for ${p.technology}.`);
  }

  // Alumina
  rec.step('alumina_floor_t_per_t', aluminaFloor, 't/t Al', 'Al2O3_min = 2·M_Al2O3 / (4·M_Al)', `Stoichiometric alumina of ${HALL_HEROULT}.`, ['ref:M_Al2O3', 'ref:M_Al']);
  if (p.alumina_t_per_t !== undefined) {
    if (positive(rec, 'alumina_t_per_t', p.alumina_t_per_t) && p.alumina_t_per_t < aluminaFloor) rec.problem('alumina_t_per_t', p.alumina_t_per_t, `${p.alumina_t_per_t} t/t is below the stoichiometric ${formatFixed(aluminaFloor, 3)} t alumina per t Al`, `at least ${formatFixed(aluminaFloor, 3)}`);
    rec.step('alumina_t_per_t', p.alumina_t_per_t, 't/t Al', 'Al2O3 = measured', 'Alumina consumed, as measured.', ['param:alumina_t_per_t']);
  } else {
    const loss = p.alumina_loss_share ?? 0;
    if (p.alumina_loss_share !== undefined) share(rec, 'alumina_loss_share', p.alumina_loss_share, { allowZero: true });
    rec.step('alumina_t_per_t', aluminaFloor * (1 + loss), 't/t Al', 'Al2O3 = Al2O3_min·(1 + loss)', 'Alumina from stoichiometry plus the stated handling loss.', ['alumina_floor_t_per_t', ...(p.alumina_loss_share !== undefined ? ['param:alumina_loss_share'] : [])]);
  }
  rec.flow('alumina', 'material', 'alumina_t_per_t', 't');
  if (p.aluminium_fluoride_t_per_t !== undefined && nonNegative(rec, 'aluminium_fluoride_t_per_t', p.aluminium_fluoride_t_per_t)) {
    rec.step('aluminium_fluoride_t_per_t', p.aluminium_fluoride_t_per_t, 't/t Al', 'AlF3 = measured', 'Aluminium fluoride added to the bath.', ['param:aluminium_fluoride_t_per_t']);
    rec.flow('aluminium fluoride', 'material', 'aluminium_fluoride_t_per_t', 't');
  }
  if (p.net_anode_consumption_t_per_t !== undefined && isPrebake(p.technology)) {
    rec.step('anode_t_per_t', p.net_anode_consumption_t_per_t, 't/t Al', 'anodes = NAC', 'Prebaked anode consumed (net).', ['param:net_anode_consumption_t_per_t']);
    rec.flow('anode', 'material', 'anode_t_per_t', 't');
  }
  return rec.result();
}

function percent(rec: StepRecorder, parameter: string, value: number | undefined): void {
  if (value !== undefined && !(value >= 0 && value < 100)) rec.problem(parameter, value, 'is not a percentage', 'a percentage from 0 to below 100');
}

/** IPCC 2006 Vol. 3 Eq. 4.22 (Søderberg, Tier 2), written down from memory of the Guidelines. */
function soderberg(rec: StepRecorder, p: AluminiumSmelter, carbonFloor: number): void {
  const needed = ['paste_consumption_t_per_t', 'csm_kg_per_t', 'binder_pct', 'pitch_sulphur_pct', 'pitch_ash_pct', 'pitch_hydrogen_pct', 'coke_sulphur_pct', 'coke_ash_pct', 'skimmed_dust_carbon_t_per_t'] as const;
  for (const name of needed) if (p[name] === undefined) rec.problem(name, undefined, `is required with paste_consumption_t_per_t (IPCC Tier 2, Søderberg)`, 'the value from the plant records');
  if (needed.some((name) => p[name] === undefined)) return;
  const pc = p.paste_consumption_t_per_t!;
  if (nonNegative(rec, 'paste_consumption_t_per_t', pc) && pc < carbonFloor) rec.problem('paste_consumption_t_per_t', pc, `${pc} t/t Al is below the stoichiometric carbon floor of ${formatFixed(carbonFloor, 3)} t C/t Al`, `at least ${formatFixed(carbonFloor, 3)}`);
  for (const name of ['binder_pct', 'pitch_sulphur_pct', 'pitch_ash_pct', 'pitch_hydrogen_pct', 'coke_sulphur_pct', 'coke_ash_pct'] as const) percent(rec, name, p[name]);
  const bc = p.binder_pct!;
  const carbon = pc - p.csm_kg_per_t! / 1000 - (bc / 100) * pc * ((p.pitch_sulphur_pct! + p.pitch_ash_pct! + p.pitch_hydrogen_pct!) / 100) - ((100 - bc) / 100) * pc * ((p.coke_sulphur_pct! + p.coke_ash_pct!) / 100) - p.skimmed_dust_carbon_t_per_t!;
  rec.step(
    'anode_co2_t_per_t',
    carbon * CO2_PER_C,
    't CO2/t Al',
    'E_CO2 = (PC − CSM/1000 − BC/100·PC·(S_p + Ash_p + H_p)/100 − (100 − BC)/100·PC·(S_c + Ash_c)/100 − CD)·44/12',
    'Anode CO2, IPCC 2006 Vol. 3 Eq. 4.22 (Søderberg paste, Tier 2).',
    needed.map((name) => `param:${name}`).concat('ref:CO2_per_C'),
  );
  rec.notes.push('Anode CO2: IPCC 2006 Tier 2, Søderberg equation (Eq. 4.22).');
}
