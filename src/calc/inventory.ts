import type { BomLine, EolRow, Material, Product } from '../model/types.ts';
import type { Row } from '../schema/table.ts';
import { cellTerm, figureTerm, type FigureGraph, type Term } from '../trace/graph.ts';
import { inventoryStep, lineKey } from '../trace/ids.ts';
import type { CalcContext } from './context.ts';

/** One BOM line's mass flows, with the ids of the figures that hold them. */
export interface LineFlows {
  row: Row<BomLine>;
  line: BomLine;
  material: Row<Material>;
  /** Gross input G = m / (1 − s), kg. */
  grossKg: number;
  /** Recycled content R1 = pre + post. */
  r1: number;
  /** Process scrap G − m, kg. */
  scrapKg: number;
  ids: { gross: string; r1: string; scrap: string };
  key: string;
}

/** End-of-life flows of one material of the product (role product), or of its packaging (M_pack). */
export interface MaterialEol {
  materialId: string;
  material: Row<Material>;
  eol: Row<EolRow>;
  lines: LineFlows[];
  /** M_eol = Σ mass_kg of the material's lines, kg. */
  massKg: number;
  ids: { mass: string };
}

export interface Inventory {
  product: Row<Product>;
  lines: LineFlows[];
  productLines: LineFlows[];
  packagingLines: LineFlows[];
  materials: MaterialEol[];
  grossKg: number;
  ids: { gross: string; mass: string };
}

const scalar = (graph: FigureGraph, id: string, value: number, unit: string, formula: string, description: string, terms: Term[]) =>
  graph.add({ kind: 'scalar', id, value, unit, formula, description, terms });

/** The product's mass flows as scalar figures: gross inputs, recycled content, scrap, end-of-life masses. */
export function inventory(ctx: CalcContext, graph: FigureGraph, product: Row<Product>, bomRows: Row<BomLine>[]): Inventory {
  const bom = ctx.project.bom;
  const lines = bomRows.map((row): LineFlows => {
    const bomLine = row.value;
    const key = lineKey(bomLine.role, bomLine.line_id);
    const grossKg = bomLine.mass_kg / (1 - bomLine.scrap_rate);
    const r1 = bomLine.recycled_pre + bomLine.recycled_post;
    const ids = { gross: inventoryStep.line(key, 'G'), r1: inventoryStep.line(key, 'R1'), scrap: inventoryStep.line(key, 'scrap') };
    scalar(graph, ids.gross, grossKg, 'kg', 'G = m / (1 − s)', `Gross input of ${bomLine.component}: net mass over the share that does not leave as process scrap.`, [
      cellTerm(ctx.cell(bom, row, 'mass_kg'), 'm'),
      cellTerm(ctx.cell(bom, row, 'scrap_rate'), 's'),
    ]);
    scalar(graph, ids.r1, r1, 'share', 'R1 = pre + post', `Recycled content of the input of ${bomLine.component} (ISO 14021 pre- plus post-consumer).`, [
      cellTerm(ctx.cell(bom, row, 'recycled_pre'), 'pre'),
      cellTerm(ctx.cell(bom, row, 'recycled_post'), 'post'),
    ]);
    scalar(graph, ids.scrap, grossKg - bomLine.mass_kg, 'kg', 'scrap = G − m', `Process scrap of ${bomLine.component} (${bomLine.scrap_fate}).`, [
      figureTerm(ids.gross, 'G'),
      cellTerm(ctx.cell(bom, row, 'mass_kg'), 'm'),
      cellTerm(ctx.cell(bom, row, 'scrap_fate'), 'fate'),
    ]);
    return { row, line: bomLine, material: ctx.material(bomLine.material), grossKg, r1, scrapKg: grossKg - bomLine.mass_kg, ids, key };
  });
  const productLines = lines.filter((l) => l.line.role === 'product');
  const packagingLines = lines.filter((l) => l.line.role === 'packaging');

  const materials = byMaterial(ctx, graph, product, productLines, 'M_eol');

  const ids = { gross: inventoryStep.product('G'), mass: inventoryStep.product('M') };
  const grossKg = productLines.reduce((total, l) => total + l.grossKg, 0);
  scalar(graph, ids.gross, grossKg, 'kg', 'G_product = Σ G', 'Gross input of the product’s own lines (role product).', productLines.map((l) => figureTerm(l.ids.gross, `G(${l.line.line_id})`)));
  scalar(graph, ids.mass, materials.reduce((t, m) => t + m.massKg, 0), 'kg', 'M = Σ M_eol', 'Net mass of the product (role product) at end of life.', materials.map((m) => figureTerm(m.ids.mass, `M_eol(${m.materialId})`)));
  return { product, lines, productLines, packagingLines, materials, grossKg, ids };
}

/**
 * Lines grouped by material, each with its mass and the end-of-life row of the product's
 * scenario: the product's materials at end of life (M_eol), or its packaging (M_pack, whose
 * waste processing is in A5 where A5 is declared).
 */
export function byMaterial(ctx: CalcContext, graph: FigureGraph, product: Row<Product>, lines: LineFlows[], flow: 'M_eol' | 'M_pack'): MaterialEol[] {
  const groups = new Map<string, LineFlows[]>();
  for (const line of lines) groups.set(line.line.material, [...(groups.get(line.line.material) ?? []), line]);
  return [...groups.entries()].map(([materialId, materialLines]): MaterialEol => {
    const id = inventoryStep.material(materialId, flow);
    const massKg = materialLines.reduce((total, l) => total + l.line.mass_kg, 0);
    const what = flow === 'M_eol' ? 'End-of-life mass' : 'Packaging waste';
    scalar(graph, id, massKg, 'kg', `${flow} = Σ m`, `${what} of ${materialId}: the net mass of its ${flow === 'M_eol' ? 'product' : 'packaging'} lines.`, materialLines.map((l) => cellTerm(ctx.cell(ctx.project.bom, l.row, 'mass_kg'), `m(${l.line.line_id})`)));
    return { materialId, material: ctx.material(materialId), eol: ctx.eolRow(product.value.eol_scenario, materialId), lines: materialLines, massKg, ids: { mass: id } };
  });
}
