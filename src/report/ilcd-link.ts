import { DECLARATION_ILCD } from '../files.ts';
import { datasetUuid } from '../reference/ilcd.ts';
import type { Declaration } from '../schema/declaration.ts';

/** Where a declaration's ILCD+EPD archive is, relative to its results.json, and its process dataset's UUID (results.json `ilcd_epd`). */
export interface IlcdLink {
  archive: string;
  process_uuid: string;
}

/** The UUID of a declaration's process dataset: name-based, from the owner, the kind (product or family) and the id, so it stays the same from build to build. */
export const processUuidOf = (declaration: Declaration, kind: 'product' | 'family', id: string): string => datasetUuid(declaration.owner.name, kind, id, 'process');

export const ilcdLink = (declaration: Declaration, kind: 'product' | 'family', id: string): IlcdLink => ({ archive: DECLARATION_ILCD, process_uuid: processUuidOf(declaration, kind, id) });
