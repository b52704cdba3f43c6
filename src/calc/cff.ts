import { cellTerm, figureTerm, type FigureGraph, type Term } from '../trace/graph.ts';
import { conversionTerm, type CalcContext, type ResolvedFactor } from './context.ts';
import { methodStep, referenceStep } from '../trace/ids.ts';
import type { CutoffResult } from './cutoff.ts';
import type { Inventory, LineFlows, MaterialEol } from './inventory.ts';
import { sumFigure, vectorFigure } from './nodes.ts';
import { addScaled, scaled, zeros } from './vector.ts';
import { defaultA } from '../reference/cff.ts';

/**
 * The Circular Footprint Formula (Commission Recommendation (EU) 2021/2279, Annex C), per
 * material line, with B = 0:
 *   material: G·[(1−R1)·Ev + R1·(A·Erec + (1−A)·Ev·Qsin/Qp)] + M·(1−A)·R2·(ErecEoL − E*v·Qsout/Qp)
 *   energy:   M·R3·(EER − LHV·X_heat·E_heat − LHV·X_el·E_el)
 *   disposal: M·(1 − R2 − R3 − reuse)·ED
 * with R2 = recycling·yield and R3 = energy_recovery. The same equation with A = 0 is the
 * end-of-life recycling (0:100) method and with A = 0.5 the 50:50 method: presets, not copies.
 */
export type CffMethod = 'cff' | 'eol-recycling' | 'fifty-fifty';

const PRESET_A: Record<Exclude<CffMethod, 'cff'>, number> = { 'eol-recycling': 0, 'fifty-fifty': 0.5 };


export interface CffResult {
  parts: { material: string; energy: string; disposal: string };
  total: string;
}

function allocationOf(ctx: CalcContext, graph: FigureGraph, method: CffMethod, line: LineFlows): { a: number; term: Term } {
  if (method !== 'cff') {
    const a = PRESET_A[method];
    const id = referenceStep.methodA(method);
    graph.add({ kind: 'scalar', id, value: a, unit: 'share', formula: `A = ${a}`, description: `The ${method === 'eol-recycling' ? 'end-of-life recycling (0:100)' : '50:50'} method: the Circular Footprint Formula with A = ${a} for every material.`, terms: [] });
    return { a, term: figureTerm(id, 'A') };
  }
  const material = line.material.value;
  if (material.cff_a !== undefined) return { a: material.cff_a, term: cellTerm(ctx.cell(ctx.project.materials, line.material, 'cff_a'), 'A') };
  const a = defaultA(material.family);
  const id = referenceStep.defaultA(material.family === 'metal' ? 'metal' : 'other');
  if (!graph.get(id)) graph.add({ kind: 'scalar', id, value: a, unit: 'share', formula: `A = ${a}`, description: material.family === 'metal' ? 'Default allocation factor for metals, Recommendation (EU) 2021/2279 Annex C.' : 'loopsheet’s default allocation factor where materials.csv gives none: set cff_a from the applicable PCR.', terms: [] });
  return { a, term: figureTerm(id, 'A') };
}

/** The energy and disposal parts (they do not depend on A, B = 0): computed once per product, shared by the three methods. */
export interface CffSharedParts {
  energy: string;
  disposal: string;
}

export function cffSharedParts(ctx: CalcContext, graph: FigureGraph, inv: Inventory): CffSharedParts {
  const factor = (id: string): ResolvedFactor => {
    const resolved = ctx.factor(id);
    resolved.ensure(graph);
    return resolved;
  };
  const eolOf = new Map<string, MaterialEol>(inv.materials.map((m) => [m.materialId, m]));
  const energyIds: string[] = [];
  const disposalIds: string[] = [];
  for (const line of inv.productLines) {
    const materialEol = eolOf.get(line.line.material);
    if (!materialEol) continue;
    energyIds.push(...energyPart(ctx, graph, line, materialEol, factor));
    disposalIds.push(disposalPart(ctx, graph, line, materialEol, factor));
  }
  const energy = sumFigure(graph, methodStep.part('cff', 'energy'), energyIds, 'Σ lines (1−B)·R3·M·(EER − LHV·X_heat·E_heat − LHV·X_el·E_el), B = 0', 'Energy part: incineration with energy recovery, minus the energy it replaces; it does not depend on A, so the CFF, 0:100 and 50:50 share it.');
  const disposal = sumFigure(graph, methodStep.part('cff', 'disposal'), disposalIds, 'Σ lines M·(1 − R2 − R3 − reuse)·ED', 'Disposal part: what is neither recycled, re-used nor recovered for energy; it does not depend on A, so the CFF, 0:100 and 50:50 share it.');
  return { energy: energy.id, disposal: disposal.id };
}

export function circularFootprint(ctx: CalcContext, graph: FigureGraph, inv: Inventory, cut: CutoffResult, shared: CffSharedParts, method: CffMethod): CffResult {
  const factor = (id: string): ResolvedFactor => {
    const resolved = ctx.factor(id);
    resolved.ensure(graph);
    return resolved;
  };
  // A per method preset, else per material (its cff_a cell or the default): one term each, shared by its lines.
  const allocations = new Map<string, { a: number; term: Term }>();
  const allocation = (line: LineFlows): { a: number; term: Term } => {
    const key = method === 'cff' ? line.line.material : method;
    let found = allocations.get(key);
    if (!found) allocations.set(key, (found = allocationOf(ctx, graph, method, line)));
    return found;
  };
  const eolOf = new Map<string, MaterialEol>(inv.materials.map((m) => [m.materialId, m]));
  const materialIds: string[] = [];

  for (const line of inv.lines) {
    const material = line.material.value;
    const { a, term: aTerm } = allocation(line);
    const ev = factor(material.virgin);
    // Production of the gross input: the recycled share carries A·Erec + (1−A)·Ev·Qsin/Qp.
    const values = scaled(ev.values, line.grossKg * (1 - line.r1));
    const terms: Term[] = [figureTerm(line.ids.gross, 'G'), figureTerm(line.ids.r1, 'R1'), aTerm, ev.term('Ev')];
    if (line.r1 > 0) {
      const erec = factor(material.recycled!);
      addScaled(values, erec.values, line.grossKg * line.r1 * a);
      addScaled(values, ev.values, line.grossKg * line.r1 * (1 - a) * material.q_in);
      terms.push(erec.term('Erec'), cellTerm(ctx.cell(ctx.project.materials, line.material, 'q_in'), 'Qsin/Qp'));
    }
    const materialEol = line.line.role === 'product' ? eolOf.get(line.line.material) : undefined;
    let formula = 'G·[(1−R1)·Ev + R1·(A·Erec + (1−A)·Ev·Qsin/Qp)]';
    if (materialEol) {
      const eol = materialEol.eol.value;
      const eolCell = (column: string) => cellTerm(ctx.cell(ctx.project.eol, materialEol.eol, column), column);
      const r2 = eol.recycling * eol.recycling_yield;
      // Process scrap sent to recycling earns the same end-of-life term as the product (rule in DEVELOPERS.md).
      const scrapKg = line.line.scrap_fate === 'recycled' ? line.scrapKg : 0;
      const recycledOutKg = line.line.mass_kg * r2 + scrapKg * eol.recycling_yield;
      if (recycledOutKg > 0 && a < 1) {
        const recycling = factor(material.eol_recycling!);
        const substituted = factor(material.substituted ?? material.virgin);
        addScaled(values, ctx.netRecyclingPerKg(line.material), recycledOutKg * (1 - a));
        terms.push(
          cellTerm(ctx.cell(ctx.project.bom, line.row, 'mass_kg'), 'M'),
          eolCell('recycling'),
          eolCell('recycling_yield'),
          ...(scrapKg > 0 ? [figureTerm(line.ids.scrap, 'scrap')] : []),
          recycling.term('ErecEoL'),
          substituted.term('E*v'),
          cellTerm(ctx.cell(ctx.project.materials, line.material, 'q_out'), 'Qsout/Qp'),
        );
        formula += ' + (M·R2 + scrap·yield)·(1−A)·(ErecEoL − E*v·Qsout/Qp)';
      }
    }
    const id = methodStep.line(method, 'material', line.key);
    vectorFigure(graph, id, values, formula, `${method === 'cff' ? 'Circular Footprint Formula' : method} material part for ${line.line.component} (${material.material}).`, terms);
    materialIds.push(id);
  }

  const materialPart = sumFigure(graph, methodStep.part(method, 'material'), materialIds, 'Σ lines material part', 'Material part: production of the inputs with the recycled-content credit shared by A, and the end-of-life recycling credit shared by 1 − A.');
  // The energy and disposal parts do not depend on A: computed once (cff/…), and named under each
  // method too, so that every `<method>/<part>` a result reports is a step of the graph.
  const energy = method === 'cff' ? shared.energy : sharedPart(graph, method, 'energy', shared.energy);
  const disposal = method === 'cff' ? shared.disposal : sharedPart(graph, method, 'disposal', shared.disposal);
  const others = [cut.parts.a2, cut.parts.a3Activities, cut.parts.a3ScrapDisposal, ...(cut.parts.a4 ? [cut.parts.a4] : []), ...(cut.parts.a5 ? [cut.parts.a5] : []), cut.parts.c1, cut.parts.c2, cut.parts.c3Processing];
  const total = sumFigure(
    graph,
    methodStep.total(method),
    [materialPart.id, energy, disposal, ...others],
    'total = material + energy + disposal + A2 + A3 activities + A3 scrap disposal + C1 + C2 + C3 processing',
    'Method total over the life cycle; the disposal part replaces C4 and the energy part replaces incineration with energy recovery in C3.',
    (child) => child.replace(/^cutoff\//, ''),
  );
  return { parts: { material: materialPart.id, energy, disposal }, total: total.id };
}

function sharedPart(graph: FigureGraph, method: CffMethod, part: 'energy' | 'disposal', sharedId: string): string {
  return sumFigure(graph, methodStep.part(method, part), [sharedId], `${part} = cff ${part}`, `The ${part} part of the Circular Footprint Formula, which does not depend on A: the same for every method.`, () => 'cff').id;
}

function energyPart(ctx: CalcContext, graph: FigureGraph, line: LineFlows, materialEol: MaterialEol, factor: (id: string) => ResolvedFactor): string[] {
  const eol = materialEol.eol.value;
  const material = line.material.value;
  if (eol.energy_recovery <= 0 || !material.incineration) return [];
  const massKg = line.line.mass_kg * eol.energy_recovery;
  const eer = factor(material.incineration);
  const values = scaled(eer.values, massKg);
  const eolCell = cellTerm(ctx.cell(ctx.project.eol, materialEol.eol, 'energy_recovery'), 'R3');
  const terms: Term[] = [cellTerm(ctx.cell(ctx.project.bom, line.row, 'mass_kg'), 'M'), eolCell, eer.term('EER')];
  const energy = ctx.project.declaration.energy_recovery;
  const lhv = material.lhv_mj_per_kg;
  if (energy && lhv !== null && lhv > 0) {
    const mj = massKg * lhv;
    const elec = factor(energy.electricity_factor);
    const heat = factor(energy.heat_factor);
    const toElec = conversionTerm(graph, 'MJ', elec.unit);
    const toHeat = conversionTerm(graph, 'MJ', heat.unit);
    addScaled(values, elec.values, -mj * energy.electricity_efficiency * toElec.factor);
    addScaled(values, heat.values, -mj * energy.heat_efficiency * toHeat.factor);
    terms.push(
      cellTerm(ctx.cell(ctx.project.materials, line.material, 'lhv_mj_per_kg'), 'LHV'),
      cellTerm(ctx.declarationCell(['energy_recovery', 'electricity_efficiency']), 'X_el'),
      cellTerm(ctx.declarationCell(['energy_recovery', 'heat_efficiency']), 'X_heat'),
      ...toElec.terms,
      ...toHeat.terms,
      elec.term('E_el'),
      heat.term('E_heat'),
    );
  }
  const id = methodStep.line('cff', 'energy', line.key);
  vectorFigure(graph, id, values, 'M·R3·(EER − LHV·X_heat·E_heat − LHV·X_el·E_el)', `Energy recovery from ${line.line.component}.`, terms);
  return [id];
}

/**
 * M·(1 − R2 − R3 − reuse)·ED. Where eol.csv sends a share to incineration without
 * recovery, that share is charged at the incineration factor and the rest at ED (landfill);
 * with no such share this is the formula as published.
 */
function disposalPart(ctx: CalcContext, graph: FigureGraph, line: LineFlows, materialEol: MaterialEol, factor: (id: string) => ResolvedFactor): string {
  const eol = materialEol.eol.value;
  const material = line.material.value;
  const r2 = eol.recycling * eol.recycling_yield;
  const landfillShare = 1 - r2 - eol.energy_recovery - eol.reuse - eol.incineration;
  const values = zeros(ctx.length);
  const eolCell = (column: string, symbol: string) => cellTerm(ctx.cell(ctx.project.eol, materialEol.eol, column), symbol);
  const terms: Term[] = [cellTerm(ctx.cell(ctx.project.bom, line.row, 'mass_kg'), 'M'), eolCell('recycling', 'recycling'), eolCell('recycling_yield', 'yield'), eolCell('energy_recovery', 'R3'), eolCell('reuse', 'reuse')];
  if (landfillShare > 1e-12) {
    if (material.landfill) {
      const ed = factor(material.landfill);
      addScaled(values, ed.values, line.line.mass_kg * landfillShare);
      terms.push(ed.term('ED'));
    } else {
      // Validation asks for the factor; should it be absent the part is incomplete, never zero.
      values.fill(Number.NaN);
    }
  }
  if (eol.incineration > 0) {
    const inc = factor(material.incineration!);
    addScaled(values, inc.values, line.line.mass_kg * eol.incineration);
    terms.push(eolCell('incineration', 'incineration'), inc.term('E_inc'));
  }
  const id = methodStep.line('cff', 'disposal', line.key);
  vectorFigure(graph, id, values, 'M·[(1 − R2 − R3 − reuse − incineration)·ED + incineration·E_inc]', `Disposal of ${line.line.component} at end of life.`, terms);
  return id;
}
