import { CalcContext } from '../calc/context.ts';
import { calculateProduct } from '../calc/product.ts';
import { rowsByProduct } from '../model/by-product.ts';
import { loadProject } from '../model/project.ts';
import { hasErrors } from '../problems.ts';
import { nearestName } from '../reference/nearest.ts';
import { explainFigure, figureIds, resolveFigure } from '../trace/explain.ts';
import { EXIT, UsageError, type Io } from './io.ts';
import { printProblems } from './report-problems.ts';

export async function runExplain(options: { data: string; product: string; figure: string; depth: number }, io: Io): Promise<number> {
  const { project, problems } = await loadProject(options.data);
  if (!project || hasErrors(problems)) {
    printProblems(problems, options.data, io);
    return EXIT.input;
  }
  const rows = rowsByProduct(project).find((r) => r.product.value.product_id === options.product);
  if (!rows) {
    const near = nearestName(options.product, project.products.rows.map((r) => r.value.product_id));
    throw new UsageError(`no product "${options.product}"${near ? ` (did you mean "${near}"?)` : ''}`);
  }
  const ctx = new CalcContext(project);
  const result = calculateProduct(ctx, rows);
  const figure = resolveFigure(result.graph, options.figure);
  if (!figure) {
    const ids = figureIds(result.graph);
    const near = nearestName(options.figure, ids);
    throw new UsageError(`product ${options.product} has no figure "${options.figure}"${near ? ` (did you mean "${near}"?)` : ''}; figure ids look like cutoff/A1/GWP-total, cff/total/GWP-total, flows/recycled_content/total`);
  }
  io.out(explainFigure(result.graph, figure, options.depth).join('\n'));
  return EXIT.ok;
}
