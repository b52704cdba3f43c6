import { describe, expect, it } from 'vitest';
import { cp, readdir, readFile, writeFile, stat } from 'node:fs/promises';
import path from 'node:path';
import { CSV_FILES } from '../../src/schema/index.ts';
import { columnsOf } from '../../src/schema/csv-file.ts';
import type { z } from 'zod';
import { DEMO, removeDir, runCli, tempDir } from '../helpers.ts';

/**
 * Ids that reach the file system. Every id column is given hostile text: the ids that name
 * folders (products, families) must refuse it at the cell; every other id may hold "/" and
 * "." (factor ids from a database often do), so a build must never turn one into a path.
 */
const HOSTILE = ['../escape', '/etc/passwd', 'a\\b', 'x'.repeat(5000), '.loopsheet-output', ' ', 'a\u0000b', 'a\u001b[31mb'];
const FOLDER_HOSTILE = [...HOSTILE, 'a/../../b', 'results.csv', 'VERIFICATION', 'nul', 'x'.repeat(101)];

describe('every id column refuses hostile text at its cell', () => {
  const idColumns = CSV_FILES.flatMap((schema) =>
    columnsOf(schema)
      .filter((column) => column.kind === 'id' || column.kind === 'reference')
      .map((column) => ({ file: schema.file, column: column.name, folder: column.path === true, cell: (schema.row({ decimalComma: false }).shape as Record<string, z.ZodType>)[column.name]! })),
  );

  it('finds the id columns of every file, and the two that name folders', () => {
    expect(idColumns.length).toBeGreaterThan(20);
    expect(idColumns.filter((c) => c.folder).map((c) => `${c.file}:${c.column}`).sort()).toEqual(['families.csv:family_id', 'products.csv:product_id']);
  });

  it.each(idColumns.map((c) => [`${c.file} ${c.column}`, c] as const))('%s', (_name, { cell, folder }) => {
    for (const value of folder ? FOLDER_HOSTILE : HOSTILE) {
      const parsed = cell.safeParse(value);
      // A blank optional reference is "not given": allowed.
      if (parsed.success && value.trim() === '' && parsed.data === undefined) continue;
      expect(parsed.success, `${JSON.stringify(value.slice(0, 40))} accepted`).toBe(false);
    }
  });
});

/** Every file and folder under a folder, files with their content and time, but the output folder itself. */
async function snapshot(dir: string, skip: string): Promise<string[]> {
  const entries: string[] = [];
  for (const entry of await readdir(dir, { recursive: true, withFileTypes: true })) {
    const full = path.join(entry.parentPath, entry.name);
    if (full === skip || full.startsWith(skip + path.sep)) continue;
    // A folder's own time changes as the staging folder comes and goes beside the output: its entries are what counts.
    entries.push(entry.isFile() ? `${path.relative(dir, full)} ${(await readFile(full)).toString('base64')} ${(await stat(full)).mtimeMs}` : `${path.relative(dir, full)}/`);
  }
  return entries.sort();
}

describe('a build writes nothing outside --out', () => {
  it('with ids that hold "/" and ".." in every file that allows them', async () => {
    // Five folders deep in a sandbox of its own: every "../" in an id points into the sandbox.
    const sandbox = await tempDir();
    const data = path.join(sandbox, 'a', 'b', 'c', 'd', 'data');
    await cp(DEMO, data, { recursive: true });
    const out = path.join(sandbox, 'a', 'b', 'c', 'd', 'out');
    const renames: Array<[RegExp, string]> = [
      [/(?<![\w-])norwick-press-shop(?![\w-])/g, 'n/../../../../../site-escape'],
      [/(?<![\w-])al-6060(?![\w-])/g, 'al/../../../../../material-escape'],
      [/(?<![\w-])grid-electricity(?![\w-])/g, 'g/../../../../../factor-escape'],
      [/(?<![\w-])glenmoor-potline(?![\w-])/g, 'p/../../../../../process-escape'],
      [/(?<![\w-])building-metals(?![\w-])/g, 'b/../../../../../scenario-escape'],
      [/(?<=^KV-EXT-6060,(?:A2,)?)L1(?=,)/gm, 'L1/../../../../../line-escape'],
    ];
    for (const entry of await readdir(data, { withFileTypes: true })) {
      if (!entry.isFile()) continue;
      const file = path.join(data, entry.name);
      const text = await readFile(file, 'utf8');
      const edited = renames.reduce((t, [pattern, to]) => t.replace(pattern, to), text);
      if (edited !== text) await writeFile(file, edited);
    }
    const before = await snapshot(sandbox, out);
    const result = await runCli(['build', '--data', data, '--out', out, '--no-pdf']);
    expect(result.code, result.stderr).toBe(0);
    expect(await snapshot(sandbox, out)).toEqual(before);
    // The ids are in the results, as text.
    expect(await readFile(path.join(out, 'KV-EXT-6060', 'results.json'), 'utf8')).toContain('al/../../../../../material-escape');
    await removeDir(sandbox);
  }, 60_000);
});
