import { z } from 'zod';
import { choice, id, requiredText, text } from './cells.ts';
import { defineCsv } from './csv-file.ts';

import { PROCESS_KINDS } from './process-kinds.ts';

/**
 * process.csv (optional): operating data of the declarant's own metal-making processes,
 * one parameter a row, so that every parameter is a traceable cell. What each kind needs
 * is in `process-kinds.ts`.
 */
export const processCsv = defineCsv({
  file: 'process.csv',
  purpose: 'Operating data of your own metal-making processes (smelter cell line, tank house, furnace), one parameter a row; optional. See the parameters of each kind in the input format reference.',
  key: { columns: ['process_id', 'parameter'], what: 'parameter within its process' },
  optional: true,
  row: () =>
    z.object({
      process_id: id('Your name for the process (a cell line, a tank house).'),
      kind: choice('What the process is.', PROCESS_KINDS),
      parameter: requiredText('The parameter, as the kind names it (cell_voltage_v, current_efficiency, technology, …).'),
      value: requiredText('Its value: a number (decimal point or, in a semicolon file, comma), a share as 0.95 or 95%, or a word (technology, metal).'),
      unit: text('The unit the value is in, as the parameter names it (V, share, kWh/t, t/t, kg/t, %, min/cell-day); empty for words.'),
      source: text('Where the value comes from (plant records, year).'),
    }),
  example: {
    process_id: 'potline-1',
    kind: 'electrolysis-aluminium',
    parameter: 'cell_voltage_v',
    value: '4.2',
    unit: 'V',
    source: 'Potline log 2025 (illustrative)',
  },
});
