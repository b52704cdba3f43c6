import type { SupplierFactor } from './supplier-datasets.ts';
import type { ProjectVerification } from './verification-record.ts';
import type { Product, BomLine, Material, EolRow, Activity, TransportLeg, FactorRow, ExcludedFlow } from './rows.ts';
import type { Declaration } from '../schema/declaration.ts';
import type { JsonCell, JsonFile } from '../load/json.ts';
import type { Table } from '../schema/table.ts';
import type { ProcessDefinition, ProcessRow } from './processes.ts';
import type { ProductionRow, SiteAllocation, SiteRow } from './sites.ts';
import type { Family, FamilyRow } from './families.ts';
import type { ProjectLookups } from './lookups.ts';
import type { IndicatorSet } from '../reference/indicators.ts';

// The row types live in rows.ts (sites.ts and families.ts use them without importing this file back).
export type { Product, BomLine, Material, EolRow, Activity, TransportLeg, FactorRow } from './rows.ts';
export { indicatorValue } from './rows.ts';

/** The validated project: every table with its rows' provenance, and the declaration. */
export interface Project {
  dir: string;
  declaration: Declaration;
  declarationFile: JsonFile;
  /** Every value of declaration.json as a cell, by JSON path, located when the file was read (the calculation cites them). */
  declarationCells: Map<string, JsonCell>;
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
  /** excluded.csv (optional): flows left out under the cut-off rule. */
  excluded: Table<ExcludedFlow>;
  /** Rows by id, built once (src/model/lookups.ts). */
  lookups: ProjectLookups;
  /** The indicators of this project: EN 15804+A2's and the programme's own (declaration.json extra_indicators). */
  indicatorSet: IndicatorSet;
  /** Supplier declarations read as factors (factors.csv supplier_dataset), by factor id. */
  suppliers: ReadonlyMap<string, SupplierFactor>;
  /** The verifier's signed record (verification-record.json) as read and checked, and the input files' hashes now. */
  verification: ProjectVerification;
}
