import type { CalcContext } from '../calc/context.ts';
import type { ProductResult } from '../calc/product.ts';
import { productUncertainty, type UncertaintyJson } from '../calc/uncertainty.ts';
import { toNullable } from '../calc/vector.ts';
import type { IndicatorBasis } from '../reference/indicators.ts';
import type { FigureGraph } from '../trace/graph.ts';
import { graphJson, type GraphJson } from '../trace/graph-json.ts';
import { figureId, resultStep, type ResultMethod } from '../trace/ids.ts';
import { productDataQuality, type DataQualityJson } from '../calc/data-quality.ts';
import { productSensitivity, type SensitivityJson } from '../calc/sensitivity.ts';
import { productCompleteness, type CompletenessJson } from './completeness.ts';
import { productChecklist, type ChecklistJson } from '../calc/checklist.ts';
import { ilcdLink, type IlcdLink } from './ilcd-link.ts';

/**
 * The results contract (`out/<product_id>/results.json`, format 2): keys and nesting are what
 * CI users script against — add keys, rename none. Every number is a figure: its id is
 * `<step>/<indicator>` for a vector step (e.g. `cutoff/A1/GWP-total`) or a scalar step's id
 * (src/trace/ids.ts), and `graph` holds each step once with its formula, values and terms
 * (src/trace/graph-json.ts).
 */
export type IndicatorValues = Record<string, number | null>;

/** The version of this contract; `diff` refuses another. Format 1 listed every step once per indicator (`figures`). */
export const RESULTS_FORMAT = 2;

export interface ResultsJson {
  format: typeof RESULTS_FORMAT;
  product_id: string;
  declared_unit: string;
  /** `basis`: `factors` — characterised from factor rows, a value of each step that has values; `flows` — the product's own mass flows, steps of their own (`cutoff/<module>/<code>`). */
  indicators: Array<{ code: string; unit: string; name: string; basis: IndicatorBasis }>;
  methods: {
    cutoff: { modules: Record<string, IndicatorValues>; total: IndicatorValues };
    cff?: { parts: Record<string, IndicatorValues>; total: IndicatorValues };
    'eol-recycling'?: { parts: Record<string, IndicatorValues>; total: IndicatorValues };
    'fifty-fifty'?: { parts: Record<string, IndicatorValues>; total: IndicatorValues };
  };
  flows: {
    recycled_content: { pre: number; post: number; total: number };
    biogenic_carbon_kg: { product: number | null; packaging: number | null };
    biogenic_co2_kg: { product: number | null; packaging: number | null };
  };
  /** The scenario information beside C1–C4 (and A5 for the packaging) and D (EN 15804+A2); each number's figure id is in `figures` (absent in results written before it was added). */
  scenarios?: ScenariosJson;
  /** The checks a verifier makes first, answered for this product (absent in results written before it was added). */
  checklist?: ChecklistJson;
  /** Whether every mandatory indicator is reported in every declared module, and what is missing and why (absent in results written before it was added). */
  completeness?: CompletenessJson;
  /** The data quality of the cradle-to-gate result (PEF DQR, contribution-weighted); see src/report/data-quality.ts. */
  data_quality?: DataQualityJson;
  /** The ten inputs that contribute most to GWP-total A1-A3 and to D, and ±step on each; see src/report/sensitivity.ts. */
  sensitivity?: SensitivityJson;
  /** Monte Carlo ranges of GWP-total A1-A3 and D, when asked for (declaration.json uncertainty or build --uncertainty). */
  uncertainty?: UncertaintyJson;
  /** The declaration as an ILCD+EPD archive beside this file, and the UUID of its process dataset (absent in results written before it was added). */
  ilcd_epd?: IlcdLink;
  graph: GraphJson;
}

/** A product's results without its figure graph (the catalogue-wide results.json). */
export type ResultsSummary = Omit<ResultsJson, 'graph'>;

/** The figure id of a value in the `methods` maps: `methods.<method>.modules|parts.<key>[<code>]`, or `.total` with key `total`. */
export const resultFigureId = (method: ResultMethod, key: string, code: string): string => figureId(resultStep(method, key), code);

export function indicatorList(ctx: CalcContext): ResultsJson['indicators'] {
  return [...ctx.indicators, ...ctx.flowIndicators].map((code) => {
    const indicator = ctx.project.indicatorSet.find(code)!;
    return { code, unit: indicator.unit, name: indicator.name, basis: indicator.basis };
  });
}

function vectorValues(ctx: CalcContext, graph: FigureGraph, id: string, flowIds?: Record<string, string>): IndicatorValues {
  const node = graph.vector(id);
  const out: IndicatorValues = {};
  ctx.indicators.forEach((code, i) => (out[code] = toNullable(node.values[i]!)));
  if (flowIds) for (const code of ctx.flowIndicators) out[code] = toNullable(graph.scalar(flowIds[code]!).value);
  return out;
}

const scalarValue = (graph: FigureGraph, id: string) => toNullable(graph.scalar(id).value);

export function resultsJson(ctx: CalcContext, result: ProductResult, summary = resultsSummary(ctx, result)): ResultsJson {
  return { ...summary, graph: graphJson(result.graph, summary.indicators.map((i) => i.code)) };
}

/** A product's results without its figure graph. */
export function resultsSummary(ctx: CalcContext, result: ProductResult): ResultsSummary {
  const { graph } = result;
  const modules: Record<string, IndicatorValues> = {};
  for (const [module, id] of Object.entries(result.cutoff.modules)) modules[module] = vectorValues(ctx, graph, id, result.flows.moduleFlows[module]);
  const methods: ResultsJson['methods'] = { cutoff: { modules, total: vectorValues(ctx, graph, result.cutoff.total, result.flows.totalFlows) } };
  for (const [method, cff] of Object.entries(result.methods)) {
    methods[method as 'cff'] = {
      parts: Object.fromEntries(Object.entries(cff.parts).map(([part, id]) => [part, vectorValues(ctx, graph, id)])),
      total: vectorValues(ctx, graph, cff.total),
    };
  }
  const f = result.flows;
  const completeness = productCompleteness(ctx, { methods });
  return {
    format: RESULTS_FORMAT,
    product_id: result.productId,
    declared_unit: result.declaredUnit,
    indicators: indicatorList(ctx),
    methods,
    flows: {
      recycled_content: { pre: graph.scalar(f.recycledContent.pre).value, post: graph.scalar(f.recycledContent.post).value, total: graph.scalar(f.recycledContent.total).value },
      biogenic_carbon_kg: { product: scalarValue(graph, f.biogenicCarbon.product), packaging: scalarValue(graph, f.biogenicCarbon.packaging) },
      biogenic_co2_kg: { product: scalarValue(graph, f.biogenicCarbon.productCo2), packaging: scalarValue(graph, f.biogenicCarbon.packagingCo2) },
    },
    completeness,
    checklist: productChecklist(ctx, result, modules, completeness.missing),
    scenarios: scenariosJson(ctx, result),
    data_quality: productDataQuality(ctx, result),
    ...withSensitivity(ctx, result),
    ...withUncertainty(ctx, result),
    ilcd_epd: ilcdLink(ctx.project.declaration, 'product', result.productId),
  };
}

function withSensitivity(ctx: CalcContext, result: ProductResult): { sensitivity?: SensitivityJson } {
  const sensitivity = productSensitivity(ctx, result, ctx.project.declaration.report.sensitivity_step);
  return sensitivity ? { sensitivity } : {};
}

/** Monte Carlo runs only when asked for: ordinary builds do not pay for it. */
function withUncertainty(ctx: CalcContext, result: ProductResult): { uncertainty?: UncertaintyJson } {
  const settings = ctx.project.declaration.uncertainty;
  const uncertainty = settings ? productUncertainty(ctx, result, settings) : undefined;
  return uncertainty ? { uncertainty } : {};
}

export interface ScenariosJson {
  end_of_life: Array<{
    material: string;
    stage: 'C1-C4' | 'A5';
    mass_kg: number;
    collected_separately_kg: number;
    collected_with_mixed_waste_kg: number;
    reuse_kg: number;
    recycling_kg: number;
    energy_recovery_kg: number;
    incineration_kg: number;
    landfill_kg: number;
    recycling_yield: number;
    transport_km: number;
    transport_factor: string | null;
    processing_factor: string | null;
    figures: Record<string, string>;
  }>;
  module_d: Array<{ material: string; m_mr_out_kg: number; m_mr_in_kg: number; net_kg: number; substituted_factor: string; q_out: number; figures: Record<string, string> }>;
  exported_energy: { electricity_mj: number | null; heat_mj: number | null; electricity_factor: string | null; heat_factor: string | null; figures: Record<string, string> };
}

const SCENARIO_KEYS = { mass_kg: 'mass', collected_separately_kg: 'separately', collected_with_mixed_waste_kg: 'mixed', reuse_kg: 'reuse', recycling_kg: 'recycling', energy_recovery_kg: 'energy-recovery', incineration_kg: 'incineration', landfill_kg: 'landfill' } as const;

/** results.json `scenarios`: the numbers of the scenario tables, each with its figure id. */
function scenariosJson(ctx: CalcContext, result: ProductResult): ScenariosJson {
  const { graph } = result;
  const value = (id: string) => graph.scalar(id).value;
  const recovery = ctx.project.declaration.energy_recovery;
  const totals = result.flows.totalFlows;
  return {
    end_of_life: result.scenarios.endOfLife.map((scenario) => {
      const eol = scenario.eol.eol.value;
      // A quantity without a figure is a route the scenario gives no share: 0 kg.
      const figures = Object.fromEntries(Object.entries(SCENARIO_KEYS).flatMap(([key, quantity]) => (scenario.ids[quantity] ? [[key, scenario.ids[quantity]!]] : [])));
      return {
        material: scenario.material,
        stage: scenario.stage,
        ...(Object.fromEntries(Object.keys(SCENARIO_KEYS).map((key) => [key, figures[key] ? value(figures[key]) : 0])) as Record<keyof typeof SCENARIO_KEYS, number>),
        recycling_yield: eol.recycling_yield,
        transport_km: eol.transport_km,
        transport_factor: eol.transport_factor ?? null,
        processing_factor: eol.processing_factor ?? null,
        figures,
      };
    }),
    module_d: result.scenarios.moduleD.map((d) => ({
      material: d.material,
      m_mr_out_kg: value(d.ids.out),
      m_mr_in_kg: value(d.ids.in),
      net_kg: value(d.ids.net),
      substituted_factor: d.substituted,
      q_out: d.qOut,
      figures: { m_mr_out_kg: d.ids.out, m_mr_in_kg: d.ids.in, net_kg: d.ids.net },
    })),
    exported_energy: {
      electricity_mj: totals.EEE ? value(totals.EEE) : null,
      heat_mj: totals.EET ? value(totals.EET) : null,
      electricity_factor: recovery?.electricity_factor ?? null,
      heat_factor: recovery?.heat_factor ?? null,
      figures: { ...(totals.EEE ? { electricity_mj: totals.EEE } : {}), ...(totals.EET ? { heat_mj: totals.EET } : {}) },
    },
  };
}
