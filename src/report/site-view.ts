import { indicatorValue, type Project } from '../model/project.ts';
import { groupBy, rowsByProduct, type ProductRows } from '../model/by-product.ts';
import type { Table } from '../schema/table.ts';
import { formatProblem, type Problem } from '../problems.ts';
import { findGas, GWP_SOURCES } from '../reference/ghg.ts';
import { findIndicator } from '../reference/indicators.ts';
import { TOOL_NAME, TOOL_VERSION } from '../reference/tool.ts';
import { formatInput, formatScientific, formatShare } from './format.ts';
import type { ResultsSummary } from './results.ts';

/**
 * View models for the site: everything a template prints, already formatted, so the
 * templates only lay it out (no arithmetic in Nunjucks).
 */
export interface SourceRef {
  /** `bom.csv:12` */
  label: string;
  file: string;
  line: number;
  /** The record exactly as it appears in the file. */
  written: string;
}

export interface Cell {
  text: string;
  /** Right-aligned number column. */
  numeric?: boolean;
  /** A link, relative to the page the cell is on. */
  href?: string;
}

export interface TableView {
  title: string;
  caption: string;
  headers: Array<{ text: string; numeric?: boolean }>;
  rows: Array<{ cells: Cell[]; source: SourceRef; anchor?: string }>;
  empty: string;
}

export interface ResultsView {
  modules: Array<{ code: string; moduleD: boolean }>;
  rows: Array<{ code: string; name: string; unit: string; cells: Array<{ text: string; moduleD: boolean }> }>;
  methods: Array<{ name: string; rewards: string; total: string; note: string }>;
  indicator: string;
}

export interface ProductView {
  id: string;
  name: string;
  declaredUnit: string;
  unitMass: string;
  description: string;
  eolScenario: string;
  source: SourceRef;
  url: string;
  pdf: string;
  lineCount: number;
  tables: TableView[];
  results?: ResultsView;
  resultsJson: string;
  resultsCsv: string;
}

export interface SiteView {
  tool: { name: string; version: string };
  declaration: {
    owner: string;
    address: string;
    contact: string;
    standard: string;
    pcr: string;
    referenceYear: string;
    issued: string;
    validUntil: string;
    status: string;
    draft: boolean;
    verifier: string;
    verificationDate: string;
    gwpSet: string;
    backgroundData: string[];
    illustrative: boolean;
  };
  cautions: string[];
  products: ProductView[];
  /** Every factor row once, on its own page; product pages link to it. */
  factors: TableView;
  warnings: string[];
  indicators: Array<{ code: string; name: string; unit: string }>;
}

export const CAUTIONS = [
  'This is a public environmental claim only once an independent verifier has verified it under ISO 14025 and the applicable programme rules.',
  'Results depend on the background database, its version and the product category rules (PCR); declarations are comparable only under the same PCR, declared unit and modules (EN 15804+A2 §5.3).',
  'Emission figures used for regulatory reporting must follow the monitoring rules of the jurisdiction and be checked by an accredited verifier; this tool supports, and does not replace, that practice.',
];

/** Each file's physical lines, split once per file (not once per row). */
const linesCache = new WeakMap<object, string[]>();

function sourceOf(table: Table<unknown>, row: { line: number; lineEnd: number }): SourceRef {
  let lines = linesCache.get(table.csv);
  if (!lines) {
    lines = table.csv.text.split('\n');
    linesCache.set(table.csv, lines);
  }
  return {
    label: `${table.file}:${row.line}`,
    file: table.file,
    line: row.line,
    written: lines.slice(row.line - 1, row.lineEnd).join('\n'),
  };
}

const num = (value: number): Cell => ({ text: formatInput(value), numeric: true });
const pct = (value: number): Cell => ({ text: formatShare(value), numeric: true });
const txt = (value: string | undefined): Cell => ({ text: value ?? '' });

/** One sentence per method: what it rewards. */
export const METHOD_SENTENCES: Record<string, { name: string; rewards: string }> = {
  cutoff: { name: 'Cut-off, with module D (EN 15804+A2)', rewards: 'Rewards recycled content: secondary input carries only its reprocessing; the net benefit of recycling at end of life is shown apart, in module D, and is not in the total.' },
  cff: { name: 'Circular Footprint Formula', rewards: 'Shares the benefit of recycling between the user of recycled material and the supplier of recyclable material by the allocation factor A (0.2 for metals, Recommendation (EU) 2021/2279).' },
  'eol-recycling': { name: 'End-of-life recycling, 0:100', rewards: 'Rewards recycling at end of life: recycled input carries the virgin burden, and material recycled at end of life earns the virgin production it avoids.' },
  'fifty-fifty': { name: '50:50', rewards: 'Splits the burden and the benefit of recycling equally between the recycled input and the recyclable output.' },
};

const sci = (value: number | null | undefined): string => (value === null || value === undefined ? 'n/a' : formatScientific(value, 3));

function resultsView(results: ResultsSummary): ResultsView {
  const modules = Object.keys(results.methods.cutoff.modules).map((code) => ({ code, moduleD: code === 'D' }));
  const rows = results.indicators.map((indicator) => ({
    code: indicator.code,
    name: indicator.name,
    unit: indicator.unit,
    cells: modules.map((m) => ({ text: sci(results.methods.cutoff.modules[m.code]?.[indicator.code]), moduleD: m.moduleD })),
  }));
  const code = 'GWP-total';
  const methods = Object.entries(results.methods).map(([method, values]) => ({
    ...METHOD_SENTENCES[method]!,
    total: sci(values.total[code]),
    note: method === 'cutoff' ? `A1–C4; module D ${sci(results.methods.cutoff.modules.D?.[code])} reported apart` : 'life cycle, as the method defines it',
  }));
  return { modules, rows, methods, indicator: code };
}

export function buildSiteView(project: Project, problems: readonly Problem[], results: readonly ResultsSummary[] = []): SiteView {
  const d = project.declaration;
  return {
    tool: { name: TOOL_NAME, version: TOOL_VERSION },
    declaration: {
      owner: d.owner.name,
      address: d.owner.address ?? '',
      contact: d.owner.contact ?? '',
      standard: d.standard,
      pcr: d.pcr,
      referenceYear: String(d.reference_year),
      issued: d.issued,
      validUntil: d.valid_until,
      status: d.verification.status,
      draft: d.verification.status !== 'verified',
      verifier: d.verification.verifier ?? '',
      verificationDate: d.verification.date ?? '',
      gwpSet: `${d.gwp_set} — ${GWP_SOURCES[d.gwp_set]}`,
      backgroundData: d.background_data.map((b) => `${b.name}, version ${b.version}${b.licence ? ` (${b.licence})` : ''}`),
      illustrative: d.illustrative,
    },
    cautions: CAUTIONS,
    products: productViews(project, new Map(results.map((r) => [r.product_id, r]))),
    factors: factorTable(project, project.factors.rows),
    warnings: problems.filter((p) => p.severity === 'warning').map(formatProblem),
    indicators: project.indicators.map((code) => {
      const indicator = findIndicator(code)!;
      return { code, name: indicator.name, unit: indicator.unit };
    }),
  };
}

/** A fragment id for a factor row (ids may hold characters that are awkward in URLs). */
export const factorAnchor = (factorId: string) => `f-${encodeURIComponent(factorId).replace(/%/g, '_')}`;

function factorTable(project: Project, rows: Project['factors']['rows']): TableView {
  const codes = project.indicators.filter((code) => project.factorIndicators.includes(code));
  return {
    title: 'Factor table',
    caption: 'Every row of factors.csv, values per row unit. An empty cell is “not available”, never zero.',
    headers: [{ text: 'Factor' }, { text: 'Name' }, { text: 'Per' }, { text: 'Dataset' }, ...codes.map((code) => ({ text: code, numeric: true }))],
    rows: rows.map((row) => ({
      anchor: factorAnchor(row.value.factor_id),
      source: sourceOf(project.factors, row),
      cells: [
        txt(row.value.factor_id),
        txt(row.value.name),
        txt(row.value.unit),
        txt(row.value.dataset),
        ...codes.map((code) => {
          const value = indicatorValue(row.value, code);
          return value === null ? txt('n/a') : num(value);
        }),
      ],
    })),
    empty: 'No factors.',
  };
}

/** Rows grouped by product once (and scenarios by name), so building every page is linear in the catalogue. */
function productViews(project: Project, results: Map<string, ResultsSummary>): ProductView[] {
  const scenarios = groupBy(project.eol.rows, (row) => row.value.scenario);
  return rowsByProduct(project).map((rows) => productView(project, rows, scenarios, results.get(rows.product.value.product_id)));
}

function productView(project: Project, rows: ProductRows, scenarios: Map<string, Project['eol']['rows']>, results: ResultsSummary | undefined): ProductView {
  const productRow = rows.product;
  const product = productRow.value;
  const lines = rows.bom;
  const activities = rows.activities;
  const legs = rows.transport;
  const eolRows = scenarios.get(product.eol_scenario) ?? [];
  const materialIds = new Set(lines.map((row) => row.value.material));
  const materials = project.materials.rows.filter((row) => materialIds.has(row.value.material));

  const factorIds = new Set<string>();
  for (const m of materials) for (const id of [m.value.virgin, m.value.recycled, m.value.eol_recycling, m.value.substituted, m.value.landfill, m.value.incineration]) if (id) factorIds.add(id);
  for (const a of activities) factorIds.add(a.value.factor);
  for (const t of legs) factorIds.add(t.value.factor);
  for (const e of eolRows) for (const id of [e.value.transport_factor, e.value.processing_factor]) if (id) factorIds.add(id);
  const factors = project.factors.rows.filter((row) => factorIds.has(row.value.factor_id));
  const gases = [...factorIds].map(findGas).filter((gas) => gas !== undefined);

  const tables: TableView[] = [
    {
      title: 'Bill of materials',
      caption: `Material lines in one declared unit (${product.declared_unit}); masses are net; pre- and post-consumer recycled content (ISO 14021) and scrap rate are shares of the input.`,
      headers: [{ text: 'Line' }, { text: 'Component' }, { text: 'Material' }, { text: 'Role' }, { text: 'Mass (kg)', numeric: true }, { text: 'Pre-consumer', numeric: true }, { text: 'Post-consumer', numeric: true }, { text: 'Scrap rate', numeric: true }, { text: 'Scrap to' }, { text: 'Source' }],
      rows: lines.map((row) => ({
        source: sourceOf(project.bom, row),
        cells: [txt(row.value.line_id), txt(row.value.component), txt(row.value.material), txt(row.value.role), num(row.value.mass_kg), pct(row.value.recycled_pre), pct(row.value.recycled_post), pct(row.value.scrap_rate), txt(row.value.scrap_fate), txt(row.value.source)],
      })),
      empty: 'No BOM lines.',
    },
    {
      title: 'Activities',
      caption: 'Energy, ancillary materials and direct emissions per declared unit.',
      headers: [{ text: 'Module' }, { text: 'Activity' }, { text: 'Factor' }, { text: 'Amount', numeric: true }, { text: 'Unit' }, { text: 'Source' }],
      rows: activities.map((row) => ({
        source: sourceOf(project.activities, row),
        cells: [txt(row.value.module), txt(row.value.activity), txt(row.value.factor), num(row.value.amount), txt(row.value.unit), txt(row.value.source)],
      })),
      empty: 'No activities.',
    },
    {
      title: 'Transport',
      caption: 'Legs carrying one BOM line’s gross input, or the whole product’s gross input where no line is named.',
      headers: [{ text: 'Module' }, { text: 'Line' }, { text: 'Leg' }, { text: 'Factor' }, { text: 'Distance (km)', numeric: true }, { text: 'Source' }],
      rows: legs.map((row) => ({
        source: sourceOf(project.transport, row),
        cells: [txt(row.value.module), txt(row.value.line_id ?? 'whole product'), txt(row.value.leg), txt(row.value.factor), num(row.value.distance_km), txt(row.value.source)],
      })),
      empty: 'No transport legs.',
    },
    {
      title: `End-of-life scenario “${product.eol_scenario}”`,
      caption: 'Shares of the end-of-life mass by route; * applies to every material without its own row.',
      headers: [{ text: 'Material' }, { text: 'Re-use', numeric: true }, { text: 'Recycling', numeric: true }, { text: 'Energy recovery', numeric: true }, { text: 'Incineration', numeric: true }, { text: 'Landfill', numeric: true }, { text: 'Recycling yield', numeric: true }, { text: 'Transport (km)', numeric: true }, { text: 'Source' }],
      rows: eolRows.map((row) => ({
        source: sourceOf(project.eol, row),
        cells: [txt(row.value.material), pct(row.value.reuse), pct(row.value.recycling), pct(row.value.energy_recovery), pct(row.value.incineration), pct(row.value.landfill), pct(row.value.recycling_yield), num(row.value.transport_km), txt(row.value.source)],
      })),
      empty: 'No scenario rows.',
    },
    {
      title: 'Materials',
      caption: 'Factor ids for each stage of the material’s life and the parameters of the recycling-credit methods.',
      headers: [{ text: 'Material' }, { text: 'Family' }, { text: 'Virgin' }, { text: 'Recycled' }, { text: 'EoL recycling' }, { text: 'Landfill' }, { text: 'Incineration' }, { text: 'Q in', numeric: true }, { text: 'Q out', numeric: true }, { text: 'Biogenic C (kg/kg)', numeric: true }],
      rows: materials.map((row) => {
        const m = row.value;
        return {
          source: sourceOf(project.materials, row),
          cells: [txt(`${m.material} — ${m.name}`), txt(m.family), txt(m.virgin), txt(m.recycled ?? '—'), txt(m.eol_recycling ?? '—'), txt(m.landfill ?? '—'), txt(m.incineration ?? '—'), num(m.q_in), num(m.q_out), m.biogenic_c_kg_per_kg === null ? txt('not given') : num(m.biogenic_c_kg_per_kg)],
        };
      }),
      empty: 'No materials.',
    },
    {
      title: 'Factors used',
      caption: 'Factor rows this product reaches; their values per indicator are on the factor table page.',
      headers: [{ text: 'Factor' }, { text: 'Name' }, { text: 'Per' }, { text: 'Dataset' }],
      rows: factors.map((row) => ({
        source: sourceOf(project.factors, row),
        cells: [{ text: row.value.factor_id, href: `../factors/index.html#${factorAnchor(row.value.factor_id)}` }, txt(row.value.name), txt(row.value.unit), txt(row.value.dataset)],
      })),
      empty: 'No factors.',
    },
  ];
  if (gases.length > 0) {
    tables.push({
      title: 'Built-in greenhouse gases used',
      caption: `GWP-100 values from ${GWP_SOURCES[project.declaration.gwp_set]}.`,
      headers: [{ text: 'Gas' }, { text: 'Name' }, { text: `GWP-100 (${project.declaration.gwp_set})`, numeric: true }],
      rows: gases.map((gas) => ({
        source: { label: 'src/reference/ghg.ts', file: 'src/reference/ghg.ts', line: 0, written: GWP_SOURCES[project.declaration.gwp_set] },
        cells: [txt(`ghg:${gas.id}`), txt(gas.name), num(gas[project.declaration.gwp_set])],
      })),
      empty: '',
    });
  }
  return {
    id: product.product_id,
    name: product.name,
    declaredUnit: product.declared_unit,
    unitMass: formatInput(product.unit_mass_kg),
    description: product.description ?? '',
    eolScenario: product.eol_scenario,
    source: sourceOf(project.products, productRow),
    url: `${product.product_id}/index.html`,
    pdf: `${product.product_id}/declaration.pdf`,
    lineCount: lines.length,
    tables,
    ...(results ? { results: resultsView(results) } : {}),
    resultsJson: 'results.json',
    resultsCsv: 'results.csv',
  };
}
