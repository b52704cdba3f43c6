import { productStatus, type VerificationStatus } from '../model/verification-status.ts';
import { verificationView, type VerificationView } from './verification-status.ts';
import type { Project } from '../model/project.ts';
import type { ProductRows } from '../model/by-product.ts';
import { reachedRows } from '../model/reach.ts';
import { findGas, GWP_SOURCES } from '../reference/ghg.ts';
import { factorsCsv } from '../schema/factors.ts';
import { formatInput, NOT_GIVEN } from '../format.ts';
import type { AuditView } from './audit-view.ts';
import type { DeclarationResultsView } from './declaration-view.ts';
import type { ResultsSummary } from './results.ts';
import { AUDIT_PAGE, RESULTS_CSV, RESULTS_JSON } from '../files.ts';
import { factorHref, figureHref, fragment, inputAnchor } from './figure-links.ts';
import { allocationStepOf } from '../calc/allocation.ts';
import { familyDir } from './family-view.ts';
import { num, pct, sourceOf, txt, type SourceRef, type TableView } from './table-view.ts';

/**
 * A product's declaration page as a view model: its identity, the seven tables of the inputs
 * it reads (its own rows and the rows it reaches, src/model/reach.ts), its results and audit
 * views once calculated.
 */
/** What the site shows of one product's results, taken while its figure graph is alive. */
export interface ProductReport {
  summary: ResultsSummary;
  results: DeclarationResultsView;
  audit: AuditView;
  /** Its verification status, results.json compared with the record's (the writer has it). */
  verification: VerificationStatus;
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
  verification: VerificationView;
}

/** A catalogue row: what the catalogue shows of a product. */
export interface CatalogueEntry {
  id: string;
  name: string;
  declaredUnit: string;
  url: string;
  headline?: DeclarationResultsView['headline'];
  /** A mandatory indicator is missing in a declared module (the declaration page says which). */
  incomplete: boolean;
  /** The verifier's checklist, a status per check (the declaration page has the detail). */
  checks: Array<{ id: string; status: string }>;
  /** The factors.csv lines this product's figures read (the catalogue-wide reverse index). */
  factorLines: number[];
  verification: VerificationView;
}

export const catalogueEntry = (product: ProductView): CatalogueEntry => ({
  id: product.id,
  name: product.name,
  declaredUnit: product.declaredUnit,
  url: product.url,
  ...(product.results ? { headline: product.results.headline } : {}),
  incomplete: product.results?.incomplete !== undefined,
  checks: (product.results?.checklist ?? []).map((item) => ({ id: item.id, status: item.status })),
  factorLines: product.audit?.inputs.find((input) => input.file === factorsCsv.file)?.rows.map((row) => row.line) ?? [],
  verification: product.verification,
});

export function productView(project: Project, rows: ProductRows, report: ProductReport | undefined): ProductView {
  const productRow = rows.product;
  const product = productRow.value;
  const lines = rows.bom;
  const activities = rows.activities;
  const legs = rows.transport;
  const { eolRows, materials, factorIds, factors, processRows, productionRows } = reachedRows(project, rows);
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
          cells: [txt(`${m.material} — ${m.name}`), txt(m.family), txt(m.virgin), txt(m.recycled ?? NOT_GIVEN), txt(m.eol_recycling ?? NOT_GIVEN), txt(m.landfill ?? '—'), txt(m.incineration ?? '—'), num(m.q_in), num(m.q_out), m.biogenic_c_kg_per_kg === null ? txt('not given') : num(m.biogenic_c_kg_per_kg)],
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
            return key === undefined ? [txt(NOT_GIVEN), txt(NOT_GIVEN)] : [num(key), pct(key / a.key.total)];
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
  // "Read from bom.csv:6" links to the row on the audit trail, where the audit shows it (every row a figure reads).
  if (report) {
    const audited = new Set(report.audit.inputs.flatMap((file) => file.rows.map((row) => row.anchor)));
    for (const table of tables) {
      for (const row of table.rows) {
        const anchor = inputAnchor(row.source.file, row.source.line);
        if (audited.has(anchor)) row.source = { ...row.source, href: `${AUDIT_PAGE}#${fragment(anchor)}` };
      }
    }
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
    verification: verificationView(report?.verification ?? productStatus(project, rows)),
  };
}
