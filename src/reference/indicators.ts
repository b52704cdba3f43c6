/**
 * The EN 15804:2012+A2:2019 indicator registry: codes, names, units, reporting order and
 * table group (EN 15804+A2 §7.2, tables 3–7). Units and names are written down from
 * memory of the standard; the codes are the standard's own and are the column headers
 * of `factors.csv`.
 *
 * `basis` says where a value comes from: `factors` — characterised from factor rows;
 * `flows` — computed from the product's own mass flows (SM, CRU, MFR, MER), never read
 * from a factor table.
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

const core = (code: string, name: string, unit: string): Indicator => ({ code, name, unit, group: 'core', basis: 'factors' });
const additional = (code: string, name: string, unit: string): Indicator => ({ code, name, unit, group: 'additional', basis: 'factors' });
const resource = (code: string, name: string, unit: string, basis: IndicatorBasis = 'factors'): Indicator => ({ code, name, unit, group: 'resource', basis });
const waste = (code: string, name: string, unit: string): Indicator => ({ code, name, unit, group: 'waste', basis: 'factors' });
const output = (code: string, name: string, unit: string, basis: IndicatorBasis = 'factors'): Indicator => ({ code, name, unit, group: 'output', basis });

/** In EN 15804+A2 reporting order. */
export const INDICATORS: readonly Indicator[] = [
  core('GWP-total', 'Climate change – total', 'kg CO2 eq.'),
  core('GWP-fossil', 'Climate change – fossil', 'kg CO2 eq.'),
  core('GWP-biogenic', 'Climate change – biogenic', 'kg CO2 eq.'),
  core('GWP-luluc', 'Climate change – land use and land use change', 'kg CO2 eq.'),
  core('ODP', 'Ozone depletion', 'kg CFC-11 eq.'),
  core('AP', 'Acidification', 'mol H+ eq.'),
  core('EP-freshwater', 'Eutrophication, freshwater', 'kg P eq.'),
  core('EP-marine', 'Eutrophication, marine', 'kg N eq.'),
  core('EP-terrestrial', 'Eutrophication, terrestrial', 'mol N eq.'),
  core('POCP', 'Photochemical ozone formation', 'kg NMVOC eq.'),
  core('ADP-minerals&metals', 'Depletion of abiotic resources – minerals and metals', 'kg Sb eq.'),
  core('ADP-fossil', 'Depletion of abiotic resources – fossil fuels', 'MJ, net calorific value'),
  core('WDP', 'Water use', 'm3 world eq. deprived'),
  additional('PM', 'Particulate matter emissions', 'disease incidence'),
  additional('IRP', 'Ionising radiation, human health', 'kBq U235 eq.'),
  additional('ETP-fw', 'Ecotoxicity, freshwater', 'CTUe'),
  additional('HTP-c', 'Human toxicity, cancer effects', 'CTUh'),
  additional('HTP-nc', 'Human toxicity, non-cancer effects', 'CTUh'),
  additional('SQP', 'Land use related impacts / soil quality', 'dimensionless'),
  resource('PERE', 'Renewable primary energy used as energy carrier', 'MJ'),
  resource('PERM', 'Renewable primary energy used as raw material', 'MJ'),
  resource('PERT', 'Total use of renewable primary energy', 'MJ'),
  resource('PENRE', 'Non-renewable primary energy used as energy carrier', 'MJ'),
  resource('PENRM', 'Non-renewable primary energy used as raw material', 'MJ'),
  resource('PENRT', 'Total use of non-renewable primary energy', 'MJ'),
  resource('SM', 'Use of secondary material', 'kg', 'flows'),
  resource('RSF', 'Use of renewable secondary fuels', 'MJ'),
  resource('NRSF', 'Use of non-renewable secondary fuels', 'MJ'),
  resource('FW', 'Net use of fresh water', 'm3'),
  waste('HWD', 'Hazardous waste disposed', 'kg'),
  waste('NHWD', 'Non-hazardous waste disposed', 'kg'),
  waste('RWD', 'Radioactive waste disposed', 'kg'),
  output('CRU', 'Components for re-use', 'kg', 'flows'),
  output('MFR', 'Materials for recycling', 'kg', 'flows'),
  output('MER', 'Materials for energy recovery', 'kg', 'flows'),
  output('EEE', 'Exported electrical energy', 'MJ'),
  output('EET', 'Exported thermal energy', 'MJ'),
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
