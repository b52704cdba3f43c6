import { z } from 'zod';
import { choice, gsdCell, quantity, reference, requiredText, text, unitCell, yearCell } from './cells.ts';
import { defineCsv } from './csv-file.ts';

export const ACTIVITY_MODULES = ['A1', 'A2', 'A3', 'A4', 'A5', 'C1', 'C2', 'C3', 'C4'] as const;

export const activitiesCsv = defineCsv({
  file: 'activities.csv',
  purpose: 'Energy, ancillary materials and direct emissions per declared unit, by module.',
  // Repeats are legal but usually a double count.
  key: { columns: ['product_id', 'module', 'activity'], repeat: 'warning', what: 'product, module and activity' },
  row: (d) =>
    z.object({
      product_id: reference('The product.', 'products.csv product_id'),
      module: choice('EN 15804+A2 module the activity belongs to.', ACTIVITY_MODULES),
      activity: requiredText('What the activity is (extrusion press electricity, anode effects).'),
      factor: reference('Factor id (→ factors.csv), or a built-in greenhouse gas such as ghg:CF4.', 'factors.csv factor_id or ghg:<gas>'),
      amount: quantity(d, 'Amount per declared unit, in `unit`.', 'the row’s unit'),
      unit: unitCell('Unit of the amount; must convert to the factor’s unit (kWh ↔ MJ ↔ GJ, g ↔ kg ↔ t, L ↔ m3).'),
      source: text('Where the figure comes from (meter, allocation sheet).'),
      gsd: gsdCell(d, 'Uncertainty of amount for an uncertainty run: geometric standard deviation of a lognormal whose median is amount; empty: fixed.'),
      reference_year: yearCell('The year the amount represents (your own data: the verifier’s checklist allows at most 5 years before declaration.json reference_year, common practice); empty: not given.'),
    }),
  example: {
    product_id: 'EXT-6060-40',
    module: 'A3',
    activity: 'Extrusion press and ageing oven, electricity',
    factor: 'grid-electricity',
    amount: '1.1',
    unit: 'kWh',
    source: 'Plant meter 2025 / output 2025',
  },
});
