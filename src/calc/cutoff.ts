import type { Activity, TransportLeg } from '../model/types.ts';
import type { ProductRows } from '../model/by-product.ts';
import { siteFigures } from './allocation.ts';
import type { Row } from '../schema/table.ts';
import { cellTerm, figureTerm, type FigureGraph, type Term } from '../trace/graph.ts';
import { cutoffModuleOf, cutoffStep, inventoryStep, type MaterialFlow } from '../trace/ids.ts';
import { conversionTerm, type CalcContext, type ResolvedFactor } from './context.ts';
import type { Inventory, LineFlows, MaterialEol } from './inventory.ts';
import { bomMass, driver, sumFigure, useFactor, vectorFigure } from './nodes.ts';
import { addScaled, scaled, zeros } from './vector.ts';
import { exportedEnergyCredit, packagingEndOfLife, type PackagingEndOfLife } from './packaging.ts';
import { declaresModule } from '../model/declared-modules.ts';

/** Modules in EN 15804+A2 order. A4 and A5 appear only when the product has rows for them. */
export const CUTOFF_MODULES = ['A1', 'A2', 'A3', 'A1-A3', 'A4', 'A5', 'C1', 'C2', 'C3', 'C4', 'D'] as const;
export type CutoffModule = (typeof CUTOFF_MODULES)[number];

export interface CutoffResult {
  /** Figure id of each declared module. */
  modules: Partial<Record<CutoffModule, string>>;
  total: string;
  /** The packaging's end of life, where A5 is declared. */
  packaging?: PackagingEndOfLife;
  /** Sub-figures the other methods reuse. */
  parts: {
    a2: string;
    a3Activities: string;
    a3ScrapDisposal: string;
    a4?: string;
    a5?: string;
    c1: string;
    c2: string;
    c3Processing: string;
  };
}

/** The product's own rows cut-off reads besides its inventory (site rows allocated to it join its activities of the same module). */
export type CutoffRows = Pick<ProductRows, 'activities' | 'transport' | 'site'>;

/**
 * Cut-off ("polluter pays", EN 15804+A2): recycled input carries only its own
 * reprocessing, scrap and end-of-life material leave the system free of burden, and the
 * net benefit of recycling is reported in module D beside the A–C modules.
 */
export function cutoff(ctx: CalcContext, graph: FigureGraph, inv: Inventory, rows: CutoffRows): CutoffResult {
  const indicatorCount = ctx.length;
  const factor = (id: string): ResolvedFactor => {
    const resolved = ctx.factor(id);
    resolved.ensure(graph);
    return resolved;
  };

  // The product's own activities of a module, then the site rows allocated to it.
  const activities = (module: string) => [...activityFigures(ctx, graph, module, rows.activities, factor), ...siteFigures(ctx, graph, module, rows.site, factor)];

  // A1: raw material supply of the product's lines.
  const a1Lines = inv.productLines.map((line) => productionFigure(graph, cutoffStep.line('A1', line.key), line, factor));
  const a1Activities = activities('A1');
  const a1 = sumFigure(graph, cutoffStep.module('A1'), [...a1Lines, ...a1Activities], 'A1 = Σ lines G·[(1−R1)·Ev + R1·Erec] + Σ A1 activities', 'Raw material supply: each product line’s gross input, virgin share at the virgin factor, recycled share at the recycled-production factor.');

  // A2: transport of inputs.
  const a2Legs = transportFigures(ctx, graph, 'A2', inv, rows.transport, factor);
  const a2Activities = activities('A2');
  const a2 = sumFigure(graph, cutoffStep.module('A2'), [...a2Legs, ...a2Activities], 'A2 = Σ legs (G/1000)·d·F_tkm', 'Transport of inputs to the factory: carried mass in tonnes × distance × factor per tonne-kilometre.');

  // A3: manufacturing.
  const a3ActivityIds = activities('A3');
  const a3Activities = sumFigure(graph, cutoffStep.part('A3', 'activities'), a3ActivityIds, 'Σ A3 activities: amount·unit conversion·F', 'Energy, ancillaries and direct emissions of manufacturing.');
  const scrapIds: string[] = [];
  for (const line of inv.lines) {
    const fate = line.line.scrap_fate;
    if (line.scrapKg <= 0 || fate === 'recycled') continue;
    const material = line.material.value;
    const factorId = fate === 'landfill' ? material.landfill! : material.incineration!;
    const resolved = factor(factorId);
    const id = cutoffStep.scrapDisposal(line.line.line_id);
    useFactor(graph, id, factorId, line.scrapKg, [[bomMass(line)]]);
    vectorFigure(graph, id, scaled(resolved.values, line.scrapKg), `scrap·${fate === 'landfill' ? 'ED' : 'E_inc'}`, `Treatment of the process scrap of ${line.line.component} (${fate}).`, [figureTerm(line.ids.scrap, 'scrap'), resolved.term(fate === 'landfill' ? 'ED' : 'E_inc')]);
    scrapIds.push(id);
  }
  const a3Scrap = sumFigure(graph, cutoffStep.part('A3', 'scrap-disposal'), scrapIds, 'Σ scrap to landfill·ED + scrap to incineration·E_inc', 'Process scrap that is disposed of; scrap sent to recycling leaves free of burden (reported as MFR).');
  const packaging = inv.packagingLines.map((line) => productionFigure(graph, cutoffStep.line('A3', line.key), line, factor));
  const a3 = sumFigure(graph, cutoffStep.module('A3'), [a3Activities.id, a3Scrap.id, ...packaging], 'A3 = activities + scrap disposal + packaging production', 'Manufacturing: energy and ancillaries, disposal of process scrap, production of the packaging.');

  const a13 = sumFigure(graph, cutoffStep.module('A1-A3'), [a1.id, a2.id, a3.id], 'A1-A3 = A1 + A2 + A3', 'Cradle to gate.');

  // A4, A5: where declaration.json declares them, or the product has rows for them.
  const a4Ids = [...transportFigures(ctx, graph, 'A4', inv, rows.transport, factor), ...activities('A4')];
  const a4 = a4Ids.length > 0 || declaresModule(ctx.project.declaration, rows, 'A4') ? sumFigure(graph, cutoffStep.module('A4'), a4Ids, 'A4 = Σ legs and activities', 'Transport to the site.').id : undefined;
  // The packaging's end of life is part of A5 where A5 is declared (EN 15804+A2).
  const packagingWaste = declaresModule(ctx.project.declaration, rows, 'A5') ? packagingEndOfLife(ctx, graph, inv, factor) : undefined;
  const a5Ids = [...(packagingWaste?.a5 ?? []), ...activities('A5')];
  const a5 = packagingWaste
    ? sumFigure(graph, cutoffStep.module('A5'), a5Ids, 'A5 = Σ packaging end of life + Σ activities', 'Installation: the waste processing and disposal of the packaging, the release of its biogenic carbon, and installation activities.').id
    : undefined;

  // C1–C4 and D, per material of the product.
  const c1 = sumFigure(graph, cutoffStep.module('C1'), activities('C1'), 'C1 = Σ C1 activities', 'De-construction and demolition.');
  const c2Ids: string[] = [];
  const c3ProcessingIds: string[] = [];
  const c3EnergyIds: string[] = [];
  const c4Ids: string[] = [];
  const dIds: string[] = [];
  for (const materialEol of inv.materials) {
    const eol = materialEol.eol.value;
    const eolCell = (column: string) => cellTerm(ctx.cell(ctx.project.eol, materialEol.eol, column), column);
    const massTerm = figureTerm(materialEol.ids.mass, 'M_eol');
    // End-of-life amounts scale with the material's lines' masses, each by its share of M_eol.
    const eolMass = [materialEol.lines.map((l) => bomMass(l, l.line.mass_kg / materialEol.massKg))];
    if (eol.transport_km > 0 && eol.transport_factor) {
      const resolved = factor(eol.transport_factor);
      const tonnes = conversionTerm(graph, 'kg', 't');
      const id = cutoffStep.material('C2', materialEol.materialId);
      useFactor(graph, id, eol.transport_factor, materialEol.massKg * tonnes.factor * eol.transport_km, eolMass);
      vectorFigure(graph, id, scaled(resolved.values, materialEol.massKg * tonnes.factor * eol.transport_km), 'M_eol/1000·km·F_tkm', `Transport of end-of-life ${materialEol.materialId} to waste processing.`, [massTerm, ...tonnes.terms, eolCell('transport_km'), resolved.term('F_tkm')]);
      c2Ids.push(id);
    }
    if (eol.recycling > 0 && eol.processing_factor) {
      const resolved = factor(eol.processing_factor);
      const id = cutoffStep.material('C3', materialEol.materialId);
      useFactor(graph, id, eol.processing_factor, materialEol.massKg * eol.recycling, eolMass);
      vectorFigure(graph, id, scaled(resolved.values, materialEol.massKg * eol.recycling), 'M_eol·recycling·F_proc', `Waste processing of the ${materialEol.materialId} sent to recycling, up to the end-of-waste state.`, [massTerm, eolCell('recycling'), resolved.term('F_proc')]);
      c3ProcessingIds.push(id);
    }
    if (eol.energy_recovery > 0 && materialEol.material.value.incineration) {
      const resolved = factor(materialEol.material.value.incineration);
      const id = cutoffStep.energyRecovery(materialEol.materialId);
      useFactor(graph, id, materialEol.material.value.incineration, materialEol.massKg * eol.energy_recovery, eolMass);
      vectorFigure(graph, id, scaled(resolved.values, materialEol.massKg * eol.energy_recovery), 'M_eol·energy_recovery·E_inc', `Incineration of ${materialEol.materialId} with energy recovery (benefits in D).`, [massTerm, eolCell('energy_recovery'), resolved.term('E_inc')]);
      c3EnergyIds.push(id);
    }
    const disposal: Term[] = [];
    const c4 = zeros(indicatorCount);
    if (eol.landfill > 0) {
      const resolved = factor(materialEol.material.value.landfill!);
      addScaled(c4, resolved.values, materialEol.massKg * eol.landfill);
      disposal.push(eolCell('landfill'), resolved.term('ED'));
    }
    if (eol.incineration > 0) {
      const resolved = factor(materialEol.material.value.incineration!);
      addScaled(c4, resolved.values, materialEol.massKg * eol.incineration);
      disposal.push(eolCell('incineration'), resolved.term('E_inc'));
    }
    if (disposal.length > 0) {
      const id = cutoffStep.material('C4', materialEol.materialId);
      if (eol.landfill > 0) useFactor(graph, id, materialEol.material.value.landfill!, materialEol.massKg * eol.landfill, eolMass);
      if (eol.incineration > 0) useFactor(graph, id, materialEol.material.value.incineration!, materialEol.massKg * eol.incineration, eolMass);
      vectorFigure(graph, id, c4, 'M_eol·(landfill·ED + incineration·E_inc)', `Disposal of end-of-life ${materialEol.materialId}.`, [massTerm, ...disposal]);
      c4Ids.push(id);
    }
    dIds.push(...moduleD(ctx, graph, materialEol, factor));
  }
  const c2 = sumFigure(graph, cutoffStep.module('C2'), [...c2Ids, ...transportFigures(ctx, graph, 'C2', inv, rows.transport, factor), ...activities('C2')], 'C2 = Σ materials M_eol·km/1000·F_tkm + C2 legs', 'Transport to waste processing.');
  const c3Processing = sumFigure(graph, cutoffStep.part('C3', 'processing'), [...c3ProcessingIds, ...activities('C3')], 'Σ M_eol·recycling·F_proc + C3 activities', 'Processing of material sent to recycling, and other C3 activities.');
  const c3Energy = sumFigure(graph, cutoffStep.part('C3', 'energy-recovery'), c3EnergyIds, 'Σ M_eol·energy_recovery·E_inc', 'Incineration with energy recovery.');
  const c3 = sumFigure(graph, cutoffStep.module('C3'), [c3Processing.id, c3Energy.id], 'C3 = processing + energy recovery', 'Waste processing up to the end-of-waste state.');
  const c4 = sumFigure(graph, cutoffStep.module('C4'), [...c4Ids, ...activities('C4')], 'C4 = Σ M_eol·(landfill·ED + incineration·E_inc) + C4 activities', 'Disposal.');
  dIds.push(...(packagingWaste?.d ?? []));
  const moduleDSum = sumFigure(graph, cutoffStep.module('D'), dIds, 'D = Σ materials (M_MR,out − M_MR,in)·(E_MR − E_VMSub·Q) + energy recovery', 'Benefits and loads beyond the system boundary (EN 15804+A2 Annex D); declared separately and not added to A–C.');

  const totalIds = [a1.id, a2.id, a3.id, ...(a4 ? [a4] : []), ...(a5 ? [a5] : []), c1.id, c2.id, c3.id, c4.id];
  const total = sumFigure(graph, cutoffStep.module('total'), totalIds, `total = ${totalIds.map(cutoffModuleOf).join(' + ')}`, 'Sum of the declared modules A1 to C4; module D is not added (EN 15804+A2).');
  return {
    ...(packagingWaste ? { packaging: packagingWaste } : {}),
    modules: { A1: a1.id, A2: a2.id, A3: a3.id, 'A1-A3': a13.id, ...(a4 ? { A4: a4 } : {}), ...(a5 ? { A5: a5 } : {}), C1: c1.id, C2: c2.id, C3: c3.id, C4: c4.id, D: moduleDSum.id },
    total: total.id,
    parts: { a2: a2.id, a3Activities: a3Activities.id, a3ScrapDisposal: a3Scrap.id, ...(a4 ? { a4 } : {}), ...(a5 ? { a5 } : {}), c1: c1.id, c2: c2.id, c3Processing: c3Processing.id },
  };
}

/** G·[(1−R1)·Ev + R1·Erec]: making one line's gross input. */
function productionFigure(graph: FigureGraph, id: string, line: LineFlows, factor: (id: string) => ResolvedFactor): string {
  const material = line.material.value;
  const ev = factor(material.virgin);
  const values = scaled(ev.values, line.grossKg * (1 - line.r1));
  const terms: Term[] = [figureTerm(line.ids.gross, 'G'), figureTerm(line.ids.r1, 'R1'), ev.term('Ev')];
  if (line.r1 > 0) {
    const erec = factor(material.recycled!);
    addScaled(values, erec.values, line.grossKg * line.r1);
    terms.push(erec.term('Erec'));
  }
  vectorFigure(graph, id, values, 'G·[(1−R1)·Ev + R1·Erec]', `Production of ${line.line.component} (${material.material}).`, terms);
  const mass = [[bomMass(line)]];
  useFactor(graph, id, material.virgin, line.grossKg * (1 - line.r1), mass);
  if (line.r1 > 0) useFactor(graph, id, material.recycled!, line.grossKg * line.r1, mass);
  return id;
}

function activityFigures(ctx: CalcContext, graph: FigureGraph, module: string, activities: Row<Activity>[], factor: (id: string) => ResolvedFactor): string[] {
  const table = ctx.project.activities;
  return activities
    .filter((row) => row.value.module === module)
    .map((row) => {
      const activity = row.value;
      const resolved = factor(activity.factor);
      const conversion = conversionTerm(graph, activity.unit, resolved.unit);
      const id = cutoffStep.activity(module, row.line);
      useFactor(graph, id, activity.factor, activity.amount * conversion.factor, [[driver(table.file, row.line, 'amount')]]);
      vectorFigure(graph, id, scaled(resolved.values, activity.amount * conversion.factor), conversion.terms.length ? 'amount·(unit→factor unit)·F' : 'amount·F', activity.activity, [
        cellTerm(ctx.cell(table, row, 'amount'), 'amount'),
        cellTerm(ctx.cell(table, row, 'unit'), 'unit'),
        ...conversion.terms,
        resolved.term('F'),
      ]);
      return id;
    });
}

/**
 * Transport legs. Inbound legs (A2) carry gross input — one line's, or the product's own
 * lines' together; outbound legs (A4, C2) carry net mass. A choice documented in
 * DEVELOPERS.md.
 */
function transportFigures(ctx: CalcContext, graph: FigureGraph, module: string, inv: Inventory, legs: Row<TransportLeg>[], factor: (id: string) => ResolvedFactor): string[] {
  const table = ctx.project.transport;
  const inbound = module === 'A2';
  return legs
    .filter((row) => row.value.module === module)
    .map((row) => {
      const leg = row.value;
      const line = leg.line_id === undefined ? undefined : inv.lines.find((l) => l.line.line_id === leg.line_id);
      const massKg = line ? (inbound ? line.grossKg : line.line.mass_kg) : inbound ? inv.grossKg : inv.materials.reduce((t, m) => t + m.massKg, 0);
      const massTerm = line
        ? inbound
          ? figureTerm(line.ids.gross, 'G')
          : cellTerm(ctx.cell(ctx.project.bom, line.row, 'mass_kg'), 'm')
        : figureTerm(inbound ? inv.ids.gross : inv.ids.mass, inbound ? 'G_product' : 'M');
      const resolved = factor(leg.factor);
      const tonnes = conversionTerm(graph, 'kg', 't');
      const km = conversionTerm(graph, 'tkm', resolved.unit);
      const id = cutoffStep.transport(module, row.line);
      // The carried mass: one line's, or shared among the lines it adds up from.
      const carried = line
        ? [bomMass(line)]
        : inbound
          ? inv.productLines.map((l) => bomMass(l, l.grossKg / inv.grossKg))
          : inv.materials.flatMap((m) => m.lines.map((l) => bomMass(l, l.line.mass_kg / massKg)));
      useFactor(graph, id, leg.factor, massKg * tonnes.factor * leg.distance_km * km.factor, [[driver(table.file, row.line, 'distance_km')], carried]);
      vectorFigure(graph, id, scaled(resolved.values, massKg * tonnes.factor * leg.distance_km * km.factor), `(${inbound ? 'G' : 'm'}/1000)·d·F_tkm`, leg.leg, [
        massTerm,
        ...tonnes.terms,
        cellTerm(ctx.cell(table, row, 'distance_km'), 'd'),
        ...km.terms,
        resolved.term('F_tkm'),
      ]);
      return id;
    });
}

/**
 * EN 15804+A2 Annex D, material recycling: only the net flow of secondary material earns
 * a credit; a negative net flow (more recycled input than recycled output) is a load.
 *   D = (M_MR,out − M_MR,in) · (E_MR,after EoW − E_VMSub · Q_R,out/Q_Sub)
 */
function moduleD(ctx: CalcContext, graph: FigureGraph, materialEol: MaterialEol, factor: (id: string) => ResolvedFactor): string[] {
  const eol = materialEol.eol.value;
  const material = materialEol.material.value;
  const eolCell = (column: string) => cellTerm(ctx.cell(ctx.project.eol, materialEol.eol, column), column);
  const mr = (flow: MaterialFlow) => inventoryStep.material(materialEol.materialId, flow);
  const scrapLines = materialEol.lines.filter((l) => l.line.scrap_fate === 'recycled' && l.scrapKg > 0);
  const scrapKg = scrapLines.reduce((t, l) => t + l.scrapKg, 0);
  const outKg = (materialEol.massKg * eol.recycling + scrapKg) * eol.recycling_yield;
  graph.add({
    kind: 'scalar', id: mr('M_MR_out'), value: outKg, unit: 'kg',
    formula: 'M_MR,out = (M_eol·recycling + scrap to recycling)·yield',
    description: `${materialEol.materialId} that leaves the system and reaches the point of substitution: end-of-life material sent to recycling and process scrap sent to recycling, times the recycling yield.`,
    terms: [figureTerm(materialEol.ids.mass, 'M_eol'), eolCell('recycling'), ...scrapLines.map((l) => figureTerm(l.ids.scrap, `scrap(${l.line.line_id})`)), eolCell('recycling_yield')],
  });
  const inKg = materialEol.lines.reduce((t, l) => t + l.grossKg * l.r1, 0);
  graph.add({
    kind: 'scalar', id: mr('M_MR_in'), value: inKg, unit: 'kg',
    formula: 'M_MR,in = Σ G·R1', description: `Secondary ${materialEol.materialId} entering the system.`,
    terms: materialEol.lines.flatMap((l) => [figureTerm(l.ids.gross, `G(${l.line.line_id})`), figureTerm(l.ids.r1, `R1(${l.line.line_id})`)]),
  });
  const netKg = outKg - inKg;
  graph.add({
    kind: 'scalar', id: mr('M_MR_net'), value: netKg, unit: 'kg', formula: 'M_MR,out − M_MR,in',
    description: netKg >= 0 ? 'Net secondary material leaving the system: earns a credit.' : 'Net secondary material entering the system: a load (EN 15804+A2 Annex D).',
    terms: [figureTerm(mr('M_MR_out'), 'M_MR,out'), figureTerm(mr('M_MR_in'), 'M_MR,in')],
  });
  const ids: string[] = [];
  if (netKg !== 0) {
    const recycling = factor(material.eol_recycling!);
    const substituted = factor(material.substituted ?? material.virgin);
    const id = cutoffStep.material('D', materialEol.materialId);
    // Each line's own net flow: (m·recycling + scrap to recycling)·yield − G·R1, proportional to its mass.
    const lineNet = materialEol.lines.map((l) => (l.line.mass_kg * eol.recycling + (l.line.scrap_fate === 'recycled' ? l.scrapKg : 0)) * eol.recycling_yield - l.grossKg * l.r1);
    const lines = [materialEol.lines.map((l, k) => bomMass(l, lineNet[k]! / netKg))];
    useFactor(graph, id, material.eol_recycling!, netKg, lines);
    useFactor(graph, id, material.substituted ?? material.virgin, -netKg * material.q_out, lines);
    vectorFigure(graph, id, scaled(ctx.netRecyclingPerKg(materialEol.material), netKg), '(M_MR,out − M_MR,in)·(E_MR − E_VMSub·Q_out)', `Net recycling of ${materialEol.materialId}: recycling after end of waste minus the virgin material it replaces.`, [
      figureTerm(mr('M_MR_net'), 'M_net'),
      recycling.term('E_MR'),
      substituted.term('E_VMSub'),
      cellTerm(ctx.cell(ctx.project.materials, materialEol.material, 'q_out'), 'Q_out'),
    ]);
    ids.push(id);
  }
  const burnt = [materialEol.lines.map((l) => bomMass(l, l.line.mass_kg / materialEol.massKg))];
  const exported = exportedEnergyCredit(ctx, graph, cutoffStep.exportedEnergy(materialEol.materialId), materialEol, 'M_eol', materialEol.materialId, factor, burnt);
  if (exported) ids.push(exported);
  return ids;
}


