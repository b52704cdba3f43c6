import { z } from 'zod';
import { choice, id, optionalQuantity, optionalReference, optionalShare, reference, requiredText, share, text } from './cells.ts';
import { defineCsv } from './csv-file.ts';

export const MATERIAL_FAMILIES = ['metal', 'polymer', 'mineral', 'wood', 'paper', 'other'] as const;

/** The columns of materials.csv that name a factor row (checked, reached and read the same way everywhere). */
export const MATERIAL_FACTOR_COLUMNS = ['virgin', 'recycled', 'eol_recycling', 'substituted', 'landfill', 'incineration'] as const;

const factor = (what: string) => optionalReference(`Factor id (→ factors.csv) for ${what}.`, 'factors.csv factor_id');

export const materialsCsv = defineCsv({
  file: 'materials.csv',
  purpose: 'One row per material: the factors for making it, recycling it and disposing of it, and the parameters of the recycling-credit methods.',
  key: { columns: ['material'] },
  needsRows: true,
  row: (d) =>
    z.object({
      material: id('Identifier of the material.'),
      name: requiredText('Material name.'),
      family: choice('Material family.', MATERIAL_FAMILIES),
      virgin: reference('Factor id for virgin production, per kg (Ev).', 'factors.csv factor_id'),
      recycled: factor('production from secondary input, per kg (Erec)'),
      eol_recycling: factor('recycling after the end-of-waste point up to the point of substitution, per kg of recycled output (ErecEoL)'),
      substituted: factor('the virgin material that recycled output replaces, per kg (E*v); default: virgin'),
      landfill: factor('landfill, per kg (ED)'),
      incineration: factor('incineration, per kg'),
      q_in: share(d, 'Quality ratio Qsin/Qp of secondary input (1 for metals that keep their properties).', { default: 1 }),
      q_out: share(d, 'Quality ratio Qsout/Qp of recycled output.', { default: 1 }),
      cff_a: optionalShare(d, 'Allocation factor A of the Circular Footprint Formula (empty: 0.2 for metal, 0.5 otherwise).'),
      lhv_mj_per_kg: optionalQuantity(d, 'Lower heating value, for energy recovery.', 'MJ/kg'),
      biogenic_c_kg_per_kg: optionalQuantity(d, 'Biogenic carbon content.', 'kg C per kg'),
      source: text('Where the parameters come from.'),
    }),
  example: {
    material: 'al-6060',
    name: 'Aluminium alloy EN AW-6060',
    family: 'metal',
    virgin: 'al-primary-ingot',
    recycled: 'al-remelted-ingot',
    eol_recycling: 'al-scrap-remelting',
    substituted: '',
    landfill: 'landfill-inert',
    incineration: '',
    q_in: '1',
    q_out: '1',
    cff_a: '0.2',
    lhv_mj_per_kg: '',
    biogenic_c_kg_per_kg: '0',
    source: 'Alloy specification sheet',
  },
});
