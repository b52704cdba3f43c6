/**
 * The one unit converter. Each unit belongs to a dimension and has a factor to that
 * dimension's base unit. Definitions: SI Brochure (BIPM, 9th ed. 2019) for the SI units
 * and the units accepted for use with the SI (tonne, litre); 1 kWh = 3.6 MJ follows from
 * 1 W = 1 J/s and 1 h = 3600 s.
 */
export type Dimension = 'mass' | 'energy' | 'volume' | 'transport' | 'count' | 'length' | 'area';

interface UnitDefinition {
  dimension: Dimension;
  /** How many base units one of this unit is. */
  toBase: number;
}

/** Each dimension's units, by how many base units one of each is (the base is the one worth 1: kg, MJ, m3, tkm, piece, m, m2). */
const DIMENSIONS: Record<Dimension, Record<string, number>> = {
  mass: { g: 1e-3, kg: 1, t: 1e3 },
  energy: { kJ: 1e-3, MJ: 1, GJ: 1e3, Wh: 3.6e-3, kWh: 3.6, MWh: 3.6e3 },
  volume: { L: 1e-3, m3: 1 },
  transport: { kgkm: 1e-3, tkm: 1 },
  count: { piece: 1 },
  length: { mm: 1e-3, m: 1, km: 1e3 },
  area: { m2: 1 },
};

const UNITS: Record<string, UnitDefinition> = Object.fromEntries(
  Object.entries(DIMENSIONS).flatMap(([dimension, units]) => Object.entries(units).map(([name, toBase]) => [name, { dimension: dimension as Dimension, toBase }])),
);

/** Spellings users write for the same unit, all matched case-insensitively. */
const ALIASES: Record<string, string> = {
  kilogram: 'kg', kilograms: 'kg', kgs: 'kg', gram: 'g', grams: 'g',
  tonne: 't', tonnes: 't', ton: 't',
  kwh: 'kWh', mwh: 'MWh', wh: 'Wh', mj: 'MJ', gj: 'GJ', kj: 'kJ',
  l: 'L', litre: 'L', liter: 'L', litres: 'L', liters: 'L',
  'm³': 'm3', 'm^3': 'm3', 'm²': 'm2', 'm^2': 'm2',
  'kg·km': 'kgkm', 'kg*km': 'kgkm', 't·km': 'tkm', 't*km': 'tkm',
  pc: 'piece', pcs: 'piece', pieces: 'piece', unit: 'piece', item: 'piece',
};

const byLowerName = new Map<string, string>([
  ...Object.keys(UNITS).map((name) => [name.toLowerCase(), name] as [string, string]),
  ...Object.entries(ALIASES),
]);

/** The canonical spelling of a unit, or undefined if it is not known. */
export function canonicalUnit(unit: string): string | undefined {
  const trimmed = unit.trim();
  if (trimmed in UNITS) return trimmed;
  return byLowerName.get(trimmed.toLowerCase());
}

export const KNOWN_UNITS: readonly string[] = Object.keys(UNITS);

export function dimensionOf(unit: string): Dimension | undefined {
  const name = canonicalUnit(unit);
  return name === undefined ? undefined : UNITS[name]?.dimension;
}

/** Units of one dimension, for messages ("expected one of kg, g, t"). */
export function unitsOf(dimension: Dimension): string[] {
  return Object.entries(UNITS).filter(([, def]) => def.dimension === dimension).map(([name]) => name);
}

export function convertible(from: string, to: string): boolean {
  const a = dimensionOf(from);
  return a !== undefined && a === dimensionOf(to);
}

/** How many `to` one `from` is (e.g. factor('kWh', 'MJ') = 3.6); throws if not convertible. */
export function conversionFactor(from: string, to: string): number {
  const a = UNITS[canonicalUnit(from) ?? ''];
  const b = UNITS[canonicalUnit(to) ?? ''];
  if (!a || !b || a.dimension !== b.dimension) {
    throw new Error(`cannot convert ${from} to ${to}`);
  }
  return a.toBase / b.toBase;
}

export function convert(value: number, from: string, to: string): number {
  return value * conversionFactor(from, to);
}

/**
 * A declared unit as products.csv writes it ("1 m", "2 km", "1 piece", "1 t"): its amount and
 * its unit, when the text is an optional number and a unit this converter knows; undefined
 * otherwise ("1 bracket", "one coil").
 */
export function parseDeclaredUnit(text: string): { amount: number; unit: string; dimension: Dimension } | undefined {
  const match = /^\s*([0-9]+(?:\.[0-9]+)?)?\s*(.*?)\s*$/.exec(text);
  if (!match) return undefined;
  const unit = canonicalUnit(match[2] ?? '');
  if (!unit) return undefined;
  const amount = match[1] === undefined ? 1 : Number(match[1]);
  return amount > 0 ? { amount, unit, dimension: UNITS[unit]!.dimension } : undefined;
}
