import { readFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import { v5 as uuidV5 } from 'uuid';
import { INDICATORS, PUBLISHED_INDICATORS_EF30_FILE, PUBLISHED_INDICATORS_FILE, publishedList } from './indicators.ts';
import type { Dimension } from './units.ts';

/**
 * The vocabulary of the open ILCD+EPD exchange format (ILCD process datasets with the EN 15804
 * extensions): namespaces, the binding module codes, and the published UUIDs of the reference
 * sources, flow properties, unit groups and indicators, read from the identifier lists copied
 * unchanged into `reference-data/ilcd-epd/identifiers/` (Apache-2.0, working group InData).
 */
export const NS = {
  process: 'http://lca.jrc.it/ILCD/Process',
  flow: 'http://lca.jrc.it/ILCD/Flow',
  contact: 'http://lca.jrc.it/ILCD/Contact',
  source: 'http://lca.jrc.it/ILCD/Source',
  unitGroup: 'http://lca.jrc.it/ILCD/UnitGroup',
  flowProperty: 'http://lca.jrc.it/ILCD/FlowProperty',
  common: 'http://lca.jrc.it/ILCD/Common',
  epd: 'http://www.iai.kit.edu/EPD/2013',
  epd2: 'http://www.indata.network/EPD/2019',
  epd24: 'http://www.indata.network/EPD/2024',
  mat: 'http://www.matml.org/',
  xml: 'http://www.w3.org/XML/1998/namespace',
} as const;

/** The ILCD format version the datasets declare, and the EPD extension version (`epd2:epd-version`). */
export const ILCD_VERSION = '1.1';
export const EPD_FORMAT_VERSION = '1.3';

/** The module codes of the format's `epd:module` attribute ("binding", the format's technical details). */
export const ILCD_MODULES = ['A1', 'A2', 'A3', 'A1-A3', 'A4', 'A5', 'B1', 'B2', 'B3', 'B4', 'B5', 'B6', 'B7', 'C1', 'C2', 'C3', 'C4', 'D'] as const;

const IDENTIFIERS = 'reference-data/ilcd-epd/identifiers';
const readRows = (file: string): Array<Record<string, string>> =>
  parse(readFileSync(new URL(`../../${IDENTIFIERS}/${file}`, import.meta.url), 'utf8'), { columns: true, skip_empty_lines: true, relax_column_count: true }) as Array<Record<string, string>>;

export interface Reference {
  uuid: string;
  version: string;
  name: string;
}

/** Common references by their published name ("ILCD Format", "EN 15804+A2 (EF 3.1)", "ISO 14025", …). */
const COMMON = new Map(
  readRows('Common_references.csv')
    .filter((row) => (row.UUID ?? '').trim() && (row.Name ?? '').trim())
    .map((row) => [row.Name!.trim(), { uuid: row.UUID!.trim(), version: (row.Version ?? '').trim(), name: row.Name!.trim() }]),
);
const common = (name: string): Reference => {
  const found = COMMON.get(name);
  if (!found) throw new Error(`internal: ${name} is not in ${IDENTIFIERS}/Common_references.csv`);
  return found;
};
export const SOURCES = {
  ilcdFormat: common('ILCD Format'),
  epdExtensions: common('EPD Data Format Extensions v1.2'),
  en15804A1: common('EN 15804+A1'),
  en15804A2Ef30: common('EN 15804+A2 (EF 3.0)'),
  en15804A2Ef31: common('EN 15804+A2 (EF 3.1)'),
  iso14025: common('ISO 14025'),
};

export interface UnitGroup {
  uuid: string;
  version: string;
  name: string;
  /** Its reference unit (the unit a flow property of this group is measured in). */
  unit: string;
}
export interface FlowProperty {
  uuid: string;
  version: string;
  name: string;
  unitGroup: UnitGroup;
}

/** The published flow properties and their unit groups, by name ("Mass", "Length", "Carbon content (biogenic)", …). */
const FLOW_PROPERTIES: ReadonlyMap<string, FlowProperty> = (() => {
  const out = new Map<string, FlowProperty>();
  for (const row of readRows('Flow_properties_and_unit_groups.csv')) {
    const name = (row['Flow property'] ?? '').trim();
    const uuid = (row['Flow property UUID'] ?? '').trim();
    if (!name || !uuid) continue;
    const unit = (row['Reference unit'] ?? '').trim();
    const groupUuid = (row['Reference unit group UUID'] ?? '').trim();
    out.set(name, {
      uuid,
      version: (row.Version ?? '').trim() || '03.00.000',
      name,
      unitGroup: { uuid: groupUuid, version: (row['Version.1'] ?? '').trim() || '03.00.000', name: (row['Reference unit group'] ?? '').trim(), unit },
    });
  }
  return out;
})();
export function flowProperty(name: string): FlowProperty {
  const found = FLOW_PROPERTIES.get(name);
  if (!found) throw new Error(`internal: ${name} is not in ${IDENTIFIERS}/Flow_properties_and_unit_groups.csv`);
  return found;
}

/** The flow property that measures each of loopsheet's unit dimensions, as a declared unit may be given in. */
export const DIMENSION_PROPERTY: Partial<Record<Dimension, string>> = { mass: 'Mass', length: 'Length', area: 'Area', volume: 'Volume', count: 'Number of items' };

export const MASS = flowProperty('Mass');
/**
 * The biogenic carbon content of the product and of its packaging are flow properties of the
 * product flow (kg C per reference unit). The published list gives them no unit group: their
 * unit is kg, measured as mass.
 */
export const BIOGENIC_CARBON = { ...flowProperty('Carbon content (biogenic)'), unitGroup: MASS.unitGroup };
export const BIOGENIC_CARBON_PACKAGING = { ...flowProperty('Carbon content (biogenic) - packaging'), unitGroup: MASS.unitGroup };

/** Which dimension a published flow property (or its deprecated alternative unit group) measures, for reading a supplier's product flow. */
export function dimensionOfProperty(uuid: string): Dimension | undefined {
  for (const [dimension, name] of Object.entries(DIMENSION_PROPERTY)) {
    if (FLOW_PROPERTIES.get(name!)?.uuid === uuid) return dimension as Dimension;
  }
  return undefined;
}

export type Characterisation = 'EF 3.1' | 'EF 3.0';

/** Every published indicator UUID, of the EF 3.1 and the EF 3.0 lists, to its EN 15804+A2 code and the list it is from. */
export const INDICATOR_BY_UUID: ReadonlyMap<string, { code: string; characterisation: Characterisation }> = (() => {
  const out = new Map<string, { code: string; characterisation: Characterisation }>();
  for (const [file, characterisation] of [
    [PUBLISHED_INDICATORS_EF30_FILE, 'EF 3.0'],
    [PUBLISHED_INDICATORS_FILE, 'EF 3.1'],
  ] as const) {
    for (const [code, entry] of publishedList(file)) out.set(entry.uuid.toLowerCase(), { code, characterisation });
  }
  return out;
})();

/** The indicators exchanged as LCIA results (impact categories); the others are exchanges (flows). */
export const isImpactIndicator = (code: string): boolean => {
  const group = INDICATORS.find((indicator) => indicator.code === code)?.group;
  return group === 'core' || group === 'additional';
};

/** Inputs (resource use) and outputs (waste, output flows) among the exchanged indicators. */
export const exchangeDirection = (code: string): 'Input' | 'Output' => (INDICATORS.find((indicator) => indicator.code === code)?.group === 'resource' ? 'Input' : 'Output');

/**
 * The namespace of loopsheet's name-based dataset UUIDs (RFC 9562 §5.5, version 5): a UUID
 * drawn once at random for loopsheet and fixed here, so the same names give the same UUIDs on
 * every machine and in every build.
 */
const LOOPSHEET_NAMESPACE = '4b1f0c37-6a52-4c8e-9a0e-2f5d3c7e8b19';

/** A dataset's UUID from the names that identify it (e.g. the owner and the product id). */
export const datasetUuid = (...names: string[]): string => uuidV5(JSON.stringify(names), LOOPSHEET_NAMESPACE);
