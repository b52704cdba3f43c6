import type { ProductRows } from '../model/by-product.ts';
import { chosenMethods } from '../schema/declaration.ts';
import { FigureGraph } from '../trace/graph.ts';
import { cffSharedParts, circularFootprint, type CffMethod, type CffResult } from './cff.ts';
import type { CalcContext } from './context.ts';
import { cutoff, type CutoffResult } from './cutoff.ts';
import { flows, type FlowsResult } from './flows.ts';
import { inventory } from './inventory.ts';
import { scenarios, type ScenariosResult } from './scenarios.ts';

export interface ProductResult {
  productId: string;
  declaredUnit: string;
  graph: FigureGraph;
  cutoff: CutoffResult;
  flows: FlowsResult;
  /** The scenario information beside C1–C4, A5 (packaging) and D. */
  scenarios: ScenariosResult;
  methods: Partial<Record<CffMethod, CffResult>>;
}

/** The methods a declaration reports besides cut-off (always computed). */
export function reportedMethods(ctx: CalcContext): CffMethod[] {
  const chosen = chosenMethods(ctx.project.declaration);
  return (['cff', 'eol-recycling', 'fifty-fifty'] as const).filter((method) => chosen.includes(method));
}

/** One product, every method, every indicator, with its own figure graph. Pure. */
export function calculateProduct(ctx: CalcContext, rows: ProductRows): ProductResult {
  const graph = new FigureGraph(ctx.indicators);
  const inv = inventory(ctx, graph, rows.product, rows.bom);
  const cut = cutoff(ctx, graph, inv, { activities: rows.activities, transport: rows.transport, site: rows.site });
  const modules = Object.keys(cut.modules);
  const flowResult = flows(ctx, graph, inv, modules, modules.filter((m) => m !== 'A1-A3' && m !== 'D'), cut.packaging?.materials);
  const scenarioResult = scenarios(ctx, graph, inv.materials, cut.packaging?.materials);
  const methods: ProductResult['methods'] = {};
  const chosen = reportedMethods(ctx);
  const shared = chosen.length > 0 ? cffSharedParts(ctx, graph, inv) : undefined;
  for (const method of chosen) methods[method] = circularFootprint(ctx, graph, inv, cut, shared!, method);
  return { productId: rows.product.value.product_id, declaredUnit: rows.product.value.declared_unit, graph, cutoff: cut, flows: flowResult, scenarios: scenarioResult, methods };
}
