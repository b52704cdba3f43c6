import type { Project } from '../model/project.ts';
import { rowsByProduct, type ProductRows } from '../model/by-product.ts';
import { formatProblem, type Problem } from '../problems.ts';
import { GWP_SOURCES } from '../reference/ghg.ts';
import { findIndicator } from '../reference/indicators.ts';
import { HEADLINE_INDICATOR, HEADLINE_MODULE, HEADLINE_MODULE_D } from '../reference/headline.ts';
import { TOOL_NAME, TOOL_VERSION } from '../reference/tool.ts';
import { PROCESS_CAUTION } from './declaration-view.ts';
import { familyDir, type FamilyView } from './family-view.ts';
import { processUuidOf } from './ilcd-link.ts';
import { DECLARATION_ILCD } from '../files.ts';
import { factorTable } from './factor-table.ts';
import { methodology } from './methodology.ts';
import { productView, type CatalogueEntry, type ProductReport, type ProductView } from './product-view.ts';
import type { TableView } from './table-view.ts';
import { datasetCounts, factorQualityTable } from './verification-view.ts';
import { formatCounted } from '../format.ts';
import { CHECKS } from '../calc/checklist.ts';

export type { CatalogueEntry, ProductReport, ProductView } from './product-view.ts';
export { catalogueEntry } from './product-view.ts';
export type { Cell, SourceRef, TableView } from './table-view.ts';

/**
 * The view of a render of the site: the project-wide context every page prints, the products
 * of one shard (src/report/product-view.ts) and, in the render that writes them, the
 * catalogue-wide pages: the factor table (factor-table.ts), the verification pack
 * (verification-view.ts) and the families. The methodology statements are in methodology.ts.
 */

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
  verification: {
    inputs: Array<{ file: string; sha256: string; bytes: number }>;
    datasets: Array<{ name: string; rows: number }>;
    factorQuality: TableView;
    /** Each product's and family's ILCD+EPD archive, with its process dataset's UUID. */
    exchange: Array<{ kind: string; id: string; name: string; href: string; uuid: string }>;
    /** The verifier's record (verification-record.json), and what is still as verified. */
    record: { state: string; verifier: string; date: string; programme: string; tool: string; fingerprint: string; scope: string; declarations: Array<{ kind: string; id: string; name: string; href: string; status: string; text: string }> } | undefined;
  };
  /** The products that have an audit trail page (those with results). */
  audits: ProductView[];
  /** Every product of the catalogue (in the render that writes the catalogue pages). */
  catalogue: CatalogueEntry[];
  /** Whether this render writes the catalogue-wide pages (catalogue, factor table, verification pack). */
  writesCatalogue: boolean;
  /** Every factor row once, on its own page; product pages link to it. */
  factors: TableView;
  /** Family declarations (families.csv), in the render that writes the catalogue-wide pages. */
  families: FamilyView[];
  /** “1 family”, “3 families”. */
  familiesCount: string;
  /** “1 product”, “1000 products”. */
  productsCount: string;
  /** The headline columns of the catalogue: `GWP-total A1-A3 (kg CO2 eq.)`, `Module D GWP-total (kg CO2 eq.)`. */
  headlineHeads: { indicator: string; a1a3: string; d: string };
  warnings: string[];
  indicators: Array<{ code: string; name: string; unit: string }>;
  /** The verifier's checklist over the catalogue: the checks, and how many products hold, warn or fail. */
  checklist: { checks: typeof CHECKS; summary: string };
}

export const CAUTIONS = [
  'This is a public environmental claim only once an independent verifier has verified it under ISO 14025 and the applicable programme rules.',
  'Results depend on the background database, its version and the product category rules (PCR); declarations are comparable only under the same PCR, declared unit and modules (EN 15804+A2 §5.3).',
  'Emission figures used for regulatory reporting must follow the monitoring rules of the jurisdiction and be checked by an accredited verifier; this tool supports, and does not replace, that practice.',
];

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

/**
 * The view of one render. A build renders its products in shards (each with its own
 * product and audit pages), then the catalogue-wide pages once, so memory does not grow
 * with the catalogue.
 */
export function buildSiteView(project: Project, problems: readonly Problem[], options: SiteViewOptions = {}): SiteView {
  const shard: ReadonlyArray<{ rows: ProductRows; report?: ProductReport }> = options.products ?? rowsByProduct(project).map((rows) => ({ rows }));
  const products = shard.map(({ rows, report }) => productView(project, rows, report));
  const catalogue = options.catalogue;
  const view: SiteView = {
    ...siteContext(project, options.pdfs ?? false),
    products,
    audits: products.filter((product) => product.audit !== undefined),
    catalogue: catalogue ?? [],
    writesCatalogue: catalogue !== undefined,
    families: catalogue ? [...(options.families ?? [])] : [],
    familiesCount: formatCounted(catalogue ? (options.families ?? []).length : 0, 'family', 'families'),
    productsCount: formatCounted(catalogue?.length ?? 0, 'product', 'products'),
    headlineHeads: headlineHeads(),
    checklist: { checks: CHECKS, summary: catalogue ? checklistSummary(catalogue) : '' },
    verification: {
      inputs: [...(options.inputs ?? [])],
      datasets: catalogue ? datasetCounts(project) : [],
      factorQuality: catalogue ? factorQualityTable(project, catalogue) : { title: '', caption: '', headers: [], rows: [], empty: '' },
      exchange: catalogue
        ? [
            ...catalogue.map((entry) => ({ kind: 'product', id: entry.id, name: entry.name, href: `../${entry.id}/${DECLARATION_ILCD}`, uuid: processUuidOf(project.declaration, 'product', entry.id) })),
            ...(options.families ?? []).map((family) => ({ kind: 'family', id: family.id, name: family.name, href: `../${familyDir(family.id)}/${DECLARATION_ILCD}`, uuid: processUuidOf(project.declaration, 'family', family.id) })),
          ]
        : [],
      record: catalogue ? recordView(project, catalogue, options.families ?? []) : undefined,
    },
    factors: catalogue ? factorTable(project, project.factors.rows, catalogue) : { title: '', caption: '', headers: [], rows: [], empty: '' },
    // Family spreads are known once every member is computed: the catalogue render adds them.
    warnings: [...problems.filter((p) => p.severity === 'warning').map((problem) => formatProblem(problem)), ...(catalogue ? (options.families ?? []).flatMap((family) => family.warnings) : [])],
  };
  // The catalogue-wide pages are drafts unless every declaration is as verified; they say how many are.
  if (catalogue) {
    const verified = catalogue.filter((entry) => entry.verification.status === 'verified').length;
    if (verified < catalogue.length) view.declaration = { ...view.declaration, draft: true, status: 'draft' };
    if (project.verification.state.kind === 'valid') view.declaration = { ...view.declaration, statusText: `${view.declaration.statusText}: ${formatCounted(verified, 'declaration', 'declarations')} of ${catalogue.length} as verified` };
  }
  return view;
}

/** The verification pack's account of the verifier's record: who, when, which key, and each declaration's status now. */
function recordView(project: Project, catalogue: readonly CatalogueEntry[], families: readonly FamilyView[]): SiteView['verification']['record'] {
  const state = project.verification.state;
  if (state.kind === 'none') return undefined;
  const declarations = [
    ...catalogue.map((entry) => ({ kind: 'product', id: entry.id, name: entry.name, href: `../${entry.url}`, status: entry.verification.status, text: entry.verification.text })),
    ...families.map((family) => ({ kind: 'family', id: family.id, name: family.name, href: `../${family.url}`, status: family.verification?.status ?? 'draft', text: family.verification?.text ?? 'draft' })),
  ];
  if (state.kind === 'invalid') return { state: state.reason, verifier: '', date: state.date ?? '', programme: '', tool: '', fingerprint: '', scope: '', declarations };
  const r = state.record;
  return {
    state: `valid: the signature checks against ${state.publicKeyFile}`,
    verifier: r.verifier,
    date: r.date,
    programme: r.programme,
    tool: `${r.tool.name} ${r.tool.version}`,
    fingerprint: state.fingerprint,
    scope: `${formatCounted(r.scope.products.length, 'product', 'products')} (${r.scope.products.join(', ') || 'none'}); ${formatCounted(r.scope.families.length, 'family', 'families')} (${r.scope.families.join(', ') || 'none'})`,
    declarations,
  };
}

/** The project-wide part of every page: who declares, under what, the cautions, the methodology, the indicators. */
export type SiteContext = Pick<SiteView, 'tool' | 'declaration' | 'cautions' | 'processCaution' | 'pdfs' | 'methodology' | 'indicators'>;

export function siteContext(project: Project, pdfs: boolean): SiteContext {
  const d = project.declaration;
  const record = project.verification.state;
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
      // Only a verifier's valid record verifies (src/model/verification-record.ts); each declaration says whether it is still as verified.
      status: record.kind === 'valid' ? 'verified' : 'draft',
      statusText: record.kind === 'valid' ? `verification record of ${record.record.date} by ${record.record.verifier} (key ${record.fingerprint.slice(0, 16)}…); each declaration says whether it is still as verified` : record.kind === 'invalid' ? `draft — not verified (${record.reason})` : 'draft — not verified',
      draft: record.kind !== 'valid',
      verifier: record.kind === 'valid' ? record.record.verifier : '',
      verificationDate: record.kind === 'valid' ? record.record.date : '',
      gwpSet: `${d.gwp_set} — ${GWP_SOURCES[d.gwp_set]}`,
      backgroundData: d.background_data.map((b) => `${b.name}, version ${b.version}${b.licence ? ` (${b.licence})` : ''}`),
      illustrative: d.illustrative,
    },
    cautions: CAUTIONS,
    processCaution: PROCESS_CAUTION,
    pdfs,
    methodology: methodology(project),
    indicators: project.indicators.map((code) => {
      const indicator = project.indicatorSet.find(code)!;
      return { code, name: indicator.name, unit: indicator.unit };
    }),
  };
}

/** A count with its noun, singular or plural. */

/** The catalogue's headline column heads, from the headline's definition and the indicator registry. */
function headlineHeads(): SiteView['headlineHeads'] {
  const unit = findIndicator(HEADLINE_INDICATOR)!.unit;
  return { indicator: HEADLINE_INDICATOR, a1a3: `${HEADLINE_INDICATOR} ${HEADLINE_MODULE} (${unit})`, d: `Module ${HEADLINE_MODULE_D} ${HEADLINE_INDICATOR} (${unit})` };
}

/** How many products' checks fail or warn, in a sentence. */
function checklistSummary(catalogue: readonly CatalogueEntry[]): string {
  const failing = catalogue.filter((entry) => entry.checks.some((check) => check.status === 'fails')).length;
  const warning = catalogue.filter((entry) => !entry.checks.some((check) => check.status === 'fails') && entry.checks.some((check) => check.status === 'warning')).length;
  return `${formatCounted(failing, 'product fails', 'products fail')} a check, ${formatCounted(warning, 'more has', 'more have')} a warning.`;
}
