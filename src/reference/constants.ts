/**
 * Physical constants, SI. Since the 2019 redefinition of the SI the elementary charge and
 * the Avogadro constant are exact (CODATA 2018), so the Faraday constant F = e·N_A is exact
 * too: 96 485.332 12… C/mol.
 */
export const ELEMENTARY_CHARGE_C = 1.602176634e-19;
export const AVOGADRO_PER_MOL = 6.02214076e23;
export const FARADAY_C_PER_MOL = ELEMENTARY_CHARGE_C * AVOGADRO_PER_MOL;
export const CONSTANTS_SOURCE = 'CODATA 2018 (exact in the 2019 SI)';

export const SECONDS_PER_HOUR = 3600;

/**
 * Mass of CO2 per mass of carbon, 44/12: the rounded molar masses the IPCC 2006 Guidelines,
 * EN 16449 (biogenic carbon in wood products) and EN 15804+A2 use, not the ratio of the
 * standard atomic weights (44.009/12.011 = 3.664), so results match theirs.
 */
export const CO2_PER_C = 44 / 12;
