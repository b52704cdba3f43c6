import type { Project, Material, EolRow, FactorRow } from '../model/types.ts';
import type { SupplierFactor } from '../model/supplier-datasets.ts';
import { indicatorValue } from '../model/types.ts';
import type { Row, Table } from '../schema/table.ts';
import { findGas, GWP_SOURCES, type GwpSet } from '../reference/ghg.ts';
import { conversionFactor } from '../reference/units.ts';
import { jsonPath } from '../load/json.ts';
import { cellTerm, factorTerm, figureTerm, type CellRef, type FactorRef, type FigureGraph, type Term } from '../trace/graph.ts';
import { flowFactor } from '../process/run.ts';
import { processReference } from '../process/references.ts';
import { PROCESS_PREFIX } from '../schema/process-kinds.ts';
import { processStep, referenceStep, supplierStep } from '../trace/ids.ts';
import type { Vec } from './vector.ts';
import { eolRowFor } from '../model/lookups.ts';

/** A factor resolved to an indicator vector, per one unit of `unit`. */
export interface ResolvedFactor {
  id: string;
  unit: string;
  values: Vec;
  /** How the factor appears among a figure's terms. */
  term: (symbol: string) => Term;
  /** Reference figures the term needs in the product's graph (GWP values). */
  ensure: (graph: FigureGraph) => void;
}

/**
 * What every product's calculation shares: the indicator order, factor vectors (resolved
 * once per project), material and scenario lookups. Pure: built from the validated
 * project, no I/O.
 */
export class CalcContext {
  /** Factor-based indicator codes computed, in reporting order. */
  readonly indicators: string[];
  /** Flow indicators reported (SM, CRU, MFR, MER), from the product's mass flows. */
  readonly flowIndicators: string[];
  readonly gwpSet: GwpSet;
  private readonly factors = new Map<string, ResolvedFactor>();

  constructor(readonly project: Project) {
    this.indicators = project.indicators.filter((code) => project.indicatorSet.find(code)?.basis === 'factors');
    this.flowIndicators = project.indicators.filter((code) => project.indicatorSet.find(code)?.basis === 'flows');
    this.gwpSet = project.declaration.gwp_set;
  }

  get length(): number {
    return this.indicators.length;
  }

  material(id: string): Row<Material> {
    const row = this.project.lookups.materials.get(id);
    if (!row) throw new Error(`material ${id} not in the validated project`);
    return row;
  }

  /** The scenario row for a material: its own, else `*` (validation guarantees one). */
  eolRow(scenario: string, material: string): Row<EolRow> {
    const row = eolRowFor(this.project.lookups, scenario, material);
    if (!row) throw new Error(`no eol.csv row for ${scenario}/${material}`);
    return row;
  }

  factor(id: string): ResolvedFactor {
    let resolved = this.factors.get(id);
    if (!resolved) {
      resolved = findGas(id) ? this.gasFactor(id) : id.startsWith(PROCESS_PREFIX) ? this.processFactor(id) : this.tableFactor(id);
      this.factors.set(id, resolved);
    }
    return resolved;
  }

  /** A factors.csv row by id (validation guarantees every id the project uses). */
  factorRow(id: string): Row<FactorRow> {
    const row = this.project.lookups.factors.get(id);
    if (!row) throw new Error(`factor ${id} not in the validated project`);
    return row;
  }

  private tableFactor(id: string): ResolvedFactor {
    const row = this.project.lookups.factors.get(id);
    if (!row) throw new Error(`factor ${id} not in the validated project`);
    const values: Vec = this.indicators.map((code) => indicatorValue(row.value, code) ?? Number.NaN);
    const supplier = this.project.suppliers.get(id);
    if (supplier) return this.supplierFactor(row, supplier, values);
    const ref = { file: this.project.factors.file, line: row.line, factorId: id, raw: row.raw };
    // Terms are immutable and shared by every figure that uses the factor under the same symbol.
    const terms = new Map<string, Term>();
    const term = (symbol: string) => {
      let cached = terms.get(symbol);
      if (!cached) terms.set(symbol, (cached = factorTerm(ref, symbol)));
      return cached;
    };
    return { id, unit: row.value.unit, values, term, ensure: () => undefined };
  }

  /**
   * A factor read from a supplier's ILCD+EPD dataset: F = V · k, V the supplier's declared
   * A1-A3 per declared unit (each indicator's element of the dataset), k the declared units per
   * unit of the factors.csv row (from the dataset's reference amount and mass).
   */
  private supplierFactor(row: Row<FactorRow>, supplier: SupplierFactor, values: Vec): ResolvedFactor {
    const id = supplier.factorId;
    const nodeId = supplierStep.factor(id);
    const kId = supplierStep.conversion(id);
    const project = this.project;
    const indicators = this.indicators;
    const ensure = (graph: FigureGraph) => {
      if (graph.get(nodeId)) return;
      const dataset = supplier.dataset;
      const elements: NonNullable<FactorRef['elements']> = {};
      for (const code of indicators) {
        const read = supplier.values.get(code);
        if (read?.amount) elements[code] = { line: read.amount.line, column: read.amount.column, module: read.parts ? 'A1+A2+A3' : read.amount.module, value: read.parts ? read.parts.map((p) => p.text).join(' + ') : read.amount.text };
      }
      const first = Object.values(elements).sort((a, b) => a.line - b.line)[0];
      const ref: FactorRef = { file: dataset.file, line: first?.line ?? 1, factorId: id, raw: {}, elements };
      graph.add({
        kind: 'scalar',
        id: kId,
        value: supplier.perUnit,
        unit: `declared units per ${row.value.unit}`,
        formula: `k = ${supplier.perUnit}`,
        description: `Declared units of the supplier’s dataset per ${row.value.unit} of factor ${id}: ${supplier.conversion.text}.`,
        terms: [
          cellTerm({ file: project.factors.file, line: row.line, column: 'supplier_dataset', value: row.raw.supplier_dataset ?? '' }, 'dataset'),
          cellTerm({ file: project.factors.file, line: row.line, column: 'unit', value: row.raw.unit ?? '' }, 'unit'),
          ...supplier.conversion.elements.map((element) => cellTerm({ file: element.file, line: element.line, column: element.what, value: element.value }, element.what)),
        ],
      });
      graph.add({
        kind: 'vector',
        id: nodeId,
        values,
        formula: 'F = V(A1-A3) · k',
        description: `Factor ${id} per ${row.value.unit} from the supplier’s own declaration ${supplier.file} (“${dataset.name}”, EN 15804+A2): its declared A1-A3 per declared unit (module C and D of the supplier’s product are not used), times k. Specific data.`,
        terms: [factorTerm(ref, 'V'), figureTerm(kId, 'k')],
      });
    };
    return { id, unit: row.value.unit, values, term: (symbol) => figureTerm(nodeId, symbol), ensure };
  }

  /**
   * A built-in greenhouse gas, per kg emitted: its GWP-100 goes to GWP-total and to
   * GWP-fossil (GWP-biogenic for non-fossil methane); it adds nothing to the other
   * indicators (a choice documented in DEVELOPERS.md).
   */
  private gasFactor(id: string): ResolvedFactor {
    const gas = findGas(id)!;
    const gwp = gas[this.gwpSet];
    const part = gas.id === 'CH4-nonfossil' || gas.id === 'CO2-biogenic' ? 'GWP-biogenic' : 'GWP-fossil';
    const values: Vec = this.indicators.map((code) => (code === 'GWP-total' || code === part ? gwp : 0));
    const referenceId = referenceStep.gwp(this.gwpSet, gas.id);
    return {
      id,
      unit: 'kg',
      values,
      term: (symbol) => figureTerm(referenceId, symbol),
      ensure: (graph) => {
        if (graph.get(referenceId)) return;
        graph.add({
          kind: 'scalar', id: referenceId, value: gwp, unit: 'kg CO2 eq. per kg',
          formula: `GWP-100(${gas.id}) = ${gwp}`,
          description: `Global warming potential over 100 years of ${gas.name}, ${GWP_SOURCES[this.gwpSet]}; counted in GWP-total and ${part}.`,
          terms: [],
        });
      },
    };
  }

  /**
   * A process of process.csv as a factor per kg of its metal: its calculator's steps become
   * scalar figures whose terms are the process.csv cells and reference values, and the
   * factor is Σ flows (amount per t / 1000 kg) · the flow's factor, over every indicator.
   */
  private processFactor(id: string): ResolvedFactor {
    const processId = id.slice(PROCESS_PREFIX.length);
    const definition = this.project.lookups.processes.get(processId);
    if (!definition) throw new Error(`process ${processId} not in the validated project`);
    const { result } = definition;
    const flows = result.inventory.map((flow) => {
      const factorId = flowFactor(definition, flow.flow).factor!;
      const factor = this.factor(factorId);
      // Per kg of metal: the flow per tonne over 1000 kg, in the factor's unit.
      const perKg = (flow.amount / 1000) * conversionFactor(flow.unit, factor.unit);
      return { flow, factor, perKg };
    });
    const values: Vec = this.indicators.map((_, i) => flows.reduce((sum, f) => sum + f.perKg * f.factor.values[i]!, 0));
    const factorNodeId = processStep.factor(processId);
    const project = this.project;
    const ensure = (graph: FigureGraph) => {
      if (graph.get(factorNodeId)) return;
      for (const step of result.steps) {
        const terms: Term[] = step.inputs.map((input) => {
          if (input.startsWith('param:')) {
            const name = input.slice('param:'.length);
            const row = definition.rows.get(name);
            if (!row) throw new Error(`process ${processId}: no row for ${name}`);
            return cellTerm({ file: project.process.file, line: row.line, column: 'value', value: row.raw.value ?? '' }, name);
          }
          if (input.startsWith('ref:')) {
            const name = input.slice('ref:'.length);
            const refId = referenceStep.process(processId, name);
            if (!graph.get(refId)) {
              const ref = processReference(name, definition);
              if (!ref) throw new Error(`process ${processId}: no reference value ${name}`);
              graph.add({ kind: 'scalar', id: refId, value: ref.value, unit: ref.unit, formula: `${name} = ${ref.value}`, description: ref.description, terms: [] });
            }
            return figureTerm(refId, name);
          }
          return figureTerm(processStep.step(processId, input), input);
        });
        graph.add({ kind: 'scalar', id: processStep.step(processId, step.id), value: step.value, unit: step.unit, formula: step.formula, description: step.description, terms });
      }
      const terms: Term[] = [];
      for (const { flow, factor } of flows) {
        factor.ensure(graph);
        terms.push(figureTerm(processStep.step(processId, flow.step), flow.flow), factor.term(`F(${flow.flow})`));
      }
      graph.add({
        kind: 'vector',
        id: factorNodeId,
        values,
        formula: 'F = Σ flows (amount per t / 1000 kg)·F(flow)',
        description: `Factor per kg of ${definition.kind === 'electrolysis-aluminium' ? 'aluminium' : definition.values.metal} from the operating data of process ${processId} (${definition.kind})${result.notes.length ? `; ${result.notes.map((note) => note.replace(/\.$/, '')).join('; ')}` : ''}.`,
        terms,
      });
    };
    return { id, unit: 'kg', values, term: (symbol) => figureTerm(factorNodeId, symbol), ensure };
  }

  /**
   * What one kg of a process's metal takes of each factor its flows name (kWh of
   * electricity, kg of alumina, kg of CO2 as ghg:CO2): the process factor is Σ perKg × F.
   */
  processFlows(id: string): Array<{ factor: string; perKg: number }> {
    const definition = this.project.lookups.processes.get(id.slice(PROCESS_PREFIX.length));
    if (!definition) throw new Error(`process ${id} not in the validated project`);
    return definition.result.inventory.map((flow) => {
      const factorId = flowFactor(definition, flow.flow).factor!;
      return { factor: factorId, perKg: (flow.amount / 1000) * conversionFactor(flow.unit, this.factor(factorId).unit) };
    });
  }

  private readonly netRecycling = new Map<string, Vec>();

  /**
   * Per kg of recycled output: E_MR,after EoW − E_VMSub·Q_out (EN 15804+A2 Annex D), the
   * same bracket as ErecEoL − E*v·Qsout/Qp of the CFF. Computed once per material.
   */
  netRecyclingPerKg(materialRow: Row<Material>): Vec {
    const material = materialRow.value;
    let values = this.netRecycling.get(material.material);
    if (!values) {
      const recycling = this.factor(material.eol_recycling!).values;
      const substituted = this.factor(material.substituted ?? material.virgin).values;
      values = recycling.map((value, i) => value - substituted[i]! * material.q_out);
      this.netRecycling.set(material.material, values);
    }
    return values;
  }

  /** A value of declaration.json as a cell: its line, its JSON path, its text. */
  declarationCell(path: (string | number)[]): CellRef {
    const column = jsonPath(path);
    return this.project.declarationCells.get(column) ?? { file: this.project.declarationFile.file, line: 1, column, value: '' };
  }

  /** A cell of a validated row, as written. */
  cell<T>(table: Table<T>, row: Row<T>, column: string): CellRef {
    return { file: table.file, line: row.line, column, value: row.raw[column] ?? '' };
  }
}

/**
 * A unit conversion as a reference figure, so that a kWh → MJ step is visible in the
 * trail. Returns the factor and the term (none when the units are the same).
 */
export function conversionTerm(graph: FigureGraph, from: string, to: string): { factor: number; terms: Term[] } {
  const factor = conversionFactor(from, to);
  if (factor === 1) return { factor, terms: [] };
  const id = referenceStep.unit(from, to);
  if (!graph.get(id)) {
    graph.add({ kind: 'scalar', id, value: factor, unit: `${to} per ${from}`, formula: `1 ${from} = ${factor} ${to}`, description: 'Unit conversion (SI Brochure, 9th ed.).', terms: [] });
  }
  return { factor, terms: [figureTerm(id, `${from}→${to}`)] };
}
