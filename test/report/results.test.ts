import { describe, expect, it } from 'vitest';
import { CalcContext } from '../../src/calc/context.ts';
import { calculateProduct } from '../../src/calc/product.ts';
import { rowsByProduct } from '../../src/model/by-product.ts';
import { loadProject } from '../../src/model/project.ts';
import { resultsJson, resultsJsonText } from '../../src/report/results.ts';
import { DEMO } from '../helpers.ts';

describe('results.json as written', () => {
  it('is byte for byte JSON.stringify of the results object (the text writer skips building figure objects)', async () => {
    const { project } = await loadProject(DEMO);
    const ctx = new CalcContext(project!);
    for (const rows of rowsByProduct(project!)) {
      const result = calculateProduct(ctx, rows);
      // JSON.stringify (ECMA-262) is the reference serialiser.
      expect(resultsJsonText(ctx, result)).toBe(JSON.stringify(resultsJson(ctx, result)));
    }
  });
});
