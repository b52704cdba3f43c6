import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import { loadProject } from '../../src/model/project.ts';
import { ProductPipeline } from '../../src/pipeline/product.ts';
import { auditView, type AuditStep, type AuditView } from '../../src/report/audit-view.ts';
import type { ProductResult } from '../../src/calc/product.ts';
import { writeSyntheticProject } from '../../scripts/synthetic.ts';
import { removeDir, tempDir } from '../helpers.ts';

/**
 * The audit view laid out in runs, tested on its own (the browser test reads the page): a
 * synthetic product of 8 lines, where steps of one kind become runs. Nothing is lost or
 * shown twice: every step of the graph is on the page once, and every one of its terms is
 * there — in the step's entry, its run row, the run's shared terms or its keyed table.
 */
let dir = '';
let view: AuditView;
let result: ProductResult;

beforeAll(async () => {
  dir = await tempDir();
  await writeSyntheticProject(path.join(dir, 'data'), { products: 1, linesPerProduct: 8, indicators: 25 });
  const { project, problems } = await loadProject(path.join(dir, 'data'));
  expect(problems.filter((p) => p.severity === 'error')).toEqual([]);
  const pipeline = new ProductPipeline(project!);
  const rows = pipeline.products()[0]!;
  result = pipeline.calculate(rows);
  view = auditView(project!, result, rows.bom);
});
afterAll(async () => {
  if (dir) await removeDir(dir);
});

/** Every step the view shows, with the terms it shows for it (shared ones included). */
function shown(v: AuditView): Array<{ step: AuditStep; terms: number }> {
  const out: Array<{ step: AuditStep; terms: number }> = [];
  const keyed = (step: AuditStep) => (step.keyed ? step.keyed.rows.reduce((n, row) => n + row.cells.filter(Boolean).length, 0) + step.keyed.after.length : 0);
  for (const group of v.groups) {
    for (const item of group.items) {
      if (item.step) out.push({ step: item.step, terms: item.step.terms.length + keyed(item.step) });
      else for (const row of item.run.rows) out.push({ step: row.step, terms: row.step.terms.length + item.run.shared.length + keyed(row.step) });
    }
  }
  return out;
}

describe('the audit view', () => {
  it('lays steps of one kind out as runs, each row a step whose id is the run’s pattern with its key', () => {
    const runs = view.groups.flatMap((group) => group.items.flatMap((item) => (item.run ? [item.run] : [])));
    expect(runs.length).toBeGreaterThan(8);
    for (const run of runs) {
      expect(run.rows.length).toBeGreaterThanOrEqual(3);
      for (const row of run.rows) expect(row.step.id).toBe(run.pattern.replace('*', row.key));
      // A column per term the rows do not share, or (terms that differ by row) one list per row.
      if (run.columns) for (const row of run.rows) expect(row.step.terms).toHaveLength(run.columns.length);
    }
  });

  it('shows every step of the graph once, with every one of its terms', () => {
    const steps = shown(view);
    expect(steps.map((s) => s.step.id).sort()).toEqual([...result.graph.nodes.keys()].sort());
    for (const { step, terms } of steps) expect(terms, step.id).toBe(result.graph.get(step.id)!.terms.length);
    expect(view.stepCount).toBe(result.graph.nodes.size);
  });

  it('names each input row it links to, once, with the short anchor its links use', () => {
    const rows = view.inputs.flatMap((file) => file.rows);
    expect(new Set(rows.map((row) => row.anchor)).size).toBe(rows.length);
    expect(new Set(rows.map((row) => row.short)).size).toBe(rows.length);
    const hrefs = new Set(shown(view).flatMap(({ step }) => step.terms.map((t) => t.href)));
    for (const row of rows) expect(row.anchor).toBe(`input:${view.inputs.find((f) => f.rows.includes(row))!.file}:${row.line}`);
    expect([...hrefs].filter((href) => /^#i\d+$/.test(href)).every((href) => rows.some((row) => `#${row.short}` === href))).toBe(true);
  });
});
