import { z } from 'zod';
import { choice, id, quantity, reference, requiredText, text } from './cells.ts';
import { defineCsv } from './csv-file.ts';
import type { Dialect } from './numbers.ts';

/**
 * production.csv (optional): each product's output at a site in a period, the base of the
 * allocation of site.csv. Columns beyond the contract are your own allocation keys (numbers
 * per product: machine_hours, surface_m2), used where a site.csv row names them.
 */
/** stage: a step the product passes through; parallel: one of several plants making the whole product. */
export const SITE_ROLES = ['stage', 'parallel'] as const;

export const productionCsv = defineCsv({
  file: 'production.csv',
  purpose: 'Each product’s output at a site in a period, which shares the site’s consumption (site.csv); extra numeric columns are your own allocation keys; optional.',
  key: { columns: ['site_id', 'period', 'product_id'], what: 'site, period and product' },
  optional: true,
  row: (d) =>
    z.object({
      site_id: id('The site (→ site.csv site_id).'),
      period: requiredText('The period (→ site.csv period).'),
      product_id: reference('The product.', 'products.csv product_id'),
      output: quantity(d, 'Declared units of the product made at the site in the period.', 'declared units', { positive: true }),
      source: text('Where the figure comes from (production records, year).'),
      site_role: choice(
        'How the site takes part in making the product. stage: one step the product passes through (a billet cast here and extruded at another site); its amounts per declared unit add to those of the product’s other sites. parallel: one of several plants that each make the whole product (one profile pressed at two plants); its amounts per declared unit count in proportion to its share of the product’s output at those plants.',
        SITE_ROLES,
        'stage',
      ),
    }),
  example: {
    site_id: 'norwick-press-shop',
    period: '2025',
    product_id: 'EXT-6060-40',
    output: '1200000',
    source: 'Production records 2025 (illustrative)',
    site_role: 'stage',
  },
});

/**
 * A production.csv column of your own that a site.csv row names as its allocation key: each
 * product's key in the period, a non-negative number (empty is refused: a product that
 * takes no share writes 0).
 */
export const ownKeyCell = (dialect: Dialect, column: string) => quantity(dialect, `The product’s ${column} in the period, an allocation key of your own.`, `the unit of ${column}`);
