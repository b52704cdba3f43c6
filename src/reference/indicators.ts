/**
 * The EN 15804:2012+A2:2019 indicator registry: codes, names, units, reporting order and
 * table group (EN 15804+A2 §7.2, tables 3–7). Units and names are written down from
 * memory of the standard; the codes are the standard's own and are the column headers
 * of `factors.csv`.
 *
 * `basis` says where a value comes from: `factors` — characterised from factor rows;
 * `flows` — computed from the product's own mass and energy flows (SM, CRU, MFR, MER, and
 * EEE, EET from its own energy recovery), never read from a factor table.
 */
export type IndicatorGroup = 'core' | 'additional' | 'resource' | 'waste' | 'output';
export type IndicatorBasis = 'factors' | 'flows';

export interface Indicator {
  code: string;
  name: string;
  unit: string;
  group: IndicatorGroup;
  basis: IndicatorBasis;
}

/** One table of EN 15804+A2 §7.2 as [code, name, unit] rows; `flows` names those computed from the product's mass flows. */
function table(group: IndicatorGroup, rows: ReadonlyArray<readonly [code: string, name: string, unit: string]>, flows: readonly string[] = []): Indicator[] {
  return rows.map(([code, name, unit]) => ({ code, name, unit, group, basis: flows.includes(code) ? 'flows' : 'factors' }));
}

/** In EN 15804+A2 reporting order. */
export const INDICATORS: readonly Indicator[] = [
  ...table('core', [
    ['GWP-total', 'Climate change – total', 'kg CO2 eq.'],
    ['GWP-fossil', 'Climate change – fossil', 'kg CO2 eq.'],
    ['GWP-biogenic', 'Climate change – biogenic', 'kg CO2 eq.'],
    ['GWP-luluc', 'Climate change – land use and land use change', 'kg CO2 eq.'],
    ['ODP', 'Ozone depletion', 'kg CFC-11 eq.'],
    ['AP', 'Acidification', 'mol H+ eq.'],
    ['EP-freshwater', 'Eutrophication, freshwater', 'kg P eq.'],
    ['EP-marine', 'Eutrophication, marine', 'kg N eq.'],
    ['EP-terrestrial', 'Eutrophication, terrestrial', 'mol N eq.'],
    ['POCP', 'Photochemical ozone formation', 'kg NMVOC eq.'],
    ['ADP-minerals&metals', 'Depletion of abiotic resources – minerals and metals', 'kg Sb eq.'],
    ['ADP-fossil', 'Depletion of abiotic resources – fossil fuels', 'MJ, net calorific value'],
    ['WDP', 'Water use', 'm3 world eq. deprived'],
  ]),
  ...table('additional', [
    ['PM', 'Particulate matter emissions', 'disease incidence'],
    ['IRP', 'Ionising radiation, human health', 'kBq U235 eq.'],
    ['ETP-fw', 'Ecotoxicity, freshwater', 'CTUe'],
    ['HTP-c', 'Human toxicity, cancer effects', 'CTUh'],
    ['HTP-nc', 'Human toxicity, non-cancer effects', 'CTUh'],
    ['SQP', 'Land use related impacts / soil quality', 'dimensionless'],
  ]),
  ...table('resource', [
    ['PERE', 'Renewable primary energy used as energy carrier', 'MJ'],
    ['PERM', 'Renewable primary energy used as raw material', 'MJ'],
    ['PERT', 'Total use of renewable primary energy', 'MJ'],
    ['PENRE', 'Non-renewable primary energy used as energy carrier', 'MJ'],
    ['PENRM', 'Non-renewable primary energy used as raw material', 'MJ'],
    ['PENRT', 'Total use of non-renewable primary energy', 'MJ'],
    ['SM', 'Use of secondary material', 'kg'],
    ['RSF', 'Use of renewable secondary fuels', 'MJ'],
    ['NRSF', 'Use of non-renewable secondary fuels', 'MJ'],
    ['FW', 'Net use of fresh water', 'm3'],
  ], ['SM']),
  ...table('waste', [
    ['HWD', 'Hazardous waste disposed', 'kg'],
    ['NHWD', 'Non-hazardous waste disposed', 'kg'],
    ['RWD', 'Radioactive waste disposed', 'kg'],
  ]),
  ...table('output', [
    ['CRU', 'Components for re-use', 'kg'],
    ['MFR', 'Materials for recycling', 'kg'],
    ['MER', 'Materials for energy recovery', 'kg'],
    ['EEE', 'Exported electrical energy', 'MJ'],
    ['EET', 'Exported thermal energy', 'MJ'],
  ], ['CRU', 'MFR', 'MER', 'EEE', 'EET']),
];

const byLowerCode = new Map(INDICATORS.map((indicator) => [indicator.code.toLowerCase(), indicator]));

/** Looks an indicator up by its code, ignoring case (headers are matched case-insensitively). */
export function findIndicator(code: string): Indicator | undefined {
  return byLowerCode.get(code.trim().toLowerCase());
}

export const INDICATOR_CODES: readonly string[] = INDICATORS.map((indicator) => indicator.code);

/** Codes whose values come from factor rows, in reporting order. */
export const FACTOR_INDICATOR_CODES: readonly string[] = INDICATORS.filter((i) => i.basis === 'factors').map((i) => i.code);

/** Sorts codes into EN 15804+A2 reporting order. */
export function inReportingOrder(codes: Iterable<string>): string[] {
  const position = new Map(INDICATORS.map((indicator, index) => [indicator.code, index]));
  return [...new Set(codes)].sort((a, b) => (position.get(a) ?? Infinity) - (position.get(b) ?? Infinity));
}
