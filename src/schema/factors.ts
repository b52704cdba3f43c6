import { z } from 'zod';
import { gsdCell, id, optionalChoice, optionalQuantity, pedigreeScore, requiredText, text, unitCell, yearCell } from './cells.ts';
import { defineCsv } from './csv-file.ts';
import { INDICATORS } from '../reference/indicators.ts';
import type { Dialect } from './numbers.ts';

/** The fixed columns; one optional column per EN 15804+A2 indicator code follows. */
function baseShape(d: Dialect) {
  return {
    factor_id: id('Identifier of the factor row.'),
    name: requiredText('What the factor is.'),
    unit: unitCell('What one row is per: kg, t, kWh, MJ, tkm, m3, piece (and g, GJ, L and the like).'),
    dataset: requiredText('The background dataset the values come from, with its version.'),
    source: text('Where the row was taken from (database, EPD, supplier).'),
    // Pedigree scores of the PEF data quality rating (Recommendation (EU) 2021/2279): DQR = (TeR + GeR + TiR + P)/4.
    ter: pedigreeScore('Technological representativeness, 1 (best) to 5; empty: not scored.'),
    ger: pedigreeScore('Geographical representativeness, 1 (best) to 5; empty: not scored.'),
    tir: pedigreeScore('Time representativeness, 1 (best) to 5; empty: not scored.'),
    p: pedigreeScore('Precision, 1 (best) to 5; empty: not scored.'),
    gsd: gsdCell(d, 'Uncertainty of the row’s values for an uncertainty run: geometric standard deviation of a lognormal whose median is each value (one draw scales every indicator of the row); empty: fixed.'),
    data_type: optionalChoice('specific (your own or a supplier’s data) or generic (database data); empty: not stated.', ['specific', 'generic']),
    supplier_dataset: text('A supplier’s own declaration as an ILCD+EPD dataset (an EPD process dataset .xml, or an ILCD archive .zip with its product flow), path relative to the data folder (e.g. suppliers/billet.ilcd.zip): the row’s indicator values are then the supplier’s declared A1-A3, converted to the row’s unit through the dataset’s own declared unit and mass; leave the indicator cells empty. Such a row counts as specific data.'),
    reference_year: yearCell('The year the row’s data represent; the verifier’s checklist holds it to declaration.json reference_year (specific data at most 5, generic at most 10 years older: common practice); empty: not given.'),
  };
}

function indicatorShape(dialect: Dialect) {
  return Object.fromEntries(
    INDICATORS.filter((indicator) => indicator.basis === 'factors').map((indicator) => [
      indicator.code,
      optionalQuantity(dialect, `${indicator.name}, per row unit; an empty cell means "not available" and is never read as 0.`, `${indicator.unit} per row unit`, { signed: true }),
    ]),
  ) as Record<string, ReturnType<typeof optionalQuantity>>;
}

export const FACTOR_BASE_COLUMNS = Object.keys(baseShape({ decimalComma: false }));

export const factorsCsv = defineCsv({
  file: 'factors.csv',
  purpose: 'Impact factors per unit of a flow, one column per EN 15804+A2 indicator code.',
  key: { columns: ['factor_id'] },
  needsRows: true,
  row: (d) => z.object({ ...baseShape(d), ...indicatorShape(d) }),
  example: {
    factor_id: 'grid-electricity',
    name: 'Electricity, medium voltage, national grid',
    unit: 'kWh',
    dataset: 'Name of your background database and version',
    source: 'Database record id',
    'GWP-total': '0.42',
    'GWP-fossil': '0.41',
    'GWP-biogenic': '0.005',
    'GWP-luluc': '0.005',
  },
});
