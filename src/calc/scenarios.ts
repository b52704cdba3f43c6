import { cellTerm, figureTerm, type FigureGraph, type Term } from '../trace/graph.ts';
import { inventoryStep, scenarioStep, type ScenarioQuantity } from '../trace/ids.ts';
import type { CalcContext } from './context.ts';
import type { MaterialEol } from './inventory.ts';

/**
 * The scenario information EN 15804+A2 asks for beside C1–C4 (and A5 for the packaging):
 * per material, the kg collected separately and with mixed waste, for re-use, recycling and
 * energy recovery, incinerated and landfilled, each a figure of the end-of-life mass times
 * a share of its eol.csv row. Beside D: the net secondary material of each material and the
 * production it substitutes (figures of module D, src/calc/cutoff.ts).
 */
export interface EndOfLifeScenario {
  material: string;
  /** Where its end of life is declared: the product's C1–C4, or A5 for the packaging. */
  stage: 'C1-C4' | 'A5';
  eol: MaterialEol;
  /** The figure id of each quantity (kg), the mass included; a route the scenario gives no share is 0 and has none. */
  ids: Partial<Record<ScenarioQuantity, string>>;
}

export interface ModuleDScenario {
  material: string;
  ids: { out: string; in: string; net: string };
  /** The factor whose production the net output replaces (materials.csv substituted, else virgin), and Q_out. */
  substituted: string;
  qOut: number;
}

export interface ScenariosResult {
  endOfLife: EndOfLifeScenario[];
  moduleD: ModuleDScenario[];
}

const SHARES: ReadonlyArray<[Exclude<ScenarioQuantity, 'mass' | 'separately' | 'mixed'>, 'reuse' | 'recycling' | 'energy_recovery' | 'incineration' | 'landfill', string]> = [
  ['reuse', 'reuse', 'for re-use'],
  ['recycling', 'recycling', 'for recycling'],
  ['energy-recovery', 'energy_recovery', 'for energy recovery'],
  ['incineration', 'incineration', 'incinerated without energy recovery'],
  ['landfill', 'landfill', 'to final deposition in landfill'],
];

function endOfLife(ctx: CalcContext, graph: FigureGraph, waste: MaterialEol, stage: EndOfLifeScenario['stage']): EndOfLifeScenario {
  const eolTable = ctx.project.eol;
  const eol = waste.eol.value;
  const symbol = stage === 'A5' ? 'M_pack' : 'M_eol';
  const massTerm = figureTerm(waste.ids.mass, symbol);
  const id = (quantity: ScenarioQuantity) => scenarioStep(stage, waste.materialId, quantity);
  const scalar = (quantity: ScenarioQuantity, value: number, formula: string, description: string, terms: Term[]) => {
    graph.add({ kind: 'scalar', id: id(quantity), value, unit: 'kg', formula, description, terms });
    return id(quantity);
  };
  const what = stage === 'A5' ? `${waste.materialId} packaging` : `${waste.materialId} at end of life`;
  const ids: Partial<Record<ScenarioQuantity, string>> = { mass: waste.ids.mass };
  for (const [quantity, column, words] of SHARES) {
    // A route with no share is 0 kg, read from its empty or zero cell: no figure of its own.
    if (!(eol[column] > 0)) continue;
    ids[quantity] = scalar(quantity, waste.massKg * eol[column], `${symbol}·${column}`, `Kilograms of ${what} ${words}.`, [massTerm, cellTerm(ctx.cell(eolTable, waste.eol, column), column)]);
  }
  // Collected separately: as written, else what is re-used and recycled.
  const written = eol.separate_collection;
  const separateShare = written ?? eol.reuse + eol.recycling;
  const shareTerms = written !== undefined ? [cellTerm(ctx.cell(eolTable, waste.eol, 'separate_collection'), 'separate_collection')] : [cellTerm(ctx.cell(eolTable, waste.eol, 'reuse'), 'reuse'), cellTerm(ctx.cell(eolTable, waste.eol, 'recycling'), 'recycling')];
  if (separateShare > 0) ids.separately = scalar('separately', waste.massKg * separateShare, written !== undefined ? `${symbol}·separate_collection` : `${symbol}·(reuse + recycling)`, `Kilograms of ${what} collected separately${written === undefined ? ' (eol.csv gives no separate_collection: what is re-used and recycled)' : ''}.`, [massTerm, ...shareTerms]);
  if (separateShare < 1) ids.mixed = scalar('mixed', waste.massKg * (1 - separateShare), `${symbol} − collected separately`, `Kilograms of ${what} collected with mixed waste.`, [massTerm, ...(ids.separately ? [figureTerm(ids.separately, 'separately')] : [])]);
  return { material: waste.materialId, stage, eol: waste, ids };
}

/** The scenario figures of a product: its materials' end of life (C1–C4), its packaging's (A5, where declared), and module D's net flows. */
export function scenarios(ctx: CalcContext, graph: FigureGraph, materials: readonly MaterialEol[], packaging: readonly MaterialEol[] | undefined): ScenariosResult {
  const endOfLifeRows = [...materials.map((m) => endOfLife(ctx, graph, m, 'C1-C4')), ...(packaging ?? []).map((m) => endOfLife(ctx, graph, m, 'A5'))];
  const moduleD = materials.map((m): ModuleDScenario => {
    const material = m.material.value;
    return {
      material: m.materialId,
      ids: { out: inventoryStep.material(m.materialId, 'M_MR_out'), in: inventoryStep.material(m.materialId, 'M_MR_in'), net: inventoryStep.material(m.materialId, 'M_MR_net') },
      substituted: material.substituted ?? material.virgin,
      qOut: material.q_out,
    };
  });
  return { endOfLife: endOfLifeRows, moduleD };
}
