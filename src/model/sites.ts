import type { Problem } from '../problems.ts';
import { nearestName } from '../reference/nearest.ts';
import type { Dialect } from '../schema/numbers.ts';
import { describeIssue } from '../schema/issues.ts';
import { BUILT_IN_KEYS, type siteCsv } from '../schema/site.ts';
import { ownKeyCell, productionCsv } from '../schema/production.ts';
import { columnsOf, type RowOf } from '../schema/csv-file.ts';
import { cellProblem, type Row, type Table } from '../schema/table.ts';
import type { Product } from './rows.ts';

export type SiteRow = RowOf<typeof siteCsv>;
export type ProductionRow = RowOf<typeof productionCsv>;

/**
 * Site-level data, allocated (ISO 14044 §4.3.4, allocation by a physical relationship or
 * another key). A site.csv row holds a whole period's amount; production.csv says what each
 * product made there. Per declared unit of product p, a row contributes
 *
 *   amount × key_p / Σ_q key_q ÷ output_p
 *
 * where key is output × unit_mass_kg (mass), output (declared_unit) or the product's cell of
 * a production.csv column the row names (machine_hours). The shares of a key add up to 1,
 * so the allocated amounts of a row add up to the metered amount over the period's output.
 *
 * A product made at several sites: a site that is one stage the product passes through
 * (site_role stage, the default) adds its amount per unit to the other stages'; a site that is
 * one of several plants each making the whole product (site_role parallel) divides by the
 * product's output at all those plants instead of its own, so each plant counts in proportion
 * to its share of the output: amount × key_p / Σ_q key_q ÷ Σ_plants output_p.
 */
export interface AllocationKey {
  /** mass, declared_unit, or the production.csv column. */
  name: string;
  /** Each product's key in the period, by product_id. */
  values: Map<string, number>;
  total: number;
}

/** A site and period: its site.csv rows and the production rows that share them. */
export interface SitePeriod {
  site: string;
  period: string;
  rows: Row<SiteRow>[];
  production: Row<ProductionRow>[];
  /** The keys its rows name, computed once. */
  keys: Map<string, AllocationKey>;
}

/** One site.csv row as it reaches one product. */
export interface AllocatedRow {
  row: Row<SiteRow>;
  group: SitePeriod;
  /** The product's production row in the period. */
  production: Row<ProductionRow>;
  key: AllocationKey;
  /** key_p / Σ keys. */
  share: number;
  /**
   * Where the site is one of several plants that each make the whole product (production.csv
   * site_role parallel): the product's output at every such plant, whose sum its per-unit
   * amounts are divided by instead of the output at this site alone.
   */
  plants?: { outputs: Row<ProductionRow>[]; total: number };
}

export interface SiteAllocation {
  groups: SitePeriod[];
  /** Every allocated row a product receives, in site.csv order. */
  byProduct: Map<string, AllocatedRow[]>;
}

/** The contract's columns of production.csv; any other is a user's key. */
const PRODUCTION_COLUMNS: ReadonlySet<string> = new Set(columnsOf(productionCsv).map((column) => column.name));

const groupKey = (site: string, period: string) => `${site}\u0000${period}`;

/**
 * Groups site.csv and production.csv by site and period, computes every key the site rows
 * name and checks what the allocation needs: a key that exists, numbers in custom key cells,
 * production for every site period, one period per product and site, keys that do not add up
 * to zero. Products unknown to products.csv are reported by the reference checks.
 */
export function readSites(site: Table<SiteRow>, production: Table<ProductionRow>, products: Table<Product>): { allocation: SiteAllocation; problems: Problem[] } {
  const problems: Problem[] = [];
  const at = (...args: Parameters<typeof cellProblem>) => problems.push(cellProblem(...args));

  const productById = new Map(products.rows.map((row) => [row.value.product_id, row]));
  const groups = new Map<string, SitePeriod>();
  const groupOf = (siteId: string, period: string) => {
    const key = groupKey(siteId, period);
    let group = groups.get(key);
    if (!group) groups.set(key, (group = { site: siteId, period, rows: [], production: [], keys: new Map() }));
    return group;
  };
  for (const row of site.rows) groupOf(row.value.site_id, row.value.period.trim()).rows.push(row);
  for (const row of production.rows) groupOf(row.value.site_id, row.value.period.trim()).production.push(row);

  // The user's own key columns: every production.csv column outside the contract.
  const ownColumns = Object.keys(production.columns).filter((name) => !PRODUCTION_COLUMNS.has(name));
  const named = new Set(site.rows.map((row) => allocationOf(row)));
  for (const column of ownColumns) {
    if (named.has(column)) continue;
    const near = nearestName(column, [...PRODUCTION_COLUMNS, ...named]);
    problems.push({
      severity: 'warning', code: 'COLUMN_UNKNOWN', file: production.file, line: production.csv.header.line, column, columnIndex: production.columns[column]!, value: column,
      message: 'is not a column of production.csv, and no site.csv row names it as its allocation key; it is ignored',
      ...(near ? { hint: `did you mean "${near}"?` } : {}),
    });
  }
  const dialect: Dialect = { decimalComma: production.delimiter === ';' };

  const byProduct = new Map<string, AllocatedRow[]>();
  for (const group of groups.values()) {
    if (group.rows.length === 0) {
      const first = group.production[0]!;
      at(production, first, 'period', 'warning', 'PRODUCTION_UNUSED', `site ${group.site} has no site.csv rows for period ${group.period}; nothing is allocated to these products`, { expected: `site.csv rows for ${group.site}, ${group.period}` });
      continue;
    }
    if (group.production.length === 0) {
      for (const row of group.rows) {
        at(site, row, 'period', 'error', 'SITE_NO_PRODUCTION', `has no production.csv rows for site ${group.site}, so its amount cannot be shared among products`, { expected: `rows ${group.site},${group.period},<product_id>,<output> in production.csv` });
      }
      continue;
    }
    for (const row of group.rows) {
      const name = allocationOf(row);
      if (group.keys.has(name)) continue;
      if (!(BUILT_IN_KEYS as readonly string[]).includes(name) && production.columns[name] === undefined) {
        const near = nearestName(name, [...BUILT_IN_KEYS, ...ownColumns]);
        at(site, row, 'allocation', 'error', 'ALLOCATION_KEY_UNKNOWN', 'is not mass, declared_unit or a column of production.csv', {
          expected: `mass, declared_unit${ownColumns.length ? `, ${ownColumns.join(', ')}` : ''} or a column of that name in production.csv`,
          ...(near ? { hint: `did you mean "${near}"?` } : {}),
        });
        continue;
      }
      const values = new Map<string, number>();
      let readable = true;
      const ownKey = (BUILT_IN_KEYS as readonly string[]).includes(name) ? undefined : ownKeyCell(dialect, name);
      for (const p of group.production) {
        const product = productById.get(p.value.product_id)?.value;
        if (ownKey) {
          const parsed = ownKey.safeParse(p.raw[name]);
          if (!parsed.success) {
            readable = false;
            const issue = describeIssue(parsed.error.issues[0]!);
            at(production, p, name, 'error', issue.code, `${issue.message}, but site.csv line ${row.line} shares by ${name}`, { expected: `a non-negative number: the product’s ${name} in ${group.period}` });
            continue;
          }
          values.set(p.value.product_id, parsed.data);
        } else if (name === 'declared_unit') values.set(p.value.product_id, p.value.output);
        // By mass: output × unit mass; a product unknown to products.csv is reported by the reference checks.
        else if (product) values.set(p.value.product_id, p.value.output * product.unit_mass_kg);
      }
      if (!readable) continue;
      const total = [...values.values()].reduce((sum, value) => sum + value, 0);
      if (!(total > 0)) {
        at(site, row, 'allocation', 'error', 'ALLOCATION_KEY_ZERO', `adds up to zero over the production rows of ${group.site}, ${group.period}`, { expected: 'a key that some product of the period has' });
        continue;
      }
      group.keys.set(name, { name, values, total });
    }

    // One period per product and site: two would count the site twice in one declaration.
    for (const p of group.production) {
      const rows = group.rows.filter((row) => group.keys.has(allocationOf(row)));
      if (rows.length === 0) continue;
      const list = byProduct.get(p.value.product_id) ?? [];
      const other = list.find((allocated) => allocated.group.site === group.site && allocated.group.period !== group.period);
      if (other) {
        at(production, p, 'period', 'error', 'PRODUCTION_PERIODS', `gives ${p.value.product_id} output at ${group.site} in ${group.period} and in ${other.group.period} (line ${other.production.line}); a declaration rests on one period`, { expected: 'one period per product and site (remove or move the other rows)' });
        continue;
      }
      for (const row of rows) {
        const key = group.keys.get(allocationOf(row))!;
        const value = key.values.get(p.value.product_id);
        if (value === undefined) continue;
        list.push({ row, group, production: p, key, share: value / key.total });
      }
      byProduct.set(p.value.product_id, list);
    }
  }
  // Parallel plants: a product's output summed over the sites that each make the whole of it.
  const parallel = new Map<string, Row<ProductionRow>[]>();
  for (const row of production.rows) if (row.value.site_role === 'parallel') parallel.set(row.value.product_id, [...(parallel.get(row.value.product_id) ?? []), row]);
  for (const [productId, list] of byProduct) {
    const outputs = parallel.get(productId);
    if (!outputs) continue;
    const plants = { outputs, total: outputs.reduce((sum, row) => sum + row.value.output, 0) };
    for (const allocated of list) if (allocated.production.value.site_role === 'parallel') allocated.plants = plants;
  }
  for (const list of byProduct.values()) list.sort((a, b) => a.row.line - b.row.line);
  return { allocation: { groups: [...groups.values()], byProduct }, problems };
}

/** The allocation key a site row names (mass when empty). */
export const allocationOf = (row: Row<SiteRow>): string => (row.value.allocation ?? '').trim() || 'mass';
