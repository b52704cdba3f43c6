import { describe, expect, it } from 'vitest';
import { INDICATORS } from '../../src/reference/indicators.ts';
import { groupedTables } from '../../src/report/declaration-view.ts';

describe('the results tables of a declaration', () => {
  const tables = groupedTables(INDICATORS, () => []);

  it('are the five tables of EN 15804+A2, in its order', () => {
    expect(tables.map((t) => t.rows.length)).toEqual([13, 6, 10, 3, 5]);
  });

  it('carry the disclaimers EN 15804+A2 requires beside IRP, and beside ADP-minerals&metals, ADP-fossil, WDP, ETP-fw, HTP-c, HTP-nc and SQP (field guide §2)', () => {
    const marked = tables.flatMap((t) => t.rows.filter((row) => row.marker).map((row) => `${row.code}${row.marker}`));
    expect(marked.sort()).toEqual(['ADP-fossil²', 'ADP-minerals&metals²', 'ETP-fw²', 'HTP-c²', 'HTP-nc²', 'IRP¹', 'SQP²', 'WDP²'].sort());
    const [core, additional] = tables;
    expect(core!.disclaimers.map((d) => `${d.marker} ${d.codes}`)).toEqual(['² ADP-minerals&metals, ADP-fossil, WDP']);
    expect(additional!.disclaimers.map((d) => `${d.marker} ${d.codes}`)).toEqual(['¹ IRP', '² ETP-fw, HTP-c, HTP-nc, SQP']);
    expect(additional!.disclaimers[0]!.text).toMatch(/low-dose ionising radiation .* nuclear fuel cycle/);
    expect(core!.disclaimers[0]!.text).toContain('shall be used with care');
  });
});
