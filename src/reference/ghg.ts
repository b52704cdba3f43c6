/**
 * 100-year global warming potentials for direct greenhouse-gas emissions, referenced in
 * `activities.csv` as `ghg:<gas>` (amount in a mass unit).
 *
 * AR6: IPCC (2021), Climate Change 2021: The Physical Science Basis, WG1, Chapter 7,
 *      Table 7.15 (GWP-100).
 * AR5: IPCC (2013), Climate Change 2013: The Physical Science Basis, WG1, Chapter 8,
 *      Appendix 8.A, Table 8.A.1 (GWP-100, without climate-carbon feedback).
 */
export type GwpSet = 'AR6' | 'AR5';

export interface GreenhouseGas {
  id: string;
  name: string;
  AR6: number;
  AR5: number;
}

export const GWP_SOURCES: Record<GwpSet, string> = {
  AR6: 'IPCC AR6 WG1 (2021), Table 7.15, GWP-100',
  AR5: 'IPCC AR5 WG1 (2013), Table 8.A.1, GWP-100',
};

export const GREENHOUSE_GASES: readonly GreenhouseGas[] = [
  { id: 'CO2', name: 'carbon dioxide', AR6: 1, AR5: 1 },
  // Biogenic CO2 counts in GWP-biogenic with +1 for a release and −1 for an uptake (EN 15804+A2, the −1/+1 rule).
  { id: 'CO2-biogenic', name: 'carbon dioxide, biogenic', AR6: 1, AR5: 1 },
  { id: 'CH4-fossil', name: 'methane, fossil', AR6: 29.8, AR5: 28 },
  { id: 'CH4-nonfossil', name: 'methane, non-fossil', AR6: 27.0, AR5: 28 },
  { id: 'N2O', name: 'nitrous oxide', AR6: 273, AR5: 265 },
  { id: 'CF4', name: 'tetrafluoromethane (PFC-14)', AR6: 7380, AR5: 6630 },
  { id: 'C2F6', name: 'hexafluoroethane (PFC-116)', AR6: 12400, AR5: 11100 },
  { id: 'SF6', name: 'sulphur hexafluoride', AR6: 25200, AR5: 23500 },
  { id: 'HFC-134a', name: 'HFC-134a', AR6: 1530, AR5: 1300 },
];

export const GHG_PREFIX = 'ghg:';

export function findGas(factorId: string): GreenhouseGas | undefined {
  if (!factorId.startsWith(GHG_PREFIX)) return undefined;
  const id = factorId.slice(GHG_PREFIX.length).toLowerCase();
  return GREENHOUSE_GASES.find((gas) => gas.id.toLowerCase() === id);
}

export const GHG_FACTOR_IDS: readonly string[] = GREENHOUSE_GASES.map((gas) => GHG_PREFIX + gas.id);
