import { afterAll, describe, expect, it } from 'vitest';
import { readdir } from 'node:fs/promises';
import path from 'node:path';
import { loadProject } from '../../../src/model/project.ts';
import { demoCopy, editFile, removeDir } from '../../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((dir) => removeDir(path.dirname(dir)))));

/** The demo with every CSV file's text changed. */
async function demoWith(edit: (file: string, text: string) => string) {
  const dir = await demoCopy();
  dirs.push(dir);
  for (const file of (await readdir(dir)).filter((name) => name.endsWith('.csv'))) {
    // editFile refuses an edit that changes nothing: files the edit does not touch stay as they are.
    await editFile(path.join(dir, file), (text) => edit(file, text)).catch(() => undefined);
  }
  return loadProject(dir);
}

describe('one invalid id is one problem', () => {
  it('an invalid product id used the same way everywhere: one BAD_ID, at its definition, counting the rows that refer to it', async () => {
    const { problems } = await demoWith((_file, text) => text.replaceAll('KV-BR-40', 'KV BR 40'));
    const errors = problems.filter((p) => p.severity === 'error');
    expect(errors).toEqual([expect.objectContaining({ code: 'BAD_ID', file: 'products.csv', line: 5, value: 'KV BR 40', message: expect.stringMatching(/; 10 rows of activities\.csv, bom\.csv and transport\.csv refer to it/) })]);
  });

  it('an invalid definition with valid references: no UNKNOWN_REFERENCE suggesting the invalid id', async () => {
    const { problems } = await demoWith((file, text) => (file === 'products.csv' ? text.replace('KV-BR-40,', 'KV BR-40,') : text));
    const errors = problems.filter((p) => p.severity === 'error');
    expect(errors).toHaveLength(1);
    expect(errors[0]).toMatchObject({ code: 'BAD_ID', value: 'KV BR-40', message: expect.stringMatching(/10 rows of .* refer to it/) });
    expect(problems.some((p) => p.hint?.includes('KV BR-40'))).toBe(false);
  });

  it('a reference that is simply wrong is still reported, with a valid suggestion', async () => {
    const { problems } = await demoWith((file, text) => (file === 'bom.csv' ? text.replace('KV-BR-40,L1,', 'KV-BR-41,L1,') : text));
    expect(problems).toContainEqual(expect.objectContaining({ code: 'UNKNOWN_REFERENCE', file: 'bom.csv', value: 'KV-BR-41', hint: 'did you mean "KV-BR-40"?' }));
  });
});
