import { dataTypeOf } from '../model/rows.ts';
import { formatCounted, formatSignificant } from '../format.ts';
import { DISCLAIMERS, MANDATORY_INDICATORS } from '../reference/indicators.ts';
import { LIFE_CYCLE_MODULES } from '../reference/modules.ts';
import { cutoffStep, flowStep, inventoryStep } from '../trace/ids.ts';
import type { CalcContext } from './context.ts';
import { expandedUses } from './contributions.ts';
import { findGas } from '../reference/ghg.ts';
import type { ProductResult } from './product.ts';

/**
 * The checks a verifier makes first (ISO 14025 §8 and programme checklists; common practice
 * where no clause is given), answered per product from its figures: each with a status, the
 * figures or rows that are the evidence, and its source.
 */
export type CheckStatus = 'holds' | 'warning' | 'fails';

export interface ChecklistItem {
  id: string;
  title: string;
  status: CheckStatus;
  /** What was found, in a sentence. */
  detail: string;
  /** Figure ids (of this product's graph) that are the evidence. */
  figures: string[];
  /** Input rows that are the evidence, where no figure is (excluded.csv). */
  rows?: Array<{ file: string; line: number }>;
  source: string;
}

export interface ChecklistJson {
  items: ChecklistItem[];
}

/** The checks in the order a verifier takes them, with their sources. */
export const CHECKS: ReadonlyArray<{ id: string; title: string; source: string }> = [
  { id: 'mass-balance', title: 'Mass balance of inputs and outputs', source: 'ISO 14044 (validation of data by mass balance); common practice' },
  { id: 'gwp-sum', title: 'GWP-total = GWP-fossil + GWP-biogenic + GWP-luluc', source: 'EN 15804+A2 (the parts of GWP-total)' },
  { id: 'biogenic-balance', title: 'Biogenic carbon taken up is released within the declared modules', source: 'EN 15804+A2 (biogenic carbon, the −1/+1 rule); EN 16449' },
  { id: 'module-d-net', title: 'Module D on net flows only', source: 'EN 15804+A2 Annex D' },
  { id: 'mandatory', title: 'Mandatory modules and indicators present, undeclared ones marked', source: 'EN 15804+A2 (mandatory modules and indicators)' },
  { id: 'disclaimers', title: 'Disclaimers printed beside the indicators that need them', source: 'EN 15804+A2 (notes to the indicator tables)' },
  { id: 'data-age', title: 'Data age: specific data at most 5, generic at most 10 years older than the reference year', source: 'common practice (programme rules on data quality)' },
  { id: 'cut-off', title: 'Cut-off rule: each flow left out at most 1 %, all of a module at most 5 %', source: 'EN 15804+A2 (cut-off criteria, of the mass and of the primary energy of a unit process)' },
  { id: 'validity', title: 'Validity at most five years from issue', source: 'EN 15804+A2 / ISO 14025 practice' },
];

const MANDATORY_MODULES = ['A1', 'A2', 'A3', 'C1', 'C2', 'C3', 'C4', 'D'];

/** The checklist of one product (src/report turns it into the page and the pack's table). */
export function productChecklist(ctx: CalcContext, result: ProductResult, modules: Record<string, Record<string, number | null>>, missing: ReadonlyArray<{ indicator: string; modules: string[] | null }>): ChecklistJson {
  const { graph } = result;
  const project = ctx.project;
  const declaration = project.declaration;
  const items: ChecklistItem[] = [];
  const add = (id: string, status: CheckStatus, detail: string, figures: string[] = [], rows: Array<{ file: string; line: number }> = []) => {
    const check = CHECKS.find((c) => c.id === id)!;
    items.push({ id, title: check.title, status, detail, figures, ...(rows.length > 0 ? { rows } : {}), source: check.source });
  };

  // Mass balance: every kg of gross input leaves as product, packaging or process scrap; the product's net mass is its declared unit's.
  let gross = 0;
  let scrap = 0;
  for (const id of graph.nodes.keys()) {
    if (!/^inventory\/(line|packaging):[^/]+\/G$/.test(id)) continue;
    gross += graph.scalar(id).value;
    scrap += graph.scalar(id.replace(/\/G$/, '/scrap')).value;
  }
  const productMass = graph.scalar(inventoryStep.product('M')).value;
  const unitMass = project.lookups.products.get(result.productId)!.value.unit_mass_kg;
  const deviation = Math.abs(productMass - unitMass) / unitMass;
  add(
    'mass-balance',
    deviation <= 0.01 ? 'holds' : 'fails',
    `Gross input ${formatSignificant(gross, 6)} kg leaves as net mass ${formatSignificant(gross - scrap, 6)} kg (product and packaging) and process scrap ${formatSignificant(scrap, 6)} kg; the product’s net mass ${formatSignificant(productMass, 6)} kg is its declared unit’s ${formatSignificant(unitMass, 6)} kg (products.csv) within ${deviation <= 0.01 ? '1 %' : `${formatSignificant(deviation * 100, 3)} %, more than 1 %`}; every eol.csv row’s shares add up to 1.`,
    [inventoryStep.product('G'), inventoryStep.product('M')],
  );

  // GWP-total against its parts, module by module.
  const parts = ['GWP-fossil', 'GWP-biogenic', 'GWP-luluc'];
  if (!ctx.indicators.includes('GWP-total') || parts.some((p) => !ctx.indicators.includes(p))) {
    add('gwp-sum', 'warning', 'GWP-total or one of its parts is not reported, so the sum cannot be checked.');
  } else {
    const off = Object.entries(modules).filter(([, values]) => {
      const total = values['GWP-total'];
      if (total === null || total === undefined) return false;
      const sum = parts.reduce((s, p) => s + (values[p] ?? Number.NaN), 0);
      return !(Math.abs(total - sum) <= 1e-3 * Math.max(Math.abs(total), 1e-12));
    });
    add('gwp-sum', off.length === 0 ? 'holds' : 'fails', off.length === 0 ? `Within 0.1 % in every declared module (${Object.keys(modules).join(', ')}).` : `Differs by more than 0.1 % in ${off.map(([m]) => m).join(', ')}.`, Object.keys(modules).map((m) => cutoffStep.module(m)));
  }

  // Biogenic carbon: the packaging's is released in A5 (where declared); loopsheet does not release the product's own.
  const productC = graph.scalar(result.flows.biogenicCarbon.product).value;
  const packagingC = graph.scalar(result.flows.biogenicCarbon.packaging).value;
  const notes: string[] = [];
  let biogenic: CheckStatus = 'holds';
  if (Number.isNaN(productC) || Number.isNaN(packagingC)) {
    biogenic = 'warning';
    notes.push('a wood or paper material has no biogenic carbon content, so the balance cannot be checked');
  }
  if (productC > 0) {
    biogenic = 'warning';
    notes.push(`the product holds ${formatSignificant(productC, 3)} kg C, whose release at end of life loopsheet does not model: check C3/C4`);
  }
  if (packagingC > 0) {
    if (result.cutoff.packaging) notes.push(`the packaging’s ${formatSignificant(packagingC, 3)} kg C (${formatSignificant(graph.scalar(result.flows.biogenicCarbon.packagingCo2).value, 3)} kg CO2) taken up in A1–A3 is released in A5`);
    else {
      biogenic = 'warning';
      notes.push(`the packaging’s ${formatSignificant(packagingC, 3)} kg C is not released in any declared module: A5 is not declared`);
    }
  }
  if (notes.length === 0) notes.push('neither the product nor its packaging holds biogenic carbon');
  const releases = result.cutoff.packaging ? result.cutoff.packaging.materials.map((m) => cutoffStep.packaging('biogenic-carbon', m.materialId)).filter((id) => graph.get(id)) : [];
  add('biogenic-balance', biogenic, `${notes.join('; ')}.`.replace(/^./, (c) => c.toUpperCase()), [flowStep.biogenicCarbon('product'), flowStep.biogenicCarbon('packaging'), ...releases]);

  // Module D counts the net secondary flow of each material.
  const nets = result.scenarios.moduleD.map((d) => d.ids.net);
  add('module-d-net', 'holds', `D = Σ materials (M_MR,out − M_MR,in)·(E_MR − E_VMSub·Q_out), ${formatCounted(nets.length, 'material', 'materials')}: recycled input is netted against recycled output before any credit; D is not added to A–C.`, [...nets, cutoffStep.module('D')]);

  // Mandatory modules and indicators.
  const absentModules = MANDATORY_MODULES.filter((m) => !(m in modules));
  const undeclared = LIFE_CYCLE_MODULES.filter((m) => !(m.code in modules)).map((m) => m.code);
  const gaps = missing.filter((m) => MANDATORY_INDICATORS.includes(m.indicator));
  const mandatoryOk = absentModules.length === 0 && gaps.length === 0;
  add(
    'mandatory',
    mandatoryOk ? 'holds' : 'fails',
    `${absentModules.length === 0 ? 'A1–A3, C1–C4 and D are declared' : `${absentModules.join(', ')} not declared`}; ${gaps.length === 0 ? 'every core, resource use, waste and output indicator is reported in every declared module' : `missing: ${gaps.map((g) => (g.modules ? `${g.indicator} in ${g.modules.join(', ')}` : `${g.indicator} (not reported)`)).join('; ')}`}; ${undeclared.length > 0 ? `${undeclared.join(', ')} marked “ND” (not declared), never 0` : 'every module declared'}.`,
  );

  // Disclaimers: printed beside every reported indicator that needs one.
  const needing = DISCLAIMERS.flatMap((d) => d.codes.filter((code) => project.indicators.includes(code)));
  add('disclaimers', 'holds', needing.length === 0 ? 'No reported indicator needs a disclaimer.' : `Printed under the results tables, marked beside ${needing.join(', ')} (on the page and in the PDF).`);

  // Data age: the factors behind the figures and the product's own activities, against the reference year.
  const year = declaration.reference_year;
  const uses = expandedUses(ctx, graph, Object.keys(modules).filter((m) => m !== 'A1-A3'));
  const tooOld: string[] = [];
  const undated = new Set<string>();
  const seen = new Set<string>();
  for (const use of uses) {
    if (!seen.has(use.factor) && !findGas(use.factor)) {
      seen.add(use.factor);
      const row = ctx.factorRow(use.factor).value;
      const type = dataTypeOf(row);
      const limit = type === 'specific' ? 5 : 10;
      if (row.reference_year === null) undated.add(`factor ${use.factor}`);
      else if (year - row.reference_year > limit) tooOld.push(`factor ${use.factor} (${row.reference_year}, ${type ?? 'generic'}: ${year - row.reference_year} years)`);
    }
    for (const group of use.drivers) {
      for (const driver of group) {
        if (driver.file !== project.activities.file) continue;
        const key = `activities.csv line ${driver.line}`;
        if (seen.has(key)) continue;
        seen.add(key);
        const activity = project.lookups.byLine.activities.get(driver.line)?.value;
        if (!activity) continue;
        if (activity.reference_year === null) undated.add(key);
        else if (year - activity.reference_year > 5) tooOld.push(`${key} (${activity.reference_year}, specific: ${year - activity.reference_year} years)`);
      }
    }
  }
  add(
    'data-age',
    tooOld.length > 0 ? 'fails' : undated.size > 0 ? 'warning' : 'holds',
    tooOld.length > 0
      ? `Older than allowed for reference year ${year}: ${tooOld.join('; ')}.`
      : undated.size > 0
        ? `${formatCounted(undated.size, 'input behind the figures gives', 'inputs behind the figures give')} no reference_year (${[...undated].slice(0, 5).join(', ')}${undated.size > 5 ? ', …' : ''}), so its age cannot be checked.`
        : `Every factor and activity behind the figures is within its limit of reference year ${year} (specific 5, generic or not stated 10 years).`,
  );

  // Cut-off: the flows excluded.csv lists for this product (and for every product), against 1 % each and 5 % per module.
  const left = [...(project.lookups.excluded.get(result.productId) ?? []), ...(project.lookups.excluded.get('*') ?? [])];
  const rowsOf = left.map((row) => ({ file: project.excluded.file, line: row.line }));
  if (project.excluded.written.length === 0) {
    add('cut-off', 'warning', 'No flows are listed as left out (excluded.csv): the declaration should state the flows it leaves out under the cut-off rule, or that it leaves none out.');
  } else if (left.length === 0) {
    add('cut-off', 'holds', 'excluded.csv lists no flow left out of this product.');
  } else {
    const over: string[] = [];
    for (const row of left) {
      for (const [column, words] of [['mass_share', 'of the mass'], ['energy_share', 'of the primary energy']] as const) {
        const value = row.value[column];
        if (value !== undefined && value > 0.01) over.push(`${row.value.flow} (${row.value.module}) carries ${formatSignificant(value * 100, 3)} % ${words}`);
      }
    }
    for (const module of [...new Set(left.map((row) => row.value.module))]) {
      for (const [column, words] of [['mass_share', 'mass'], ['energy_share', 'primary energy']] as const) {
        const sum = left.filter((row) => row.value.module === module).reduce((total, row) => total + (row.value[column] ?? 0), 0);
        if (sum > 0.05) over.push(`the flows left out of ${module} carry ${formatSignificant(sum * 100, 3)} % of its ${words} together`);
      }
    }
    add('cut-off', over.length > 0 ? 'fails' : 'holds', over.length > 0 ? `${over.join('; ')} (limits: 1 % each, 5 % per module).` : `${formatCounted(left.length, 'flow is', 'flows are')} left out (excluded.csv), each within 1 % and together within 5 % per module.`, [], rowsOf);
  }

  // Validity.
  const issued = new Date(`${declaration.issued}T00:00:00Z`);
  const limit = new Date(issued);
  limit.setUTCFullYear(limit.getUTCFullYear() + 5);
  const validUntil = new Date(`${declaration.valid_until}T00:00:00Z`);
  add('validity', validUntil <= limit ? 'holds' : 'fails', `Issued ${declaration.issued}, valid until ${declaration.valid_until}${validUntil <= limit ? ': within five years' : ': more than five years'} (declaration.json).`);
  return { items };
}
