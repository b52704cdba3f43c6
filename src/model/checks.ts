import type { Problem, ProblemCode, Severity } from '../problems.ts';
import { locate } from '../load/json.ts';
import { findGas, GHG_FACTOR_IDS, GHG_PREFIX } from '../reference/ghg.ts';
import { parameterSpec, PROCESS_PREFIX } from '../schema/process-parameters.ts';
import { findIndicator } from '../reference/indicators.ts';
import { nearestName } from '../reference/nearest.ts';
import { convertible, dimensionOf, unitsOf, type Dimension } from '../reference/units.ts';
import { cellProblem, type Row, type Table } from '../schema/table.ts';
import { chosenMethods } from '../schema/declaration.ts';
import { indicatorValue, type BomLine, type EolRow, type FactorRow, type Material, type Product, type Project } from './types.ts';

/**
 * Rules that need more than one row or file: duplicate ids, references across files,
 * the BOM against the declared unit, end-of-life coverage, factors a use requires, unit
 * compatibility and factor completeness. Each rule reports at the cell a user must edit.
 */
/** The tables, and the declaration when it parsed. */
export type CheckInput = Omit<Project, 'declaration' | 'declarationFile'> & Partial<Pick<Project, 'declaration' | 'declarationFile'>>;

export function crossFileChecks(project: CheckInput): Problem[] {
  const problems: Problem[] = [];
  const ctx = new CheckContext(project, problems);
  duplicateKeys(ctx);
  references(ctx);
  productRules(ctx);
  factorRequirements(ctx);
  unitRules(ctx);
  factorCompleteness(ctx);
  gwpConsistency(ctx);
  energyRecoveryRules(ctx);
  provenanceWarnings(ctx);
  declarationRules(ctx);
  return problems;
}

type AnyTable = Table<unknown>;

class CheckContext {
  constructor(
    readonly project: CheckInput,
    readonly problems: Problem[],
  ) {}

  at(table: AnyTable, line: number, raw: Record<string, string>, column: string, severity: Severity, code: ProblemCode, message: string, extra: Partial<Problem> = {}): void {
    this.problems.push(cellProblem(table, { line, raw }, column, severity, code, message, extra));
  }

  /** Ids written in a table's column, valid rows or not, so one bad cell elsewhere in a row does not make references to it dangle. */
  ids(table: AnyTable, column: string): Set<string> {
    return new Set(table.written.map((row) => (row.raw[column] ?? '').trim()).filter((id) => id !== ''));
  }

  factor(id: string | undefined): Row<FactorRow> | undefined {
    return id === undefined ? undefined : this.factorIndex().get(id);
  }

  private factorsById: Map<string, Row<FactorRow>> | undefined;
  factorIndex(): Map<string, Row<FactorRow>> {
    this.factorsById ??= new Map(this.project.factors.rows.map((row) => [row.value.factor_id, row]));
    return this.factorsById;
  }

  private scenarioRows: Map<string, Map<string, Row<EolRow>>> | undefined;
  private productsById: Map<string, Row<Product>> | undefined;

  /** The end-of-life row that applies to a BOM line: its product's scenario, its material's row, else `*`. */
  eolRowOf(line: BomLine): Row<EolRow> | undefined {
    if (!this.scenarioRows) {
      this.scenarioRows = new Map();
      for (const row of this.project.eol.rows) {
        if (!this.scenarioRows.has(row.value.scenario)) this.scenarioRows.set(row.value.scenario, new Map());
        this.scenarioRows.get(row.value.scenario)!.set(row.value.material, row);
      }
    }
    this.productsById ??= new Map(this.project.products.rows.map((row) => [row.value.product_id, row]));
    const product = this.productsById.get(line.product_id);
    const scenario = product && this.scenarioRows.get(product.value.eol_scenario);
    return scenario?.get(line.material) ?? scenario?.get('*');
  }

  private materialsById: Map<string, Row<Material>> | undefined;
  material(id: string): Row<Material> | undefined {
    this.materialsById ??= new Map(this.project.materials.rows.map((row) => [row.value.material, row]));
    return this.materialsById.get(id);
  }
}

function duplicateKeys(ctx: CheckContext): void {
  const p = ctx.project;
  const rules: Array<{ table: AnyTable; key: string[]; severity: Severity; what: string }> = [
    { table: p.products, key: ['product_id'], severity: 'error', what: 'product_id' },
    { table: p.bom, key: ['product_id', 'line_id'], severity: 'error', what: 'line_id within its product' },
    { table: p.materials, key: ['material'], severity: 'error', what: 'material' },
    { table: p.eol, key: ['scenario', 'material'], severity: 'error', what: 'scenario and material' },
    { table: p.factors, key: ['factor_id'], severity: 'error', what: 'factor_id' },
    // Repeated activities and legs are legal but usually a double count.
    { table: p.activities, key: ['product_id', 'module', 'activity'], severity: 'warning', what: 'product, module and activity' },
    { table: p.transport, key: ['product_id', 'module', 'line_id', 'leg'], severity: 'warning', what: 'product, module, line and leg' },
    { table: p.site, key: ['site_id', 'period', 'module', 'activity'], severity: 'warning', what: 'site, period, module and activity' },
    { table: p.production, key: ['site_id', 'period', 'product_id'], severity: 'error', what: 'site, period and product' },
    { table: p.familyRows, key: ['family_id', 'product_id'], severity: 'error', what: 'family and product' },
  ];
  for (const rule of rules) {
    const seen = new Map<string, number>();
    for (const row of rule.table.written) {
      const parts = rule.key.map((column) => (row.raw[column] ?? '').trim());
      if (parts[0] === '' || (rule.key.length > 1 && parts[rule.key.length - 1] === '' && rule.table !== p.transport)) continue;
      const key = parts.join('\u0000');
      const first = seen.get(key);
      if (first === undefined) {
        seen.set(key, row.line);
        continue;
      }
      const column = rule.key[rule.key.length - 1]!;
      ctx.at(rule.table, row.line, row.raw, column, rule.severity, 'DUPLICATE_ID', `repeats the ${rule.what} of line ${first}`, { expected: `a ${rule.what} not used before`, hint: `first defined on line ${first}` });
    }
  }
}

function references(ctx: CheckContext): void {
  const p = ctx.project;
  const productIds = ctx.ids(p.products, 'product_id');
  const materialIds = ctx.ids(p.materials, 'material');
  const scenarios = ctx.ids(p.eol, 'scenario');
  const factorIds = ctx.ids(p.factors, 'factor_id');

  const check = (table: AnyTable, row: { line: number; raw: Record<string, string> }, column: string, value: string | undefined, known: Set<string>, target: string, extraKnown: readonly string[] = []) => {
    if (value === undefined || known.has(value) || extraKnown.includes(value)) return;
    const near = nearestName(value, [...known, ...extraKnown]);
    ctx.at(table, row.line, row.raw, column, 'error', 'UNKNOWN_REFERENCE', `is not a ${target}`, {
      expected: `an existing ${target}`,
      ...(near ? { hint: `did you mean "${near}"?` } : {}),
    });
  };

  for (const row of p.products.rows) check(p.products, row, 'eol_scenario', row.value.eol_scenario, scenarios, 'scenario in eol.csv');
  for (const row of p.bom.rows) {
    check(p.bom, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
    check(p.bom, row, 'material', row.value.material, materialIds, 'material in materials.csv');
  }
  // A process of process.csv stands for a factor per kg of its metal, wherever a factor id is accepted.
  const processFactors = [...new Set(p.process.rows.map((row) => `${PROCESS_PREFIX}${row.value.process_id}`))];
  for (const row of p.materials.rows) {
    for (const column of ['virgin', 'recycled', 'eol_recycling', 'substituted', 'landfill', 'incineration'] as const) {
      check(p.materials, row, column, row.value[column], factorIds, 'factor_id in factors.csv', processFactors);
    }
  }
  // The factor-id parameters of process.csv name rows of factors.csv.
  for (const row of p.process.rows) {
    const type = parameterSpec(row.value.kind, row.value.parameter)?.type;
    if (type === 'factor') check(p.process, row, 'value', row.value.value, factorIds, 'factor_id in factors.csv');
    // A reagent is named by its factor id: reagent:<factor_id>.
    if (row.value.parameter.startsWith('reagent:')) check(p.process, row, 'parameter', row.value.parameter.slice('reagent:'.length), factorIds, 'factor_id in factors.csv');
  }
  for (const row of p.eol.rows) {
    if (row.value.material !== '*') check(p.eol, row, 'material', row.value.material, materialIds, 'material in materials.csv (or *)');
    check(p.eol, row, 'transport_factor', row.value.transport_factor, factorIds, 'factor_id in factors.csv');
    check(p.eol, row, 'processing_factor', row.value.processing_factor, factorIds, 'factor_id in factors.csv');
  }
  // Activities and site rows name their factor the same way.
  const factorColumn = (table: AnyTable, row: { line: number; raw: Record<string, string> }, factor: string) => {
    if (factor.startsWith(GHG_PREFIX)) {
      if (!findGas(factor)) {
        const near = nearestName(factor, GHG_FACTOR_IDS);
        ctx.at(table, row.line, row.raw, 'factor', 'error', 'UNKNOWN_REFERENCE', 'is not a built-in greenhouse gas', {
          expected: `one of ${GHG_FACTOR_IDS.join(', ')}`,
          ...(near ? { hint: `did you mean "${near}"?` } : {}),
        });
      }
    } else {
      check(table, row, 'factor', factor, factorIds, 'factor_id in factors.csv', processFactors);
    }
  };
  for (const row of p.activities.rows) {
    check(p.activities, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
    factorColumn(p.activities, row, row.value.factor);
  }
  for (const row of p.site.rows) factorColumn(p.site, row, row.value.factor);
  for (const row of p.production.rows) check(p.production, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
  for (const row of p.familyRows.rows) check(p.familyRows, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
  const linesByProduct = new Map<string, Set<string>>();
  for (const row of p.bom.written) {
    const product = (row.raw.product_id ?? '').trim();
    const line = (row.raw.line_id ?? '').trim();
    if (!linesByProduct.has(product)) linesByProduct.set(product, new Set());
    if (line) linesByProduct.get(product)!.add(line);
  }
  for (const row of p.transport.rows) {
    check(p.transport, row, 'product_id', row.value.product_id, productIds, 'product_id in products.csv');
    check(p.transport, row, 'factor', row.value.factor, factorIds, 'factor_id in factors.csv');
    if (row.value.line_id !== undefined && productIds.has(row.value.product_id)) {
      check(p.transport, row, 'line_id', row.value.line_id, linesByProduct.get(row.value.product_id) ?? new Set(), `line_id of product ${row.value.product_id} in bom.csv`);
    }
  }
}

/** EN 15804+A2 declares per declared unit: the BOM must add up to it. */
const UNIT_MASS_TOLERANCE = 0.01;

function productRules(ctx: CheckContext): void {
  const p = ctx.project;
  const writtenLines = new Map<string, number>();
  for (const row of p.bom.written) {
    const product = (row.raw.product_id ?? '').trim();
    writtenLines.set(product, (writtenLines.get(product) ?? 0) + 1);
  }
  const validLines = new Map<string, typeof p.bom.rows>();
  for (const row of p.bom.rows) {
    const list = validLines.get(row.value.product_id) ?? [];
    list.push(row);
    validLines.set(row.value.product_id, list);
  }
  const scenarioMaterials = new Map<string, Set<string>>();
  for (const row of p.eol.written) {
    const scenario = (row.raw.scenario ?? '').trim();
    if (!scenarioMaterials.has(scenario)) scenarioMaterials.set(scenario, new Set());
    scenarioMaterials.get(scenario)!.add((row.raw.material ?? '').trim());
  }

  for (const productRow of p.products.rows) {
    const product = productRow.value;
    const lines = validLines.get(product.product_id) ?? [];
    const complete = lines.length === (writtenLines.get(product.product_id) ?? 0);
    const productLines = lines.filter((line) => line.value.role === 'product');
    if (complete && productLines.length === 0) {
      ctx.at(p.products, productRow.line, productRow.raw, 'product_id', 'error', 'NO_BOM_LINES', 'has no product-role lines in bom.csv', { expected: 'at least one bom.csv line with role product' });
      continue;
    }
    if (complete) {
      const sum = productLines.reduce((total, line) => total + line.value.mass_kg, 0);
      const deviation = Math.abs(sum - product.unit_mass_kg) / product.unit_mass_kg;
      if (deviation > UNIT_MASS_TOLERANCE) {
        ctx.at(p.products, productRow.line, productRow.raw, 'unit_mass_kg', 'error', 'UNIT_MASS_MISMATCH',
          `differs from the sum of its product-role BOM masses, ${formatKg(sum)} kg (bom.csv lines ${productLines.map((l) => l.line).join(', ')}), by ${(deviation * 100).toFixed(1)} %`,
          { expected: `within 1 % of ${formatKg(sum)} kg` });
      }
    }
    const covered = scenarioMaterials.get(product.eol_scenario);
    if (covered && !covered.has('*')) {
      const missing = [...new Set(productLines.map((line) => line.value.material))].filter((material) => !covered.has(material));
      for (const material of missing) {
        ctx.at(p.products, productRow.line, productRow.raw, 'eol_scenario', 'error', 'EOL_SCENARIO_GAP', `has no eol.csv row for material ${material} and no * row`, { expected: `an eol.csv row with scenario ${product.eol_scenario} and material ${material} or *` });
      }
    }
  }
}

const formatKg = (kg: number) => String(Math.round(kg * 1e6) / 1e6);

/** A material used in a way that needs a factor its row leaves empty. */
function factorRequirements(ctx: CheckContext): void {
  const p = ctx.project;
  const reported = new Set<string>();
  const need = (materialId: string, column: keyof Material, because: string) => {
    const material = ctx.material(materialId);
    if (!material || material.value[column] !== undefined || (column === 'substituted')) return;
    const key = `${materialId}\u0000${String(column)}`;
    if (reported.has(key)) return;
    reported.add(key);
    ctx.at(p.materials, material.line, material.raw, String(column), 'error', 'FACTOR_REQUIRED', `is empty, but ${because}`, { expected: 'a factor_id in factors.csv' });
  };
  const methods = chosenMethods(p.declaration);
  const cffReported = methods.some((method) => method !== 'cutoff');
  for (const line of p.bom.rows) {
    const where = `bom.csv line ${line.line}`;
    const b = line.value;
    if (b.recycled_pre + b.recycled_post > 0) need(b.material, 'recycled', `${where} has recycled content`);
    if (b.role === 'product' && b.recycled_pre + b.recycled_post > 0) need(b.material, 'eol_recycling', `${where} has recycled content, whose net flow module D charges or credits (EN 15804+A2 Annex D)`);
    if (b.scrap_rate > 0 && b.scrap_fate === 'landfill') need(b.material, 'landfill', `${where} sends its process scrap to landfill`);
    if (b.scrap_rate > 0 && b.scrap_fate === 'incineration') need(b.material, 'incineration', `${where} sends its process scrap to incineration`);
    if (b.scrap_rate > 0 && b.scrap_fate === 'recycled') need(b.material, 'eol_recycling', `${where} sends process scrap to recycling (module D)`);
    if (b.role !== 'product') continue;
    const eolRow = ctx.eolRowOf(b);
    if (!eolRow) continue;
    const route = `eol.csv line ${eolRow.line} sends it`;
    if (eolRow.value.recycling > 0) need(b.material, 'eol_recycling', `${route} to recycling (module D)`);
    if (eolRow.value.landfill > 0) need(b.material, 'landfill', `${route} to landfill`);
    if (eolRow.value.incineration > 0) need(b.material, 'incineration', `${route} to incineration`);
    if (eolRow.value.energy_recovery > 0) need(b.material, 'incineration', `${route} to incineration with energy recovery (C3; EER in the CFF)`);
    if (cffReported && eolRow.value.recycling > 0 && eolRow.value.recycling_yield < 1) need(b.material, 'landfill', `${route} to recycling with a yield below 1, and the Circular Footprint Formula disposes of the losses (1 − R2 − R3)`);
  }
}

function unitRules(ctx: CheckContext): void {
  const p = ctx.project;
  const perUnitOf = (table: AnyTable, row: { line: number; raw: Record<string, string> }, column: string, factorId: string | undefined, dimension: Dimension, what: string) => {
    const factor = ctx.factor(factorId);
    if (!factor) return;
    if (dimensionOf(factor.value.unit) !== dimension) {
      ctx.at(table, row.line, row.raw, column, 'error', 'UNIT_MISMATCH', `names factor ${factorId} (factors.csv line ${factor.line}), which is per ${factor.value.unit}; ${what} needs a factor per ${unitsOf(dimension).join(' or ')}`, {
        expected: `a factor per ${unitsOf(dimension).join(' or ')}`,
      });
    }
  };
  for (const row of p.materials.rows) {
    for (const column of ['virgin', 'recycled', 'eol_recycling', 'substituted', 'landfill', 'incineration'] as const) {
      perUnitOf(p.materials, row, column, row.value[column], 'mass', 'a material');
    }
  }
  for (const row of p.eol.rows) {
    perUnitOf(p.eol, row, 'transport_factor', row.value.transport_factor, 'transport', 'C2 transport');
    perUnitOf(p.eol, row, 'processing_factor', row.value.processing_factor, 'mass', 'waste processing');
  }
  for (const row of p.transport.rows) perUnitOf(p.transport, row, 'factor', row.value.factor, 'transport', 'a transport leg');
  // A process's electricity is in kWh, its materials in t or kg.
  for (const row of p.process.rows) {
    if (parameterSpec(row.value.kind, row.value.parameter)?.type !== 'factor') continue;
    perUnitOf(p.process, row, 'value', row.value.value, row.value.parameter === 'electricity_factor' ? 'energy' : 'mass', `${row.value.parameter} of a process`);
  }
  for (const table of [p.activities, p.site] as Array<Table<{ factor: string; unit: string }>>) {
    for (const row of table.rows) {
      const { factor: factorId, unit } = row.value;
      if (factorId.startsWith(GHG_PREFIX)) {
        if (findGas(factorId) && dimensionOf(unit) !== 'mass') {
          ctx.at(table, row.line, row.raw, 'unit', 'error', 'UNIT_MISMATCH', `is not a mass; ${factorId} is characterised per kg of gas emitted`, { expected: 'a mass unit: g, kg or t' });
        }
        continue;
      }
      if (factorId.startsWith(PROCESS_PREFIX)) {
        if (dimensionOf(unit) !== 'mass') ctx.at(table, row.line, row.raw, 'unit', 'error', 'UNIT_MISMATCH', `is not a mass; ${factorId} is a factor per kg of the metal the process makes`, { expected: 'a mass unit: g, kg or t' });
        continue;
      }
      const factor = ctx.factor(factorId);
      if (factor && !convertible(unit, factor.value.unit)) {
        ctx.at(table, row.line, row.raw, 'unit', 'error', 'UNIT_MISMATCH', `cannot be converted to ${factor.value.unit}, the unit of factor ${factorId} (factors.csv line ${factor.line})`, {
          expected: `a unit of ${dimensionOf(factor.value.unit) ?? factor.value.unit}: ${unitsOf(dimensionOf(factor.value.unit) ?? 'mass').join(', ')}`,
        });
      }
    }
  }
}

/** Factor ids the project uses, with the first place each is used. */
function usedFactors(ctx: CheckContext): Map<string, string> {
  const p = ctx.project;
  const used = new Map<string, string>();
  const use = (id: string | undefined, where: string) => {
    if (id !== undefined && !used.has(id)) used.set(id, where);
  };
  const materialIds = new Set(p.bom.rows.map((row) => row.value.material));
  for (const row of p.materials.rows) {
    if (!materialIds.has(row.value.material)) continue;
    for (const column of ['virgin', 'recycled', 'eol_recycling', 'substituted', 'landfill', 'incineration'] as const) use(row.value[column], `materials.csv line ${row.line}`);
  }
  for (const row of p.eol.rows) {
    use(row.value.transport_factor, `eol.csv line ${row.line}`);
    use(row.value.processing_factor, `eol.csv line ${row.line}`);
  }
  for (const row of p.activities.rows) use(row.value.factor, `activities.csv line ${row.line}`);
  for (const row of p.site.rows) use(row.value.factor, `site.csv line ${row.line}`);
  for (const row of p.transport.rows) use(row.value.factor, `transport.csv line ${row.line}`);
  for (const row of p.process.rows) if (parameterSpec(row.value.kind, row.value.parameter)?.type === 'factor') use(row.value.value, `process.csv line ${row.line}`);
  return used;
}

function factorCompleteness(ctx: CheckContext): void {
  const p = ctx.project;
  const present = new Set(p.factorIndicators);
  const asked = p.indicators.filter((code) => findIndicator(code)?.basis === 'factors');
  const requested = p.declaration?.indicators;
  if (requested && p.declarationFile) {
    for (const code of asked) {
      if (present.has(code)) continue;
      const where = locate(p.declarationFile, ['indicators', requested.indexOf(code)]);
      ctx.problems.push({
        severity: 'warning', code: 'INDICATOR_NO_DATA', file: p.declarationFile.file, line: where.line, column: 'indicators', columnIndex: where.column, value: code,
        message: `is asked for, but factors.csv has no ${code} column; every ${code} figure will be incomplete`,
        expected: `a ${code} column in factors.csv`,
      });
    }
  }
  // The method comparison can only show indicators the declaration computes from factors.
  const compared = p.declaration?.report.compare_indicators ?? [];
  if (p.declarationFile) {
    compared.forEach((code, index) => {
      if (asked.includes(code)) return;
      const where = locate(p.declarationFile!, ['report', 'compare_indicators', index]);
      ctx.problems.push({
        severity: 'warning', code: 'INDICATOR_NO_DATA', file: p.declarationFile!.file, line: where.line, column: 'report.compare_indicators', columnIndex: where.column, value: code,
        message: `is asked for in the method comparison, but the declaration does not report ${code} from factors.csv; the comparison leaves it out`,
        expected: `an indicator reported from factors.csv (${asked.slice(0, 3).join(', ')}, …)`,
      });
    });
  }
  const used = usedFactors(ctx);
  for (const row of p.factors.rows) {
    const where = used.get(row.value.factor_id);
    if (!where) continue;
    const missing = asked.filter((code) => present.has(code) && indicatorValue(row.value, code) === null);
    if (missing.length === 0) continue;
    const first = missing[0]!;
    ctx.at(p.factors, row.line, row.raw, first, 'warning', 'FACTOR_VALUE_MISSING',
      `factor ${row.value.factor_id} (used by ${where}) has no value for ${missing.join(', ')}; figures using it will be marked incomplete`,
      { value: row.raw[first] ?? '', expected: 'a number (an empty cell means "not available", never 0)' });
  }
}

/** EN 15804+A2: GWP-total = GWP-fossil + GWP-biogenic + GWP-luluc; rounding within 0.1 % is tolerated. */
function gwpConsistency(ctx: CheckContext): void {
  const p = ctx.project;
  const parts = ['GWP-fossil', 'GWP-biogenic', 'GWP-luluc'];
  if (!['GWP-total', ...parts].every((code) => p.factorIndicators.includes(code))) return;
  for (const row of p.factors.rows) {
    const total = indicatorValue(row.value, 'GWP-total');
    const values = parts.map((code) => indicatorValue(row.value, code));
    if (total === null || values.some((v) => v === null)) continue;
    const sum = (values as number[]).reduce((a, b) => a + b, 0);
    if (Math.abs(total - sum) > 1e-3 * Math.max(Math.abs(total), Math.abs(sum)) + 1e-12) {
      ctx.at(p.factors, row.line, row.raw, 'GWP-total', 'warning', 'GWP_SUM_MISMATCH', `is not GWP-fossil + GWP-biogenic + GWP-luluc = ${Number(sum.toPrecision(6))} for factor ${row.value.factor_id}`, {
        expected: `${Number(sum.toPrecision(6))} (within 0.1 %)`,
      });
    }
  }
}

/** Energy recovery needs the declaration's efficiencies and substituted energy whenever a product material is burnt with recovery and has a heating value. */
function energyRecoveryRules(ctx: CheckContext): void {
  const p = ctx.project;
  if (!p.declaration || !p.declarationFile) return;
  const energy = p.declaration.energy_recovery;
  const file = p.declarationFile;
  if (energy) {
    for (const column of ['electricity_factor', 'heat_factor'] as const) {
      const id = energy[column];
      const where = locate(file, ['energy_recovery', column]);
      const factor = ctx.factor(id);
      const base = { file: file.file, line: where.line, column: `energy_recovery.${column}`, columnIndex: where.column, value: id };
      if (!factor) {
        const near = nearestName(id, [...ctx.ids(p.factors, 'factor_id')]);
        ctx.problems.push({ ...base, severity: 'error', code: 'UNKNOWN_REFERENCE', message: 'is not a factor_id in factors.csv', expected: 'an existing factor_id in factors.csv', ...(near ? { hint: `did you mean "${near}"?` } : {}) });
      } else if (dimensionOf(factor.value.unit) !== 'energy') {
        ctx.problems.push({ ...base, severity: 'error', code: 'UNIT_MISMATCH', message: `names factor ${id} (factors.csv line ${factor.line}), which is per ${factor.value.unit}; substituted energy needs a factor per unit of energy`, expected: `a factor per ${unitsOf('energy').join(' or ')}` });
      }
    }
    return;
  }
  for (const line of p.bom.rows) {
    if (line.value.role !== 'product') continue;
    const material = ctx.material(line.value.material);
    if (!material) continue;
    const eolRow = ctx.eolRowOf(line.value);
    const lhv = material.value.lhv_mj_per_kg;
    if (eolRow && eolRow.value.energy_recovery > 0 && lhv !== null && lhv > 0) {
      ctx.problems.push({
        severity: 'error', code: 'VALUE_REQUIRED', file: file.file, line: 1, column: 'energy_recovery', columnIndex: 1,
        message: `is missing, but eol.csv line ${eolRow.line} sends ${line.value.material} (LHV ${lhv} MJ/kg, bom.csv line ${line.line}) to energy recovery`,
        expected: 'energy_recovery: { electricity_efficiency, heat_efficiency, electricity_factor, heat_factor }',
      });
      return;
    }
  }
}

function provenanceWarnings(ctx: CheckContext): void {
  const p = ctx.project;
  for (const table of [p.bom, p.activities, p.transport, p.site, p.production, p.familyRows] as AnyTable[]) {
    for (const row of table.rows as Array<Row<{ source?: string }>>) {
      if (row.value.source === undefined) {
        ctx.at(table, row.line, row.raw, 'source', 'warning', 'SOURCE_MISSING', 'is empty: a verifier will ask where this figure comes from', { value: row.raw.source ?? '', expected: 'a document, meter or supplier declaration' });
      }
    }
  }
  for (const row of p.materials.rows) {
    if ((row.value.family === 'wood' || row.value.family === 'paper') && row.value.biogenic_c_kg_per_kg === null) {
      ctx.at(p.materials, row.line, row.raw, 'biogenic_c_kg_per_kg', 'warning', 'BIOGENIC_CARBON_MISSING', `is empty for a ${row.value.family} material; EN 15804+A2 declares the biogenic carbon content of product and packaging`, {
        value: row.raw.biogenic_c_kg_per_kg ?? '', expected: 'kg C per kg (wood: 0.5 of dry mass, EN 16449)',
      });
    }
  }
}

function declarationRules(ctx: CheckContext): void {
  const { declaration, declarationFile } = ctx.project;
  if (!declaration || !declarationFile) return;
  const issued = new Date(`${declaration.issued}T00:00:00Z`);
  const limit = new Date(Date.UTC(issued.getUTCFullYear() + 5, issued.getUTCMonth(), issued.getUTCDate()));
  if (new Date(`${declaration.valid_until}T00:00:00Z`) > limit) {
    const where = locate(declarationFile, ['valid_until']);
    ctx.problems.push({
      severity: 'warning', code: 'VALIDITY_LONG', file: declarationFile.file, line: where.line, column: 'valid_until', columnIndex: where.column, value: declaration.valid_until,
      message: `is more than five years after issued (${declaration.issued}); EN 15804 and ISO 14025 practice is five years`,
      expected: `at most ${limit.toISOString().slice(0, 10)}`,
    });
  }
}
