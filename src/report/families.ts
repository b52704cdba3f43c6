import { formatFixed, formatScientific } from '../format.ts';
import type { Family, WeightCell } from '../model/families.ts';
import type { IndicatorValues, ResultsSummary } from './results.ts';
import type { IlcdLink } from './ilcd-link.ts';
import { textCell } from './results-csv.ts';
import { HEADLINE_INDICATOR, HEADLINE_MODULE } from '../reference/headline.ts';

/** A family figure: the members' weighted mean, and the lowest and highest member. */
export interface FamilyStat {
  mean: number | null;
  min: number | null;
  max: number | null;
  /** Which member is lowest and highest (the first, where two are equal). */
  min_product: string | null;
  max_product: string | null;
}
export type FamilyValues = Record<string, FamilyStat>;

export interface FamilyMemberResult {
  product_id: string;
  weight: number;
  /** weight / Σ weights. */
  share: number;
  weight_from: WeightCell[];
  /** GWP-total of cut-off A1-A3, and its relative distance from the family mean. */
  gwp_a1_a3: number | null;
  deviation: number | null;
  /** Further from the mean than the tolerance. */
  outside_tolerance: boolean;
}

/** `families/<family_id>/results.json`: the family declaration, every figure with its range. */
export interface FamilyResults {
  family_id: string;
  name: string;
  declared_unit: string;
  /** The grouping rule's tolerance on GWP-total A1-A3 (declaration.json report.family_tolerance). */
  tolerance: number;
  members: FamilyMemberResult[];
  indicators: ResultsSummary['indicators'];
  /** Modules some members declare and others do not: not declared for the family. */
  modules_not_declared: Array<{ module: string; declared_by: string[] }>;
  methods: {
    cutoff: { modules: Record<string, FamilyValues>; total: FamilyValues };
    cff?: { parts: Record<string, FamilyValues>; total: FamilyValues };
    'eol-recycling'?: { parts: Record<string, FamilyValues>; total: FamilyValues };
    'fifty-fifty'?: { parts: Record<string, FamilyValues>; total: FamilyValues };
  };
  flows: { recycled_content: { pre: FamilyStat; post: FamilyStat; total: FamilyStat } };
  /** Each member's own values (method → module or part, or total → indicator), so the means can be checked from this file alone. */
  member_values: Record<string, Record<string, Record<string, IndicatorValues>>>;
  /** The family declaration as an ILCD+EPD archive beside this file, and its process dataset's UUID. */
  ilcd_epd?: IlcdLink;
}

const HEADLINE = { module: HEADLINE_MODULE, indicator: HEADLINE_INDICATOR } as const;

/**
 * The weighted mean of a family's members, mean = Σ w_p·v_p / Σ w_p, with the lowest and
 * highest member, for every method, module and indicator. A value that is "not available"
 * for any member leaves the family's figure not available (never an average of the rest).
 */
export function familyResults(family: Family, summaries: ReadonlyMap<string, ResultsSummary>, tolerance: number): FamilyResults {
  const members = family.members.filter((m) => summaries.has(m.productId));
  const all = members.map((m) => summaries.get(m.productId)!);
  const totalWeight = members.reduce((sum, m) => sum + m.weight, 0);
  const stat = (values: Array<number | null>): FamilyStat => {
    if (values.length === 0 || values.some((v) => v === null || !Number.isFinite(v))) return { mean: null, min: null, max: null, min_product: null, max_product: null };
    const numbers = values as number[];
    let low = 0;
    let high = 0;
    numbers.forEach((v, k) => {
      if (v < numbers[low]!) low = k;
      if (v > numbers[high]!) high = k;
    });
    const mean = numbers.reduce((sum, v, k) => sum + members[k]!.weight * v, 0) / totalWeight;
    return { mean, min: numbers[low]!, max: numbers[high]!, min_product: members[low]!.productId, max_product: members[high]!.productId };
  };
  const statValues = (pick: (s: ResultsSummary) => IndicatorValues | undefined): FamilyValues => {
    const codes = Object.keys(pick(all[0]!) ?? {});
    return Object.fromEntries(codes.map((code) => [code, stat(all.map((s) => pick(s)?.[code] ?? null))]));
  };

  // Modules every member declares; the others are not declared for the family.
  const moduleLists = all.map((s) => Object.keys(s.methods.cutoff.modules));
  const shared = moduleLists[0]?.filter((module) => moduleLists.every((list) => list.includes(module))) ?? [];
  const notDeclared = [...new Set(moduleLists.flat())]
    .filter((module) => !shared.includes(module))
    .map((module) => ({ module, declared_by: all.filter((s) => module in s.methods.cutoff.modules).map((s) => s.product_id) }));

  const methods: FamilyResults['methods'] = {
    cutoff: {
      modules: Object.fromEntries(shared.map((module) => [module, statValues((s) => s.methods.cutoff.modules[module])])),
      total: statValues((s) => s.methods.cutoff.total),
    },
  };
  for (const method of ['cff', 'eol-recycling', 'fifty-fifty'] as const) {
    const first = all[0]?.methods[method];
    if (!first || !all.every((s) => s.methods[method])) continue;
    methods[method] = {
      parts: Object.fromEntries(Object.keys(first.parts).map((part) => [part, statValues((s) => s.methods[method]!.parts[part])])),
      total: statValues((s) => s.methods[method]!.total),
    };
  }
  const headline = methods.cutoff.modules[HEADLINE.module]?.[HEADLINE.indicator]?.mean ?? null;
  return {
    family_id: family.id,
    name: family.name,
    declared_unit: family.declaredUnit,
    tolerance,
    members: members.map((m, k) => {
      const own = all[k]!.methods.cutoff.modules[HEADLINE.module]?.[HEADLINE.indicator] ?? null;
      const deviation = own === null || headline === null || headline === 0 ? null : (own - headline) / Math.abs(headline);
      return { product_id: m.productId, weight: m.weight, share: m.weight / totalWeight, weight_from: m.weightCells, gwp_a1_a3: own, deviation, outside_tolerance: deviation !== null && Math.abs(deviation) > tolerance };
    }),
    indicators: all[0]?.indicators ?? [],
    modules_not_declared: notDeclared,
    methods,
    member_values: Object.fromEntries(all.map((s) => [s.product_id, memberValues(s)])),
    flows: {
      recycled_content: {
        pre: stat(all.map((s) => s.flows.recycled_content.pre)),
        post: stat(all.map((s) => s.flows.recycled_content.post)),
        total: stat(all.map((s) => s.flows.recycled_content.total)),
      },
    },
  };
}

function memberValues(s: ResultsSummary): Record<string, Record<string, IndicatorValues>> {
  const values: Record<string, Record<string, IndicatorValues>> = { cutoff: { ...s.methods.cutoff.modules, total: s.methods.cutoff.total } };
  for (const method of ['cff', 'eol-recycling', 'fifty-fifty'] as const) {
    const result = s.methods[method];
    if (result) values[method] = { ...result.parts, total: result.total };
  }
  return values;
}

/** The stderr and page warning for members outside the tolerance. */
export function familyWarnings(results: FamilyResults): string[] {
  return results.members
    .filter((m) => m.outside_tolerance)
    .map((m) => `family ${results.family_id}: ${m.product_id} GWP-total A1-A3 ${formatScientific(m.gwp_a1_a3!)} lies ${formatFixed(Math.abs(m.deviation!) * 100, 1)} % ${m.deviation! > 0 ? 'above' : 'below'} the family’s weighted average ${formatScientific(results.methods.cutoff.modules[HEADLINE.module]![HEADLINE.indicator]!.mean!)} (tolerance ${formatFixed(results.tolerance * 100, 0)} %, declaration.json report.family_tolerance); consider declaring it apart`);
}

/** One CSV row per family × method × module × indicator: mean, min and max with their members. */
export const FAMILY_CSV_HEADER = ['family_id', 'method', 'module', 'indicator', 'unit', 'mean', 'min', 'min_product', 'max', 'max_product'];

export function familyResultsCsv(results: FamilyResults): string {
  const units = new Map(results.indicators.map((i) => [i.code, i.unit]));
  const num = (value: number | null) => (value === null ? '' : String(value));
  const rows: string[] = [FAMILY_CSV_HEADER.join(',')];
  const emit = (method: string, module: string, values: FamilyValues) => {
    for (const [code, s] of Object.entries(values)) {
      rows.push([textCell(results.family_id), method, textCell(module), textCell(code), textCell(units.get(code) ?? ''), num(s.mean), num(s.min), textCell(s.min_product ?? ''), num(s.max), textCell(s.max_product ?? '')].join(','));
    }
  };
  const { cutoff, ...others } = results.methods;
  for (const [module, values] of Object.entries(cutoff.modules)) emit('cutoff', module, values);
  emit('cutoff', 'total', cutoff.total);
  for (const [method, result] of Object.entries(others)) {
    if (!result) continue;
    for (const [part, values] of Object.entries(result.parts)) emit(method, part, values);
    emit(method, 'total', result.total);
  }
  return `${rows.join('\n')}\n`;
}
