import { describe, expect, it } from 'vitest';
import { CalcContext } from '../../src/calc/context.ts';
import { calculateProduct } from '../../src/calc/product.ts';
import { rowsByProduct } from '../../src/model/by-product.ts';
import { loadProject } from '../../src/model/project.ts';
import { contextChanges, pageContextKey, productInputKey, readsOutside } from '../../src/render/input-key.ts';
import { productReach, reachedRows } from '../../src/model/reach.ts';
import { mapLimit } from '../../src/render/each-limit.ts';
import { DEMO } from '../helpers.ts';

/**
 * The input key of `build --changed` is found from a product's rows without calculating it;
 * the figure graph is the independent account of what the calculation read. These tests hold
 * the two against each other on the demo, whose aluminium profile reaches factor rows only
 * through a process of process.csv.
 */
describe('input key', async () => {
  const { project } = await loadProject(DEMO);
  if (!project) throw new Error('the demo does not load');
  const all = rowsByProduct(project);
  const ctx = new CalcContext(project);

  it('covers every input row that each demo product’s figure graph reads', () => {
    for (const rows of all) {
      const graph = calculateProduct(ctx, rows).graph;
      expect(readsOutside(project, productReach(project, rows), graph), rows.product.value.product_id).toBeUndefined();
    }
  });

  it('reaches the factor rows of a process’s flows, which the product names nowhere itself', () => {
    const rows = all.find((r) => r.product.value.product_id === 'KV-EXT-6060')!;
    const alumina = project.factors.rows.find((row) => row.value.factor_id === 'alumina-smelter-grade')!;
    // The page's own list of factors does not name it: only the Glenmoor potline's alumina_factor does.
    expect(reachedRows(project, rows).factors.map((row) => row.line)).not.toContain(alumina.line);
    expect(productReach(project, rows).get(project.factors.file)?.has(alumina.line)).toBe(true);
    // …and the calculation does read it.
    const graph = calculateProduct(ctx, rows).graph;
    const reads = [...graph.nodes.values()].some((node) => node.terms.some((term) => term.kind === 'factor' && term.factor.line === alumina.line));
    expect(reads).toBe(true);
  });

  it('names the figure and row when a reach misses a row the graph reads (the guard of the results writer)', () => {
    const rows = all.find((r) => r.product.value.product_id === 'KV-EXT-6060')!;
    const reach = productReach(project, rows);
    const alumina = project.factors.rows.find((row) => row.value.factor_id === 'alumina-smelter-grade')!;
    reach.get(project.factors.file)!.delete(alumina.line);
    const outside = readsOutside(project, reach, calculateProduct(ctx, rows).graph);
    expect(outside).toMatchObject({ file: project.factors.file, line: alumina.line });
    expect(outside!.figure).toMatch(/^process\/glenmoor-potline\//);
  });

  it('is the same for the same rows and changes with a row it reaches, not with one it does not', () => {
    const [first, second] = all;
    const key = productInputKey(project, first!, 'context').key;
    expect(productInputKey(project, first!, 'context').key).toBe(key);
    expect(productInputKey(project, first!, 'other context').key).not.toBe(key);
    expect(productInputKey(project, second!, 'context').key).not.toBe(key);
  });
});

describe('mapLimit', () => {
  it('keeps the items’ order and never runs more than the limit at once', async () => {
    let running = 0;
    let most = 0;
    const delays = [5, 1, 4, 2, 3, 0, 6, 1, 2, 5];
    const results = await mapLimit(delays, 3, async (delay, index) => {
      running++;
      most = Math.max(most, running);
      await new Promise((resolve) => setTimeout(resolve, delay));
      running--;
      return index * 10;
    });
    expect(results).toEqual(delays.map((_, index) => index * 10));
    expect(most).toBe(3);
    expect(await mapLimit([], 4, async () => 1)).toEqual([]);
  });
});

describe('what changed in the pages’ context', () => {
  it('names the part that changed: only the PDF setting, or declaration.json, or an old cache it cannot read part by part', async () => {
    const { project } = await loadProject(DEMO);
    const withPdfs = pageContextKey(project!, true);
    const withoutPdfs = pageContextKey(project!, false);
    expect(contextChanges(withPdfs, withoutPdfs)).toEqual(['the PDF setting (with or without PDFs) changed']);
    const edited = { ...project!, declaration: { ...project!.declaration, pcr: 'Another PCR' } };
    expect(contextChanges(withPdfs, pageContextKey(edited, true))[0]).toBe('declaration.json changed');
    expect(contextChanges('0f3a', withPdfs)).toEqual(['declaration.json or the page settings changed']);
  });
});
