import { z } from 'zod';
import { folderId, requiredText, text, quantity, reference } from './cells.ts';
import { defineCsv } from './csv-file.ts';

export const productsCsv = defineCsv({
  file: 'products.csv',
  purpose: 'One row per declared product: what it is, its declared unit and its end-of-life scenario.',
  key: { columns: ['product_id'] },
  needsRows: true,
  row: (d) =>
    z.object({
      product_id: folderId('Identifier of the product; names its folder in the output.'),
      name: requiredText('Product name as it appears on the declaration.'),
      declared_unit: requiredText('The declared unit in words, e.g. "1 kg", "1 m", "1 piece".'),
      unit_mass_kg: quantity(d, 'Mass of one declared unit without packaging.', 'kg', { positive: true }),
      eol_scenario: reference('End-of-life scenario of the product.', 'eol.csv scenario'),
      description: text('Optional longer description.'),
    }),
  example: {
    product_id: 'EXT-6060-40',
    name: 'Extruded profile 40 × 40 mm, EN AW-6060',
    declared_unit: '1 m',
    unit_mass_kg: '0.85',
    eol_scenario: 'building-metals',
    description: 'Mill-finish profile, 6 m lengths',
  },
});
