import type { RowOf } from '../schema/csv-file.ts';
import type { productsCsv, bomCsv, materialsCsv, eolCsv, activitiesCsv, transportCsv, factorsCsv, excludedCsv } from '../schema/index.ts';

/** Typed rows of each input file, inferred from the zod schemas (never written twice). */
export type Product = RowOf<typeof productsCsv>;
export type BomLine = RowOf<typeof bomCsv>;
export type Material = RowOf<typeof materialsCsv>;
export type EolRow = RowOf<typeof eolCsv>;
export type Activity = RowOf<typeof activitiesCsv>;
export type TransportLeg = RowOf<typeof transportCsv>;
export type FactorRow = RowOf<typeof factorsCsv>;
export type ExcludedFlow = RowOf<typeof excludedCsv>;

/** A factor row's value for an indicator: a number, or null where the cell is empty ("not available"). */
export function indicatorValue(factor: FactorRow, code: string): number | null {
  const value = (factor as unknown as Record<string, number | null | undefined>)[code];
  return value ?? null;
}

/** A factor row's data type: as stated; a supplier's own declaration (supplier_dataset) is specific data unless stated otherwise. */
export const dataTypeOf = (factor: FactorRow): 'specific' | 'generic' | null => factor.data_type ?? (factor.supplier_dataset !== undefined ? 'specific' : null);
