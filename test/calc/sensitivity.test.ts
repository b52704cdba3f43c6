import { describe, expect, it } from 'vitest';
import { CalcContext } from '../../src/calc/context.ts';
import { calculateProduct } from '../../src/calc/product.ts';
import { rowsByProduct, type ProductRows } from '../../src/model/by-product.ts';
import { loadProject, type Project } from '../../src/model/project.ts';
import { productSensitivity } from '../../src/calc/sensitivity.ts';
import { DEMO } from '../helpers.ts';
import { projectLookups } from '../../src/model/lookups.ts';

/**
 * One-at-a-time sensitivity checked by doing it: every input of every demo product's top-ten
 * tables is moved by +10 % in a copy of the inputs and the product calculated again; the new
 * GWP-total must equal the table's "plus" value, R + 10 % × contribution — for a result
 * linear in the input, its sensitivity is its contribution share × 10 % (common practice of
 * contribution and perturbation analysis, ISO 14044 §4.5.3.3 interpretation).
 */
const { project } = await loadProject(DEMO);
if (!project) throw new Error('demo does not load');
const STEP = 0.1;

/** The project and product rows with one input scaled by k. */
function scaled(p: Project, rows: ProductRows, input: { kind: string; file: string; line: number; column: string }, k: number): { project: Project; rows: ProductRows } {
  const scale = <T extends { line: number; value: object }>(list: readonly T[], column: string): T[] =>
    list.map((row) => (row.line === input.line ? { ...row, value: { ...row.value, [column]: (row.value as Record<string, number>)[column]! * k } } : row));
  switch (input.kind) {
    case 'factor': {
      const codes = new Set(p.factorIndicators);
      const factors = p.factors.rows.map((row) =>
        row.line === input.line ? { ...row, value: Object.fromEntries(Object.entries(row.value).map(([key, v]) => [key, codes.has(key) && typeof v === 'number' ? v * k : v])) as typeof row.value } : row,
      );
      const table = { ...p.factors, rows: factors };
      // The lookups are built from the tables once, so a changed table needs its own.
      return { project: { ...p, factors: table, lookups: projectLookups({ ...p, factors: table }) }, rows };
    }
    case 'bom':
      return { project: p, rows: { ...rows, bom: scale(rows.bom, 'mass_kg') } };
    case 'activity':
      return { project: p, rows: { ...rows, activities: scale(rows.activities, 'amount') } };
    case 'transport':
      return { project: p, rows: { ...rows, transport: scale(rows.transport, 'distance_km') } };
    case 'site':
      return { project: p, rows: { ...rows, site: rows.site.map((a) => (a.row.line === input.line ? { ...a, row: { ...a.row, value: { ...a.row.value, amount: a.row.value.amount * k } } } : a)) } };
  }
  throw new Error(`unknown input kind ${input.kind}`);
}

describe('one-at-a-time sensitivity equals the recalculated result', () => {
  const ctx = new CalcContext(project);
  it.each(rowsByProduct(project).map((rows) => [rows.product.value.product_id, rows] as const))('%s: every top-ten input of A1-A3 and D at +10 %', (_id, rows) => {
    const sensitivity = productSensitivity(ctx, calculateProduct(ctx, rows), STEP)!;
    let checked = 0;
    for (const scope of sensitivity.scopes) {
      expect(scope.inputs.length).toBeGreaterThan(0);
      for (const input of scope.inputs) {
        const moved = scaled(project, rows, input, 1 + STEP);
        const again = calculateProduct(new CalcContext(moved.project), moved.rows);
        const index = ctx.indicators.indexOf('GWP-total');
        const value = again.graph.vector(again.cutoff.modules[scope.module]!).values[index]!;
        expect(value, `${scope.module} ${input.label}`).toBeCloseTo(input.plus, 9);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(5);
  });

  it('lists the billet, its ingot factor and the grid electricity among the profile’s largest A1-A3 inputs, largest first', () => {
    const rows = rowsByProduct(project).find((r) => r.product.value.product_id === 'KV-EXT-6060')!;
    const scope = productSensitivity(ctx, calculateProduct(ctx, rows), STEP)!.scopes[0]!;
    const magnitudes = scope.inputs.map((i) => Math.abs(i.contribution));
    expect(magnitudes).toEqual([...magnitudes].sort((a, b) => b - a));
    const labels = scope.inputs.map((i) => i.label);
    expect(labels).toContain('L1 Extrusion billet, mass');
    expect(labels).toContain('factor grid-electricity');
    expect(scope.inputs.length).toBe(10);
  });
});
