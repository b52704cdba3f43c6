import { zipSync } from 'fflate';
import type { IlcdFile } from '../report/ilcd-export.ts';

/**
 * The ILCD archive of one declaration: a zip of its datasets under ILCD/<folder>/, in path
 * order, every entry dated 1980-01-01 00:00 (the earliest date a zip records) and deflated at
 * level 9, so the same datasets give the same bytes on any machine, in any time zone (the
 * date is given in local time because zip records local time; fflate writes no other time).
 */
export function ilcdArchive(files: readonly IlcdFile[]): Uint8Array {
  const mtime = new Date(1980, 0, 1, 0, 0, 0);
  const entries: Record<string, [Uint8Array, { mtime: Date; level: 9 }]> = {};
  for (const file of [...files].sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0))) entries[file.path] = [Buffer.from(file.xml, 'utf8'), { mtime, level: 9 }];
  return zipSync(entries);
}
