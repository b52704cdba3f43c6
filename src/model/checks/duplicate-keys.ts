import type { Severity } from '../../problems.ts';
import type { AnyTable, CheckContext } from './context.ts';

export function duplicateKeys(ctx: CheckContext): void {
  const p = ctx.project;
  const rules: Array<{ table: AnyTable; key: string[]; severity: Severity; what: string }> = [
    { table: p.products, key: ['product_id'], severity: 'error', what: 'product_id' },
    { table: p.bom, key: ['product_id', 'line_id'], severity: 'error', what: 'line_id within its product' },
    { table: p.materials, key: ['material'], severity: 'error', what: 'material' },
    { table: p.eol, key: ['scenario', 'material'], severity: 'error', what: 'scenario and material' },
    { table: p.factors, key: ['factor_id'], severity: 'error', what: 'factor_id' },
    // Repeated activities and legs are legal but usually a double count.
    { table: p.activities, key: ['product_id', 'module', 'activity'], severity: 'warning', what: 'product, module and activity' },
    { table: p.transport, key: ['product_id', 'module', 'line_id', 'leg'], severity: 'warning', what: 'product, module, line and leg' },
    { table: p.site, key: ['site_id', 'period', 'module', 'activity'], severity: 'warning', what: 'site, period, module and activity' },
    { table: p.production, key: ['site_id', 'period', 'product_id'], severity: 'error', what: 'site, period and product' },
    { table: p.familyRows, key: ['family_id', 'product_id'], severity: 'error', what: 'family and product' },
  ];
  for (const rule of rules) {
    const seen = new Map<string, number>();
    for (const row of rule.table.written) {
      const parts = rule.key.map((column) => (row.raw[column] ?? '').trim());
      if (parts[0] === '' || (rule.key.length > 1 && parts[rule.key.length - 1] === '' && rule.table !== p.transport)) continue;
      const key = parts.join('\u0000');
      const first = seen.get(key);
      if (first === undefined) {
        seen.set(key, row.line);
        continue;
      }
      const column = rule.key[rule.key.length - 1]!;
      ctx.at(rule.table, row.line, row.raw, column, rule.severity, 'DUPLICATE_ID', `repeats the ${rule.what} of line ${first}`, { expected: `a ${rule.what} not used before`, hint: `first defined on line ${first}` });
    }
  }
}
