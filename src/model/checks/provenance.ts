import { type Row } from '../../schema/table.ts';
import type { AnyTable, CheckContext } from './context.ts';

export function provenanceWarnings(ctx: CheckContext): void {
  const p = ctx.project;
  for (const table of [p.bom, p.activities, p.transport, p.site, p.production, p.familyRows] as AnyTable[]) {
    for (const row of table.rows as Array<Row<{ source?: string }>>) {
      if (row.value.source === undefined) {
        ctx.at(table, row.line, row.raw, 'source', 'warning', 'SOURCE_MISSING', 'is empty: a verifier will ask where this figure comes from', { value: row.raw.source ?? '', expected: 'a document, meter or supplier declaration' });
      }
    }
  }
  for (const row of p.materials.rows) {
    if ((row.value.family === 'wood' || row.value.family === 'paper') && row.value.biogenic_c_kg_per_kg === null) {
      ctx.at(p.materials, row.line, row.raw, 'biogenic_c_kg_per_kg', 'warning', 'BIOGENIC_CARBON_MISSING', `is empty for a ${row.value.family} material; EN 15804+A2 declares the biogenic carbon content of product and packaging`, {
        value: row.raw.biogenic_c_kg_per_kg ?? '', expected: 'kg C per kg (wood: 0.5 of dry mass, EN 16449)',
      });
    }
  }
}
