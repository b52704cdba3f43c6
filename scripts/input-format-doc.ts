// Regenerates the generated part of docs/input-format.md from the zod schemas.
import { readFile, writeFile } from 'node:fs/promises';
import { withGeneratedReference } from '../src/schema/reference-doc.ts';

const file = new URL('../docs/input-format.md', import.meta.url);
await writeFile(file, withGeneratedReference(await readFile(file, 'utf8')));
process.stdout.write('docs/input-format.md updated\n');
