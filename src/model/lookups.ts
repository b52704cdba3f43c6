import type { Row, Table } from '../schema/table.ts';
import type { ProcessDefinition, ProcessRow } from './processes.ts';
import type { Activity, BomLine, EolRow, ExcludedFlow, FactorRow, Material, Product, TransportLeg } from './rows.ts';
import type { SiteRow } from './sites.ts';

/**
 * The project's rows by id, built once when the project is read and shared by the
 * cross-file checks, the calculation and each product's reach. Without them each product
 * would filter whole tables, and the products table once per product is quadratic in the
 * catalogue (10 000 products: 10⁸ comparisons per pass). Where an id is repeated (an error
 * the duplicate-key check reports), the last row wins.
 */
export interface ProjectLookups {
  products: Map<string, Row<Product>>;
  materials: Map<string, Row<Material>>;
  factors: Map<string, Row<FactorRow>>;
  /** eol.csv rows of each scenario, in file order. */
  scenarios: Map<string, Row<EolRow>[]>;
  /** eol.csv rows by scenario, then material (`*` included). */
  eolRows: Map<string, Map<string, Row<EolRow>>>;
  /** process.csv rows of each process, in file order. */
  processRows: Map<string, Row<ProcessRow>[]>;
  /** Validated processes by process_id. */
  processes: Map<string, ProcessDefinition>;
  /** excluded.csv rows by product_id (`*` for every product). */
  excluded: Map<string, Row<ExcludedFlow>[]>;
  /** The rows of a product's own files by start line (how a contribution names its input). */
  byLine: {
    bom: Map<number, Row<BomLine>>;
    activities: Map<number, Row<Activity>>;
    transport: Map<number, Row<TransportLeg>>;
    site: Map<number, Row<SiteRow>>;
  };
}

export interface LookupTables {
  products: Table<Product>;
  materials: Table<Material>;
  eol: Table<EolRow>;
  factors: Table<FactorRow>;
  process: Table<ProcessRow>;
  processes: ProcessDefinition[];
  bom: Table<BomLine>;
  activities: Table<Activity>;
  transport: Table<TransportLeg>;
  site: Table<SiteRow>;
  excluded: Table<ExcludedFlow>;
}

const byLine = <T>(table: Table<T>): Map<number, Row<T>> => new Map(table.rows.map((row) => [row.line, row]));

export function projectLookups(tables: LookupTables): ProjectLookups {
  const scenarios = groupBy(tables.eol.rows, (row) => row.value.scenario);
  return {
    products: new Map(tables.products.rows.map((row) => [row.value.product_id, row])),
    materials: new Map(tables.materials.rows.map((row) => [row.value.material, row])),
    factors: new Map(tables.factors.rows.map((row) => [row.value.factor_id, row])),
    scenarios,
    eolRows: new Map([...scenarios].map(([scenario, rows]) => [scenario, new Map(rows.map((row) => [row.value.material, row]))])),
    processRows: groupBy(tables.process.rows, (row) => row.value.process_id),
    processes: new Map(tables.processes.map((process) => [process.id, process])),
    excluded: groupBy(tables.excluded.rows, (row) => row.value.product_id),
    byLine: { bom: byLine(tables.bom), activities: byLine(tables.activities), transport: byLine(tables.transport), site: byLine(tables.site) },
  };
}

/** The end-of-life row that applies to a material in a scenario: its own, else the scenario's `*` row. */
export function eolRowFor(lookups: ProjectLookups, scenario: string, material: string): Row<EolRow> | undefined {
  const rows = lookups.eolRows.get(scenario);
  return rows?.get(material) ?? rows?.get('*');
}

/** Rows grouped by a key, each group in the rows' order. */
export function groupBy<T>(rows: T[], key: (row: T) => string): Map<string, T[]> {
  const groups = new Map<string, T[]>();
  for (const row of rows) {
    const k = key(row);
    const group = groups.get(k);
    if (group) group.push(row);
    else groups.set(k, [row]);
  }
  return groups;
}
