import { FARADAY_C_PER_MOL, SECONDS_PER_HOUR } from '../reference/constants.ts';

/**
 * Faraday's law for electrolysis and electrowinning: the charge to deposit one kilogram of
 * a metal whose ion carries z charges, Q = z·F·m/M, and the DC energy at a cell voltage and
 * current efficiency, E = Q·U/η.
 */
export function chargeAhPerKg(charge: number, molarMassGPerMol: number): number {
  return (charge * FARADAY_C_PER_MOL * 1000) / molarMassGPerMol / SECONDS_PER_HOUR;
}

/** kWh of DC per kg of metal. */
export function dcEnergyKwhPerKg(charge: number, molarMassGPerMol: number, cellVoltageV: number, currentEfficiency: number): number {
  return (chargeAhPerKg(charge, molarMassGPerMol) * cellVoltageV) / currentEfficiency / 1000;
}
