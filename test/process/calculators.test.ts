import { describe, expect, it } from 'vitest';
import { aluminiumSmelter, type AluminiumSmelter } from '../../src/process/electrolysis-aluminium.ts';
import { carbothermicReduction } from '../../src/process/carbothermic-reduction.ts';
import { electrowinning } from '../../src/process/electrowinning.ts';
import type { ProcessResult } from '../../src/process/steps.ts';
import { ALUMINA_DECOMPOSITION_GIBBS_KJ_PER_MOL, ALUMINA_DECOMPOSITION_V } from '../../src/reference/smelting.ts';
import { FARADAY_C_PER_MOL } from '../../src/reference/constants.ts';

const value = (result: ProcessResult, id: string): number => {
  const step = result.steps.find((s) => s.id === id);
  if (!step) throw new Error(`no step ${id}: ${JSON.stringify(result.problems)}`);
  return step.value;
};
const base: AluminiumSmelter = { technology: 'CWPB', cell_voltage_v: 4.2, current_efficiency: 0.95 };

describe('electrolysis-aluminium (Hall–Héroult)', () => {
  it("DC energy by Faraday's law: 2 980 Ah per kg and 13.2 kWh per kg at 4.2 V and 95 %", () => {
    // Field guide §4: Q = z·F·m/M with z = 3, E = Q·U/η.
    const result = aluminiumSmelter(base);
    expect(value(result, 'charge_ah_per_t') / 1000).toBeCloseTo(2980, 0);
    expect(value(result, 'dc_kwh_per_t') / 1000).toBeCloseTo(13.2, 1);
    expect(value(result, 'electricity_kwh_per_t')).toBe(value(result, 'dc_kwh_per_t'));
    expect(value(aluminiumSmelter({ ...base, auxiliary_share: 0.05 }), 'electricity_kwh_per_t')).toBeCloseTo(value(result, 'dc_kwh_per_t') * 1.05, 6);
  });

  it('a measured energy below the Faraday floor at the stated voltage is an error naming both numbers', () => {
    // Floor at 4.2 V, 100 % current efficiency: 2 980.0 Ah/kg × 4.2 V = 12 516 kWh/t.
    const result = aluminiumSmelter({ ...base, current_efficiency: undefined, electricity_kwh_per_t: 12000 });
    expect(result.steps).toEqual([]);
    expect(result.problems).toHaveLength(1);
    expect(result.problems[0]).toMatchObject({ parameter: 'electricity_kwh_per_t', value: '12000' });
    expect(result.problems[0]!.message).toMatch(/12000 kWh\/t is below the Faraday-law floor of 1251[56] kWh\/t at 4\.2 V/);
    expect(value(aluminiumSmelter({ ...base, electricity_kwh_per_t: 13500 }), 'dc_kwh_per_t')).toBe(13500);
  });

  it('anode CO2 by the IPCC 2006 prebake equation (Eq. 4.21), hand-worked', () => {
    // E = NAC·(100 − S_a − Ash_a)/100·44/12 = 0.42 × (100 − 2 − 0.4)/100 × 44/12 = 0.42 × 0.976 × 3.6667 = 1.50304 t CO2/t Al
    const result = aluminiumSmelter({ ...base, net_anode_consumption_t_per_t: 0.42, anode_sulphur_pct: 2, anode_ash_pct: 0.4 });
    expect(value(result, 'anode_co2_t_per_t')).toBeCloseTo(1.50304, 5);
    expect(result.notes.join(' ')).toContain('Tier 2, prebake');
  });

  it('anode CO2 by the Søderberg equation (Eq. 4.22, from memory of the Guidelines), hand-worked', () => {
    // PC 0.53, CSM 4 kg/t, BC 27 %, pitch S 0.6 %, ash 0.2 %, H 3.3 %, coke S 1.9 %, ash 0.2 %, CD 0.01 t/t:
    // C = 0.53 − 0.004 − 0.27·0.53·0.041 − 0.73·0.53·0.021 − 0.01 = 0.53 − 0.004 − 0.0058671 − 0.0081249 − 0.01 = 0.502008
    // E = 0.502008 × 44/12 = 1.840696 t CO2/t Al
    const result = aluminiumSmelter({ technology: 'VSS', cell_voltage_v: 4.5, current_efficiency: 0.92, paste_consumption_t_per_t: 0.53, csm_kg_per_t: 4, binder_pct: 27, pitch_sulphur_pct: 0.6, pitch_ash_pct: 0.2, pitch_hydrogen_pct: 3.3, coke_sulphur_pct: 1.9, coke_ash_pct: 0.2, skimmed_dust_carbon_t_per_t: 0.01 });
    expect(value(result, 'anode_co2_t_per_t')).toBeCloseTo(1.840696, 5);
  });

  it('Tier 1 when no anode data are given, and says so', () => {
    // IPCC 2006 Table 4.10 (field guide §4, from memory): prebake 1.6, Søderberg 1.7 t CO2/t Al.
    expect(value(aluminiumSmelter(base), 'anode_co2_t_per_t')).toBe(1.6);
    expect(value(aluminiumSmelter({ ...base, technology: 'HSS' }), 'anode_co2_t_per_t')).toBe(1.7);
    expect(aluminiumSmelter(base).notes.join(' ')).toContain('Tier 1 default for CWPB');
  });

  it('PFCs by the slope method: CF4 = S·AEM, C2F6 = CF4·F', () => {
    // CWPB defaults (field guide §4, from memory): S = 0.143, F = 0.121; AEM 0.1 min/cell-day:
    // CF4 = 0.143 × 0.1 = 0.0143 kg/t; C2F6 = 0.0143 × 0.121 = 0.0017303 kg/t
    const result = aluminiumSmelter({ ...base, anode_effect_minutes_per_cell_day: 0.1 });
    expect(value(result, 'cf4_kg_per_t')).toBeCloseTo(0.0143, 7);
    expect(value(result, 'c2f6_kg_per_t')).toBeCloseTo(0.0017303, 7);
    const measured = aluminiumSmelter({ ...base, anode_effect_minutes_per_cell_day: 0.1, slope_cf4: 0.2, c2f6_per_cf4: 0.1 });
    expect(value(measured, 'cf4_kg_per_t')).toBeCloseTo(0.02, 9);
    expect(value(measured, 'c2f6_kg_per_t')).toBeCloseTo(0.002, 9);
  });

  it('alumina from stoichiometry (1.889 t/t) plus the stated loss; below it is an error', () => {
    // 2Al2O3 + 3C → 4Al + 3CO2: 2 × 101.961 / (4 × 26.9815) = 1.8894 t Al2O3 per t Al (field guide §4)
    expect(value(aluminiumSmelter(base), 'alumina_t_per_t')).toBeCloseTo(1.889, 3);
    expect(value(aluminiumSmelter({ ...base, alumina_loss_share: 0.01 }), 'alumina_t_per_t')).toBeCloseTo(1.889 * 1.01, 3);
    expect(aluminiumSmelter({ ...base, alumina_t_per_t: 1.85 }).problems[0]).toMatchObject({ parameter: 'alumina_t_per_t', expected: 'at least 1.889' });
  });

  it('a typical smelter lands in the usual ranges: 13–15 kWh/kg and 1.5–1.7 t CO2/t (common practice)', () => {
    const typical = aluminiumSmelter({ technology: 'CWPB', cell_voltage_v: 4.25, current_efficiency: 0.94, net_anode_consumption_t_per_t: 0.43, anode_sulphur_pct: 1.5, anode_ash_pct: 0.3 });
    expect(value(typical, 'dc_kwh_per_t') / 1000).toBeGreaterThan(13);
    expect(value(typical, 'dc_kwh_per_t') / 1000).toBeLessThan(15);
    expect(value(typical, 'anode_co2_t_per_t')).toBeGreaterThan(1.5);
    expect(value(typical, 'anode_co2_t_per_t')).toBeLessThan(1.7);
  });

  it.each([
    [{ cell_voltage_v: 0 }, 'cell_voltage_v'],
    [{ current_efficiency: 1.2 }, 'current_efficiency'],
    [{ net_anode_consumption_t_per_t: -0.4, anode_sulphur_pct: 2, anode_ash_pct: 0.4 }, 'net_anode_consumption_t_per_t'],
    [{ net_anode_consumption_t_per_t: 0.3, anode_sulphur_pct: 2, anode_ash_pct: 0.4 }, 'net_anode_consumption_t_per_t'],
    [{ net_anode_consumption_t_per_t: 0.42 }, 'anode_sulphur_pct'],
  ] as Array<[Partial<AluminiumSmelter>, string]>)('refuses %j with a problem on %s, not a number', (change, parameter) => {
    const result = aluminiumSmelter({ ...base, ...change });
    expect(result.steps).toEqual([]);
    expect(result.problems.map((p) => p.parameter)).toContain(parameter);
  });

  it('refuses a cell voltage below the decomposition voltage of alumina with a carbon anode', () => {
    // E = ΔG / (zF): about 683 kJ per mol Al2O3 over z = 6 at 960 °C is 1.18 V (Thonstad et al.,
    // Aluminium Electrolysis, 3rd ed., 2001; from memory), F from CODATA 2018.
    expect((ALUMINA_DECOMPOSITION_GIBBS_KJ_PER_MOL * 1000) / (6 * FARADAY_C_PER_MOL)).toBeCloseTo(ALUMINA_DECOMPOSITION_V, 2);
    const result = aluminiumSmelter({ ...base, cell_voltage_v: 1.1, electricity_kwh_per_t: 4000 });
    expect(result.steps).toEqual([]);
    expect(result.problems[0]).toMatchObject({ parameter: 'cell_voltage_v', message: expect.stringMatching(/1\.1 V is below the decomposition voltage of alumina with a carbon anode \(about 1\.18 V/) });
    expect(aluminiumSmelter({ ...base, cell_voltage_v: 1.2 }).problems).toEqual([]);
  });

  it('the carbon floor is the stoichiometric 0.334 t C/t Al', () => {
    // 3 × 12.011 / (4 × 26.9815) = 0.3339 (field guide §4)
    const result = aluminiumSmelter({ ...base, net_anode_consumption_t_per_t: 0.3, anode_sulphur_pct: 2, anode_ash_pct: 0.4 });
    expect(result.problems[0]!.message).toContain('below the stoichiometric floor of 0.334 t C/t Al');
  });
});

describe('electrowinning', () => {
  it('copper at 2.0 V and 92 %: 843.5 Ah/kg and about 1.83 kWh/kg', () => {
    // Field guide §4: z = 2, 843.5 Ah/kg Cu; 843.5 × 2.0 / 0.92 = 1 833.7 kWh/t (1.8–2.0 kWh/kg, common practice)
    const result = electrowinning({ metal: 'Cu', charge: 2, cell_voltage_v: 2.0, current_efficiency: 0.92, reagent: { 'sulphuric-acid': 25 } });
    expect(value(result, 'charge_ah_per_t') / 1000).toBeCloseTo(843.5, 1);
    expect(value(result, 'electricity_kwh_per_t')).toBeCloseTo(1833.7, 0);
    expect(result.inventory.map((f) => f.flow)).toEqual(['electricity', 'sulphuric-acid']);
  });

  it('zinc from Zn²⁺: 819.87 Ah/kg', () => {
    // 2 × 96 485.332 C/mol / 65.38 g/mol = 2 951.5 C/g = 2 951 500 C/kg; / 3600 s/h = 819.87 Ah/kg (Faraday's law, IUPAC atomic weight of Zn)
    expect(value(electrowinning({ metal: 'Zn', charge: 2, cell_voltage_v: 3.3, current_efficiency: 0.9, reagent: {} }), 'charge_ah_per_t') / 1000).toBeCloseTo(819.87, 2);
  });

  it.each([
    [{ metal: 'Qq' }, 'metal'],
    [{ metal: 'CuSO4' }, 'metal'],
    [{ charge: 0 }, 'charge'],
    [{ cell_voltage_v: -1 }, 'cell_voltage_v'],
    [{ current_efficiency: 1.2 }, 'current_efficiency'],
  ])('refuses %j', (change, parameter) => {
    const result = electrowinning({ metal: 'Cu', charge: 2, cell_voltage_v: 2, current_efficiency: 0.9, reagent: {}, ...change });
    expect(result.steps).toEqual([]);
    expect(result.problems.map((p) => p.parameter)).toContain(parameter);
  });
});

describe('carbothermic reduction', () => {
  it('CO2 by the IPCC 2006 carbon mass balance, hand-worked', () => {
    // C_in = 0.5 × 0.85 + 0.05 × 0.75 = 0.4625; C_out = 0.02 × 0.5 = 0.01; CO2 = (0.4625 − 0.01) × 44/12 = 1.659167 t/t
    const result = carbothermicReduction({
      metal: 'Zn',
      inputs: [
        { name: 'coke', mass_t_per_t: 0.5, carbon_share: 0.85 },
        { name: 'coal', mass_t_per_t: 0.05, carbon_share: 0.75 },
      ],
      outputs: [{ name: 'slag', mass_t_per_t: 0.02, carbon_share: 0.5 }],
    });
    expect(value(result, 'co2_t_per_t')).toBeCloseTo(1.659167, 6);
  });

  it.each(['Al', 'Mg', 'Na', 'Ca', 'K'])('refuses %s: above carbon in the reactivity series, won by electrolysis (common practice)', (metal) => {
    const result = carbothermicReduction({ metal, inputs: [{ name: 'coke', mass_t_per_t: 1, carbon_share: 0.85 }], outputs: [] });
    expect(result.steps).toEqual([]);
    expect(result.problems[0]!.message).toContain('won by electrolysis');
  });

  it('refuses negative masses, shares above 1, and more carbon out than in', () => {
    expect(carbothermicReduction({ metal: 'Fe', inputs: [{ name: 'coke', mass_t_per_t: -1, carbon_share: 0.85 }], outputs: [] }).problems[0]!.parameter).toBe('reductant:coke');
    expect(carbothermicReduction({ metal: 'Fe', inputs: [{ name: 'coke', mass_t_per_t: 1, carbon_share: 1.5 }], outputs: [] }).problems[0]!.parameter).toBe('reductant_carbon:coke');
    expect(carbothermicReduction({ metal: 'Fe', inputs: [{ name: 'coke', mass_t_per_t: 0.05, carbon_share: 0.5 }], outputs: [{ name: 'pig iron', mass_t_per_t: 1, carbon_share: 0.045 }] }).problems[0]!.message).toContain('more carbon leaves');
  });
});
