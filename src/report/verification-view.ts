import { dataTypeOf } from '../model/rows.ts';
import type { Project } from '../model/project.ts';
import { dqrBandsText, dqrRating, pedigreeDqr } from '../reference/dqr.ts';
import { factorHref } from './figure-links.ts';
import { readersOf } from './factor-table.ts';
import type { CatalogueEntry } from './product-view.ts';
import { sourceOf, txt, type Cell, type TableView } from './table-view.ts';
import { formatFixed, NOT_GIVEN } from '../format.ts';

/** The verification pack's own tables: the factors' data quality and the size of each input file. */

/** The verification pack's data-quality table: every factor row with its pedigree scores, DQR, rating and data type, and the products whose figures it feeds. */
export function factorQualityTable(project: Project, catalogue: readonly CatalogueEntry[]): TableView {
  const readBy = readersOf(catalogue);
  const score = (value: number | null | undefined): Cell => ({ text: value === null || value === undefined ? NOT_GIVEN : String(value), numeric: true });
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
          { text: formatFixed(dqr, 2), numeric: true },
          txt(dqr === null ? (missing.length === 4 ? 'not scored' : 'partly scored') : dqrRating(dqr)),
          txt(dataTypeOf(row.value) ?? 'not stated'),
          readBy(row.line),
        ],
      };
    }),
    empty: 'No factors.',
  };
}

export function datasetCounts(project: Project): Array<{ name: string; rows: number }> {
  const counts = new Map<string, number>();
  for (const row of project.factors.rows) counts.set(row.value.dataset, (counts.get(row.value.dataset) ?? 0) + 1);
  return [...counts].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([name, rows]) => ({ name, rows }));
}
