import type { Product } from '../model/rows.ts';
import { DIMENSION_PROPERTY, flowProperty, type FlowProperty } from '../reference/ilcd.ts';
import { canonicalUnit, conversionFactor, parseDeclaredUnit } from '../reference/units.ts';
import type { FamilyResults } from './families.ts';
import type { IndicatorValues, ResultsSummary } from './results.ts';

/**
 * What the ILCD+EPD export (src/report/ilcd-export.ts) reads of a product's or a family's
 * declaration: its products.csv row or families' members, its results, its end-of-life shares
 * and its verification status.
 */

/** What the export reads of one product or family declaration. */
export interface ExportedDeclaration {
  kind: 'product' | 'family';
  /** product_id or family_id. */
  id: string;
  name: string;
  description: string;
  /** As products.csv writes it ("1 m", "1 kg", "1 piece"). */
  declaredUnit: string;
  /** kg of product per declared unit (a family: the members' weighted mean). */
  unitMassKg: number;
  /** Indicators reported, in reporting order. */
  indicators: ReadonlyArray<{ code: string; unit: string; name: string }>;
  /** Cut-off results by declared module (EN 15804+A2), A1, A2, A3 and A1-A3 among them. */
  modules: Readonly<Record<string, IndicatorValues>>;
  /** kg C per declared unit; null where not available. */
  biogenicCarbonKg: { product: number | null; packaging: number | null };
  /** The end-of-life scenario of C1–C4 and D, with the shares of the product's mass per route. */
  endOfLife: EndOfLifeScenario | undefined;
  /** A family's members (ids and shares of the weighted mean). */
  members?: ReadonlyArray<{ id: string; share: number }>;
  /** Its verification: verified only by a verifier's valid record (src/model/verification-record.ts); a draft otherwise. */
  verification: { status: 'verified' | 'draft'; verifier?: string | undefined; date?: string | undefined };
}

export interface EndOfLifeScenario {
  name: string;
  /** Shares of the end-of-life mass. */
  separate: number;
  withMixedWaste: number;
  reuse: number;
  recycling: number;
  energyRecovery: number;
  incineration: number;
  landfill: number;
}

/** The shares of a product's end-of-life mass per route, from its scenario rows of C1–C4 (results.json `scenarios.end_of_life`). */
export function endOfLifeShares(name: string, rows: NonNullable<ResultsSummary['scenarios']>['end_of_life']): EndOfLifeScenario | undefined {
  const own = rows.filter((row) => row.stage === 'C1-C4');
  const mass = own.reduce((sum, row) => sum + row.mass_kg, 0);
  if (!(mass > 0)) return undefined;
  const share = (key: 'collected_separately_kg' | 'collected_with_mixed_waste_kg' | 'reuse_kg' | 'recycling_kg' | 'energy_recovery_kg' | 'incineration_kg' | 'landfill_kg') => own.reduce((sum, row) => sum + row[key], 0) / mass;
  return {
    name,
    separate: share('collected_separately_kg'),
    withMixedWaste: share('collected_with_mixed_waste_kg'),
    reuse: share('reuse_kg'),
    recycling: share('recycling_kg'),
    energyRecovery: share('energy_recovery_kg'),
    incineration: share('incineration_kg'),
    landfill: share('landfill_kg'),
  };
}

/** A product's declaration as the export reads it: its products.csv row and its results. */
export function productExport(product: Product, summary: ResultsSummary, verification: ExportedDeclaration['verification']): ExportedDeclaration {
  return {
    verification,
    kind: 'product',
    id: product.product_id,
    name: product.name,
    description: product.description ?? '',
    declaredUnit: product.declared_unit,
    unitMassKg: product.unit_mass_kg,
    indicators: summary.indicators,
    modules: summary.methods.cutoff.modules,
    biogenicCarbonKg: summary.flows.biogenic_carbon_kg,
    endOfLife: summary.scenarios ? endOfLifeShares(product.eol_scenario, summary.scenarios.end_of_life) : undefined,
  };
}

/**
 * A family's declaration as the export reads it: the family's weighted means (families/<id>/
 * results.json), and, weighted by the same shares, the members' mass per declared unit,
 * biogenic carbon and end-of-life shares (a value not available for a member leaves the
 * family's not available). The scenario is named after the members' scenarios.
 */
export function familyExport(results: FamilyResults, members: ReadonlyArray<{ product: Product; summary: ResultsSummary }>, verification: ExportedDeclaration['verification']): ExportedDeclaration {
  const byId = new Map(members.map((m) => [m.product.product_id, m]));
  const weighted = (value: (m: { product: Product; summary: ResultsSummary }) => number | null | undefined): number | null => {
    let sum = 0;
    for (const member of results.members) {
      const found = byId.get(member.product_id);
      const v = found ? value(found) : undefined;
      if (v === null || v === undefined) return null;
      sum += member.share * v;
    }
    return sum;
  };
  const modules: Record<string, IndicatorValues> = {};
  for (const [module, values] of Object.entries(results.methods.cutoff.modules)) modules[module] = Object.fromEntries(Object.entries(values).map(([code, stat]) => [code, stat.mean]));
  const scenarioNames = [...new Set(members.map((m) => m.product.eol_scenario))].sort();
  const shares = members.map((m) => ({ id: m.product.product_id, eol: m.summary.scenarios ? endOfLifeShares(m.product.eol_scenario, m.summary.scenarios.end_of_life) : undefined }));
  const eolShare = (key: keyof Omit<EndOfLifeScenario, 'name'>) => weighted((m) => shares.find((s) => s.id === m.product.product_id)?.eol?.[key]);
  const keys = ['separate', 'withMixedWaste', 'reuse', 'recycling', 'energyRecovery', 'incineration', 'landfill'] as const;
  const eolValues = Object.fromEntries(keys.map((key) => [key, eolShare(key)]));
  return {
    verification,
    kind: 'family',
    id: results.family_id,
    name: results.name,
    description: '',
    declaredUnit: results.declared_unit,
    unitMassKg: weighted((m) => m.product.unit_mass_kg) ?? NaN,
    indicators: results.indicators,
    modules,
    biogenicCarbonKg: { product: weighted((m) => m.summary.flows.biogenic_carbon_kg.product), packaging: weighted((m) => m.summary.flows.biogenic_carbon_kg.packaging) },
    endOfLife: keys.every((key) => eolValues[key] !== null) ? ({ name: scenarioNames.join(' + '), ...eolValues } as EndOfLifeScenario) : undefined,
    members: results.members.map((m) => ({ id: m.product_id, share: m.share })),
  };
}

/** The declared unit as an amount of a published flow property: "1 m" → 1 of Length (m); "1 t" → 1000 of Mass (kg). Text that names no known unit counts as items. */
export function declaredQuantity(declaredUnit: string): { amount: number; property: FlowProperty } {
  const parsed = parseDeclaredUnit(declaredUnit);
  const propertyName = parsed ? DIMENSION_PROPERTY[parsed.dimension] : undefined;
  if (!parsed || !propertyName) return { amount: parsed?.amount ?? 1, property: flowProperty('Number of items') };
  const property = flowProperty(propertyName);
  const referenceUnit = canonicalUnit(property.unitGroup.unit) ?? (parsed.dimension === 'count' ? 'piece' : property.unitGroup.unit);
  return { amount: parsed.amount * conversionFactor(parsed.unit, referenceUnit), property };
}
