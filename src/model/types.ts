import type { RowOf } from '../schema/csv-file.ts';
import type { productsCsv, bomCsv, materialsCsv, eolCsv, activitiesCsv, transportCsv, factorsCsv } from '../schema/index.ts';
import type { Declaration } from '../schema/declaration.ts';
import type { JsonFile } from '../load/json.ts';
import type { Table } from '../schema/table.ts';
import type { ProcessDefinition, ProcessRow } from './processes.ts';
import type { ProductionRow, SiteAllocation, SiteRow } from './sites.ts';
import type { Family, FamilyRow } from './families.ts';

/** Typed rows of each input file, inferred from the zod schemas (never written twice). */
export type Product = RowOf<typeof productsCsv>;
export type BomLine = RowOf<typeof bomCsv>;
export type Material = RowOf<typeof materialsCsv>;
export type EolRow = RowOf<typeof eolCsv>;
export type Activity = RowOf<typeof activitiesCsv>;
export type TransportLeg = RowOf<typeof transportCsv>;
export type FactorRow = RowOf<typeof factorsCsv>;

/** A factor row's value for an indicator: a number, or null where the cell is empty ("not available"). */
export function indicatorValue(factor: FactorRow, code: string): number | null {
  const value = (factor as unknown as Record<string, number | null | undefined>)[code];
  return value ?? null;
}


/** The validated project: every table with its rows' provenance, and the declaration. */
export interface Project {
  dir: string;
  declaration: Declaration;
  declarationFile: JsonFile;
  /** Indicator codes the declaration reports, in EN 15804+A2 order. */
  indicators: string[];
  /** Indicator codes that factors.csv has a column for. */
  factorIndicators: string[];
  products: Table<Product>;
  bom: Table<BomLine>;
  materials: Table<Material>;
  eol: Table<EolRow>;
  activities: Table<Activity>;
  transport: Table<TransportLeg>;
  factors: Table<FactorRow>;
  /** process.csv (optional): operating data of the declarant's own processes. */
  process: Table<ProcessRow>;
  /** Its processes, validated and checked against their physical floors. */
  processes: ProcessDefinition[];
  /** site.csv (optional): a site's amounts for a whole period. */
  site: Table<SiteRow>;
  /** production.csv (optional): each product's output at a site in a period. */
  production: Table<ProductionRow>;
  /** The site rows each product receives, with their keys and shares. */
  allocation: SiteAllocation;
  /** families.csv (optional): product variants declared together. */
  familyRows: Table<FamilyRow>;
  /** Its families, members weighted. */
  families: Family[];
}
