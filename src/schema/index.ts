/** Every input file, in the order they are read and documented. */
import { productsCsv } from './products.ts';
import { bomCsv } from './bom.ts';
import { materialsCsv } from './materials.ts';
import { eolCsv } from './eol.ts';
import { activitiesCsv } from './activities.ts';
import { transportCsv } from './transport.ts';
import { factorsCsv } from './factors.ts';
import { processCsv } from './process.ts';
import { siteCsv } from './site.ts';
import { productionCsv } from './production.ts';
import { familiesCsv } from './families.ts';
import { excludedCsv } from './excluded.ts';

export const DECLARATION_FILE = 'declaration.json';

export const CSV_FILES = [productsCsv, bomCsv, materialsCsv, eolCsv, activitiesCsv, transportCsv, factorsCsv, processCsv, siteCsv, productionCsv, familiesCsv, excludedCsv] as const;

export { productsCsv, bomCsv, materialsCsv, eolCsv, activitiesCsv, transportCsv, factorsCsv, processCsv, siteCsv, productionCsv, familiesCsv, excludedCsv };
