import { chosenMethods } from '../../schema/declaration.ts';
import { type Material } from '../types.ts';
import type { CheckContext } from './context.ts';

/** A material used in a way that needs a factor its row leaves empty. */
export function factorRequirements(ctx: CheckContext): void {
  const p = ctx.project;
  const reported = new Set<string>();
  const need = (materialId: string, column: keyof Material, because: string) => {
    const material = ctx.material(materialId);
    if (!material || material.value[column] !== undefined || (column === 'substituted')) return;
    const key = `${materialId}\u0000${String(column)}`;
    if (reported.has(key)) return;
    reported.add(key);
    ctx.at(p.materials, material.line, material.raw, String(column), 'error', 'FACTOR_REQUIRED', `is empty, but ${because}`, { expected: 'a factor_id in factors.csv' });
  };
  const methods = chosenMethods(p.declaration);
  const cffReported = methods.some((method) => method !== 'cutoff');
  for (const line of p.bom.rows) {
    const where = `bom.csv line ${line.line}`;
    const b = line.value;
    if (b.recycled_pre + b.recycled_post > 0) need(b.material, 'recycled', `${where} has recycled content`);
    if (b.role === 'product' && b.recycled_pre + b.recycled_post > 0) need(b.material, 'eol_recycling', `${where} has recycled content, whose net flow module D charges or credits (EN 15804+A2 Annex D)`);
    if (b.scrap_rate > 0 && b.scrap_fate === 'landfill') need(b.material, 'landfill', `${where} sends its process scrap to landfill`);
    if (b.scrap_rate > 0 && b.scrap_fate === 'incineration') need(b.material, 'incineration', `${where} sends its process scrap to incineration`);
    if (b.scrap_rate > 0 && b.scrap_fate === 'recycled') need(b.material, 'eol_recycling', `${where} sends process scrap to recycling (module D)`);
    if (b.role === 'packaging') {
      // Packaging waste is treated in A5 where A5 is declared: landfill, incineration, energy recovery.
      const eolRow = ctx.declares(b.product_id, 'A5') ? ctx.eolRowOf(b) : undefined;
      if (!eolRow) continue;
      const route = `eol.csv line ${eolRow.line} sends the packaging of bom.csv line ${line.line} (A5)`;
      if (eolRow.value.landfill > 0) need(b.material, 'landfill', `${route} to landfill`);
      if (eolRow.value.incineration > 0) need(b.material, 'incineration', `${route} to incineration`);
      if (eolRow.value.energy_recovery > 0) need(b.material, 'incineration', `${route} to incineration with energy recovery`);
      continue;
    }
    if (b.role !== 'product') continue;
    const eolRow = ctx.eolRowOf(b);
    if (!eolRow) continue;
    const route = `eol.csv line ${eolRow.line} sends it`;
    if (eolRow.value.recycling > 0) need(b.material, 'eol_recycling', `${route} to recycling (module D)`);
    if (eolRow.value.landfill > 0) need(b.material, 'landfill', `${route} to landfill`);
    if (eolRow.value.incineration > 0) need(b.material, 'incineration', `${route} to incineration`);
    if (eolRow.value.energy_recovery > 0) need(b.material, 'incineration', `${route} to incineration with energy recovery (C3; EER in the CFF)`);
    if (cffReported && eolRow.value.recycling > 0 && eolRow.value.recycling_yield < 1) need(b.material, 'landfill', `${route} to recycling with a yield below 1, and the Circular Footprint Formula disposes of the losses (1 − R2 − R3)`);
  }
}
