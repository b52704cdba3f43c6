/**
 * Default parameters of the IPCC 2006 Guidelines for National Greenhouse Gas Inventories,
 * Volume 3 (Industrial Processes), Chapter 4.4 (Aluminium production), by cell technology:
 * CWPB centre-worked prebake, SWPB side-worked prebake, VSS vertical-stud Søderberg, HSS
 * horizontal-stud Søderberg.
 *
 * - Tier 1 CO2 emission factors (Table 4.10): prebake 1.6, Søderberg 1.7 t CO2 per t Al.
 * - Slope coefficients for the PFC slope method (Table 4.16): S_CF4 in (kg CF4/t Al) per
 *   (anode-effect minutes per cell-day), and the weight fraction C2F6/CF4.
 * Written down from memory of the tables (the CWPB slope and ratio and the Tier 1 factors
 * are also in the field guide, marked from memory there); confirm against the Guidelines
 * before relying on them for a regulatory report.
 */
export const CELL_TECHNOLOGIES = ['CWPB', 'SWPB', 'VSS', 'HSS'] as const;
export type CellTechnology = (typeof CELL_TECHNOLOGIES)[number];

export const SMELTING_SOURCE = 'IPCC 2006 Guidelines, Vol. 3, Ch. 4.4 (Tables 4.10 and 4.16)';

export const isPrebake = (technology: CellTechnology): boolean => technology === 'CWPB' || technology === 'SWPB';

export const TIER1_CO2_T_PER_T: Record<CellTechnology, number> = { CWPB: 1.6, SWPB: 1.6, VSS: 1.7, HSS: 1.7 };

export const PFC_SLOPE_DEFAULTS: Record<CellTechnology, { slopeCf4: number; c2f6PerCf4: number }> = {
  CWPB: { slopeCf4: 0.143, c2f6PerCf4: 0.121 },
  SWPB: { slopeCf4: 0.272, c2f6PerCf4: 0.252 },
  VSS: { slopeCf4: 0.092, c2f6PerCf4: 0.053 },
  HSS: { slopeCf4: 0.099, c2f6PerCf4: 0.085 },
};

/**
 * The reactivity series (common practice): metals above carbon are won by electrolysis of a
 * molten compound, not by carbothermic reduction.
 */
export const ABOVE_CARBON = ['K', 'Na', 'Li', 'Rb', 'Cs', 'Ca', 'Sr', 'Ba', 'Mg', 'Be', 'Al'] as const;


/**
 * The decomposition (reversible) voltage of the cell reaction 2Al2O3 + 3C -> 4Al + 3CO2 at
 * about 960 °C in alumina-saturated cryolite: the Gibbs energy of about 683 kJ per mol Al2O3
 * over 6 faradays, E = ΔG / (zF) ≈ 1.18 V. No cell line can run below it (industrial cells run
 * at about 4.0–4.5 V). Source: Thonstad et al., Aluminium Electrolysis, 3rd ed. (2001), the
 * reversible voltage with a carbon anode; from memory.
 */
export const ALUMINA_DECOMPOSITION_V = 1.18;
export const ALUMINA_DECOMPOSITION_GIBBS_KJ_PER_MOL = 683;
