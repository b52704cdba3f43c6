import type { AllocatedRow } from '../model/sites.ts';
import { formatCounted } from '../format.ts';
import type { Product } from '../model/types.ts';
import type { Row } from '../schema/table.ts';
import { cellTerm, figureTerm, type FigureGraph, type Term } from '../trace/graph.ts';
import { conversionTerm, type CalcContext, type ResolvedFactor } from './context.ts';
import { driver, useFactor, vectorFigure } from './nodes.ts';
import { allocationStep, cutoffStep, plantsOutputStep } from '../trace/ids.ts';
import { scaled } from './vector.ts';

/**
 * Site rows shared to the product (ISO 14044 §4.3.4), one figure each, beside the product's
 * own activities of the same module:
 *
 *   per declared unit = amount × share ÷ output_p × (unit → factor unit) × F
 *   share = key_p / Σ_q key_q      key = output × unit_mass_kg | output | the user's key cell
 *
 * The share is a figure of its own whose terms reach the annual cell, each product's output
 * (and unit mass) cell and the key, so the audit trail shows the allocation step.
 */
export function siteFigures(ctx: CalcContext, graph: FigureGraph, module: string, allocated: readonly AllocatedRow[], factor: (id: string) => ResolvedFactor): string[] {
  const site = ctx.project.site;
  return allocated
    .filter((a) => a.row.value.module === module)
    .map((shared) => {
      const siteRow = shared.row.value;
      const resolved = factor(siteRow.factor);
      const conversion = conversionTerm(graph, siteRow.unit, resolved.unit);
      const share = shareFigure(ctx, graph, shared);
      // A parallel plant divides by the product's output at every plant; a stage by its own.
      const output = shared.plants ? shared.plants.total : shared.production.value.output;
      const perUnit = (siteRow.amount * shared.share) / output;
      const id = cutoffStep.site(module, shared.row.line);
      useFactor(graph, id, siteRow.factor, perUnit * conversion.factor, [[driver(site.file, shared.row.line, 'amount')]]);
      const outputName = shared.plants ? 'Σ plants output' : 'output';
      vectorFigure(graph, id, scaled(resolved.values, perUnit * conversion.factor), `amount·share/${shared.plants ? 'Σ plants output' : 'output'}${conversion.terms.length ? '·(unit→factor unit)' : ''}·F`, `${siteRow.activity}: ${shared.group.site}, ${shared.group.period}, shared by ${shared.key.name}${shared.plants ? `, one of the ${shared.plants.outputs.length} plants that make the product` : ''}.`, [
        cellTerm(ctx.cell(site, shared.row, 'amount'), 'amount'),
        cellTerm(ctx.cell(site, shared.row, 'unit'), 'unit'),
        figureTerm(share, 'share'),
        shared.plants ? figureTerm(plantsFigure(ctx, graph, shared), outputName) : cellTerm(ctx.cell(ctx.project.production, shared.production, 'output'), outputName),
        ...conversion.terms,
        resolved.term('F'),
      ]);
      return id;
    });
}

/** The product's output summed over its parallel plants, once per graph. */
function plantsFigure(ctx: CalcContext, graph: FigureGraph, shared: AllocatedRow): string {
  const id = plantsOutputStep(shared.production.value.product_id);
  if (graph.get(id)) return id;
  const production = ctx.project.production;
  graph.add({
    kind: 'scalar', id, value: shared.plants!.total, unit: 'declared units',
    formula: `Σ output over the ${shared.plants!.outputs.length} parallel plants`,
    description: `The product’s output at every site that makes the whole of it (production.csv site_role parallel): each plant’s amounts count in proportion to its share of it.`,
    terms: shared.plants!.outputs.map((row) => cellTerm(ctx.cell(production, row, 'output'), `output[${row.value.site_id}]`)),
  });
  return id;
}

/** A step of a site period's key: the product's key, Σ keys or its share. */
export const allocationStepOf = (a: AllocatedRow, part: 'key' | 'total' | 'share'): string => allocationStep(a.group.site, a.group.period, a.key.name, part);

const KEY_UNITS: Record<string, string> = { mass: 'kg', declared_unit: 'declared units' };

/** key_p, Σ keys and the share, added once per graph (several site rows share a key). */
function shareFigure(ctx: CalcContext, graph: FigureGraph, a: AllocatedRow): string {
  const shareId = allocationStepOf(a, 'share');
  if (graph.get(shareId)) return shareId;
  const unit = KEY_UNITS[a.key.name] ?? a.key.name;
  const production = ctx.project.production;
  const keyTerms = (p: Row<{ product_id: string }>, suffix: string): Term[] => {
    if (a.key.name === 'declared_unit') return [cellTerm(ctx.cell(production, p, 'output'), `output${suffix}`)];
    if (a.key.name === 'mass') return [cellTerm(ctx.cell(production, p, 'output'), `output${suffix}`), cellTerm(ctx.cell(ctx.project.products, productRow(ctx, p.value.product_id), 'unit_mass_kg'), `unit_mass${suffix}`)];
    return [cellTerm(ctx.cell(production, p, a.key.name), `${a.key.name}${suffix}`)];
  };
  const formula = a.key.name === 'mass' ? 'output·unit_mass_kg' : a.key.name === 'declared_unit' ? 'output' : a.key.name;
  const own = a.key.values.get(a.production.value.product_id)!;
  const keyId = allocationStepOf(a, 'key');
  graph.add({ kind: 'scalar', id: keyId, value: own, unit, formula: `key = ${formula}`, description: `The allocation key of this product at ${a.group.site} in ${a.group.period}.`, terms: keyTerms(a.production, '') });
  const totalId = allocationStepOf(a, 'total');
  const members = a.group.production.filter((p) => a.key.values.has(p.value.product_id));
  graph.add({
    kind: 'scalar', id: totalId, value: a.key.total, unit,
    formula: `Σ ${formula} over the ${formatCounted(members.length, 'product', 'products')} of the period`,
    description: `The allocation key of every product made at ${a.group.site} in ${a.group.period}.`,
    terms: members.flatMap((p) => keyTerms(p, `[${p.value.product_id}]`)),
  });
  graph.add({ kind: 'scalar', id: shareId, value: a.share, unit: 'share', formula: 'share = key / Σ keys', description: `This product’s share of the amounts of ${a.group.site} in ${a.group.period} (ISO 14044 §4.3.4).`, terms: [figureTerm(keyId, 'key'), figureTerm(totalId, 'Σ keys')] });
  return shareId;
}

function productRow(ctx: CalcContext, id: string): Row<Product> {
  const row = ctx.project.lookups.products.get(id);
  if (!row) throw new Error(`product ${id} not in the validated project`);
  return row;
}
