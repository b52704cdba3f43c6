import { loadProject } from '../model/project.ts';
import { ProductPipeline } from '../pipeline/product.ts';
import { hasErrors } from '../problems.ts';
import { nearestName, nearestNames } from '../reference/nearest.ts';
import { explainFigure, figureIds, resolveFigure } from '../trace/explain.ts';
import { EXIT, UsageError, type Io } from './io.ts';
import { printProblems } from './report-problems.ts';

export async function runExplain(options: { data: string; product: string; figure: string; depth: number }, io: Io): Promise<number> {
  const { project, problems } = await loadProject(options.data);
  if (!project || hasErrors(problems)) {
    printProblems(problems, options.data, io);
    return EXIT.input;
  }
  const pipeline = new ProductPipeline(project);
  const rows = pipeline.product(options.product);
  if (!rows) {
    const near = nearestName(options.product, project.products.rows.map((r) => r.value.product_id));
    throw new UsageError(`no product "${options.product}"${near ? ` (did you mean "${near}"?)` : ''}`);
  }
  const result = pipeline.calculate(rows);
  const figure = resolveFigure(result.graph, options.figure);
  if (!figure) {
    const ids = figureIds(result.graph);
    const near = nearestNames(options.figure, ids, 8);
    const offer = near.length > 0 ? `; the nearest: ${near.join(', ')}` : '; figure ids look like cutoff/A1/GWP-total, cff/total/GWP-total, flows/recycled_content/total';
    throw new UsageError(`product ${options.product} has no figure "${options.figure}"${offer} (every id: results.csv figure_id, or the audit page's addresses)`);
  }
  io.out(explainFigure(result.graph, figure, options.depth).join('\n'));
  return EXIT.ok;
}
