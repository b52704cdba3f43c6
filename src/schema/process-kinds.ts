import { z } from 'zod';
import { CELL_TECHNOLOGIES } from '../reference/smelting.ts';
import { choice, quantity, requiredText, share } from './cells.ts';
import { DEFAULT_DIALECT } from './csv-file.ts';
import type { Dialect } from './numbers.ts';

/**
 * The process kinds of process.csv, one zod schema each: its parameters, their cells and
 * the unit each is written in. The calculators in src/process take the types inferred from
 * these schemas, so a parameter is named, typed and documented here and nowhere else.
 * `families` are parameters named `<family>:<name>` (a reagent by its factor id, a
 * reductant by its name), read into a record by name. A share may be written 0.95 (unit
 * `share`) or 95% (unit `%`).
 */
export const PROCESS_KINDS = ['electrolysis-aluminium', 'electrowinning', 'carbothermic-reduction'] as const;
export type ProcessKind = (typeof PROCESS_KINDS)[number];

/** What the docs, the unit column check and the cross-file checks need to know of a parameter. */
export interface ParameterMeta {
  description: string;
  /** What process.csv's unit column must say: a unit, `share` (`%` accepted), or empty for words and counts. */
  unit: string;
  type: 'number' | 'share' | 'percent' | 'choice' | 'element' | 'integer' | 'factor';
  required: boolean;
  /** Written `<family>:<name>`, read into a record by name. */
  family: boolean;
}

/** Each parameter's schema in a kind's shape → its metadata. */
const PARAMETERS = z.registry<ParameterMeta>();

type Described = Pick<ParameterMeta, 'description' | 'unit' | 'type'>;
function registered<T extends z.ZodType>(schema: T, meta: ParameterMeta): T {
  PARAMETERS.add(schema, meta);
  return schema;
}
const required = <T extends z.ZodType>(cell: T, meta: Described) => registered(cell, { ...meta, required: true, family: false });
const optional = <T extends z.ZodType>(cell: T, meta: Described) => registered(cell.optional(), { ...meta, required: false, family: false });
const family = <T extends z.ZodType>(cell: T, meta: Described) => registered(z.record(z.string(), cell).prefault({}), { ...meta, required: false, family: true });

/** The cells of a parameter's value, the same cells every input file uses, per dialect (a semicolon file writes decimal commas). */
function cellsOf(d: Dialect) {
  return {
    choice: <const T extends readonly [string, ...string[]]>(description: string, choices: T) => [choice(description, choices), { description, unit: '', type: 'choice' }] as const,
    number: (description: string, unit: string, options: { positive?: boolean } = {}) => [quantity(d, description, unit, options), { description, unit, type: 'number' }] as const,
    percent: (description: string) => [quantity(d, description, '%'), { description, unit: '%', type: 'percent' }] as const,
    share: (description: string) => [share(d, description), { description, unit: 'share', type: 'share' }] as const,
    factor: (description: string) => [requiredText(description), { description, unit: '', type: 'factor' }] as const,
    element: (description: string) => [requiredText(description), { description, unit: '', type: 'element' }] as const,
    integer: (description: string) =>
      [
        quantity(d, description, 'a whole number').refine((value) => Number.isInteger(value), { params: { problem: 'OUT_OF_RANGE', expected: 'a whole number' }, message: 'is not a whole number' }),
        { description, unit: '', type: 'integer' },
      ] as const,
  } satisfies Record<string, (...args: never[]) => readonly [z.ZodType, Described]>;
}

type Cells = ReturnType<typeof cellsOf>;

const KINDS = {
  'electrolysis-aluminium': {
    description: 'A Hall–Héroult cell line making primary aluminium.',
    parameters: (c: Cells) =>
      z.strictObject({
        technology: required(...c.choice('Cell technology: CWPB, SWPB (prebake), VSS, HSS (Søderberg).', CELL_TECHNOLOGIES)),
        cell_voltage_v: required(...c.number('Average cell voltage.', 'V', { positive: true })),
        current_efficiency: optional(...c.share('Current efficiency (needed unless electricity_kwh_per_t is measured).')),
        electricity_kwh_per_t: optional(...c.number('Measured DC energy per tonne of aluminium (instead of the Faraday-law value).', 'kWh/t')),
        auxiliary_share: optional(...c.share('Rectifier and auxiliary losses on top of the DC energy.')),
        net_anode_consumption_t_per_t: optional(...c.number('Net carbon anode consumption (prebake, IPCC Tier 2).', 't/t')),
        anode_sulphur_pct: optional(...c.percent('Sulphur content of the baked anodes.')),
        anode_ash_pct: optional(...c.percent('Ash content of the baked anodes.')),
        paste_consumption_t_per_t: optional(...c.number('Søderberg paste consumption (IPCC Tier 2).', 't/t')),
        csm_kg_per_t: optional(...c.number('Emissions of cyclohexane-soluble matter.', 'kg/t')),
        binder_pct: optional(...c.percent('Binder (pitch) content of the paste.')),
        pitch_sulphur_pct: optional(...c.percent('Sulphur content of the pitch.')),
        pitch_ash_pct: optional(...c.percent('Ash content of the pitch.')),
        pitch_hydrogen_pct: optional(...c.percent('Hydrogen content of the pitch.')),
        coke_sulphur_pct: optional(...c.percent('Sulphur content of the calcined coke.')),
        coke_ash_pct: optional(...c.percent('Ash content of the calcined coke.')),
        skimmed_dust_carbon_t_per_t: optional(...c.number('Carbon in skimmed dust.', 't/t')),
        anode_effect_minutes_per_cell_day: optional(...c.number('Anode-effect minutes per cell-day (PFC slope method).', 'min/cell-day')),
        slope_cf4: optional(...c.number('Measured CF4 slope, instead of the IPCC default for the technology.', 'kg/t per min/cell-day')),
        c2f6_per_cf4: optional(...c.number('Measured C2F6/CF4 weight fraction, instead of the IPCC default.', 'kg/kg')),
        alumina_t_per_t: optional(...c.number('Measured alumina consumption (at least the stoichiometric 1.889).', 't/t')),
        alumina_loss_share: optional(...c.share('Alumina lost in handling, on top of the stoichiometric need.')),
        aluminium_fluoride_t_per_t: optional(...c.number('Aluminium fluoride added to the bath.', 't/t')),
        electricity_factor: optional(...c.factor('Factor id (factors.csv) of the electricity supplied.')),
        alumina_factor: optional(...c.factor('Factor id of the alumina.')),
        aluminium_fluoride_factor: optional(...c.factor('Factor id of the aluminium fluoride.')),
        anode_factor: optional(...c.factor('Factor id of anode production.')),
      }),
  },
  electrowinning: {
    description: 'An electrowinning tank house (leach or solvent-extraction electrolyte, bacterial leaching included).',
    parameters: (c: Cells) =>
      z.strictObject({
        metal: required(...c.element('Element symbol of the metal won (Cu, Zn, Ni, Co, …).')),
        charge: required(...c.integer('Charge of its ion in the electrolyte (2 for Cu²⁺, Zn²⁺, Ni²⁺).')),
        cell_voltage_v: required(...c.number('Average cell voltage.', 'V', { positive: true })),
        current_efficiency: required(...c.share('Current efficiency.')),
        auxiliary_share: optional(...c.share('Rectifier, pumping and auxiliary loads on top of the DC energy.')),
        electricity_factor: optional(...c.factor('Factor id (factors.csv) of the electricity supplied.')),
        reagent: family(...c.number('A reagent per tonne of metal, named reagent:<factor id>.', 'kg/t')),
      }),
  },
  'carbothermic-reduction': {
    description: 'A furnace reducing an oxide with carbon (zinc, iron, tin, lead, ferroalloys).',
    parameters: (c: Cells) =>
      z.strictObject({
        metal: required(...c.element('Element symbol of the metal made.')),
        reductant: family(...c.number('A reductant or fuel charged per tonne of metal, named reductant:<name>.', 't/t')),
        reductant_carbon: family(...c.share('Carbon content of reductant <name>, named reductant_carbon:<name>.')),
        carbon_out: family(...c.number('A product or by-product carrying carbon out, named carbon_out:<name>.', 't/t')),
        carbon_out_carbon: family(...c.share('Carbon content of carbon_out <name>, named carbon_out_carbon:<name>.')),
        reductant_factor: family(...c.factor('Factor id (factors.csv, per mass) of producing reductant <name>, named reductant_factor:<name>.')),
      }),
  },
} satisfies Record<ProcessKind, { description: string; parameters: (c: Cells) => z.ZodObject }>;

/** A kind's parameters as its calculator takes them (inferred from its schema). */
export type ParametersOf<K extends ProcessKind> = z.output<ReturnType<(typeof KINDS)[K]['parameters']>>;

/** What a kind is, in a sentence (the docs). */
export const kindDescription = (kind: ProcessKind): string => KINDS[kind].description;

const schemas = new Map<string, z.ZodObject>();
/** A kind's schema for a dialect, built once. */
export function kindSchema<K extends ProcessKind>(kind: K, dialect: Dialect): ReturnType<(typeof KINDS)[K]['parameters']> {
  const key = `${kind}|${dialect.decimalComma}`;
  let schema = schemas.get(key);
  if (!schema) {
    schema = KINDS[kind].parameters(cellsOf(dialect));
    schemas.set(key, schema);
  }
  return schema as ReturnType<(typeof KINDS)[K]['parameters']>;
}

/** A kind's parameters by name, in contract order, with their metadata. */
export function parametersOf(kind: ProcessKind): Array<{ name: string; meta: ParameterMeta }> {
  return Object.entries(kindSchema(kind, DEFAULT_DIALECT).shape).map(([name, field]) => ({ name, meta: PARAMETERS.get(field as z.ZodType)! }));
}

/** The metadata of a parameter as process.csv names it (`reagent:acid` → the reagent family), or undefined if the kind has no such parameter. */
export function parameterMeta(kind: ProcessKind, parameter: string): ParameterMeta | undefined {
  const colon = parameter.indexOf(':');
  const shape = kindSchema(kind, DEFAULT_DIALECT).shape as Record<string, z.ZodType>;
  const field = shape[colon > 0 ? parameter.slice(0, colon) : parameter];
  const meta = field ? PARAMETERS.get(field) : undefined;
  return meta && meta.family === colon > 0 ? meta : undefined;
}

/** The names a kind knows, families as `<family>:<name>` (for "did you mean"). */
export const knownParameters = (kind: ProcessKind): string[] => parametersOf(kind).map(({ name, meta }) => (meta.family ? `${name}:<name>` : name));

/** How a process is named where a factor id is accepted: `process:<process_id>`. */
export const PROCESS_PREFIX = 'process:';
