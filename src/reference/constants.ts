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
