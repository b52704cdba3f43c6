// The cost of the Monte Carlo analysis per product, in a fresh process.
// usage: bench-uncertainty.ts DATA_DIR PRODUCTS ITERATIONS   (DATA_DIR: a synthetic project with gsd columns)
import { CalcContext } from '../src/calc/context.ts';
import { calculateProduct } from '../src/calc/product.ts';
import { productUncertainty } from '../src/calc/uncertainty.ts';
import { rowsByProduct } from '../src/model/by-product.ts';
import { loadProject } from '../src/model/project.ts';
import { productDataQuality } from '../src/calc/data-quality.ts';
import { productSensitivity } from '../src/calc/sensitivity.ts';

const [dir, count, iterations] = process.argv.slice(2);
const { project, problems } = await loadProject(dir!);
if (!project) throw new Error(`synthetic project has errors: ${JSON.stringify(problems.slice(0, 3))}`);
const ctx = new CalcContext(project);
const rows = rowsByProduct(project).slice(0, Number(count));
const results = rows.map((r) => calculateProduct(ctx, r));
const time = (run: () => void) => {
  const start = performance.now();
  run();
  return (performance.now() - start) / rows.length;
};
// Warm-up, then the timed passes.
for (const result of results.slice(0, 10)) productUncertainty(ctx, result, { iterations: Number(iterations), seed: 1 });
const calcMs = time(() => rows.forEach((r) => calculateProduct(ctx, r)));
const qualityMs = time(() => results.forEach((r) => productDataQuality(ctx, r)));
const sensitivityMs = time(() => results.forEach((r) => productSensitivity(ctx, r, 0.1)));
let varied = 0;
const mcMs = time(() => results.forEach((r) => {
  const u = productUncertainty(ctx, r, { iterations: Number(iterations), seed: 1 })!;
  varied += u.varied.factors.length + u.varied.bom.length + u.varied.activities.length;
}));
process.stdout.write(JSON.stringify({ products: rows.length, iterations: Number(iterations), calcMs, qualityMs, sensitivityMs, mcMs, variedPerProduct: varied / rows.length }));
