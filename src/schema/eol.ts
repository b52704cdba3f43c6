import { z } from 'zod';
import { id, optionalReference, optionalShare, referenceOrWildcard, quantity, reportAt, share, text } from './cells.ts';
import { defineCsv } from './csv-file.ts';

export const EOL_SHARE_COLUMNS = ['reuse', 'recycling', 'energy_recovery', 'incineration', 'landfill'] as const;
const SUM_TOLERANCE = 1e-6;

export const eolCsv = defineCsv({
  file: 'eol.csv',
  purpose: 'End-of-life scenarios: per scenario and material (or * for all others), the shares of the end-of-life mass by route and the C2/C3 factors.',
  key: { columns: ['scenario', 'material'] },
  needsRows: true,
  row: (d) =>
    z
      .object({
        scenario: id('Identifier of the scenario (→ products.csv eol_scenario).'),
        material: referenceOrWildcard('Material this row applies to, or * for every material without its own row.', 'materials.csv material'),
        reuse: share(d, 'Share of the end-of-life mass re-used as a component.', { default: 0 }),
        recycling: share(d, 'Share of the end-of-life mass sent to recycling.', { default: 0 }),
        energy_recovery: share(d, 'Share sent to incineration with energy recovery.', { default: 0 }),
        incineration: share(d, 'Share incinerated without sufficient energy recovery (disposal, C4).', { default: 0 }),
        landfill: share(d, 'Share landfilled.', { default: 0 }),
        separate_collection: optionalShare(d, 'Share of the end-of-life mass collected separately (the rest is collected with mixed waste); empty: the shares re-used and recycled (scenario information of EN 15804+A2).'),
        recycling_yield: share(d, 'Share of the material sent to recycling that reaches the point of substitution.', { default: 1 }),
        transport_km: quantity(d, 'Distance from the site of deconstruction to waste processing (C2).', 'km', { default: 0 }),
        transport_factor: optionalReference('Factor id per tonne-kilometre for the C2 transport; required when transport_km > 0.', 'factors.csv factor_id'),
        processing_factor: optionalReference('Factor id per kg sent to recycling for waste processing (C3); required when recycling > 0.', 'factors.csv factor_id'),
        source: text('Where the scenario comes from (PCR default, market study).'),
      })
      .superRefine((row, ctx) => {
        const sum = EOL_SHARE_COLUMNS.reduce((total, column) => total + row[column], 0);
        if (Math.abs(sum - 1) > SUM_TOLERANCE) {
          reportAt(ctx, 'landfill', 'EOL_SHARES_SUM', `reuse + recycling + energy_recovery + incineration + landfill = ${Math.round(sum * 1e9) / 1e9}, not 1`, 'shares summing to 1 (tolerance 1e-6)');
        }
        if (row.transport_km > 0 && row.transport_factor === undefined) {
          reportAt(ctx, 'transport_factor', 'VALUE_REQUIRED', `is empty while transport_km is ${row.transport_km}`, 'a factor id per tkm');
        }
        if (row.recycling > 0 && row.processing_factor === undefined) {
          reportAt(ctx, 'processing_factor', 'VALUE_REQUIRED', `is empty while recycling is ${row.recycling}`, 'a factor id per kg sent to recycling');
        }
      }),
  example: {
    scenario: 'building-metals',
    material: '*',
    reuse: '0',
    recycling: '90%',
    energy_recovery: '0',
    incineration: '0',
    landfill: '10%',
    separate_collection: '90%',
    recycling_yield: '0.95',
    transport_km: '50',
    transport_factor: 'lorry-16-32t',
    processing_factor: 'scrap-shredding',
    source: 'Market study of demolition sorting, 2024',
  },
});
