import { readFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';

/**
 * The EN 15804:2012+A2:2019 indicator registry: codes, reporting order and table group (EN
 * 15804+A2 §7.2, tables 3–7), with the names, units and UUIDs of the published list of the
 * open ILCD+EPD format (EF 3.1 characterisation; `reference-data/ilcd-epd/`, copied
 * unchanged). The codes are the standard's own and are the column headers of `factors.csv`.
 *
 * `basis` says where a value comes from: `factors` — characterised from factor rows;
 * `flows` — computed from the product's own mass and energy flows (SM, CRU, MFR, MER, and
 * EEE, EET from its own energy recovery), never read from a factor table.
 */
export type IndicatorGroup = 'core' | 'additional' | 'resource' | 'waste' | 'output' | 'programme';
export type IndicatorBasis = 'factors' | 'flows';

export interface Indicator {
  code: string;
  name: string;
  unit: string;
  group: IndicatorGroup;
  basis: IndicatorBasis;
  /** The indicator's UUID in the published list (the ILCD+EPD data set it is exchanged as); none for a programme's own. */
  uuid?: string;
  /** The version of that data set, as the published list gives it. */
  version?: string;
  /** The UUID of the unit group its unit belongs to, as the published list gives it. */
  unitGroupUuid?: string;
}

/** Where the published list is. */
export const PUBLISHED_INDICATORS_FILE = 'reference-data/ilcd-epd/identifiers/EN15804+A2_EF3.1_indicators.csv';

/** The published list names two indicators by their EF abbreviations; EN 15804+A2 codes them so. */
const EN_CODES: Record<string, string> = { ADPF: 'ADP-fossil', ADPE: 'ADP-minerals&metals' };

/** The published list of the EF 3.0 characterisation (the list before EF 3.1), read to recognise supplier datasets made with it. */
export const PUBLISHED_INDICATORS_EF30_FILE = 'reference-data/ilcd-epd/identifiers/EN15804+A2_EF3.0_indicators.csv';

export interface PublishedIndicator {
  name: string;
  unit: string;
  uuid: string;
  version: string;
  unitGroupUuid: string;
}

/** Code → name, unit, UUID, version and unit group, as a published list writes them ("Use of net fresh water (FW)", "m3"). */
export function publishedList(file: string): Map<string, PublishedIndicator> {
  const text = readFileSync(new URL(`../../${file}`, import.meta.url), 'utf8');
  const rows = parse(text, { columns: true, skip_empty_lines: true, relax_column_count: true }) as Array<Record<string, string>>;
  const list = new Map<string, PublishedIndicator>();
  for (const row of rows) {
    const uuid = (row.UUID ?? '').trim();
    const match = /^(.*)\s+\(([^()]+)\)\s*$/.exec(row['Name (en)'] ?? '');
    if (!uuid || !match) continue;
    const written = match[2]!.trim();
    list.set(EN_CODES[written] ?? written, { name: match[1]!.trim(), unit: (row['Unit (en)'] ?? '').trim(), uuid, version: (row.Version ?? '').trim(), unitGroupUuid: (row['UnitGroup UUID'] ?? '').trim() });
  }
  return list;
}
const PUBLISHED = publishedList(PUBLISHED_INDICATORS_FILE);

/** One table of EN 15804+A2 §7.2, its codes in reporting order; `flows` names those computed from the product's own flows. */
function table(group: IndicatorGroup, codes: readonly string[], flows: readonly string[] = []): Indicator[] {
  return codes.map((code) => {
    const entry = PUBLISHED.get(code);
    if (!entry) throw new Error(`internal: ${code} is not in ${PUBLISHED_INDICATORS_FILE}`);
    return { code, ...entry, group, basis: flows.includes(code) ? 'flows' : 'factors' };
  });
}

/** In EN 15804+A2 reporting order. */
export const INDICATORS: readonly Indicator[] = [
  ...table('core', ['GWP-total', 'GWP-fossil', 'GWP-biogenic', 'GWP-luluc', 'ODP', 'AP', 'EP-freshwater', 'EP-marine', 'EP-terrestrial', 'POCP', 'ADP-minerals&metals', 'ADP-fossil', 'WDP']),
  ...table('additional', ['PM', 'IRP', 'ETP-fw', 'HTP-c', 'HTP-nc', 'SQP']),
  ...table('resource', ['PERE', 'PERM', 'PERT', 'PENRE', 'PENRM', 'PENRT', 'SM', 'RSF', 'NRSF', 'FW'], ['SM']),
  ...table('waste', ['HWD', 'NHWD', 'RWD']),
  ...table('output', ['CRU', 'MFR', 'MER', 'EEE', 'EET'], ['CRU', 'MFR', 'MER', 'EEE', 'EET']),
];

/** The indicator tables EN 15804+A2 requires of a construction-product declaration; additional impact indicators are optional unless the PCR asks for them (field guide §2). */
export const MANDATORY_GROUPS: readonly IndicatorGroup[] = ['core', 'resource', 'waste', 'output'];
export const MANDATORY_INDICATORS: readonly string[] = INDICATORS.filter((indicator) => MANDATORY_GROUPS.includes(indicator.group)).map((indicator) => indicator.code);

/**
 * The disclaimers EN 15804+A2 requires beside some indicators, in the wording widely
 * reproduced in published declarations (confirm it against the standard and the PCR).
 */
export const DISCLAIMERS: ReadonlyArray<{ marker: string; codes: readonly string[]; text: string }> = [
  {
    marker: '¹',
    codes: ['IRP'],
    text: 'This impact category deals mainly with the eventual impact of low-dose ionising radiation on human health of the nuclear fuel cycle. It does not consider effects due to possible nuclear accidents, occupational exposure, or radioactive waste disposal in underground facilities. Potential ionising radiation from the soil, from radon and from some construction materials is not measured by this indicator either.',
  },
  {
    marker: '²',
    codes: ['ADP-minerals&metals', 'ADP-fossil', 'WDP', 'ETP-fw', 'HTP-c', 'HTP-nc', 'SQP'],
    text: 'The results of this environmental impact indicator shall be used with care, as the uncertainties on these results are high or as there is limited experience with the indicator.',
  },
];

/** The disclaimer EN 15804+A2 requires beside an indicator, if any. */
export const disclaimerOf = (code: string) => DISCLAIMERS.find((disclaimer) => disclaimer.codes.includes(code));

const byLowerCode = new Map(INDICATORS.map((indicator) => [indicator.code.toLowerCase(), indicator]));

/** Looks an indicator up by its code, ignoring case (headers are matched case-insensitively). */
export function findIndicator(code: string): Indicator | undefined {
  return byLowerCode.get(code.trim().toLowerCase());
}

export const INDICATOR_CODES: readonly string[] = INDICATORS.map((indicator) => indicator.code);

/** Codes whose values come from factor rows, in reporting order. */
export const FACTOR_INDICATOR_CODES: readonly string[] = INDICATORS.filter((i) => i.basis === 'factors').map((i) => i.code);

/**
 * The indicators of one project: the registry, then a programme's own indicators that
 * declaration.json declares (`extra_indicators`, e.g. GWP-GHG), read from factors.csv columns
 * of their code and reported after the registry's, in a table of their own.
 */
export class IndicatorSet {
  private readonly extras: ReadonlyMap<string, Indicator>;
  constructor(extras: ReadonlyArray<{ code: string; name: string; unit: string }> = []) {
    this.extras = new Map(extras.map((extra) => [extra.code.toLowerCase(), { code: extra.code, name: extra.name, unit: extra.unit, group: 'programme', basis: 'factors' }]));
  }

  /** A code's indicator, whatever the case of the code. */
  find(code: string): Indicator | undefined {
    return findIndicator(code) ?? this.extras.get(code.trim().toLowerCase());
  }

  /** Every code of the set, registry first. */
  get codes(): string[] {
    return [...INDICATOR_CODES, ...[...this.extras.values()].map((indicator) => indicator.code)];
  }

  /** The programme's own codes. */
  get extraCodes(): string[] {
    return [...this.extras.values()].map((indicator) => indicator.code);
  }

  /** Codes in reporting order: EN 15804+A2's, then the programme's in the order declared. */
  inReportingOrder(codes: Iterable<string>): string[] {
    const order = this.codes;
    const position = new Map(order.map((code, index) => [code, index]));
    return [...new Set(codes)].sort((a, b) => (position.get(a) ?? Infinity) - (position.get(b) ?? Infinity));
  }
}
