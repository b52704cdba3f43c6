import { indicatorValue } from '../types.ts';
import type { CheckContext } from './context.ts';
import { formatSignificant } from '../../format.ts';

/** EN 15804+A2: GWP-total = GWP-fossil + GWP-biogenic + GWP-luluc; rounding within 0.1 % is tolerated. */
export function gwpConsistency(ctx: CheckContext): void {
  const p = ctx.project;
  const parts = ['GWP-fossil', 'GWP-biogenic', 'GWP-luluc'];
  if (!['GWP-total', ...parts].every((code) => p.factorIndicators.includes(code))) return;
  for (const row of p.factors.rows) {
    // A supplier's dataset is checked where its values are written (src/model/supplier-datasets.ts).
    if (row.value.supplier_dataset !== undefined) continue;
    const total = indicatorValue(row.value, 'GWP-total');
    const values = parts.map((code) => indicatorValue(row.value, code));
    if (total === null || values.some((v) => v === null)) continue;
    const sum = (values as number[]).reduce((a, b) => a + b, 0);
    if (Math.abs(total - sum) > 1e-3 * Math.max(Math.abs(total), Math.abs(sum)) + 1e-12) {
      ctx.at(p.factors, row.line, row.raw, 'GWP-total', 'warning', 'GWP_SUM_MISMATCH', `is not GWP-fossil + GWP-biogenic + GWP-luluc = ${formatSignificant(sum, 6)} for factor ${row.value.factor_id}`, {
        expected: `${formatSignificant(sum, 6)} (within 0.1 %)`,
      });
    }
  }
}
