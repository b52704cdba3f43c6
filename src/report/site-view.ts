import { indicatorValue, type Project } from '../model/project.ts';
import { groupBy, rowsByProduct, type ProductRows } from '../model/by-product.ts';
import type { Table } from '../schema/table.ts';
import { formatProblem, type Problem } from '../problems.ts';
import { findGas, GWP_SOURCES } from '../reference/ghg.ts';
import { findIndicator } from '../reference/indicators.ts';
import { TOOL_NAME, TOOL_VERSION } from '../reference/tool.ts';
import { formatInput, formatShare } from './format.ts';
import type { AuditView } from './audit-view.ts';
import { PROCESS_CAUTION, type DeclarationResultsView } from './declaration-view.ts';
import type { ResultsSummary } from './results.ts';
import { AUDIT_PAGE, RESULTS_CSV, RESULTS_JSON } from '../files.ts';
import { factorAnchor, factorHref, figureHref, fragment, inputAnchor } from './figure-links.ts';
import { physicalLines } from './written.ts';
import { PROCESS_PREFIX } from '../schema/process-parameters.ts';
import { allocationStepOf } from '../calc/allocation.ts';
import { dqrBandsText, dqrRating, pedigreeDqr } from './data-quality.ts';
import { familyDir, type FamilyView } from './family-view.ts';

/** What the site shows of one product's results, taken while its figure graph is alive. */
export interface ProductReport {
  summary: ResultsSummary;
  results: DeclarationResultsView;
  audit: AuditView;
}

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
  /** Links after the text (e.g. the products that read a factor row). */
  links?: Array<{ text: string; href: string }>;
}

export interface TableView {
  title: string;
  caption: string;
  headers: Array<{ text: string; numeric?: boolean }>;
  rows: Array<{ cells: Cell[]; source: SourceRef; anchor?: string }>;
  empty: string;
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
  results?: DeclarationResultsView;
  audit?: AuditView;
  /** Data sources this product's figures rest on (the dataset column of the factor rows it reaches). */
  datasets: string[];
  /** The families (families.csv) this product is a member of. */
  families: Array<{ id: string; name: string; url: string }>;
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
    /** The status as a reader needs it: who verified and when, or that nobody has. */
    statusText: string;
    draft: boolean;
    verifier: string;
    verificationDate: string;
    gwpSet: string;
    backgroundData: string[];
    illustrative: boolean;
  };
  cautions: string[];
  /** Beside every process model. */
  processCaution: string;
  /** Whether this build prints PDFs (pages link to them only then). */
  pdfs: boolean;
  methodology: Array<{ title: string; paragraphs: string[] }>;
  products: ProductView[];
  verification: { inputs: Array<{ file: string; sha256: string; bytes: number }>; datasets: Array<{ name: string; rows: number }>; factorQuality: TableView };
  /** The products that have an audit trail page (those with results). */
  audits: ProductView[];
  /** Every product of the catalogue (in the render that writes the catalogue pages). */
  catalogue: CatalogueEntry[];
  /** [1] in the render that writes the catalogue-wide pages, else []: those templates paginate over it. */
  cataloguePages: number[];
  /** Every factor row once, on its own page; product pages link to it. */
  factors: TableView;
  /** Family declarations (families.csv), in the render that writes the catalogue-wide pages. */
  families: FamilyView[];
  warnings: string[];
  indicators: Array<{ code: string; name: string; unit: string }>;
}

export const CAUTIONS = [
  'This is a public environmental claim only once an independent verifier has verified it under ISO 14025 and the applicable programme rules.',
  'Results depend on the background database, its version and the product category rules (PCR); declarations are comparable only under the same PCR, declared unit and modules (EN 15804+A2 §5.3).',
  'Emission figures used for regulatory reporting must follow the monitoring rules of the jurisdiction and be checked by an accredited verifier; this tool supports, and does not replace, that practice.',
];

function sourceOf(table: Table<unknown>, row: { line: number; lineEnd: number }): SourceRef {
  const lines = physicalLines(table.csv);
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

/** A catalogue row: what the catalogue shows of a product. */
export interface CatalogueEntry {
  id: string;
  name: string;
  declaredUnit: string;
  url: string;
  headline?: DeclarationResultsView['headline'];
  /** The factors.csv lines this product's figures read (the catalogue-wide reverse index). */
  factorLines: number[];
}

export interface SiteViewOptions {
  /** The products whose pages this render writes (a shard of the catalogue), with their reports. */
  products?: ReadonlyArray<{ rows: ProductRows; report?: ProductReport }>;
  /** Given for the render that writes the catalogue-wide pages (catalogue, factor table, verification pack). */
  catalogue?: CatalogueEntry[];
  inputs?: SiteView['verification']['inputs'];
  /** Whether this build prints PDFs (pages link to them only then). */
  pdfs?: boolean;
  /** The family declarations (in the render that writes the catalogue-wide pages). */
  families?: readonly FamilyView[];
}

export const catalogueEntry = (product: ProductView): CatalogueEntry => ({
  id: product.id,
  name: product.name,
  declaredUnit: product.declaredUnit,
  url: product.url,
  ...(product.results ? { headline: product.results.headline } : {}),
  factorLines: product.audit?.inputs.find((input) => input.file === FACTORS_FILE)?.rows.map((row) => row.line) ?? [],
});

const FACTORS_FILE = 'factors.csv';
/** Products linked by name beside a factor row; the rest are counted. */
const LINKED_PRODUCTS = 8;

/**
 * The view of one render. A build renders its products in shards (each with its own
 * product and audit pages), then the catalogue-wide pages once, so memory does not grow
 * with the catalogue.
 */
export function buildSiteView(project: Project, problems: readonly Problem[], options: SiteViewOptions = {}): SiteView {
  const d = project.declaration;
  const shard: ReadonlyArray<{ rows: ProductRows; report?: ProductReport }> = options.products ?? rowsByProduct(project).map((rows) => ({ rows }));
  const products = shard.map(({ rows, report }) => productView(project, rows, report));
  const catalogue = options.catalogue;
  const view: SiteView = {
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
      statusText: d.verification.status === 'verified' ? `verified by ${d.verification.verifier ?? ''} on ${d.verification.date ?? ''}` : 'draft — not verified',
      draft: d.verification.status !== 'verified',
      verifier: d.verification.verifier ?? '',
      verificationDate: d.verification.date ?? '',
      gwpSet: `${d.gwp_set} — ${GWP_SOURCES[d.gwp_set]}`,
      backgroundData: d.background_data.map((b) => `${b.name}, version ${b.version}${b.licence ? ` (${b.licence})` : ''}`),
      illustrative: d.illustrative,
    },
    cautions: CAUTIONS,
    processCaution: PROCESS_CAUTION,
    pdfs: options.pdfs ?? false,
    products,
    methodology: methodology(project),
    audits: products.filter((product) => product.audit !== undefined),
    catalogue: catalogue ?? [],
    cataloguePages: catalogue ? [1] : [],
    families: catalogue ? [...(options.families ?? [])] : [],
    verification: { inputs: [...(options.inputs ?? [])], datasets: catalogue ? datasetCounts(project) : [], factorQuality: catalogue ? factorQualityTable(project, catalogue) : { title: '', caption: '', headers: [], rows: [], empty: '' } },
    factors: catalogue ? factorTable(project, project.factors.rows, catalogue) : { title: '', caption: '', headers: [], rows: [], empty: '' },
    // Family spreads are known once every member is computed: the catalogue render adds them.
    warnings: [...problems.filter((p) => p.severity === 'warning').map(formatProblem), ...(catalogue ? (options.families ?? []).flatMap((family) => family.warnings) : [])],
    indicators: project.indicators.map((code) => {
      const indicator = findIndicator(code)!;
      return { code, name: indicator.name, unit: indicator.unit };
    }),
  };
  return view;
}

/** A fragment id for a factor row (ids may hold characters that are awkward in URLs). */

/** The verification pack's data-quality table: every factor row with its pedigree scores, DQR, rating and data type, and the products whose figures it feeds. */
function factorQualityTable(project: Project, catalogue: readonly CatalogueEntry[]): TableView {
  const readBy = readersOf(catalogue);
  const score = (value: number | null | undefined): Cell => ({ text: value === null || value === undefined ? '—' : String(value), numeric: true });
  return {
    title: 'Data quality of the factors',
    caption: `Every row of factors.csv with its pedigree scores (1 best to 5), DQR = (TeR + GeR + TiR + P) / 4 and rating (PEF method, Recommendation (EU) 2021/2279; ${dqrBandsText()}), its data type, and the products whose figures it feeds, each linked to the row in that product’s audit trail (where the figures that read it are listed). A row without all four scores has no DQR: it is not guessed.`,
    headers: [{ text: 'Factor' }, { text: 'TeR', numeric: true }, { text: 'GeR', numeric: true }, { text: 'TiR', numeric: true }, { text: 'P', numeric: true }, { text: 'DQR', numeric: true }, { text: 'Rating' }, { text: 'Data' }, { text: 'Feeds' }],
    rows: project.factors.rows.map((row) => {
      const { ter, ger, tir, p } = row.value;
      const { dqr, missing } = pedigreeDqr(row.value);
      return {
        source: sourceOf(project.factors, row),
        cells: [
          { text: row.value.factor_id, href: factorHref(row.value.factor_id) },
          score(ter), score(ger), score(tir), score(p),
          { text: dqr === null ? '—' : dqr.toFixed(2), numeric: true },
          txt(dqr === null ? (missing.length === 4 ? 'not scored' : 'partly scored') : dqrRating(dqr)),
          txt(row.value.data_type ?? 'not stated'),
          readBy(row.line),
        ],
      };
    }),
    empty: 'No factors.',
  };
}

/** Per factors.csv line, the products that read it, as a cell with links into their audit trails. */
function readersOf(catalogue: readonly CatalogueEntry[]): (line: number) => Cell {
  const readers = new Map<number, CatalogueEntry[]>();
  for (const entry of catalogue) {
    for (const line of entry.factorLines) {
      if (!readers.has(line)) readers.set(line, []);
      readers.get(line)!.push(entry);
    }
  }
  return (line: number): Cell => {
    const products = readers.get(line) ?? [];
    const rest = products.length - LINKED_PRODUCTS;
    return {
      text: products.length === 0 ? 'none' : `${products.length} product${products.length === 1 ? '' : 's'}${rest > 0 ? `, ${rest} not listed` : ''}:`,
      links: products.slice(0, LINKED_PRODUCTS).map((product) => ({ text: product.id, href: `../${product.id}/${AUDIT_PAGE}#${fragment(inputAnchor(FACTORS_FILE, line))}` })),
    };
  };
}

function factorTable(project: Project, rows: Project['factors']['rows'], catalogue: readonly CatalogueEntry[]): TableView {
  const codes = project.indicators.filter((code) => project.factorIndicators.includes(code));
  const readBy = readersOf(catalogue);
  return {
    title: 'Factor table',
    caption: 'Every row of factors.csv, values per row unit. An empty cell is “not available”, never zero. “Read by”: the products whose figures read the row, each linked to the row in its audit trail.',
    headers: [{ text: 'Factor' }, { text: 'Name' }, { text: 'Per' }, { text: 'Dataset' }, { text: 'Read by' }, ...codes.map((code) => ({ text: code, numeric: true }))],
    rows: rows.map((row) => ({
      anchor: factorAnchor(row.value.factor_id),
      source: sourceOf(project.factors, row),
      cells: [
        txt(row.value.factor_id),
        txt(row.value.name),
        txt(row.value.unit),
        txt(row.value.dataset),
        readBy(row.line),
        ...codes.map((code) => {
          const value = indicatorValue(row.value, code);
          return value === null ? txt('n/a') : num(value);
        }),
      ],
    })),
    empty: 'No factors.',
  };
}

/** Scenario rows by name, grouped once per project (not once per product). */
const scenarioCache = new WeakMap<Project, Map<string, Project['eol']['rows']>>();
function scenariosOf(project: Project): Map<string, Project['eol']['rows']> {
  let scenarios = scenarioCache.get(project);
  if (!scenarios) scenarioCache.set(project, (scenarios = groupBy(project.eol.rows, (row) => row.value.scenario)));
  return scenarios;
}

/** The rows of other files a product's page shows beside its own: its scenario, materials, the factor rows and processes they name. */
export function productInputs(project: Project, rows: ProductRows) {
  const eolRows = scenariosOf(project).get(rows.product.value.eol_scenario) ?? [];
  const materialIds = new Set(rows.bom.map((row) => row.value.material));
  const materials = project.materials.rows.filter((row) => materialIds.has(row.value.material));
  const factorIds = new Set<string>();
  for (const m of materials) for (const id of [m.value.virgin, m.value.recycled, m.value.eol_recycling, m.value.substituted, m.value.landfill, m.value.incineration]) if (id) factorIds.add(id);
  for (const a of rows.activities) factorIds.add(a.value.factor);
  for (const t of rows.transport) factorIds.add(t.value.factor);
  for (const a of rows.site) factorIds.add(a.row.value.factor);
  for (const e of eolRows) for (const id of [e.value.transport_factor, e.value.processing_factor]) if (id) factorIds.add(id);
  const factors = project.factors.rows.filter((row) => factorIds.has(row.value.factor_id));
  const processIds = new Set([...factorIds].filter((id) => id.startsWith(PROCESS_PREFIX)).map((id) => id.slice(PROCESS_PREFIX.length)));
  const processRows = project.process.rows.filter((row) => processIds.has(row.value.process_id));
  // Site data: the rows shared to the product, and the production of every product of their periods (the shares rest on it).
  const siteRows = [...new Set(rows.site.map((a) => a.row))];
  const groups = [...new Set(rows.site.map((a) => a.group))];
  const productionRows = groups.flatMap((group) => group.production);
  const massKeyed = new Set(rows.site.filter((a) => a.key.name === 'mass').flatMap((a) => a.group.production.map((p) => p.value.product_id)));
  const siteProducts = project.products.rows.filter((row) => massKeyed.has(row.value.product_id));
  // The families it belongs to: its page names them.
  const familyIds = new Set(project.families.filter((family) => family.members.some((m) => m.productId === rows.product.value.product_id)).map((family) => family.id));
  const familyRows = project.familyRows.rows.filter((row) => familyIds.has(row.value.family_id));
  return { eolRows, materials, factorIds, factors, processRows, siteRows, productionRows, siteProducts, familyRows };
}

function productView(project: Project, rows: ProductRows, report: ProductReport | undefined): ProductView {
  const productRow = rows.product;
  const product = productRow.value;
  const lines = rows.bom;
  const activities = rows.activities;
  const legs = rows.transport;
  const { eolRows, materials, factorIds, factors, processRows, productionRows } = productInputs(project, rows);
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
        cells: [{ text: row.value.factor_id, href: factorHref(row.value.factor_id) }, txt(row.value.name), txt(row.value.unit), txt(row.value.dataset)],
      })),
      empty: 'No factors.',
    },
  ];
  if (rows.site.length > 0) {
    tables.push({
      title: 'Site data, allocated',
      caption: `Amounts metered or bought for a whole site and period (site.csv), shared among the products made there by the key each row names (ISO 14044 §4.3.4): per declared unit, amount × share ÷ this product’s output. The share links to its derivation.`,
      headers: [{ text: 'Site' }, { text: 'Period' }, { text: 'Module' }, { text: 'Activity' }, { text: 'Factor' }, { text: 'Amount in the period', numeric: true }, { text: 'Unit' }, { text: 'Key' }, { text: 'Share', numeric: true }, { text: 'Output', numeric: true }, { text: 'Source' }],
      rows: rows.site.map((a) => ({
        source: sourceOf(project.site, a.row),
        cells: [
          txt(a.group.site), txt(a.group.period), txt(a.row.value.module), txt(a.row.value.activity), txt(a.row.value.factor), num(a.row.value.amount), txt(a.row.value.unit), txt(a.key.name),
          { ...pct(a.share), href: figureHref(allocationStepOf(a, 'share')) },
          num(a.production.value.output), txt(a.row.value.source),
        ],
      })),
      empty: '',
    });
    const keys = [...new Map(rows.site.map((a) => [`${a.group.site}\u0000${a.group.period}\u0000${a.key.name}`, a])).values()];
    tables.push({
      title: 'Production at the sites',
      caption: `Output of every product made at the sites and periods above (production.csv), in declared units, with each product’s share by ${keys.map((a) => a.key.name).filter((k, i, all) => all.indexOf(k) === i).join(', ')}; the shares of a key add up to 100 %.`,
      headers: [{ text: 'Site' }, { text: 'Period' }, { text: 'Product' }, { text: 'Output', numeric: true }, ...keys.flatMap((a) => [{ text: `Key: ${a.key.name}${a.key.name === 'mass' ? ' (kg)' : ''}`, numeric: true }, { text: `Share by ${a.key.name} (${a.group.site}, ${a.group.period})`, numeric: true }]), { text: 'Source' }],
      rows: productionRows.map((row) => ({
        source: sourceOf(project.production, row),
        cells: [
          txt(row.value.site_id), txt(row.value.period), txt(row.value.product_id), num(row.value.output),
          ...keys.flatMap((a) => {
            const key = a.group.production.includes(row) ? a.key.values.get(row.value.product_id) : undefined;
            return key === undefined ? [txt('—'), txt('—')] : [num(key), pct(key / a.key.total)];
          }),
          txt(row.value.source),
        ],
      })),
      empty: '',
    });
  }
  if (processRows.length > 0) {
    tables.push({
      title: 'Process data',
      caption: 'Operating data of the processes this product’s factors are derived from (process.csv), one parameter a row.',
      headers: [{ text: 'Process' }, { text: 'Kind' }, { text: 'Parameter' }, { text: 'Value', numeric: true }, { text: 'Unit' }, { text: 'Source' }],
      rows: processRows.map((row) => ({
        source: sourceOf(project.process, row),
        cells: [txt(row.value.process_id), txt(row.value.kind), txt(row.value.parameter), { text: row.value.value, numeric: true }, txt(row.value.unit), txt(row.value.source)],
      })),
      empty: '',
    });
  }
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
    ...(report ? { results: report.results, audit: report.audit } : {}),
    datasets: [...new Set(factors.map((row) => row.value.dataset).filter((d): d is string => Boolean(d)))].sort(),
    families: project.families.filter((family) => family.members.some((m) => m.productId === product.product_id)).map((family) => ({ id: family.id, name: family.name, url: `../${familyDir(family.id)}/index.html` })),
    resultsJson: RESULTS_JSON,
    resultsCsv: RESULTS_CSV,
  };
}

/** How site-level data were shared among products, when the project has any (ISO 14044 §4.3.4). */
function siteAllocationStatement(project: Project): string[] {
  const groups = project.allocation.groups.filter((group) => group.keys.size > 0);
  if (groups.length === 0) return [];
  const described = groups.map((group) => `${group.site} (${group.period}: ${group.rows.length} row${group.rows.length === 1 ? '' : 's'} of site.csv shared among ${group.production.length} product${group.production.length === 1 ? '' : 's'} by ${[...group.keys.keys()].join(', ')})`);
  return [
    `Site-level data (ISO 14044 §4.3.4): amounts metered or bought for a whole site and period are shared among the products made there in that period, per declared unit amount × key_p / Σ keys ÷ output_p, where the key is the output’s mass (output × unit mass), the output in declared units, or a key of the practitioner’s own from production.csv. Allocation was not avoided by subdivision for these rows; the shares are listed with the inputs of each declaration. Sites: ${described.join('; ')}.`,
  ];
}

/**
 * The methodology statements every declaration page and the verification pack print: how
 * the figures were made, where the standards leave a choice, and which choice was made.
 */
export function methodology(project: Project): Array<{ title: string; paragraphs: string[] }> {
  const d = project.declaration;
  const methods = d.methods ?? ['cutoff', 'cff', 'eol-recycling', 'fifty-fifty'];
  return [
    {
      title: 'System boundary',
      paragraphs: [
        'Cradle to gate with end of life: modules A1–A3 (raw material supply, transport to the manufacturer, manufacturing including packaging production), C1–C4 (end of life) and module D (benefits and loads beyond the system boundary). A4 and A5 are declared only where the inputs hold activities or transport for them; the use stage (B1–B7) is not declared. A module not declared is marked so, never shown as zero.',
        'Module D is reported beside A–C and is never added to a total (EN 15804+A2).',
      ],
    },
    {
      title: 'Cut-off and completeness',
      paragraphs: [
        'EN 15804+A2 cut-off rule: a flow may be left out only if it is below 1 % of the mass and of the primary energy of its unit process, and all flows left out together stay below 5 % per module. The inputs list every flow that was included; flows left out are the practitioner’s statement in the inputs, not the tool’s.',
      ],
    },
    {
      title: 'Allocation and recycling',
      paragraphs: [
        'A1–C4 follow the cut-off (polluter pays) rule: recycled input carries only its reprocessing (factor “recycled”); process scrap sent to recycling leaves A3 free of burden and is reported as MFR; process scrap landfilled or incinerated is charged to A3.',
        'Module D (EN 15804+A2 Annex D), per material: D = (M_MR,out − M_MR,in) · (E_MR,after EoW,out − E_VMSub,out · Q_R,out/Q_Sub). Only the net flow earns a credit; a negative net flow gives a load. M_MR,out includes process scrap sent to recycling, after the recycling yield.',
        'Besides cut-off, the Circular Footprint Formula (Commission Recommendation (EU) 2021/2279; A from materials.csv, else 0.2 for metals; B = 0) and its presets 0:100 (A = 0) and 50:50 (A = 0.5) are shown for comparison where the declaration asks for them' + ` (${methods.join(', ')}).` + ' Under these, process scrap sent to recycling earns the same end-of-life term as the product, scrap · yield · (1 − A) · (E_recEoL − E*v · Q_out); disposed scrap is charged as in A3.',
        'Incineration with energy recovery is charged to C3; the exported energy is credited in module D' + (d.energy_recovery ? ` at an electrical efficiency of ${d.energy_recovery.electricity_efficiency} and a thermal efficiency of ${d.energy_recovery.heat_efficiency} (declaration.json energy_recovery).` : ' where declaration.json gives the plant efficiencies (energy_recovery).'),
        ...siteAllocationStatement(project),
      ],
    },
    {
      title: 'Data sources and data quality',
      paragraphs: [
        `Background data: ${d.background_data.map((b) => `${b.name}, version ${b.version}`).join('; ')}. Each factor row names its dataset; each input row its source. Reference year of the inventory: ${d.reference_year}.`,
        `Direct greenhouse-gas emissions are characterised with GWP-100 values from ${GWP_SOURCES[d.gwp_set]}.`,
        'Data quality ratings (pedigree scores) are not part of the inputs of this version; the source column of each input row and the dataset of each factor row are shown instead, and the verifier judges their representativeness.',
      ],
    },
    ...(project.processes.length > 0
      ? [
          {
            title: 'Process models',
            paragraphs: [
              `Primary metal from ${project.processes.length === 1 ? 'one process' : `${project.processes.length} processes`} of the declarant or its suppliers is modelled from operating data (process.csv: ${project.processes.map((p) => `${p.id}, ${p.kind}`).join('; ')}): electricity by Faraday’s law (F from CODATA 2018, molar masses from the IUPAC standard atomic weights) or as measured above the Faraday floor; anode CO2, PFCs and carbon balances by the IPCC 2006 Guidelines, Vol. 3, Ch. 4; stoichiometric floors from the balanced cell reactions. Each product page shows the derivation and the tier used.`,
              PROCESS_CAUTION,
            ],
          },
        ]
      : []),
    {
      title: 'Assumptions',
      paragraphs: [
        'Gross input of a BOM line G = m / (1 − scrap rate); recycled content R1 = pre- + post-consumer share (ISO 14021: rework and regrind reclaimed within the same process is not recycled content).',
        'An A2 transport leg without a BOM line carries the gross input of the product’s own lines; legs in A4 and C2 carry the net mass.',
        'Biogenic carbon not given is zero for metals, minerals and polymers; 1 kg C corresponds to 44/12 kg CO2.',
        'A value a factor row lacks is “n/a” (not available), never zero, and every figure that depends on it is n/a too.',
        'Results are rounded for display only; every sum is computed from unrounded values.',
      ],
    },
  ];
}

function datasetCounts(project: Project): Array<{ name: string; rows: number }> {
  const counts = new Map<string, number>();
  for (const row of project.factors.rows) counts.set(row.value.dataset, (counts.get(row.value.dataset) ?? 0) + 1);
  return [...counts].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([name, rows]) => ({ name, rows }));
}
