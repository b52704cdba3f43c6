import { CalcContext } from '../calc/context.ts';
import { calculateProduct, type ProductResult } from '../calc/product.ts';
import { rowsByProduct, type ProductRows } from '../model/by-product.ts';
import type { Project } from '../model/types.ts';
import { resultsJson, resultsSummary, type ResultsJson, type ResultsSummary } from '../report/results.ts';

/** One product computed: its result with the figure graph, and results.json without the graph. */
export interface ComputedProduct {
  result: ProductResult;
  summary: ResultsSummary;
}

/**
 * The one way a product is computed, for `build` and its worker processes, `explain` and the
 * tests: a validated project (src/model/project.ts `loadProject`) → the product's rows → the
 * calculation (every method, every indicator, its figure graph) → the results summary (data
 * quality, contributions and sensitivity, Monte Carlo when asked: src/calc). What is shared
 * by every product of the project (factor vectors, lookups) is made once, when the pipeline is.
 * View models (src/report) and files (src/render) are made from what it returns.
 */
export class ProductPipeline {
  readonly ctx: CalcContext;
  private grouped: ProductRows[] | undefined;

  constructor(readonly project: Project) {
    this.ctx = new CalcContext(project);
  }

  /** Every product's rows, in products.csv order, grouped once. */
  products(): ProductRows[] {
    this.grouped ??= rowsByProduct(this.project);
    return this.grouped;
  }

  /** A product's rows by its id, or undefined. */
  product(productId: string): ProductRows | undefined {
    return this.products().find((rows) => rows.product.value.product_id === productId);
  }

  /** The calculation alone: the result and its figure graph. */
  calculate(rows: ProductRows): ProductResult {
    return calculateProduct(this.ctx, rows);
  }

  /** The calculation and the results summary. */
  compute(rows: ProductRows): ComputedProduct {
    const result = calculateProduct(this.ctx, rows);
    return { result, summary: resultsSummary(this.ctx, result) };
  }

  /** results.json of a computed product (format 2: the summary and the graph). */
  resultsJson(computed: ComputedProduct): ResultsJson {
    return resultsJson(this.ctx, computed.result, computed.summary);
  }
}
