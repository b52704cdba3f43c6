import type { Declaration } from '../schema/declaration.ts';
import type { Row } from '../schema/table.ts';
import type { Activity, TransportLeg } from './rows.ts';
import type { AllocatedRow } from './sites.ts';

/** A product's rows that may fall in an optional module. */
export interface ModuleRows {
  activities: readonly Row<Activity>[];
  transport: readonly Row<TransportLeg>[];
  site: readonly AllocatedRow[];
}

/**
 * Whether a product declares an optional module (A4, A5): declaration.json lists it in
 * `declared_modules`, or the product has activity rows, transport legs or shared site rows
 * in it. Where A5 is declared, the packaging's end of life is computed in it.
 */
export function declaresModule(declaration: Pick<Declaration, 'declared_modules'> | undefined, rows: ModuleRows, module: 'A4' | 'A5'): boolean {
  return (
    (declaration?.declared_modules ?? []).includes(module) ||
    rows.activities.some((row) => row.value.module === module) ||
    rows.site.some((shared) => shared.row.value.module === module) ||
    rows.transport.some((leg) => leg.value.module === module)
  );
}
