import type { CalcContext } from '../calc/context.ts';
import type { ProductResult } from '../calc/product.ts';
import { productUncertainty, type UncertaintyJson } from '../calc/uncertainty.ts';
import { toNullable } from '../calc/vector.ts';
import { findIndicator } from '../reference/indicators.ts';
import type { FigureGraph, FigureNode, Term } from '../trace/graph.ts';
import { productDataQuality, type DataQualityJson } from './data-quality.ts';
import { productSensitivity, type SensitivityJson } from './sensitivity.ts';

/**
 * The results contract (`out/<product_id>/results.json`): keys and nesting are what CI users
 * script against — add keys, rename none. Every number is a figure: its id is
 * `<vector figure>/<indicator>` (e.g. `cutoff/A1/GWP-total`) or the id of a scalar figure,
 * and `figures` holds each with its formula, value and terms.
 */
export type IndicatorValues = Record<string, number | null>;

export interface ResultsJson {
  product_id: string;
  declared_unit: string;
  indicators: Array<{ code: string; unit: string; name: string }>;
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
  /** The data quality of the cradle-to-gate result (PEF DQR, contribution-weighted); see src/report/data-quality.ts. */
  data_quality?: DataQualityJson;
  /** The ten inputs that contribute most to GWP-total A1-A3 and to D, and ±step on each; see src/report/sensitivity.ts. */
  sensitivity?: SensitivityJson;
  /** Monte Carlo ranges of GWP-total A1-A3 and D, when asked for (declaration.json uncertainty or build --uncertainty). */
  uncertainty?: UncertaintyJson;
  figures: Record<string, FigureJson>;
}

/** A product's results without its figure graph (the catalogue-wide results.json). */
export type ResultsSummary = Omit<ResultsJson, 'figures'>;

export type TermJson = string | { file: string; line: number; column: string; value: string };

export interface FigureJson {
  value: number | null;
  unit: string;
  formula: string;
  description: string;
  terms: TermJson[];
  /** The symbol each term stands for in the formula, in the order of `terms`. */
  symbols: string[];
}

export function indicatorList(ctx: CalcContext): ResultsJson['indicators'] {
  return [...ctx.indicators, ...ctx.flowIndicators].map((code) => {
    const indicator = findIndicator(code)!;
    return { code, unit: indicator.unit, name: indicator.name };
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

export function resultsJson(ctx: CalcContext, result: ProductResult): ResultsJson {
  return { ...resultsSummary(ctx, result), figures: figuresJson(result.graph) };
}

/** results.json as text, exactly `JSON.stringify(resultsJson(…))`, written straight from the graph (no figure objects built). */
export function resultsJsonText(ctx: CalcContext, result: ProductResult, summary = resultsSummary(ctx, result)): string {
  return `${JSON.stringify(summary).slice(0, -1)},"figures":${figuresJsonText(result.graph)}}`;
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
  return {
    product_id: result.productId,
    declared_unit: result.declaredUnit,
    indicators: indicatorList(ctx),
    methods,
    flows: {
      recycled_content: { pre: graph.scalar(f.recycledContent.pre).value, post: graph.scalar(f.recycledContent.post).value, total: graph.scalar(f.recycledContent.total).value },
      biogenic_carbon_kg: { product: scalarValue(graph, f.biogenicCarbon.product), packaging: scalarValue(graph, f.biogenicCarbon.packaging) },
      biogenic_co2_kg: { product: scalarValue(graph, f.biogenicCarbon.productCo2), packaging: scalarValue(graph, f.biogenicCarbon.packagingCo2) },
    },
    data_quality: productDataQuality(ctx, result),
    ...withSensitivity(ctx, result),
    ...withUncertainty(ctx, result),
  };
}

/** Every node of the graph as figures: a vector node once per indicator. */
export function figuresJson(graph: FigureGraph): Record<string, FigureJson> {
  const figures: Record<string, FigureJson> = {};
  for (const node of graph.nodes.values()) {
    if (node.kind === 'scalar') {
      figures[node.id] = { value: toNullable(node.value), unit: node.unit, formula: node.formula, description: node.description, terms: node.terms.map((t) => termJson(graph, t, undefined)), symbols: node.terms.map((t) => t.symbol) };
      continue;
    }
    graph.indicators.forEach((code, i) => {
      figures[`${node.id}/${code}`] = {
        value: toNullable(node.values[i]!),
        unit: findIndicator(code)!.unit,
        formula: node.formula,
        description: node.description,
        terms: node.terms.map((t) => termJson(graph, t, code)),
        symbols: node.terms.map((t) => t.symbol),
      };
    });
  }
  return figures;
}

/** A term as the contract writes it: a figure id, or an input cell. */
export function termJson(graph: FigureGraph, term: Term, code: string | undefined): TermJson {
  switch (term.kind) {
    case 'figure': {
      const target: FigureNode | undefined = graph.get(term.id);
      return target?.kind === 'vector' && code ? `${term.id}/${code}` : term.id;
    }
    case 'cell':
      return term.cell;
    case 'factor': {
      // A factor row stands, per indicator, for that indicator's cell; for a scalar figure it is the row's id cell.
      const column = code ?? 'factor_id';
      return { file: term.factor.file, line: term.factor.line, column, value: term.factor.raw[column] ?? '' };
    }
  }
}

const numberText = (value: number): string => (Number.isFinite(value) ? JSON.stringify(value) : 'null');

/**
 * The `figures` object as text, the same bytes as `JSON.stringify(figuresJson(graph))`: the
 * parts of a vector node that do not vary by indicator (formula, description, symbols,
 * terms that are scalar figures or cells) are serialised once per node, not once per
 * indicator. A product's figures run to megabytes (docs/performance.md).
 */
export function figuresJsonText(graph: FigureGraph): string {
  const parts: string[] = [];
  const codes = graph.indicators;
  const units = codes.map((code) => JSON.stringify(findIndicator(code)!.unit));
  // JSON escapes character by character, so an escaped id followed by an escaped "/code" is the escaped "id/code".
  const slashCode = codes.map((code) => JSON.stringify(`/${code}`).slice(1));
  const codeText = codes.map((code) => JSON.stringify(code));
  for (const node of graph.nodes.values()) {
    const tail = `,"formula":${JSON.stringify(node.formula)},"description":${JSON.stringify(node.description)}`;
    const symbols = `,"symbols":${JSON.stringify(node.terms.map((t) => t.symbol))}}`;
    if (node.kind === 'scalar') {
      parts.push(`${JSON.stringify(node.id)}:{"value":${numberText(node.value)},"unit":${JSON.stringify(node.unit)}${tail},"terms":${JSON.stringify(node.terms.map((t) => termJson(graph, t, undefined)))}${symbols}`);
      continue;
    }
    // Per term: one text for all indicators, or the text for indicator i.
    const terms = node.terms.map((term): string | ((i: number) => string) => {
      if (term.kind === 'figure') {
        if (graph.get(term.id)?.kind !== 'vector') return JSON.stringify(term.id);
        const open = JSON.stringify(term.id).slice(0, -1);
        return (i) => open + slashCode[i]!;
      }
      if (term.kind === 'cell') return JSON.stringify(term.cell);
      // termJson's key order: file, line, column (the indicator's column), value (as written).
      const { factor } = term;
      const head = `{"file":${JSON.stringify(factor.file)},"line":${JSON.stringify(factor.line)},"column":`;
      return (i) => `${head}${codeText[i]},"value":${JSON.stringify(factor.raw[codes[i]!] ?? '')}}`;
    });
    const open = JSON.stringify(node.id).slice(0, -1);
    for (let i = 0; i < codes.length; i++) {
      let termText = '';
      for (let k = 0; k < terms.length; k++) {
        const t = terms[k]!;
        termText += (k === 0 ? '' : ',') + (typeof t === 'string' ? t : t(i));
      }
      parts.push(`${open}${slashCode[i]}:{"value":${numberText(node.values[i]!)},"unit":${units[i]}${tail},"terms":[${termText}]${symbols}`);
    }
  }
  return `{${parts.join(',')}}`;
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
