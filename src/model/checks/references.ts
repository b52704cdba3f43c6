import { findGas, GHG_FACTOR_IDS, GHG_PREFIX } from '../../reference/ghg.ts';
import { parameterMeta, PROCESS_PREFIX } from '../../schema/process-kinds.ts';
import { nearestName } from '../../reference/nearest.ts';
import type { AnyTable, CheckContext } from './context.ts';
import { MATERIAL_FACTOR_COLUMNS } from '../../schema/materials.ts';

export function references(ctx: CheckContext): void {
  const p = ctx.project;
  const productIds = ctx.ids(p.products, 'product_id');
  const materialIds = ctx.ids(p.materials, 'material');
  const scenarios = ctx.ids(p.eol, 'scenario');
  const factorIds = ctx.ids(p.factors, 'factor_id');

  const check = (table: AnyTable, row: { line: number; raw: Record<string, string> }, column: string, value: string | undefined, known: Set<string>, target: string, extraKnown: readonly string[] = []) => {
    if (value === undefined || known.has(value) || extraKnown.includes(value)) return;
    const near = nearestName(value, [...known, ...extraKnown]);
    ctx.at(table, row.line, row.raw, column, 'error', 'UNKNOWN_REFERENCE', `is not a ${target}`, {
      expected: `an existing ${target}`,
      ...(near ? { hint: `did you mean "${near}"?` } : {}),
    });
  };

  for (const row of p.products.rows) check(p.products, row, 'eol_scenario', row.value.eol_scenario, scenarios, 'scenario in eol.csv');
  for (const row of p.bom.rows) {
    check(p.bom, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
    check(p.bom, row, 'material', row.value.material, materialIds, 'material in materials.csv');
  }
  // A process of process.csv stands for a factor per kg of its metal, wherever a factor id is accepted.
  const processFactors = [...new Set(p.process.rows.map((row) => `${PROCESS_PREFIX}${row.value.process_id}`))];
  for (const row of p.materials.rows) {
    for (const column of MATERIAL_FACTOR_COLUMNS) {
      check(p.materials, row, column, row.value[column], factorIds, 'factor_id in factors.csv', processFactors);
    }
  }
  // The factor-id parameters of process.csv name rows of factors.csv.
  for (const row of p.process.rows) {
    const type = parameterMeta(row.value.kind, row.value.parameter)?.type;
    if (type === 'factor') check(p.process, row, 'value', row.value.value, factorIds, 'factor_id in factors.csv');
    // A reagent is named by its factor id: reagent:<factor_id>.
    if (row.value.parameter.startsWith('reagent:')) check(p.process, row, 'parameter', row.value.parameter.slice('reagent:'.length), factorIds, 'factor_id in factors.csv');
  }
  for (const row of p.eol.rows) {
    if (row.value.material !== '*') check(p.eol, row, 'material', row.value.material, materialIds, 'material in materials.csv (or *)');
    check(p.eol, row, 'transport_factor', row.value.transport_factor, factorIds, 'factor_id in factors.csv');
    check(p.eol, row, 'processing_factor', row.value.processing_factor, factorIds, 'factor_id in factors.csv');
  }
  // Activities and site rows name their factor the same way.
  const factorColumn = (table: AnyTable, row: { line: number; raw: Record<string, string> }, factor: string) => {
    if (factor.startsWith(GHG_PREFIX)) {
      if (!findGas(factor)) {
        const near = nearestName(factor, GHG_FACTOR_IDS);
        ctx.at(table, row.line, row.raw, 'factor', 'error', 'UNKNOWN_REFERENCE', 'is not a built-in greenhouse gas', {
          expected: `one of ${GHG_FACTOR_IDS.join(', ')}`,
          ...(near ? { hint: `did you mean "${near}"?` } : {}),
        });
      }
    } else {
      check(table, row, 'factor', factor, factorIds, 'factor_id in factors.csv', processFactors);
    }
  };
  for (const row of p.activities.rows) {
    check(p.activities, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
    factorColumn(p.activities, row, row.value.factor);
  }
  for (const row of p.site.rows) factorColumn(p.site, row, row.value.factor);
  for (const row of p.production.rows) check(p.production, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
  for (const row of p.familyRows.rows) check(p.familyRows, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
  for (const row of p.excluded.rows) if (row.value.product_id !== '*') check(p.excluded, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv (or *)');
  const linesByProduct = new Map<string, Set<string>>();
  for (const row of p.bom.written) {
    const product = (row.raw.product_id ?? '').trim();
    const line = (row.raw.line_id ?? '').trim();
    if (!linesByProduct.has(product)) linesByProduct.set(product, new Set());
    if (line) linesByProduct.get(product)!.add(line);
  }
  for (const row of p.transport.rows) {
    check(p.transport, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
    check(p.transport, row, 'factor', row.value.factor, factorIds, 'factor_id in factors.csv');
    if (row.value.line_id !== undefined && productIds.has(row.value.product_id)) {
      check(p.transport, row, 'line_id', row.value.line_id, linesByProduct.get(row.value.product_id) ?? new Set(), `line_id of product ${row.value.product_id} in bom.csv`);
    }
  }
}
