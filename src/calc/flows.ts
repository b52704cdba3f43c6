import { cellTerm, figureTerm, type FigureGraph, type Term } from '../trace/graph.ts';
import { cutoffStep, flowStep, inventoryStep } from '../trace/ids.ts';
import type { CalcContext } from './context.ts';
import type { Inventory, MaterialEol } from './inventory.ts';

import { CO2_PER_C } from '../reference/constants.ts';
import { co2PerCStep } from './nodes.ts';

export interface FlowsResult {
  /** Module → flow indicator code → figure id. */
  moduleFlows: Record<string, Record<string, string>>;
  /** Flow indicator code → figure id of its sum over the modules in the total (A1…C4). */
  totalFlows: Record<string, string>;
  recycledContent: { pre: string; post: string; total: string };
  biogenicCarbon: { product: string; packaging: string; productCo2: string; packagingCo2: string };
}

type FlowCode = 'SM' | 'CRU' | 'MFR' | 'MER' | 'EEE' | 'EET';

/** Material flows are in kg; exported energy in MJ. */
const FLOW_UNITS: Record<FlowCode, string> = { SM: 'kg', CRU: 'kg', MFR: 'kg', MER: 'kg', EEE: 'MJ', EET: 'MJ' };

/**
 * EN 15804+A2 output and input flow indicators from the product's own flows: SM secondary
 * material input, CRU components for re-use, MFR materials for recycling, MER materials
 * for energy recovery (kg), and EEE, EET the electrical and thermal energy its own energy
 * recovery exports (MJ: mass × share to energy recovery × heating value × the declared net
 * efficiency). Every module gets a figure for each, zero where no such flow arises, so a
 * reported 0 is a computed 0.
 */
export function flows(ctx: CalcContext, graph: FigureGraph, inv: Inventory, modules: readonly string[], totalModules: readonly string[], packagingWaste?: readonly MaterialEol[]): FlowsResult {
  const eol = ctx.project.eol;
  const scalar = (id: string, value: number, unit: string, formula: string, description: string, terms: Term[]) => {
    graph.add({ kind: 'scalar', id, value, unit, formula, description, terms });
    return id;
  };
  const sum = (parts: Array<{ value: number; terms: Term[] }>) => ({ value: parts.reduce((t, p) => t + p.value, 0), terms: parts.flatMap((p) => p.terms) });
  const secondary = (lines: typeof inv.lines) => sum(lines.map((l) => ({ value: l.grossKg * l.r1, terms: [figureTerm(l.ids.gross, `G(${l.line.line_id})`), figureTerm(l.ids.r1, `R1(${l.line.line_id})`)] })));
  const perMaterial = (column: 'recycling' | 'energy_recovery' | 'reuse', materials: readonly MaterialEol[] = inv.materials, symbol = 'M_eol') =>
    sum(materials.map((m) => ({ value: m.massKg * m.eol.value[column], terms: [figureTerm(m.ids.mass, `${symbol}(${m.materialId})`), cellTerm(ctx.cell(eol, m.eol, column), column)] })));
  // Exported energy: only where module D credits it (a heating value, and energy_recovery in declaration.json).
  const recovery = ctx.project.declaration.energy_recovery;
  const exported = (efficiency: 'electricity_efficiency' | 'heat_efficiency', materials: readonly MaterialEol[] = inv.materials, symbol = 'M_eol') =>
    sum(
      materials
        .filter((m) => recovery && m.eol.value.energy_recovery > 0 && (m.material.value.lhv_mj_per_kg ?? 0) > 0)
        .map((m) => ({
          value: m.massKg * m.eol.value.energy_recovery * m.material.value.lhv_mj_per_kg! * recovery![efficiency],
          terms: [
            figureTerm(m.ids.mass, `${symbol}(${m.materialId})`),
            cellTerm(ctx.cell(eol, m.eol, 'energy_recovery'), `energy_recovery(${m.materialId})`),
            cellTerm(ctx.cell(ctx.project.materials, m.material, 'lhv_mj_per_kg'), `LHV(${m.materialId})`),
            cellTerm(ctx.declarationCell(['energy_recovery', efficiency]), efficiency === 'electricity_efficiency' ? 'η_el' : 'η_heat'),
          ],
        })),
    );
  const scrapToRecycling = sum(inv.lines.filter((l) => l.line.scrap_fate === 'recycled' && l.scrapKg > 0).map((l) => ({ value: l.scrapKg, terms: [figureTerm(l.ids.scrap, `scrap(${l.line.line_id})`)] })));

  const defined: Partial<Record<string, Partial<Record<FlowCode, { value: number; terms: Term[]; formula: string; description: string }>>>> = {
    // The product's secondary input is module D's M_MR,in, summed over its materials.
    A1: { SM: { ...sum(inv.materials.map((m) => ({ value: graph.scalar(inventoryStep.material(m.materialId, 'M_MR_in')).value, terms: [figureTerm(inventoryStep.material(m.materialId, 'M_MR_in'), `M_MR,in(${m.materialId})`)] }))), formula: 'SM = Σ materials M_MR,in', description: 'Secondary material in the product’s inputs.' } },
    A3: {
      SM: { ...secondary(inv.packagingLines), formula: 'SM = Σ packaging lines G·R1', description: 'Secondary material in the packaging.' },
      MFR: { ...scrapToRecycling, formula: 'MFR = Σ process scrap sent to recycling', description: 'Process scrap leaving manufacturing for recycling.' },
    },
    ...(packagingWaste
      ? {
          A5: {
            MFR: { ...perMaterial('recycling', packagingWaste, 'M_pack'), formula: 'MFR = Σ M_pack·recycling', description: 'Packaging waste sent to recycling.' },
            MER: { ...perMaterial('energy_recovery', packagingWaste, 'M_pack'), formula: 'MER = Σ M_pack·energy_recovery', description: 'Packaging waste sent to energy recovery.' },
            CRU: { ...perMaterial('reuse', packagingWaste, 'M_pack'), formula: 'CRU = Σ M_pack·reuse', description: 'Packaging for re-use.' },
            EEE: { ...exported('electricity_efficiency', packagingWaste, 'M_pack'), formula: 'EEE = Σ M_pack·energy_recovery·LHV·η_el', description: 'Electrical energy exported by the energy recovery of the packaging waste.' },
            EET: { ...exported('heat_efficiency', packagingWaste, 'M_pack'), formula: 'EET = Σ M_pack·energy_recovery·LHV·η_heat', description: 'Thermal energy exported by the energy recovery of the packaging waste.' },
          },
        }
      : {}),
    C3: {
      MFR: { ...perMaterial('recycling'), formula: 'MFR = Σ M_eol·recycling', description: 'End-of-life material sent to recycling.' },
      MER: { ...perMaterial('energy_recovery'), formula: 'MER = Σ M_eol·energy_recovery', description: 'End-of-life material sent to energy recovery.' },
      CRU: { ...perMaterial('reuse'), formula: 'CRU = Σ M_eol·reuse', description: 'End-of-life components for re-use.' },
      EEE: { ...exported('electricity_efficiency'), formula: 'EEE = Σ M_eol·energy_recovery·LHV·η_el', description: 'Electrical energy exported by the energy recovery of the end-of-life material.' },
      EET: { ...exported('heat_efficiency'), formula: 'EET = Σ M_eol·energy_recovery·LHV·η_heat', description: 'Thermal energy exported by the energy recovery of the end-of-life material.' },
    },
  };
  const moduleFlows: FlowsResult['moduleFlows'] = {};
  const composite: Record<string, string[]> = { 'A1-A3': ['A1', 'A2', 'A3'] };
  for (const module of modules) {
    moduleFlows[module] = {};
    for (const code of ctx.flowIndicators as FlowCode[]) {
      const id = cutoffStep.flow(module, code);
      const parts = composite[module];
      if (parts) {
        const ids = parts.map((p) => moduleFlows[p]![code]!);
        scalar(id, ids.reduce((t, child) => t + graph.scalar(child).value, 0), FLOW_UNITS[code], `${code} = ${parts.join(' + ')}`, `${code} over ${module}.`, ids.map((child, i) => figureTerm(child, parts[i]!)));
      } else {
        const flow = defined[module]?.[code];
        if (flow) scalar(id, flow.value, FLOW_UNITS[code], flow.formula, flow.description, flow.terms);
        else scalar(id, 0, FLOW_UNITS[code], `${code} = 0`, `No ${code} flow arises in module ${module}.`, []);
      }
      moduleFlows[module]![code] = id;
    }
  }

  const totalFlows: Record<string, string> = {};
  for (const code of ctx.flowIndicators) {
    const ids = totalModules.map((module) => moduleFlows[module]![code]!);
    totalFlows[code] = scalar(cutoffStep.flow('total', code), ids.reduce((t, child) => t + graph.scalar(child).value, 0), FLOW_UNITS[code as FlowCode], `${code} = ${totalModules.join(' + ')}`, `${code} over the declared modules A1 to C4.`, ids.map((child, i) => figureTerm(child, totalModules[i]!)));
  }

  // Recycled content of the product, ISO 14021 terms, as shares of the product-role gross input.
  const grossTerm = figureTerm(inv.ids.gross, 'G_product');
  const share = (id: string, column: 'recycled_pre' | 'recycled_post' | null, label: string) => {
    const lines = inv.productLines;
    const value = lines.reduce((t, l) => t + l.grossKg * (column ? l.line[column] : l.r1), 0) / inv.grossKg;
    const terms = lines.flatMap((l) => [figureTerm(l.ids.gross, `G(${l.line.line_id})`), column ? cellTerm(ctx.cell(ctx.project.bom, l.row, column), `${column}(${l.line.line_id})`) : figureTerm(l.ids.r1, `R1(${l.line.line_id})`)]);
    return scalar(id, value, 'share', `Σ G·${column ?? 'R1'} / Σ G`, `${label} recycled content of the product (ISO 14021), share of its gross input.`, [...terms, grossTerm]);
  };
  const recycledContent = {
    pre: share(flowStep.recycledContent('pre'), 'recycled_pre', 'Pre-consumer'),
    post: share(flowStep.recycledContent('post'), 'recycled_post', 'Post-consumer'),
    total: share(flowStep.recycledContent('total'), null, 'Total'),
  };

  // Biogenic carbon content, kg C per declared unit, and its CO2 equivalent.
  const carbon = (id: string, lines: typeof inv.lines, what: string) => {
    let value = 0;
    const terms: Term[] = [];
    for (const lineFlows of lines) {
      const content = lineFlows.material.value.biogenic_c_kg_per_kg;
      const family = lineFlows.material.value.family;
      // Not given: zero for families without biogenic carbon, unknown (NaN) for wood and paper.
      value += lineFlows.line.mass_kg * (content ?? (family === 'wood' || family === 'paper' ? Number.NaN : 0));
      terms.push(cellTerm(ctx.cell(ctx.project.bom, lineFlows.row, 'mass_kg'), `m(${lineFlows.line.line_id})`), cellTerm(ctx.cell(ctx.project.materials, lineFlows.material, 'biogenic_c_kg_per_kg'), `c(${lineFlows.material.value.material})`));
    }
    return scalar(id, value, 'kg C', 'Σ m·c', `Biogenic carbon content of the ${what}.`, terms);
  };
  const ratioId = co2PerCStep(graph);
  const product = carbon(flowStep.biogenicCarbon('product'), inv.productLines, 'product');
  const packaging = carbon(flowStep.biogenicCarbon('packaging'), inv.packagingLines, 'packaging');
  const co2 = (id: string, of: string, what: string) => scalar(id, graph.scalar(of).value * CO2_PER_C, 'kg CO2', 'C·44/12', `Biogenic carbon of the ${what} as CO2.`, [figureTerm(of, 'C'), figureTerm(ratioId, '44/12')]);
  return {
    moduleFlows,
    totalFlows,
    recycledContent,
    biogenicCarbon: { product, packaging, productCo2: co2(flowStep.biogenicCo2('product'), product, 'product'), packagingCo2: co2(flowStep.biogenicCo2('packaging'), packaging, 'packaging') },
  };
}
