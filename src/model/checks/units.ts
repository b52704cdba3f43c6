import { findGas, GHG_PREFIX } from '../../reference/ghg.ts';
import { parameterMeta, PROCESS_PREFIX } from '../../schema/process-kinds.ts';
import { convertible, dimensionOf, unitsOf, type Dimension } from '../../reference/units.ts';
import { type Table } from '../../schema/table.ts';
import type { AnyTable, CheckContext } from './context.ts';
import { MATERIAL_FACTOR_COLUMNS } from '../../schema/materials.ts';

export function unitRules(ctx: CheckContext): void {
  const p = ctx.project;
  const perUnitOf = (table: AnyTable, row: { line: number; raw: Record<string, string> }, column: string, factorId: string | undefined, dimension: Dimension, what: string) => {
    const factor = ctx.factor(factorId);
    if (!factor) return;
    if (dimensionOf(factor.value.unit) !== dimension) {
      ctx.at(table, row.line, row.raw, column, 'error', 'UNIT_MISMATCH', `names factor ${factorId} (factors.csv line ${factor.line}), which is per ${factor.value.unit}; ${what} needs a factor per ${unitsOf(dimension).join(' or ')}`, {
        expected: `a factor per ${unitsOf(dimension).join(' or ')}`,
      });
    }
  };
  for (const row of p.materials.rows) {
    for (const column of MATERIAL_FACTOR_COLUMNS) {
      perUnitOf(p.materials, row, column, row.value[column], 'mass', 'a material');
    }
  }
  for (const row of p.eol.rows) {
    perUnitOf(p.eol, row, 'transport_factor', row.value.transport_factor, 'transport', 'C2 transport');
    perUnitOf(p.eol, row, 'processing_factor', row.value.processing_factor, 'mass', 'waste processing');
  }
  for (const row of p.transport.rows) perUnitOf(p.transport, row, 'factor', row.value.factor, 'transport', 'a transport leg');
  // A process's electricity is in kWh, its materials in t or kg.
  for (const row of p.process.rows) {
    if (parameterMeta(row.value.kind, row.value.parameter)?.type !== 'factor') continue;
    perUnitOf(p.process, row, 'value', row.value.value, row.value.parameter === 'electricity_factor' ? 'energy' : 'mass', `${row.value.parameter} of a process`);
  }
  for (const table of [p.activities, p.site] as Array<Table<{ factor: string; unit: string }>>) {
    for (const row of table.rows) {
      const { factor: factorId, unit } = row.value;
      if (factorId.startsWith(GHG_PREFIX)) {
        if (findGas(factorId) && dimensionOf(unit) !== 'mass') {
          ctx.at(table, row.line, row.raw, 'unit', 'error', 'UNIT_MISMATCH', `is not a mass; ${factorId} is characterised per kg of gas emitted`, { expected: 'a mass unit: g, kg or t' });
        }
        continue;
      }
      if (factorId.startsWith(PROCESS_PREFIX)) {
        if (dimensionOf(unit) !== 'mass') ctx.at(table, row.line, row.raw, 'unit', 'error', 'UNIT_MISMATCH', `is not a mass; ${factorId} is a factor per kg of the metal the process makes`, { expected: 'a mass unit: g, kg or t' });
        continue;
      }
      const factor = ctx.factor(factorId);
      if (factor && !convertible(unit, factor.value.unit)) {
        ctx.at(table, row.line, row.raw, 'unit', 'error', 'UNIT_MISMATCH', `cannot be converted to ${factor.value.unit}, the unit of factor ${factorId} (factors.csv line ${factor.line})`, {
          expected: `a unit of ${dimensionOf(factor.value.unit) ?? factor.value.unit}: ${unitsOf(dimensionOf(factor.value.unit) ?? 'mass').join(', ')}`,
        });
      }
    }
  }
}
