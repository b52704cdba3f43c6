import type { CalcContext } from '../calc/context.ts';
import type { ProductResult } from '../calc/product.ts';
import type { UncertaintyJson } from '../calc/uncertainty.ts';
import { toNullable } from '../calc/vector.ts';
import type { ProductRows } from '../model/by-product.ts';
import { DISCLAIMERS, disclaimerOf, findIndicator, type IndicatorGroup } from '../reference/indicators.ts';
import { LIFE_CYCLE_MODULES } from '../reference/modules.ts';
import { barChart, type ChartDatum, type ChartView } from './charts.ts';
import { dataQualityView, type DataQualityView } from './data-quality-view.ts';
import { factorHref, figureHref } from './figure-links.ts';
import { formatCount, formatInput, formatScientific, formatShare, NOT_AVAILABLE, NOT_GIVEN } from '../format.ts';
import { resultFigureId, type ResultsSummary, type ScenariosJson } from './results.ts';
import type { CffMethod } from '../calc/cff.ts';
import { figureId, processStep, processStepOf } from '../trace/ids.ts';
import { sensitivityView, type SensitivityView } from './sensitivity-view.ts';
import { HEADLINE_INDICATOR, HEADLINE_MODULE, HEADLINE_MODULE_D } from '../reference/headline.ts';
import { completenessText } from './completeness.ts';

/**
 * What a declaration page shows of the results, formatted, every number with the link to
 * its figure in the audit trail. Built per product while its figure graph is alive.
 */
export interface FigureCell {
  text: string;
  href?: string;
  moduleD?: boolean;
}

export interface ResultsTableView {
  title: string;
  caption: string;
  rows: Array<{ code: string; name: string; unit: string; cells: FigureCell[] }>;
}

export interface DeclarationResultsView {
  significantFigures: number;
  /** Each life-cycle module, whether it is declared, and whether it is reported apart (module D, beyond the system boundary). */
  boundary: Array<{ code: string; stage: string; name: string; declared: boolean; apart: boolean }>;
  /** Where a mandatory indicator is missing in a declared module: what and why, said on the page (the catalogue marks the product incomplete). */
  incomplete?: string;
  /** Where the product has packaging but A5 is not declared: what is left out, said on the page. */
  packagingNotDeclared?: string;
  modules: Array<{ code: string; moduleD: boolean }>;
  tables: ResultsTableView[];
  recycledContent: Array<{ label: string; cell: FigureCell }>;
  biogenic: Array<{ label: string; carbon: FigureCell; co2: FigureCell }>;
  /** The verifier's checklist for this product: status, what was found, evidence linked, source. */
  checklist: Array<{ id: string; title: string; status: string; detail: string; evidence: FigureCell[]; source: string }>;
  /** The scenario information beside C1–C4 (A5 for the packaging) and D, every number linked to its figure. */
  scenarios?: ScenarioTablesView;
  comparison: { indicators: Array<{ code: string; unit: string }>; rows: Array<{ method: string; name: string; rewards: string; scope: string; cells: FigureCell[] }> };
  charts: ChartView[];
  /** The declarant's own processes this product's figures rest on (process.csv). */
  processes: ProcessModelView[];
  /** Data quality of the cradle-to-gate result (PEF DQR, contribution-weighted). */
  dataQuality?: DataQualityView;
  /** Top contributors and one-at-a-time sensitivity of GWP-total A1-A3 and D. */
  sensitivity?: SensitivityView;
  /** Monte Carlo ranges, when the build ran them. */
  uncertainty?: UncertaintyView;
  /** Headline figures for the catalogue. */
  headline: { a1a3: FigureCell; moduleD: FigureCell; recycledContent: FigureCell; a1a3Value: string; moduleDValue: string; recycledValue: string };
}

export interface ScenarioTablesView {
  endOfLife: Array<{ stage: string; material: string; cells: FigureCell[]; transport: string; processing: string }>;
  moduleD: Array<{ material: string; cells: FigureCell[]; substitutes: string }>;
  exportedEnergy?: string;
}

export interface ProcessModelView {
  id: string;
  kind: string;
  description: string;
  steps: Array<{ name: string; value: FigureCell; unit: string; formula: string; description: string }>;
  factor: Array<{ code: string; unit: string; cell: FigureCell }>;
}

/** Beside every process model (field guide §6; the issue's caution). */
export const PROCESS_CAUTION =
  'Emission figures computed here from operating data serve this declaration. Emission figures for regulatory reporting must follow the monitoring rules of the jurisdiction and be verified by an accredited body; this tool supports, and does not replace, that practice.';

const GROUPS: Array<{ group: IndicatorGroup; title: string; caption: string }> = [
  { group: 'core', title: 'Core environmental impact indicators', caption: 'EN 15804+A2 core impact indicators.' },
  { group: 'additional', title: 'Additional environmental impact indicators', caption: 'EN 15804+A2 additional impact indicators.' },
  { group: 'resource', title: 'Use of resources', caption: 'Resource use; SM is the product’s own secondary material input.' },
  { group: 'waste', title: 'Waste categories', caption: 'Waste disposed of.' },
  { group: 'programme', title: 'Indicators of the programme', caption: 'Indicators the programme operator asks for beyond EN 15804+A2 (declaration.json extra_indicators), from factors.csv columns of their codes.' },
  { group: 'output', title: 'Output flows', caption: 'CRU, MFR and MER are the product’s own mass flows, EEE and EET the energy its own energy recovery exports (mass × share × heating value × efficiency); none is read from factors.' },
];

/**
 * Results tables in EN 15804+A2 groups: a row per indicator the results hold, its cells made
 * by the caller; an indicator EN 15804+A2 requires a disclaimer for carries its marker, and
 * the table the disclaimers of its markers.
 */
export function groupedTables<C>(
  indicators: ReadonlyArray<{ code: string; name: string; unit: string }>,
  cells: (code: string) => C[],
): Array<{ title: string; caption: string; rows: Array<{ code: string; name: string; unit: string; marker?: string; cells: C[] }>; disclaimers: Array<{ marker: string; codes: string; text: string }> }> {
  return GROUPS.flatMap(({ group, title, caption }) => {
    // A code outside the registry is a programme's own indicator (declaration.json extra_indicators).
    const codes = indicators.filter((i) => (findIndicator(i.code)?.group ?? 'programme') === group);
    if (codes.length === 0) return [];
    const rows = codes.map(({ code, name, unit }) => {
      const disclaimer = disclaimerOf(code);
      return { code, name, unit, ...(disclaimer ? { marker: disclaimer.marker } : {}), cells: cells(code) };
    });
    const disclaimers = DISCLAIMERS.flatMap((disclaimer) => {
      const here = rows.filter((row) => disclaimer.codes.includes(row.code)).map((row) => row.code);
      return here.length === 0 ? [] : [{ marker: disclaimer.marker, codes: here.join(', '), text: disclaimer.text }];
    });
    return [{ title, caption, rows, disclaimers }];
  });
}

/** One sentence per method: what it rewards. */
export const METHOD_SENTENCES: Record<string, { name: string; rewards: string; scope: string }> = {
  cutoff: {
    name: 'Cut-off, with module D (EN 15804+A2)',
    rewards: 'Rewards recycled content: secondary input carries only its reprocessing; the net benefit of recycling at end of life is shown apart, in module D, and is not in the total.',
    scope: 'A1–C4; module D apart',
  },
  cff: {
    name: 'Circular Footprint Formula',
    rewards: 'Shares the benefit of recycling between the user of recycled material and the supplier of recyclable material by the allocation factor A (0.2 for metals, Recommendation (EU) 2021/2279).',
    scope: 'life cycle, credits included',
  },
  'eol-recycling': {
    name: 'End-of-life recycling, 0:100',
    rewards: 'Rewards recycling at end of life: recycled input carries the virgin burden, and material recycled at end of life earns the virgin production it avoids.',
    scope: 'life cycle, credits included',
  },
  'fifty-fifty': {
    name: '50:50',
    rewards: 'Splits the burden and the benefit of recycling equally between the recycled input and the recyclable output.',
    scope: 'life cycle, credits included',
  },
};

export function declarationResultsView(ctx: CalcContext, rows: ProductRows, result: ProductResult, json: ResultsSummary): DeclarationResultsView {
  const report = ctx.project.declaration.report;
  const digits = report.significant_figures;
  const sci = (value: number | null | undefined): string => (value === null || value === undefined ? NOT_AVAILABLE : formatScientific(value, digits));
  const cell = (value: number | null | undefined, figureId: string, moduleD = false): FigureCell => ({ text: sci(value), href: figureHref(figureId), ...(moduleD ? { moduleD } : {}) });
  const cutoff = json.methods.cutoff;
  const moduleCodes = Object.keys(cutoff.modules);
  const modules = moduleCodes.map((code) => ({ code, moduleD: code === 'D' }));

  const tables: ResultsTableView[] = groupedTables(json.indicators, (code) => moduleCodes.map((module) => cell(cutoff.modules[module]?.[code], resultFigureId('cutoff', module, code), module === 'D')));

  const boundary = LIFE_CYCLE_MODULES.map((m) => ({ ...m, declared: moduleCodes.includes(m.code), apart: m.apart === true }));
  const packagingLines = rows.bom.filter((line) => line.value.role === 'packaging');
  const packagingNotDeclared =
    packagingLines.length > 0 && !moduleCodes.includes('A5')
      ? `A5 is not declared, so the end of life of this product’s packaging (${packagingLines.map((line) => `${line.value.component}, ${formatInput(line.value.mass_kg)} kg`).join('; ')}) is left out: its waste processing, its disposal and the release of the biogenic carbon it took up in A1–A3 are not in these results. Its production is in A3.`
      : undefined;

  const rc = json.flows.recycled_content;
  const recycledContent = [
    { label: 'Pre-consumer (ISO 14021)', cell: { text: formatShare(rc.pre), href: figureHref(result.flows.recycledContent.pre) } },
    { label: 'Post-consumer (ISO 14021)', cell: { text: formatShare(rc.post), href: figureHref(result.flows.recycledContent.post) } },
    { label: 'Total recycled content', cell: { text: formatShare(rc.total), href: figureHref(result.flows.recycledContent.total) } },
  ];
  const bio = json.flows;
  const biogenic = [
    { label: 'In the product', carbon: cell(bio.biogenic_carbon_kg.product, result.flows.biogenicCarbon.product), co2: cell(bio.biogenic_co2_kg.product, result.flows.biogenicCarbon.productCo2) },
    { label: 'In the accompanying packaging', carbon: cell(bio.biogenic_carbon_kg.packaging, result.flows.biogenicCarbon.packaging), co2: cell(bio.biogenic_co2_kg.packaging, result.flows.biogenicCarbon.packagingCo2) },
  ];

  const compared = report.compare_indicators.filter((code) => ctx.indicators.includes(code));
  const comparison = {
    indicators: compared.map((code) => ({ code, unit: findIndicator(code)!.unit })),
    rows: [
      { method: 'cutoff', ...METHOD_SENTENCES.cutoff!, cells: compared.map((code) => cell(cutoff.total[code], resultFigureId('cutoff', 'total', code))) },
      ...(Object.keys(result.methods) as CffMethod[]).map((method) => ({
        method,
        ...METHOD_SENTENCES[method]!,
        cells: compared.map((code) => cell(json.methods[method]!.total[code], resultFigureId(method, 'total', code))),
      })),
      ...(compared.length > 0
        ? [
            {
              method: 'cutoff-d',
              name: 'Module D (beside cut-off)',
              rewards: 'Net benefit and load of recycling and recovery beyond the system boundary; not added to any total.',
              scope: 'module D',
              cells: compared.map((code) => cell(cutoff.modules.D?.[code], resultFigureId('cutoff', 'D', code), true)),
            },
          ]
        : []),
    ],
  };

  const headlineCode = HEADLINE_INDICATOR;
  const hasHeadline = ctx.indicators.includes(headlineCode);
  const headline = {
    a1a3: hasHeadline ? cell(cutoff.modules[HEADLINE_MODULE]?.[headlineCode], resultFigureId('cutoff', HEADLINE_MODULE, headlineCode)) : { text: NOT_AVAILABLE },
    moduleD: hasHeadline ? cell(cutoff.modules[HEADLINE_MODULE_D]?.[headlineCode], resultFigureId('cutoff', HEADLINE_MODULE_D, headlineCode), true) : { text: NOT_AVAILABLE },
    recycledContent: recycledContent[2]!.cell,
    a1a3Value: String(cutoff.modules['A1-A3']?.[headlineCode] ?? ''),
    moduleDValue: String(cutoff.modules.D?.[headlineCode] ?? ''),
    recycledValue: String(rc.total),
  };

  const charts = hasHeadline ? chartsOf(ctx, rows, result, json, headlineCode, sci) : [];
  const dataQuality = json.data_quality ? dataQualityView(json.data_quality, factorHref) : undefined;
  const sensitivity = json.sensitivity ? sensitivityView(json.sensitivity, digits) : undefined;
  const uncertainty = json.uncertainty ? uncertaintyView(json.uncertainty, sci) : undefined;
  const incomplete = json.completeness ? completenessText(json.completeness) : undefined;
  const scenarios = json.scenarios ? scenarioTables(json.scenarios, sci) : undefined;
  const checklist = (json.checklist?.items ?? []).map((item) => ({ id: item.id, title: item.title, status: item.status, detail: item.detail, source: item.source, evidence: [...item.figures.map((id): FigureCell => ({ text: id, href: figureHref(id) })), ...(item.rows ?? []).map((row): FigureCell => ({ text: `${row.file} line ${row.line}` }))] }));
  return { significantFigures: digits, boundary, checklist, ...(scenarios ? { scenarios } : {}), ...(incomplete ? { incomplete } : {}), ...(packagingNotDeclared ? { packagingNotDeclared } : {}), modules, tables, recycledContent, biogenic, comparison, charts, processes: processModels(ctx, result, sci), headline, ...(dataQuality ? { dataQuality } : {}), ...(sensitivity ? { sensitivity } : {}), ...(uncertainty ? { uncertainty } : {}) };
}

function chartsOf(ctx: CalcContext, rows: ProductRows, result: ProductResult, json: ResultsSummary, code: string, sci: (v: number | null | undefined) => string): ChartView[] {
  const unit = ctx.project.indicatorSet.find(code)!.unit;
  const { graph } = result;
  const index = ctx.indicators.indexOf(code);
  const valueOf = (id: string): number => graph.vector(id).values[index]!;
  const tableOf = (data: ChartDatum[], first: string) => ({ headers: [first, 'Group', `${code} (${unit})`], rows: data.map((d) => [d.label, d.group, sci(d.value)]) });
  const finite = (data: ChartDatum[]) => data.filter((d) => Number.isFinite(d.value));

  const byModule = finite(
    Object.entries(result.cutoff.modules)
      .filter(([module]) => module !== 'A1-A3')
      .map(([module, id]) => ({ label: module, group: module === 'D' ? 'Module D (reported apart)' : 'A–C (in the total)', value: valueOf(id!) })),
  );

  const components = new Map(rows.bom.map((row) => [`${row.value.role === 'packaging' ? 'packaging' : 'line'}:${row.value.line_id}`, `${row.value.component} (${row.value.material})`]));
  const a1 = graph.vector(result.cutoff.modules.A1!);
  const a3 = graph.vector(result.cutoff.modules.A3!);
  const contributions: ChartDatum[] = [];
  for (const term of a1.terms) if (term.kind === 'figure') contributions.push({ label: `A1 ${components.get(term.symbol) ?? term.symbol}`, group: 'A1 raw materials', value: valueOf(term.id) });
  contributions.push({ label: 'A2 transport of inputs', group: 'A2 transport', value: valueOf(result.cutoff.modules.A2!) });
  for (const term of a3.terms) if (term.kind === 'figure') contributions.push({ label: `A3 ${components.get(term.symbol) ?? term.symbol.replace(/-/g, ' ')}`, group: 'A3 manufacturing', value: valueOf(term.id) });

  const methods: ChartDatum[] = [{ label: 'Cut-off (A1–C4)', group: 'Method total', value: json.methods.cutoff.total[code] ?? Number.NaN }];
  for (const method of Object.keys(result.methods)) methods.push({ label: METHOD_SENTENCES[method]!.name, group: 'Method total', value: json.methods[method as 'cff']!.total[code] ?? Number.NaN });
  methods.push({ label: 'Module D (beside cut-off)', group: 'Module D (reported apart)', value: json.methods.cutoff.modules.D?.[code] ?? Number.NaN });

  const charts: Array<Omit<ChartView, 'spec' | 'table'> & { first: string; groups: string[] }> = [
    { id: 'chart-modules', title: `${code} by module`, alt: `Bar chart of ${code} per declared unit for each module, ${byModule.map((d) => `${d.label} ${sci(d.value)}`).join(', ')} ${unit}; module D is reported apart and not added to A–C.`, unit, data: byModule, first: 'Module', groups: ['A–C (in the total)', 'Module D (reported apart)'] },
    { id: 'chart-contributions', title: `${code} of A1-A3 by BOM line and step`, alt: `Bar chart of the contributions to ${code} in A1-A3: ${finite(contributions).map((d) => `${d.label} ${sci(d.value)}`).join(', ')} ${unit}.`, unit, data: finite(contributions), first: 'Contribution', groups: ['A1 raw materials', 'A2 transport', 'A3 manufacturing'] },
    { id: 'chart-methods', title: `${code} under each recycling method`, alt: `Bar chart of ${code} under each method: ${finite(methods).map((d) => `${d.label} ${sci(d.value)}`).join(', ')} ${unit}.`, unit, data: finite(methods), first: 'Method', groups: ['Method total', 'Module D (reported apart)'] },
  ];
  return charts.map(({ first, groups, ...chart }) => ({ ...chart, table: tableOf(chart.data, first), spec: barChart(chart.data, `${code} (${unit})`, groups) }));
}

/** The process models a product's graph holds: each step of the derivation and the factor it yields, linked to the audit trail. */
function processModels(ctx: CalcContext, result: ProductResult, sci: (v: number | null | undefined) => string): ProcessModelView[] {
  // One pass over the graph: the scalar steps of each process, by process id.
  const stepsOf = new Map<string, ProcessModelView['steps']>();
  for (const node of result.graph.nodes.values()) {
    const step = processStepOf(node.id);
    if (node.kind !== 'scalar' || !step) continue;
    if (!stepsOf.has(step.processId)) stepsOf.set(step.processId, []);
    stepsOf.get(step.processId)!.push({ name: step.name, value: { text: formatInput(node.value), href: figureHref(node.id) }, unit: node.unit, formula: node.formula, description: node.description });
  }
  const views: ProcessModelView[] = [];
  for (const definition of ctx.project.processes) {
    const factorNode = result.graph.get(processStep.factor(definition.id));
    if (!factorNode || factorNode.kind !== 'vector') continue;
    views.push({
      id: definition.id,
      kind: definition.kind,
      description: factorNode.description,
      steps: stepsOf.get(definition.id) ?? [],
      factor: ctx.indicators.map((code, i) => ({ code, unit: `${ctx.project.indicatorSet.find(code)!.unit} per kg`, cell: { text: sci(toNullable(factorNode.values[i]!)), href: figureHref(figureId(factorNode.id, code)) } })),
    });
  }
  return views;
}

export interface UncertaintyView {
  iterations: string;
  seed: number;
  varied: string;
  rows: Array<{ figure: string; deterministic: string; median: string; low: string; high: string; mean: string }>;
}

/** The uncertainty section: how the run was made, what varied, and the ranges. */
function uncertaintyView(u: UncertaintyJson, sci: (v: number | null | undefined) => string): UncertaintyView {
  const count = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
  const variedCount = u.varied.factors.length + u.varied.bom.length + u.varied.activities.length;
  return {
    iterations: formatCount(u.iterations),
    seed: u.seed,
    varied:
      variedCount === 0
        ? `No input behind these results has a gsd column, so nothing varied: the ranges equal the result (${count(u.fixed, 'input', 'inputs')} fixed).`
        : `${count(variedCount, 'input', 'inputs')} varied — ${count(u.varied.factors.length, 'factor row', 'factor rows')}${u.varied.factors.length ? ` (${u.varied.factors.join(', ')})` : ''}, ${count(u.varied.bom.length, 'BOM mass', 'BOM masses')}${u.varied.bom.length ? ` (bom.csv line${u.varied.bom.length === 1 ? '' : 's'} ${u.varied.bom.join(', ')})` : ''}, ${count(u.varied.activities.length, 'activity amount', 'activity amounts')}${u.varied.activities.length ? ` (activities.csv line${u.varied.activities.length === 1 ? '' : 's'} ${u.varied.activities.join(', ')})` : ''}; ${count(u.fixed, 'input', 'inputs')} without a gsd stayed fixed.`,
    rows: u.figures.map((f) => ({ figure: f.module === 'total' ? `${f.indicator} A1–C4 total (D not added)` : `${f.indicator} ${f.module}`, deterministic: sci(f.deterministic), median: sci(f.median), low: sci(f.p2_5), high: sci(f.p97_5), mean: sci(f.mean) })),
  };
}

const SCENARIO_COLUMNS = ['mass_kg', 'collected_separately_kg', 'collected_with_mixed_waste_kg', 'reuse_kg', 'recycling_kg', 'energy_recovery_kg', 'incineration_kg', 'landfill_kg'] as const;

/** The scenario tables of a declaration (EN 15804+A2): end of life by material, and module D's net flows and substitutions. */
function scenarioTables(scenarios: ScenariosJson, sci: (value: number | null | undefined) => string): ScenarioTablesView {
  const linked = (value: number | null, id: string | undefined): FigureCell => (id ? { text: sci(value), href: figureHref(id) } : { text: sci(value) });
  const electricity = scenarios.exported_energy;
  return {
    endOfLife: scenarios.end_of_life.map((row) => ({
      stage: row.stage === 'A5' ? 'A5 (packaging)' : 'C1–C4',
      material: row.material,
      cells: SCENARIO_COLUMNS.map((column) => linked(row[column], row.figures[column])),
      transport: row.transport_km > 0 ? `${formatInput(row.transport_km)} km, ${row.transport_factor ?? NOT_GIVEN}` : 'none',
      processing: row.recycling_kg > 0 ? `${row.processing_factor ?? NOT_GIVEN}; recycling yield ${formatShare(row.recycling_yield)}` : NOT_GIVEN,
    })),
    moduleD: scenarios.module_d.map((row) => ({
      material: row.material,
      cells: [linked(row.m_mr_out_kg, row.figures.m_mr_out_kg), linked(row.m_mr_in_kg, row.figures.m_mr_in_kg), linked(row.net_kg, row.figures.net_kg)],
      substitutes: `${row.substituted_factor} (Q_out ${formatInput(row.q_out)})`,
    })),
    ...(electricity.electricity_factor && ((electricity.electricity_mj ?? 0) > 0 || (electricity.heat_mj ?? 0) > 0)
      ? { exportedEnergy: `Exported energy over the declared modules: ${sci(electricity.electricity_mj)} MJ of electricity, replacing ${electricity.electricity_factor}, and ${sci(electricity.heat_mj)} MJ of heat, replacing ${electricity.heat_factor}; credited in D.` }
      : {}),
  };
}
