import { z } from 'zod';
import { choice, optionalReference, quantity, reference, requiredText, text } from './cells.ts';
import { defineCsv } from './csv-file.ts';

export const TRANSPORT_MODULES = ['A2', 'A4', 'C2'] as const;

export const transportCsv = defineCsv({
  file: 'transport.csv',
  purpose: 'Transport legs: the carried mass (one BOM line, or the whole product) times distance times a factor per tonne-kilometre.',
  // Repeats are legal but usually a double count.
  key: { columns: ['product_id', 'module', 'line_id', 'leg'], repeat: 'warning', what: 'product, module, line and leg' },
  row: (d) =>
    z.object({
      product_id: reference('The product.', 'products.csv product_id'),
      module: choice('Module of the leg.', TRANSPORT_MODULES),
      line_id: optionalReference('BOM line whose gross input is carried; empty = the whole product’s gross input.', 'bom.csv line_id of the same product'),
      leg: requiredText('The leg in words (billet, smelter to press).'),
      factor: reference('Factor id per tonne-kilometre.', 'factors.csv factor_id'),
      distance_km: quantity(d, 'Distance of the leg.', 'km'),
      source: text('Where the distance comes from.'),
    }),
  example: {
    product_id: 'EXT-6060-40',
    module: 'A2',
    line_id: 'L1',
    leg: 'Billet, cast house to press',
    factor: 'lorry-16-32t',
    distance_km: '420',
    source: 'Route planner, supplier address',
  },
});
