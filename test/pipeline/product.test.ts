import { describe, expect, it } from 'vitest';
import { loadProject } from '../../src/model/project.ts';
import { ProductPipeline } from '../../src/pipeline/product.ts';
import { GraphReader } from '../../src/trace/graph-json.ts';
import { resultFigureId } from '../../src/report/results.ts';
import { DEMO } from '../helpers.ts';

/**
 * The one way a product is computed: what results.json says in its summary (`methods`) is,
 * figure by figure, the value of that figure in its own graph — two views of one calculation.
 */
describe('the product pipeline', () => {
  it('computes every demo product, and each module value of the summary is its figure’s value in the graph', async () => {
    const { project } = await loadProject(DEMO);
    const pipeline = new ProductPipeline(project!);
    expect(pipeline.products().map((rows) => rows.product.value.product_id)).toEqual(project!.products.rows.map((row) => row.value.product_id));
    let compared = 0;
    for (const rows of pipeline.products()) {
      const json = pipeline.resultsJson(pipeline.compute(rows));
      const reader = new GraphReader(json.graph, json.indicators);
      for (const [module, values] of Object.entries(json.methods.cutoff.modules)) {
        for (const [code, value] of Object.entries(values)) {
          const figure = reader.figure(resultFigureId('cutoff', module, code));
          expect(figure, `${rows.product.value.product_id} ${module} ${code}`).toBeDefined();
          expect(figure!.value).toBe(value);
          compared++;
        }
      }
    }
    expect(compared).toBeGreaterThan(500);
    expect(pipeline.product('no such product')).toBeUndefined();
  });
});
