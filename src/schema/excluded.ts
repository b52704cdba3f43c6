import { z } from 'zod';
import { choice, optionalShare, referenceOrWildcard, reportAt, requiredText, text } from './cells.ts';
import { defineCsv } from './csv-file.ts';

export const EXCLUDED_MODULES = ['A1', 'A2', 'A3', 'A4', 'A5', 'C1', 'C2', 'C3', 'C4'] as const;

/**
 * excluded.csv (optional): the flows the declaration leaves out under the cut-off rule, each
 * with its share of the mass or primary energy of its unit process. The verifier's checklist
 * holds them to EN 15804+A2's rule: at most 1 % each, at most 5 % together per module.
 */
export const excludedCsv = defineCsv({
  file: 'excluded.csv',
  purpose: 'Flows left out under the cut-off rule, with their share of the mass or primary energy of their unit process; optional (the verifier’s checklist warns when no list is given).',
  key: { columns: ['product_id', 'module', 'flow'], what: 'product, module and flow' },
  optional: true,
  row: (d) =>
    z
      .object({
        product_id: referenceOrWildcard('The product, or * for every product.', 'products.csv product_id'),
        module: choice('Module of the unit process the flow belongs to.', EXCLUDED_MODULES),
        flow: requiredText('The flow left out, in words (lubricant of the press, pallet wrap at the mill).'),
        mass_share: optionalShare(d, 'Its share of the mass of the unit process’s inputs; empty: not estimated.'),
        energy_share: optionalShare(d, 'Its share of the primary energy of the unit process; empty: not estimated.'),
        source: text('How the share was estimated.'),
      })
      .superRefine((row, ctx) => {
        if (row.mass_share === undefined && row.energy_share === undefined) reportAt(ctx, 'mass_share', 'VALUE_REQUIRED', 'is empty, and so is energy_share', 'the share of mass or of primary energy the flow carries');
      }),
  example: {
    product_id: '*',
    module: 'A3',
    flow: 'Press hydraulic oil top-up',
    mass_share: '0.05%',
    energy_share: '',
    source: 'Maintenance log 2025',
  },
});
