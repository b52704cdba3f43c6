import { z } from 'zod';
import { choice, gsdCell, id, quantity, reference, requiredText, share, text, reportAt } from './cells.ts';
import { defineCsv } from './csv-file.ts';

export const BOM_ROLES = ['product', 'packaging'] as const;
export const SCRAP_FATES = ['recycled', 'landfill', 'incineration'] as const;

export const bomCsv = defineCsv({
  file: 'bom.csv',
  purpose: 'Bill of materials: one row per material line in one declared unit of a product, product parts and packaging.',
  key: { columns: ['product_id', 'line_id'], what: 'line_id within its product' },
  needsRows: true,
  row: (d) =>
    z
      .object({
        product_id: reference('The product this line belongs to.', 'products.csv product_id'),
        line_id: id('Identifier of the line, unique within its product.'),
        component: requiredText('What the line is, in words (billet, coating, pallet).'),
        material: reference('The material of the line.', 'materials.csv material'),
        role: choice('Whether the line is part of the product or its packaging.', BOM_ROLES, 'product'),
        mass_kg: quantity(d, 'Net mass of the line in one declared unit.', 'kg'),
        recycled_pre: share(d, 'Share of the input that is pre-consumer recycled material (ISO 14021: excludes rework, regrind and scrap reclaimed within the same process).', { default: 0 }),
        recycled_post: share(d, 'Share of the input that is post-consumer recycled material (ISO 14021: from end users).', { default: 0 }),
        scrap_rate: share(d, 'Share of the gross input that leaves manufacturing as process scrap; gross input = mass_kg / (1 − scrap_rate).', { default: 0, belowOne: true }),
        scrap_fate: choice('Where the process scrap goes.', SCRAP_FATES, 'recycled'),
        source: text('Where the figure comes from: drawing, meter, supplier declaration.'),
        gsd: gsdCell(d, 'Uncertainty of mass_kg for an uncertainty run: geometric standard deviation of a lognormal whose median is mass_kg; empty: fixed.'),
      })
      .superRefine((row, ctx) => {
        // ISO 14021 §7.8: pre- and post-consumer shares are parts of one input.
        if (row.recycled_pre + row.recycled_post > 1 + 1e-9) {
          reportAt(ctx, 'recycled_post', 'RECYCLED_CONTENT_SUM', `recycled_pre + recycled_post = ${round(row.recycled_pre + row.recycled_post)}, more than 1`, 'recycled_pre + recycled_post ≤ 1');
        }
      }),
  example: {
    product_id: 'EXT-6060-40',
    line_id: 'L1',
    component: 'Extrusion billet',
    material: 'al-6060',
    role: 'product',
    mass_kg: '0.85',
    recycled_pre: '35%',
    recycled_post: '0.40',
    scrap_rate: '0.12',
    scrap_fate: 'recycled',
    source: 'Supplier declaration 2025-114',
  },
});

const round = (x: number) => Math.round(x * 1e9) / 1e9;
