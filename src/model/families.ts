import type { Problem } from '../problems.ts';
import type { familiesCsv } from '../schema/families.ts';
import type { RowOf } from '../schema/csv-file.ts';
import { cellProblem, type Row, type Table } from '../schema/table.ts';
import type { ProductionRow } from './sites.ts';
import type { Product } from './rows.ts';

export type FamilyRow = RowOf<typeof familiesCsv>;

/** Where a member's weight was read: its families.csv cell, or its production.csv output cells. */
export interface WeightCell {
  file: string;
  line: number;
  column: string;
  value: string;
}

export interface FamilyMember {
  productId: string;
  row: Row<FamilyRow>;
  weight: number;
  /** The cells the weight comes from (one, or the product's outputs at every site). */
  weightCells: WeightCell[];
}

/** A family of product variants declared together as the weighted average of its members. */
export interface Family {
  id: string;
  name: string;
  declaredUnit: string;
  members: FamilyMember[];
}

/**
 * Reads families.csv: members in file order, each with its weight (the weight cell, else the
 * product's production.csv output, counted once: `productOutput`), a name per family and one declared
 * unit for all members (an average over metres and pieces means nothing). Unknown products
 * are reported by the reference checks and left out here.
 */
export function readFamilies(table: Table<FamilyRow>, products: Table<Product>, production: Table<ProductionRow>): { families: Family[]; problems: Problem[] } {
  const problems: Problem[] = [];
  const at = (row: Row<FamilyRow>, column: string, code: Problem['code'], message: string, expected: string) => problems.push(cellProblem(table, row, column, 'error', code, message, { expected }));
  const productById = new Map(products.rows.map((row) => [row.value.product_id, row.value]));
  const outputs = new Map<string, Row<ProductionRow>[]>();
  for (const row of production.rows) outputs.set(row.value.product_id, [...(outputs.get(row.value.product_id) ?? []), row]);

  const byId = new Map<string, Family>();
  for (const row of table.rows) {
    const { family_id: id, product_id: productId } = row.value;
    const product = productById.get(productId);
    let family = byId.get(id);
    const name = row.value.name?.trim() ?? '';
    if (!family) {
      byId.set(id, (family = { id, name, declaredUnit: product?.declared_unit ?? '', members: [] }));
    } else if (name && family.name && name !== family.name) {
      at(row, 'name', 'FAMILY_INCONSISTENT', `differs from the name “${family.name}” an earlier row gives family ${id}`, `the same name on every row of ${id}, or an empty cell`);
    } else if (name && !family.name) {
      family.name = name;
    }
    if (!product) continue;
    if (!family.declaredUnit) family.declaredUnit = product.declared_unit;
    else if (product.declared_unit !== family.declaredUnit) {
      at(row, 'product_id', 'FAMILY_INCONSISTENT', `is declared per ${product.declared_unit}, the family’s first member per ${family.declaredUnit}; an average needs one declared unit`, `a product declared per ${family.declaredUnit}`);
      continue;
    }
    if (row.value.weight !== null && row.value.weight !== undefined) {
      family.members.push({ productId, row, weight: row.value.weight, weightCells: [{ file: table.file, line: row.line, column: 'weight', value: row.raw.weight ?? '' }] });
      continue;
    }
    const made = outputs.get(productId) ?? [];
    if (made.length === 0) {
      at(row, 'weight', 'VALUE_REQUIRED', `is empty, and production.csv has no output for ${productId} to weight it by`, 'a positive weight (e.g. annual output in declared units), or rows for the product in production.csv');
      continue;
    }
    const counted = productOutput(made);
    family.members.push({
      productId, row,
      weight: counted.reduce((sum, p) => sum + p.value.output, 0),
      weightCells: counted.map((p) => ({ file: production.file, line: p.line, column: 'output', value: p.raw.output ?? '' })),
    });
  }
  for (const family of byId.values()) if (!family.name) family.name = family.id;
  return { families: [...byId.values()], problems };
}

/**
 * The production rows that count a product's output once: the sum over its parallel plants
 * (each makes the whole product), or — made in stages only, each stage handling the same
 * units — the largest stage's output (the stages' outputs differ by stock and yield alone).
 */
export function productOutput(rows: readonly Row<ProductionRow>[]): Row<ProductionRow>[] {
  const plants = rows.filter((row) => row.value.site_role === 'parallel');
  if (plants.length > 0) return plants;
  const largest = rows.reduce<Row<ProductionRow> | undefined>((best, row) => (best === undefined || row.value.output > best.value.output ? row : best), undefined);
  return largest ? [largest] : [];
}
