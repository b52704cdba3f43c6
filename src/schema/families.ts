import { z } from 'zod';
import { folderId, optionalQuantity, reference, text } from './cells.ts';
import { defineCsv } from './csv-file.ts';

/**
 * families.csv (optional): groups of product variants (alloys, finishes, sizes) declared
 * together as their weighted average, one row per member.
 */
export const familiesCsv = defineCsv({
  file: 'families.csv',
  purpose: 'Product families declared together (variants of one product: alloys, finishes, sizes), one row per member; the family declaration is the weighted average of its members; optional.',
  key: { columns: ['family_id', 'product_id'], what: 'family and product' },
  optional: true,
  row: (d) =>
    z.object({
      family_id: folderId('Your name for the family; names its folder under families/ in the output.'),
      name: text('The family’s name as published (give it on the first row; later rows may leave it empty).'),
      product_id: reference('A member of the family.', 'products.csv product_id'),
      weight: optionalQuantity(d, 'The member’s weight in the average, e.g. its annual output in declared units; empty: its output in production.csv.', 'declared units (or any common basis)', { positive: true }),
      source: text('Where the weight comes from.'),
    }),
  example: {
    family_id: 'profiles-6060',
    name: 'Extruded hollow profiles, EN AW-6060, mill finish',
    product_id: 'EXT-6060-40',
    weight: '',
    source: 'Weights: production.csv output 2025',
  },
});
