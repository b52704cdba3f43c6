/**
 * Figure ids, spelled in one place. A *step id* names one calculation step of a product's
 * figure graph (`cutoff/A1`, `inventory/line:L1/G`). A *figure id* names one number: a
 * scalar step's id, or a vector step's id followed by `/<indicator code>`
 * (`cutoff/A1/GWP-total`, `cutoff/A1/line:L3/AP`), which is that step's value for that
 * indicator. calc makes every step id with the constructors below; report, render, diff,
 * the CSV writers and the tests take ids from the graph or from here, never by hand.
 */

/** The results.json method keys whose values are figures `<method>/<module or part>/<indicator>`. */
export type ResultMethod = 'cutoff' | 'cff' | 'eol-recycling' | 'fifty-fifty';
export type CffPart = 'material' | 'energy' | 'disposal';
export type LineFlow = 'G' | 'R1' | 'scrap';
export type PackagingPart = 'transport' | 'processing' | 'energy-recovery' | 'disposal' | 'biogenic-carbon';
export type MaterialFlow = 'M_eol' | 'M_MR_out' | 'M_MR_in' | 'M_MR_net' | 'M_pack';

/** A BOM line within a product's steps: `line:<line_id>`, or `packaging:<line_id>` for packaging. */
export const lineKey = (role: string, lineId: string): string => `${role === 'packaging' ? 'packaging' : 'line'}:${lineId}`;

export const inventoryStep = {
  line: (key: string, flow: LineFlow) => `inventory/${key}/${flow}`,
  material: (material: string, flow: MaterialFlow) => `inventory/material:${material}/${flow}`,
  product: (flow: 'G' | 'M') => `inventory/product/${flow}`,
};

/** Cut-off (A1–C4) and module D. `module` is a module code, `A1-A3` or `total`. */
export const cutoffStep = {
  module: (module: string) => `cutoff/${module}`,
  /** A flow indicator (SM, CRU, MFR, MER) of a module or the total: a scalar step. */
  flow: (module: string, code: string) => `cutoff/${module}/${code}`,
  line: (module: string, key: string) => `cutoff/${module}/${key}`,
  activity: (module: string, line: number) => `cutoff/${module}/activity:${line}`,
  transport: (module: string, line: number) => `cutoff/${module}/transport:${line}`,
  site: (module: string, line: number) => `cutoff/${module}/site:${line}`,
  scrapDisposal: (lineId: string) => `cutoff/A3/scrap:${lineId}`,
  /** End of life of one material: C2 transport, C3 processing, C4 disposal, D net recycling. */
  material: (module: 'C2' | 'C3' | 'C4' | 'D', material: string) => `cutoff/${module}/material:${material}`,
  energyRecovery: (material: string) => `cutoff/C3/energy-recovery:${material}`,
  exportedEnergy: (material: string) => `cutoff/D/energy:${material}`,
  /** The end of life of the packaging of one material, in A5 (transport, processing, energy recovery, disposal, biogenic carbon released). */
  packaging: (part: PackagingPart, material: string) => `cutoff/A5/packaging-${part}:${material}`,
  packagingEnergy: (material: string) => `cutoff/D/packaging-energy:${material}`,
  /** Sub-totals the other methods reuse. */
  part: (module: 'A3' | 'C3', part: 'activities' | 'scrap-disposal' | 'processing' | 'energy-recovery') => `cutoff/${module}/${part}`,
};

/** The Circular Footprint Formula and its presets (0:100, 50:50). */
export const methodStep = {
  part: (method: string, part: CffPart) => `${method}/${part}`,
  line: (method: string, part: CffPart, key: string) => `${method}/${part}/${key}`,
  total: (method: string) => `${method}/total`,
};

/** The step behind a results.json map: `methods.<method>.modules|parts.<key>` or `.total`. */
export const resultStep = (method: ResultMethod, key: string): string => `${method}/${key}`;

/** The step behind a results.json product flow: `flows.<group>.<key>`. */
export const flowResultStep = (group: 'recycled_content' | 'biogenic_carbon_kg' | 'biogenic_co2_kg', key: string): string => `flows/${group}/${key}`;

export const flowStep = {
  recycledContent: (part: 'pre' | 'post' | 'total') => flowResultStep('recycled_content', part),
  biogenicCarbon: (of: 'product' | 'packaging') => flowResultStep('biogenic_carbon_kg', of),
  biogenicCo2: (of: 'product' | 'packaging') => flowResultStep('biogenic_co2_kg', of),
};

/** A factor read from a supplier's ILCD+EPD dataset: its values, and the conversion from the supplier's declared unit. */
export const supplierStep = {
  factor: (factorId: string) => `supplier/${factorId}`,
  conversion: (factorId: string) => `supplier/${factorId}/k`,
};

export const referenceStep = {
  gwp: (set: string, gas: string) => `reference/gwp/${set}/${gas}`,
  unit: (from: string, to: string) => `reference/unit/${from}->${to}`,
  co2PerC: 'reference/molar/CO2-per-C',
  methodA: (method: string) => `reference/method/${method}/A`,
  defaultA: (family: 'metal' | 'other') => `reference/method/cff/default-A/${family}`,
  process: (processId: string, name: string) => `reference/process/${processId}/${name}`,
};

export const processStep = {
  step: (processId: string, name: string) => `process/${processId}/${name}`,
  factor: (processId: string) => `process/${processId}/factor`,
};

/** A process model's step read back (`process/<id>/<name>` → id and name); undefined for any other step. */
export function processStepOf(step: string): { processId: string; name: string } | undefined {
  const [group, processId, ...name] = step.split('/');
  return group === 'process' && processId !== undefined && name.length > 0 ? { processId, name: name.join('/') } : undefined;
}

/** Site rows shared among products (ISO 14044 §4.3.4): the key, Σ keys and share of one site, period and key. */
export const allocationStep = (site: string, period: string, key: string, part: 'key' | 'total' | 'share') => `allocation/${site}/${period}/${key}/${part}`;
/** The quantities of a material's end-of-life scenario (EN 15804+A2 scenario information), in kg. */
export type ScenarioQuantity = 'mass' | 'separately' | 'mixed' | 'reuse' | 'recycling' | 'energy-recovery' | 'incineration' | 'landfill';
export const scenarioStep = (stage: 'C1-C4' | 'A5', material: string, quantity: ScenarioQuantity) => `scenario/${stage}/material:${material}/${quantity}`;

/** A product's output summed over the parallel plants that each make the whole of it. */
export const plantsOutputStep = (productId: string) => `allocation/parallel-plants:${productId}/output`;

/** A figure id: a step, or a vector step's value for one indicator. */
export const figureId = (step: string, indicator?: string): string => (indicator === undefined ? step : `${step}/${indicator}`);

export interface FigureAddress {
  step: string;
  /** The indicator, for a vector step's value. */
  indicator?: string;
}

/**
 * Reads a figure id against the steps of a graph: an id that is a step names that step
 * (scalar steps, and flow indicators such as `cutoff/A1/SM`, are steps of their own);
 * otherwise its last segment is an indicator of the vector step before it.
 */
export function parseFigureId(id: string, isVectorStep: (step: string) => boolean, isStep: (step: string) => boolean, indicators: readonly string[]): FigureAddress | undefined {
  if (isStep(id)) return { step: id };
  const slash = id.lastIndexOf('/');
  if (slash <= 0) return undefined;
  const step = id.slice(0, slash);
  const indicator = id.slice(slash + 1);
  return isVectorStep(step) && indicators.includes(indicator) ? { step, indicator } : undefined;
}

/** What a step belongs to: `cutoff`, `inventory`, `cff`, `reference`, … */
export const stepGroup = (step: string): string => step.slice(0, step.indexOf('/') >>> 0);

/** The module of a cut-off step (`cutoff/A3/activity:5` → `A3`). */
export const cutoffModuleOf = (step: string): string => step.split('/')[1]!;

/** The last segment of a step id: how a sum names its parts (`cutoff/A1/line:L1` → `line:L1`). */
export const lastSegment = (step: string): string => step.slice(step.lastIndexOf('/') + 1);
