import type { Activity, BomLine, Product, Project, TransportLeg } from './types.ts';
import type { Row } from '../schema/table.ts';
import type { AllocatedRow } from './sites.ts';
import { groupBy } from './lookups.ts';

export interface ProductRows {
  product: Row<Product>;
  bom: Row<BomLine>[];
  activities: Row<Activity>[];
  transport: Row<TransportLeg>[];
  /** Rows of site.csv shared to this product through production.csv. */
  site: AllocatedRow[];
}

/** Each product with its own rows, grouped once so that work per product stays linear in the catalogue. */
export function rowsByProduct(project: Project): ProductRows[] {
  const bom = groupBy(project.bom.rows, (row) => row.value.product_id);
  const activities = groupBy(project.activities.rows, (row) => row.value.product_id);
  const transport = groupBy(project.transport.rows, (row) => row.value.product_id);
  return project.products.rows.map((product) => {
    const id = product.value.product_id;
    return { product, bom: bom.get(id) ?? [], activities: activities.get(id) ?? [], transport: transport.get(id) ?? [], site: project.allocation.byProduct.get(id) ?? [] };
  });
}
