import { locate } from '../../load/json.ts';
import { nearestName } from '../../reference/nearest.ts';
import { dimensionOf, unitsOf } from '../../reference/units.ts';
import type { CheckContext } from './context.ts';

/** Energy recovery needs the declaration's efficiencies and substituted energy whenever a product material is burnt with recovery and has a heating value. */
export function energyRecoveryRules(ctx: CheckContext): void {
  const p = ctx.project;
  if (!p.declaration || !p.declarationFile) return;
  const energy = p.declaration.energy_recovery;
  const file = p.declarationFile;
  if (energy) {
    for (const column of ['electricity_factor', 'heat_factor'] as const) {
      const id = energy[column];
      const where = locate(file, ['energy_recovery', column]);
      const factor = ctx.factor(id);
      const base = { file: file.file, line: where.line, column: `energy_recovery.${column}`, columnIndex: where.column, value: id };
      if (!factor) {
        const near = nearestName(id, [...ctx.ids(p.factors, 'factor_id')]);
        ctx.problems.push({ ...base, severity: 'error', code: 'UNKNOWN_REFERENCE', message: 'is not a factor_id in factors.csv', expected: 'an existing factor_id in factors.csv', ...(near ? { hint: `did you mean "${near}"?` } : {}) });
      } else if (dimensionOf(factor.value.unit) !== 'energy') {
        ctx.problems.push({ ...base, severity: 'error', code: 'UNIT_MISMATCH', message: `names factor ${id} (factors.csv line ${factor.line}), which is per ${factor.value.unit}; substituted energy needs a factor per unit of energy`, expected: `a factor per ${unitsOf('energy').join(' or ')}` });
      }
    }
    return;
  }
  for (const line of p.bom.rows) {
    if (line.value.role !== 'product') continue;
    const material = ctx.material(line.value.material);
    if (!material) continue;
    const eolRow = ctx.eolRowOf(line.value);
    const lhv = material.value.lhv_mj_per_kg;
    if (eolRow && eolRow.value.energy_recovery > 0 && lhv !== null && lhv > 0) {
      ctx.problems.push({
        severity: 'error', code: 'VALUE_REQUIRED', file: file.file, line: 1, column: 'energy_recovery', columnIndex: 1,
        message: `is missing, but eol.csv line ${eolRow.line} sends ${line.value.material} (LHV ${lhv} MJ/kg, bom.csv line ${line.line}) to energy recovery`,
        expected: 'energy_recovery: { electricity_efficiency, heat_efficiency, electricity_factor, heat_factor }',
      });
      return;
    }
  }
}
