import { afterAll, describe, expect, it } from 'vitest';
import path from 'node:path';
import { loadProject } from '../../../src/model/project.ts';
import { CSV_FILES } from '../../../src/schema/index.ts';
import { columnsOf } from '../../../src/schema/csv-file.ts';
import { demoCopy, editFile, removeDir } from '../../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((dir) => removeDir(path.dirname(dir)))));

/** The demo with one file's text changed. */
async function demoWith(file: string, edit: (text: string) => string) {
  const dir = await demoCopy();
  dirs.push(dir);
  await editFile(path.join(dir, file), edit);
  return loadProject(dir);
}
const repeatLine = (line: number) => (text: string) => {
  const lines = text.split('\n');
  lines.splice(line, 0, lines[line - 1]!);
  return lines.join('\n');
};

describe('each file’s key rule, declared with its schema', () => {
  it('names columns of its own file, the last of which carries the problem', () => {
    for (const schema of CSV_FILES) {
      const names = columnsOf(schema).map((column) => column.name);
      for (const column of schema.key.columns) expect(names, `${schema.file} key ${column}`).toContain(column);
      expect(schema.key.what.length).toBeGreaterThan(3);
    }
  });

  it('refuses a product defined twice, on the second line, pointing at the first', async () => {
    const { problems } = await demoWith('products.csv', repeatLine(3));
    expect(problems).toContainEqual(expect.objectContaining({ severity: 'error', code: 'DUPLICATE_ID', file: 'products.csv', line: 4, column: 'product_id', hint: 'line 3 has it already: change one, or delete the row that repeats it' }));
  });

  it('warns of a transport leg given twice (legal, but usually a double count), an empty line_id being part of the key', async () => {
    const { problems } = await demoWith('transport.csv', repeatLine(3));
    expect(problems).toContainEqual(expect.objectContaining({ severity: 'warning', code: 'DUPLICATE_ID', file: 'transport.csv', line: 4, column: 'leg', hint: 'line 3 has it already: change one, or delete the row that repeats it' }));
  });

  it('leaves a row whose required key cell is empty to that cell’s own problem', async () => {
    const { problems } = await demoWith('products.csv', (text) => {
      const lines = text.split('\n');
      const blank = lines[2]!.replace(/^[^,]*/, '');
      lines.splice(3, 0, blank, blank);
      return lines.join('\n');
    });
    const onProducts = problems.filter((p) => p.file === 'products.csv' && (p.line === 4 || p.line === 5));
    expect(onProducts.map((p) => p.code)).toEqual(['VALUE_REQUIRED', 'VALUE_REQUIRED']);
  });
});
