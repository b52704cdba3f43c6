import { z } from 'zod';
import { ACTIVITY_MODULES } from './activities.ts';
import { choice, id, quantity, reference, requiredText, text, unitCell } from './cells.ts';
import { defineCsv } from './csv-file.ts';

/** The allocation keys every project has; any other key is a column of production.csv. */
export const BUILT_IN_KEYS = ['mass', 'declared_unit'] as const;

/**
 * site.csv (optional): a plant's annual meter readings and purchases, for the whole period,
 * shared among the products made there (ISO 14044 §4.3.4) by production.csv.
 */
export const siteCsv = defineCsv({
  file: 'site.csv',
  purpose: 'A plant’s consumption for a whole period (annual meter readings, purchases), shared among the products it made by production.csv; optional.',
  // Repeats are legal but usually a double count.
  key: { columns: ['site_id', 'period', 'module', 'activity'], repeat: 'warning', what: 'site, period, module and activity' },
  optional: true,
  row: (d) =>
    z.object({
      site_id: id('Your name for the plant or site.'),
      period: requiredText('The period the amount covers, as written in production.csv (e.g. 2025).'),
      module: choice('EN 15804+A2 module the allocated amounts belong to.', ACTIVITY_MODULES, 'A3'),
      activity: requiredText('What was metered or bought (press shop electricity, natural gas for the ageing ovens).'),
      factor: reference('Factor id (→ factors.csv), or a built-in greenhouse gas such as ghg:CF4.', 'factors.csv factor_id or ghg:<gas>'),
      amount: quantity(d, 'Amount for the whole site and period, in `unit`.', 'the row’s unit'),
      unit: unitCell('Unit of the amount; must convert to the factor’s unit.'),
      allocation: text('How the amount is shared: mass (default: output × unit_mass_kg), declared_unit (output), or the name of a column of production.csv holding your own key (machine_hours).'),
      source: text('Where the figure comes from (meter, invoice, year).'),
    }),
  example: {
    site_id: 'norwick-press-shop',
    period: '2025',
    module: 'A3',
    activity: 'Press shop electricity, main meter',
    factor: 'grid-electricity',
    amount: '1840000',
    unit: 'kWh',
    allocation: 'mass',
    source: 'Main meter 2025 (illustrative)',
  },
});
