import { afterAll, describe, expect, it } from 'vitest';
import { readFile, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { demoCopy, editFile, editLine, hashTree, removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

/** The demo with two more products: copies of the steel bracket (KV-BR-41, KV-BR-42), seven in all. */
async function sevenProducts(): Promise<string> {
  const data = await demoCopy();
  dirs.push(path.dirname(data));
  for (const file of ['products.csv', 'bom.csv', 'activities.csv', 'transport.csv']) {
    const full = path.join(data, file);
    const text = await readFile(full, 'utf8');
    const rows = text.split('\n').filter((line) => line.startsWith('KV-BR-40,'));
    const copies = ['KV-BR-41', 'KV-BR-42'].flatMap((id) => rows.map((row) => row.replace('KV-BR-40,', `${id},`)));
    await writeFile(full, `${text.replace(/\n*$/, '\n')}${copies.join('\n')}\n`);
  }
  return data;
}

const build = (data: string, out: string, ...extra: string[]) => runCli(['build', '--data', data, '--out', out, '--no-pdf', ...extra]);

describe('build --changed', () => {
  it('rebuilds exactly the four of seven products that read a changed factor row, and equals a clean build byte for byte', async () => {
    const data = await sevenProducts();
    const work = await tempDir();
    dirs.push(work);
    const out = path.join(work, 'out');
    expect((await build(data, out)).code).toBe(0);

    const unchanged = await build(data, out, '--changed');
    expect(unchanged.code, unchanged.stderr).toBe(0);
    expect(unchanged.stdout).toContain('rebuilt 0 of 7 products (7 kept from the previous build)');

    // factors.csv line 16, cardboard-virgin, is the packaging of the three profiles and the busbar
    // only (the factor table's "Read by" column of the demo says so).
    const keptBefore = await stat(path.join(out, 'KV-BR-41', 'audit.html'));
    await editLine(path.join(data, 'factors.csv'), 16, ',-0.58,', ',-0.61,');
    const changed = await build(data, out, '--changed');
    expect(changed.code, changed.stderr).toBe(0);
    expect(changed.stdout).toContain('rebuilt 4 of 7 products (3 kept from the previous build):');
    for (const id of ['KV-EXT-6060', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22', 'KV-CU-BB10']) expect(changed.stdout).toContain(`  ${id}: factors.csv line 16`);
    for (const id of ['KV-BR-40', 'KV-BR-41', 'KV-BR-42']) expect(changed.stdout).not.toContain(`  ${id}:`);
    // A kept product's files are the previous files (hard links), not rewritten ones.
    expect((await stat(path.join(out, 'KV-BR-41', 'audit.html'))).ino).toBe(keptBefore.ino);

    const clean = path.join(work, 'clean');
    expect((await build(data, clean)).code).toBe(0);
    expect(await hashTree(out)).toEqual(await hashTree(clean));
  });

  it('rebuilds one product for its own BOM row, the products of a site when one output changes, every product when declaration.json changes, and everything without a previous build', async () => {
    const data = await sevenProducts();
    const work = await tempDir();
    dirs.push(work);
    const out = path.join(work, 'out');
    const first = await build(data, out, '--changed');
    expect(first.code).toBe(0);
    expect(first.stderr).toContain('no earlier build of this tool version');
    expect(first.stdout).toContain('rebuilt 7 of 7 products (0 kept from the previous build)');

    await editLine(path.join(data, 'bom.csv'), 9, '0.44,3%,22%', '0.44,3%,25%');
    const bom = await build(data, out, '--changed');
    expect(bom.stdout).toContain('rebuilt 1 of 7 products (6 kept from the previous build):\n  KV-BR-40: bom.csv line 9');

    // Another product's output moves every share of the site: the three profiles, nothing else.
    await editLine(path.join(data, 'production.csv'), 5, ',260000,', ',300000,');
    const output = await build(data, out, '--changed');
    expect(output.stdout).toContain('rebuilt 3 of 7 products (4 kept from the previous build):');
    for (const id of ['KV-EXT-6060', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22']) expect(output.stdout).toContain(`  ${id}: production.csv line 5`);

    await editFile(path.join(data, 'declaration.json'), (text) => text.replace('"pcr": "', '"pcr": "Revised '));
    const settings = await build(data, out, '--changed');
    expect(settings.stdout).toContain('rebuilt 7 of 7 products (0 kept from the previous build):');
    expect(settings.stdout).toMatch(/KV-BR-42: declaration.json changed(, the texts every page carries \(cautions, methodology, indicator names\) changed)?\n/);

    // Without the uncertainty setting, the command-line flag is what asks for the Monte Carlo ranges: a page setting too.
    await editFile(path.join(data, 'declaration.json'), (text) => text.replace(/\n\s*"uncertainty": \{[^}]*\},/, ''));
    expect((await build(data, out, '--changed')).stdout).toContain('rebuilt 7 of 7 products');
    expect((await build(data, out, '--changed', '--uncertainty')).stdout).toContain('rebuilt 7 of 7 products (0 kept from the previous build):');
    expect((await build(data, out, '--changed', '--uncertainty')).stdout).toContain('rebuilt 0 of 7 products');

    const clean = path.join(work, 'clean');
    expect((await build(data, clean, '--uncertainty')).code).toBe(0);
    expect(await hashTree(out)).toEqual(await hashTree(clean));
  });
});
