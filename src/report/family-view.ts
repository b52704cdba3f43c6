import type { VerificationView } from './verification-status.ts';
import type { Project } from '../model/types.ts';
import { findIndicator } from '../reference/indicators.ts';
import { groupedTables, METHOD_SENTENCES } from './declaration-view.ts';
import { familyWarnings, type FamilyResults, type FamilyStat } from './families.ts';
import { figureHref } from './figure-links.ts';
import { resultFigureId } from './results.ts';
import type { ResultMethod } from '../trace/ids.ts';

/** The catalogue's headline: GWP-total of cut-off A1-A3. */
const HEADLINE_FIGURE = resultFigureId('cutoff', HEADLINE_MODULE, HEADLINE_INDICATOR);
import { formatAmount, formatFixed, formatScientific, formatShare, NOT_AVAILABLE } from '../format.ts';
import { RESULTS_JSON, RESULTS_CSV } from '../files.ts';
import { HEADLINE_INDICATOR, HEADLINE_MODULE } from '../reference/headline.ts';

/** A family figure as the page shows it: the mean (a link to its derivation) and the range. */
export interface FamilyCell {
  text: string;
  range: string;
  /** The lowest and highest member, for a table that sets them on two lines (narrow columns fit A1 to D on a page). */
  low: string;
  high: string;
  href: string;
  moduleD?: boolean;
}

export interface FamilyAuditEntry {
  id: string;
  label: string;
  unit: string;
  mean: string;
  terms: Array<{ product: string; weight: string; share: string; value: string; href: string }>;
}

export interface FamilyView {
  /** Set by the build once the members' statuses are known. */
  verification?: VerificationView;
  id: string;
  name: string;
  declaredUnit: string;
  url: string;
  tolerance: string;
  warnings: string[];
  members: Array<{ id: string; name: string; url: string; weight: string; weightFrom: string; share: string; gwp: string; gwpHref: string; deviation: string; outside: boolean }>;
  modulesNotDeclared: string[];
  modules: Array<{ code: string; moduleD: boolean }>;
  tables: Array<{ title: string; caption: string; rows: Array<{ code: string; name: string; unit: string; cells: FamilyCell[] }> }>;
  comparison: { indicators: Array<{ code: string; unit: string }>; rows: Array<{ name: string; cells: FamilyCell[] }> };
  recycledContent: Array<{ label: string; mean: string; range: string }>;
  headline: { a1a3: FamilyCell | undefined; a1a3Value: string };
  audit: FamilyAuditEntry[];
  resultsJson: string;
  resultsCsv: string;
}

/** Where a family's pages live: families/<family_id>/. */
export const familyDir = (familyId: string): string => `families/${familyId}`;

/**
 * The family declaration page and its audit page, from the family's results and the members'
 * names. Every mean links to its derivation: Σ w·v / Σ w with each member's value (from
 * results.json `member_values`) linked to the member's own audit trail.
 */
export function familyView(project: Project, results: FamilyResults, names: ReadonlyMap<string, string>): FamilyView {
  const digits = project.declaration.report.significant_figures;
  const sci = (value: number | null): string => (value === null ? NOT_AVAILABLE : formatScientific(value, digits));
  const range = (stat: FamilyStat, format: (v: number) => string) => (stat.min === null ? '' : `${format(stat.min)} … ${format(stat.max!)}`);
  /** A figure's range: as one text, and its lowest and highest member apart (for a table that sets them on two lines). */
  const spread = (stat: FamilyStat) => ({ range: range(stat, sci), low: stat.min === null ? '' : sci(stat.min), high: stat.min === null ? '' : sci(stat.max) });
  const audit: FamilyAuditEntry[] = [];
  /** The cell of figure method/module/code, its audit entry added on the way. */
  const entry = (method: ResultMethod, module: string, code: string, stat: FamilyStat, moduleD = false): FamilyCell => {
    // The family's figure has the id of the members' figure it is the mean of.
    const id = resultFigureId(method, module, code);
    audit.push({
      id,
      label: `${code}, ${module}, ${method === 'cutoff' ? 'cut-off' : method}`,
      unit: results.indicators.find((i) => i.code === code)?.unit ?? '',
      mean: sci(stat.mean),
      terms: results.members.map((m) => ({
        product: m.product_id,
        weight: formatAmount(m.weight),
        share: formatShare(m.share),
        value: sci(results.member_values[m.product_id]?.[method]?.[module]?.[code] ?? null),
        href: `../../${m.product_id}/${figureHref(id)}`,
      })),
    });
    return { text: sci(stat.mean), ...spread(stat), href: figureHref(id), ...(moduleD ? { moduleD } : {}) };
  };

  const cutoff = results.methods.cutoff;
  const moduleCodes = Object.keys(cutoff.modules);
  const tables = groupedTables(results.indicators, (code) => moduleCodes.map((module) => entry('cutoff', module, code, cutoff.modules[module]![code]!, module === 'D')));
  // As on a product's page: the comparison shows indicators computed from factors.
  const compared = project.declaration.report.compare_indicators.filter((code) => findIndicator(code)?.basis === 'factors' && results.indicators.some((i) => i.code === code));
  const comparisonRows = [
    { name: METHOD_SENTENCES.cutoff!.name, cells: compared.map((code) => entry('cutoff', 'total', code, cutoff.total[code]!)) },
    ...(['cff', 'eol-recycling', 'fifty-fifty'] as const)
      .filter((method) => results.methods[method])
      .map((method) => ({ name: METHOD_SENTENCES[method]!.name, cells: compared.map((code) => entry(method, 'total', code, results.methods[method]!.total[code]!)) })),
  ];
  const rc = results.flows.recycled_content;
  const share = (s: FamilyStat) => ({ mean: s.mean === null ? NOT_AVAILABLE : formatShare(s.mean), range: range(s, formatShare) });
  const headlineStat = cutoff.modules[HEADLINE_MODULE]?.[HEADLINE_INDICATOR];
  const headline = headlineStat ? { a1a3: { text: sci(headlineStat.mean), ...spread(headlineStat), href: `${familyDir(results.family_id)}/${figureHref(HEADLINE_FIGURE)}` }, a1a3Value: String(headlineStat.mean ?? '') } : { a1a3: undefined, a1a3Value: '' };
  return {
    id: results.family_id,
    name: results.name,
    declaredUnit: results.declared_unit,
    url: `${familyDir(results.family_id)}/index.html`,
    tolerance: formatShare(results.tolerance),
    warnings: familyWarnings(results),
    members: results.members.map((m) => ({
      id: m.product_id,
      name: names.get(m.product_id) ?? m.product_id,
      url: `../../${m.product_id}/index.html`,
      weight: formatAmount(m.weight),
      weightFrom: m.weight_from.map((cell) => `${cell.file}:${cell.line}`).join(', '),
      share: formatShare(m.share),
      gwp: sci(m.gwp_a1_a3),
      gwpHref: `../../${m.product_id}/${figureHref(HEADLINE_FIGURE)}`,
      deviation: m.deviation === null ? NOT_AVAILABLE : `${m.deviation >= 0 ? '+' : '−'}${formatFixed(Math.abs(m.deviation) * 100, 1)} %`,
      outside: m.outside_tolerance,
    })),
    modulesNotDeclared: results.modules_not_declared.map((m) => `${m.module} (declared by ${m.declared_by.join(', ')} only)`),
    modules: moduleCodes.map((code) => ({ code, moduleD: code === 'D' })),
    tables,
    comparison: { indicators: compared.map((code) => ({ code, unit: findIndicator(code)?.unit ?? '' })), rows: comparisonRows },
    recycledContent: [
      { label: 'Pre-consumer (ISO 14021)', ...share(rc.pre) },
      { label: 'Post-consumer (ISO 14021)', ...share(rc.post) },
      { label: 'Total recycled content', ...share(rc.total) },
    ],
    headline,
    audit,
    resultsJson: RESULTS_JSON,
    resultsCsv: RESULTS_CSV,
  };
}
