import { mkdir, readdir, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { CSV_FILES, DECLARATION_FILE, factorsCsv } from '../schema/index.ts';
import { columnsOf } from '../schema/csv-file.ts';
import { declarationExample } from '../schema/declaration.ts';
import { FACTOR_BASE_COLUMNS } from '../schema/factors.ts';
import { columnReference } from '../schema/reference-doc.ts';
import { INDICATORS, MANDATORY_INDICATORS } from '../reference/indicators.ts';
import { EXIT, UsageError, type Io } from './io.ts';

/** The indicator columns a new factors.csv starts with: every one EN 15804+A2 requires that a factor row carries (the flow indicators are computed). */
const STARTER_INDICATORS = INDICATORS.filter((i) => MANDATORY_INDICATORS.includes(i.code) && i.basis === 'factors').map((i) => i.code);

const csvLine = (cells: string[]) => cells.map((cell) => (/[",\n]/.test(cell) ? `"${cell.replace(/"/g, '""')}"` : cell)).join(',');

export function starterFiles(): Record<string, string> {
  const files: Record<string, string> = {};
  for (const schema of CSV_FILES) {
    const columns = schema === factorsCsv ? [...FACTOR_BASE_COLUMNS, ...STARTER_INDICATORS] : columnsOf(schema).map((column) => column.name);
    const example = columns.map((column) => schema.example[column] ?? '');
    files[schema.file] = [
      `# ${schema.purpose}`,
      '# Lines that start with # are comments. Delete the # on the example row to use it, or replace it with your own rows.',
      csvLine(columns),
      `# ${csvLine(example)}`,
      '',
    ].join('\n');
  }
  files[DECLARATION_FILE] = `${JSON.stringify(declarationExample, null, 2)}\n`;
  files['README.md'] = `# loopsheet data folder

Fill these files from your spreadsheets (UTF-8 CSV, comma or semicolon separated), then run

    npx loopsheet check --data .

until it reports no errors, and build the declarations with

    npx loopsheet build --data . --out site

(\`npx loopsheet\` runs loopsheet installed as a devDependency of this repository, from the
tarball \`npm pack\` makes in a loopsheet checkout; after \`npm install -g\` of that tarball the
command is \`loopsheet\`. loopsheet is not on the public registry: do not run \`npx loopsheet\`
where it is not installed.)

Numbers: a decimal point, or a decimal comma in semicolon-separated files; never thousands
separators. Shares as fractions (0.35) or percentages (35%). Empty cells in factors.csv mean
"not available" and are never read as zero.

A declaration is not a public environmental claim until an independent verifier has verified
it under ISO 14025 and the applicable PCR. The verifier signs a record of the build they
checked with \`loopsheet verify\` (keys from \`loopsheet keygen\`, kept outside this folder);
until then, and again as soon as an input it covers changes, every declaration says it is a
draft and why.

## Columns

${columnReference()}
`;
  return files;
}

export async function runInit(options: { dir: string; force: boolean }, io: Io): Promise<number> {
  const dir = options.dir;
  let existing: string[] = [];
  try {
    if (!(await stat(dir)).isDirectory()) throw new UsageError(`${dir} is a file, not a folder`);
    existing = await readdir(dir);
  } catch (error) {
    if (error instanceof UsageError) throw error;
  }
  if (existing.length > 0 && !options.force) {
    throw new UsageError(`${dir} is not empty; use --force to add the missing files (existing files are kept)`);
  }
  await mkdir(dir, { recursive: true });
  const written: string[] = [];
  const kept: string[] = [];
  for (const [name, content] of Object.entries(starterFiles())) {
    if (existing.includes(name)) {
      kept.push(name);
      continue;
    }
    await writeFile(path.join(dir, name), content, { flag: 'wx' });
    written.push(name);
  }
  io.out(`initialised ${dir}: wrote ${written.join(', ')}${kept.length ? `; kept ${kept.join(', ')}` : ''}`);
  io.out(`next: fill the CSV files, then run: loopsheet check --data ${dir}`);
  return EXIT.ok;
}
