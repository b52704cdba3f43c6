import { flowFactor } from '../process/run.ts';
import { MATERIAL_FACTOR_COLUMNS } from '../schema/materials.ts';
import { PROCESS_PREFIX } from '../schema/process-kinds.ts';
import type { Row, Table } from '../schema/table.ts';
import type { ProductRows } from './by-product.ts';
import type { Product, Project } from './types.ts';

/**
 * A product's reach: the rows of other files its results and pages read beside its own —
 * its end-of-life scenario, its materials, the factor rows they name, its processes, the site
 * rows shared to it with the production they are shared by, its families. The input key of
 * `build --changed` hashes exactly these rows (src/render/input-key.ts), and the product's
 * page shows them, so the two cannot drift apart.
 */
export interface ReachedRows {
  eolRows: Project['eol']['rows'];
  materials: Project['materials']['rows'];
  /** Every factor id the product's rows name (process factors included). */
  factorIds: Set<string>;
  factors: Project['factors']['rows'];
  processRows: Project['process']['rows'];
  siteRows: Array<ProductRows['site'][number]['row']>;
  productionRows: Project['production']['rows'];
  /** The products whose unit mass a mass key of the product's site rows reads. */
  siteProducts: Array<Row<Product>>;
  familyRows: Project['familyRows']['rows'];
}

/** Rows found by id, in the order of their file (as a filter over the table would give them). */
function inFileOrder<T extends { line: number }>(rows: Iterable<T | undefined>): T[] {
  return [...new Set([...rows].filter((row): row is T => row !== undefined))].sort((a, b) => a.line - b.line);
}

/** The rows of other files a product reads and its page shows beside its own. */
export function reachedRows(project: Project, rows: ProductRows): ReachedRows {
  const index = project.lookups;
  const eolRows = index.scenarios.get(rows.product.value.eol_scenario) ?? [];
  const materials = inFileOrder([...new Set(rows.bom.map((row) => row.value.material))].map((id) => index.materials.get(id)));
  const factorIds = new Set<string>();
  for (const m of materials) for (const column of MATERIAL_FACTOR_COLUMNS) if (m.value[column]) factorIds.add(m.value[column]);
  for (const a of rows.activities) factorIds.add(a.value.factor);
  for (const t of rows.transport) factorIds.add(t.value.factor);
  for (const a of rows.site) factorIds.add(a.row.value.factor);
  for (const e of eolRows) for (const id of [e.value.transport_factor, e.value.processing_factor]) if (id) factorIds.add(id);
  // Energy recovery credits the electricity and heat it exports with the factors declaration.json names (module D, the CFF energy part).
  const recovery = project.declaration.energy_recovery;
  if (recovery && eolRows.some((e) => e.value.energy_recovery > 0)) for (const id of [recovery.electricity_factor, recovery.heat_factor]) factorIds.add(id);
  const factors = inFileOrder([...factorIds].map((id) => index.factors.get(id)));
  const processIds = new Set([...factorIds].filter((id) => id.startsWith(PROCESS_PREFIX)).map((id) => id.slice(PROCESS_PREFIX.length)));
  const processRows = inFileOrder([...processIds].flatMap((id) => index.processRows.get(id) ?? []));
  // Site data: the rows shared to the product, and the production of every product of their periods (the shares rest on it).
  const siteRows = [...new Set(rows.site.map((a) => a.row))];
  const groups = [...new Set(rows.site.map((a) => a.group))];
  // A parallel plant's per-unit amounts divide by the product's output at every plant.
  const productionRows = [...new Set([...groups.flatMap((group) => group.production), ...rows.site.flatMap((a) => a.plants?.outputs ?? [])])];
  const massKeyed = new Set(rows.site.filter((a) => a.key.name === 'mass').flatMap((a) => a.group.production.map((p) => p.value.product_id)));
  const siteProducts = inFileOrder([...massKeyed].map((id) => index.products.get(id)));
  // The families it belongs to: its page names them.
  const familyIds = new Set(project.families.filter((family) => family.members.some((m) => m.productId === rows.product.value.product_id)).map((family) => family.id));
  const familyRows = familyIds.size === 0 ? [] : project.familyRows.rows.filter((row) => familyIds.has(row.value.family_id));
  return { eolRows, materials, factorIds, factors, processRows, siteRows, productionRows, siteProducts, familyRows };
}

/** The project's input tables by file name. */
export function inputTables(project: Project): Map<string, Table<unknown>> {
  const list: Array<Table<unknown>> = [project.products, project.bom, project.materials, project.eol, project.activities, project.transport, project.factors, project.process, project.site, project.production, project.familyRows, project.excluded];
  return new Map(list.map((table) => [table.file, table]));
}

/**
 * Every input row a product reads, by file (start lines), found from its rows alone (no
 * calculation): its own rows (product, BOM lines, activities, transport legs), the rows it
 * reaches (`reachedRows`) and, through each process, the factor rows of the process's flows.
 * The calculation reads nothing else: every build checks that each product's figure graph
 * stays inside this set (`readsOutside` in src/render/input-key.ts), so a key that missed a
 * row would stop the build rather than keep a stale product.
 */
export function productReach(project: Project, rows: ProductRows): Map<string, Set<number>> {
  const index = project.lookups;
  const byFile = new Map<string, Set<number>>();
  const addRows = (table: Table<unknown>, list: ReadonlyArray<{ line: number }>) => {
    let lines = byFile.get(table.file);
    if (!lines) byFile.set(table.file, (lines = new Set()));
    for (const row of list) lines.add(row.line);
  };
  addRows(project.products, [rows.product]);
  addRows(project.bom, rows.bom);
  addRows(project.activities, rows.activities);
  addRows(project.transport, rows.transport);
  const shown = reachedRows(project, rows);
  addRows(project.eol, shown.eolRows);
  addRows(project.materials, shown.materials);
  addRows(project.factors, shown.factors);
  addRows(project.process, shown.processRows);
  addRows(project.site, shown.siteRows);
  addRows(project.production, shown.productionRows);
  // Mass keys read every product's unit mass of the period.
  addRows(project.products, shown.siteProducts);
  addRows(project.familyRows, shown.familyRows);
  // The verifier's checklist reads the flows left out of this product, and of every product (*).
  addRows(project.excluded, [...(project.lookups.excluded.get(rows.product.value.product_id) ?? []), ...(project.lookups.excluded.get('*') ?? [])]);
  // A process's flows are charged with factors of their own (electricity, alumina, reagents),
  // which may in turn be processes.
  const seen = new Set<string>();
  const pending = [...shown.factorIds].filter((id) => id.startsWith(PROCESS_PREFIX));
  while (pending.length > 0) {
    const processId = pending.pop()!.slice(PROCESS_PREFIX.length);
    if (seen.has(processId)) continue;
    seen.add(processId);
    const definition = index.processes.get(processId);
    if (!definition) continue;
    addRows(project.process, [...definition.rows.values()]);
    const flowFactors = new Set(definition.result.inventory.map((flow) => flowFactor(definition, flow.flow).factor).filter((id) => id !== undefined));
    addRows(project.factors, [...flowFactors].flatMap((id) => index.factors.get(id) ?? []));
    for (const id of flowFactors) if (id.startsWith(PROCESS_PREFIX)) pending.push(id);
  }
  return byFile;
}
