import { CO2_PER_C } from '../reference/constants.ts';
import { cellTerm, figureTerm, type Driver, type FigureGraph, type Term } from '../trace/graph.ts';
import { cutoffStep } from '../trace/ids.ts';
import { conversionTerm, type CalcContext, type ResolvedFactor } from './context.ts';
import { byMaterial, type Inventory, type MaterialEol } from './inventory.ts';
import { bomMass, co2PerCStep, useFactor, vectorFigure } from './nodes.ts';
import { addScaled, scaled, zeros } from './vector.ts';

/** The built-in factor the release of biogenic carbon is charged with (GWP-biogenic +1 per kg CO2). */
export const BIOGENIC_CO2 = 'ghg:CO2-biogenic';

export interface PackagingEndOfLife {
  /** The packaging by material, with the end-of-life row of the product's scenario. */
  materials: MaterialEol[];
  /** A5 figures: transport, processing, energy recovery, disposal and biogenic carbon released, per material. */
  a5: string[];
  /** Module D figures: the energy its energy recovery exports, replacing the declared substituted energy. */
  d: string[];
}

/**
 * The packaging's end of life, in A5 (EN 15804+A2: the waste processing of the packaging
 * is part of installation). Each packaging material follows the product's end-of-life
 * scenario for that material (its own row, else `*`), cut-off as in C2–C4: transport to
 * waste processing, processing of the share recycled up to the end of waste, incineration
 * with energy recovery, and disposal. The biogenic carbon the packaging took up in A1–A3
 * leaves the system here, whatever its route: M_pack·c·44/12 kg of biogenic CO2 (the
 * −1/+1 rule), so the treatment factors of such materials must not count it again (a
 * check warns where they do). The energy exported by its energy recovery is credited in D.
 */
export function packagingEndOfLife(ctx: CalcContext, graph: FigureGraph, inv: Inventory, factor: (id: string) => ResolvedFactor): PackagingEndOfLife {
  const materials = byMaterial(ctx, graph, inv.product, inv.packagingLines, 'M_pack');
  const a5: string[] = [];
  const d: string[] = [];
  for (const waste of materials) {
    const eol = waste.eol.value;
    const material = waste.material.value;
    const eolCell = (column: string) => cellTerm(ctx.cell(ctx.project.eol, waste.eol, column), column);
    const materialCell = (column: string, symbol: string) => cellTerm(ctx.cell(ctx.project.materials, waste.material, column), symbol);
    const massTerm = figureTerm(waste.ids.mass, 'M_pack');
    const drivers = [waste.lines.map((l) => bomMass(l, l.line.mass_kg / waste.massKg))];
    const charge = (id: string, factorId: string, amount: number, formula: string, description: string, terms: Term[]) => {
      const resolved = factor(factorId);
      useFactor(graph, id, factorId, amount, drivers);
      vectorFigure(graph, id, scaled(resolved.values, amount), formula, description, terms);
      a5.push(id);
    };
    if (eol.transport_km > 0 && eol.transport_factor) {
      const tonnes = conversionTerm(graph, 'kg', 't');
      const transport = factor(eol.transport_factor);
      charge(cutoffStep.packaging('transport', waste.materialId), eol.transport_factor, waste.massKg * tonnes.factor * eol.transport_km, 'M_pack/1000·km·F_tkm', `Transport of the ${waste.materialId} packaging waste to waste processing.`, [massTerm, ...tonnes.terms, eolCell('transport_km'), transport.term('F_tkm')]);
    }
    if (eol.recycling > 0 && eol.processing_factor) {
      const processing = factor(eol.processing_factor);
      charge(cutoffStep.packaging('processing', waste.materialId), eol.processing_factor, waste.massKg * eol.recycling, 'M_pack·recycling·F_proc', `Waste processing of the ${waste.materialId} packaging sent to recycling, up to the end-of-waste state.`, [massTerm, eolCell('recycling'), processing.term('F_proc')]);
    }
    if (eol.energy_recovery > 0 && material.incineration) {
      const incineration = factor(material.incineration);
      charge(cutoffStep.packaging('energy-recovery', waste.materialId), material.incineration, waste.massKg * eol.energy_recovery, 'M_pack·energy_recovery·E_inc', `Incineration of the ${waste.materialId} packaging with energy recovery (benefits in D).`, [massTerm, eolCell('energy_recovery'), incineration.term('E_inc')]);
    }
    const disposal: Term[] = [];
    const values = zeros(ctx.length);
    const disposalId = cutoffStep.packaging('disposal', waste.materialId);
    for (const [route, column, symbol] of [['landfill', material.landfill, 'ED'], ['incineration', material.incineration, 'E_inc']] as const) {
      const share = eol[route];
      if (!(share > 0) || !column) continue;
      const resolved = factor(column);
      addScaled(values, resolved.values, waste.massKg * share);
      useFactor(graph, disposalId, column, waste.massKg * share, drivers);
      disposal.push(eolCell(route), resolved.term(symbol));
    }
    if (disposal.length > 0) {
      vectorFigure(graph, disposalId, values, 'M_pack·(landfill·ED + incineration·E_inc)', `Disposal of the ${waste.materialId} packaging waste.`, [massTerm, ...disposal]);
      a5.push(disposalId);
    }
    const carbon = material.biogenic_c_kg_per_kg;
    if (carbon !== null && carbon > 0) {
      const gas = factor(BIOGENIC_CO2);
      charge(cutoffStep.packaging('biogenic-carbon', waste.materialId), BIOGENIC_CO2, waste.massKg * carbon * CO2_PER_C, 'M_pack·c·44/12·GWP(CO2, biogenic)', `The biogenic carbon of the ${waste.materialId} packaging, taken up in A1–A3, leaves the system as CO2 (EN 15804+A2, −1/+1).`, [
        massTerm,
        materialCell('biogenic_c_kg_per_kg', 'c'),
        figureTerm(co2PerCStep(graph), '44/12'),
        gas.term('GWP'),
      ]);
    }
    const exported = exportedEnergyCredit(ctx, graph, cutoffStep.packagingEnergy(waste.materialId), waste, 'M_pack', `the ${waste.materialId} packaging`, factor, drivers);
    if (exported) d.push(exported);
  }
  return { materials, a5, d };
}

/**
 * Module D: the electricity and heat that incinerating a material with energy recovery
 * exports, −M·energy_recovery·LHV·(η_el·E_el + η_heat·E_heat), replacing the substituted
 * energy declaration.json names. For the product's materials at end of life (M_eol) and for
 * its packaging (M_pack); none where the material has no heating value or the declaration no
 * energy_recovery.
 */
export function exportedEnergyCredit(ctx: CalcContext, graph: FigureGraph, id: string, waste: MaterialEol, symbol: 'M_eol' | 'M_pack', what: string, factor: (id: string) => ResolvedFactor, drivers: Driver[][]): string | undefined {
  const energy = ctx.project.declaration.energy_recovery;
  const lhv = waste.material.value.lhv_mj_per_kg;
  const eol = waste.eol.value;
  if (!(eol.energy_recovery > 0) || lhv === null || !(lhv > 0) || !energy) return undefined;
  const mj = waste.massKg * eol.energy_recovery * lhv;
  const elec = factor(energy.electricity_factor);
  const heat = factor(energy.heat_factor);
  const toElec = conversionTerm(graph, 'MJ', elec.unit);
  const toHeat = conversionTerm(graph, 'MJ', heat.unit);
  const values = scaled(elec.values, -mj * energy.electricity_efficiency * toElec.factor);
  addScaled(values, heat.values, -mj * energy.heat_efficiency * toHeat.factor);
  useFactor(graph, id, energy.electricity_factor, -mj * energy.electricity_efficiency * toElec.factor, drivers);
  useFactor(graph, id, energy.heat_factor, -mj * energy.heat_efficiency * toHeat.factor, drivers);
  const declarationCell = (column: string) => cellTerm(ctx.declarationCell(['energy_recovery', column]), column);
  vectorFigure(graph, id, values, `−${symbol}·energy_recovery·LHV·(η_el·E_el + η_heat·E_heat)`, `Electricity and heat exported from incinerating ${what}, replacing the declared substituted energy.`, [
    figureTerm(waste.ids.mass, symbol),
    cellTerm(ctx.cell(ctx.project.eol, waste.eol, 'energy_recovery'), 'energy_recovery'),
    cellTerm(ctx.cell(ctx.project.materials, waste.material, 'lhv_mj_per_kg'), 'LHV'),
    declarationCell('electricity_efficiency'),
    declarationCell('heat_efficiency'),
    ...toElec.terms,
    ...toHeat.terms,
    elec.term('E_el'),
    heat.term('E_heat'),
  ]);
  return id;
}
