import { describe, expect, it } from 'vitest';
import { detectDelimiter, MAX_ROWS, parseCsvText, readCsvText } from '../../src/load/csv.ts';
import { parseTable } from '../../src/schema/table.ts';
import { bomCsv } from '../../src/schema/bom.ts';
import { readText } from '../../src/load/text.ts';
import { writeFile } from 'node:fs/promises';
import path from 'node:path';
import { removeDir, tempDir } from '../helpers.ts';

const parse = (text: string) => {
  const load = parseCsvText('bom.csv', text);
  if (!load.ok) throw new Error(JSON.stringify(load.problems));
  return load;
};

const HEADER = 'product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source';

describe('CSV dialects', () => {
  it('detects the delimiter from the header line', () => {
    expect(detectDelimiter('a,b,c\n1;2;3')).toBe(',');
    expect(detectDelimiter('# comment, with, commas\na;b;c\n')).toBe(';');
    expect(detectDelimiter('"a;b",c\n')).toBe(',');
  });

  it('reads UTF-8 with a byte-order mark, CRLF endings, comments, blank lines and quoted line breaks, keeping physical lines', async () => {
    const text = `\ufeff# first comment\r\n${HEADER}\r\n\r\nP1,L1,"Billet,\r\nround",al,product,1.5,0,0,0,recycled,x\r\n# note\r\n,,,\r\nP1,L2,Film,pe,packaging,0.1,0,0,0,recycled,y\r\n`;
    // As a spreadsheet saves it (the BOM as the bytes EF BB BF, RFC 3629), read the way a build reads files.
    const dir = await tempDir();
    await writeFile(path.join(dir, 'bom.csv'), Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text.slice(1), 'utf8')]));
    const read = await readText(dir, 'bom.csv');
    await removeDir(dir);
    if (!read.ok) throw new Error(read.problem.message);
    const { csv } = parse(read.text);
    expect(csv.header.names[0]).toBe('product_id');
    expect(csv.header.line).toBe(2);
    expect(csv.records.map((r) => [r.line, r.lineEnd])).toEqual([
      [4, 5],
      [8, 8],
    ]);
    expect(csv.records[0]!.fields[2]).toBe('Billet,\nround');
  });

  it('skips lines of only delimiters, as spreadsheets export them', () => {
    const { csv } = parse(`${HEADER}\n,,,,,,,,,,\nP1,L1,B,al,product,1,0,0,0,recycled,x\n`);
    expect(csv.records).toHaveLength(1);
    expect(csv.records[0]!.line).toBe(3);
  });

  it('reads a semicolon file with decimal commas and percentages', () => {
    const { csv } = parse(`${HEADER.replaceAll(',', ';')}\nP1;L1;Billet;al;product;0,83;30%;45 %;0,15;recycled;x\n`);
    const { table, problems } = parseTable(csv, bomCsv);
    expect(problems).toEqual([]);
    expect(table.rows[0]!.value).toMatchObject({ mass_kg: 0.83, recycled_pre: 0.3, recycled_post: 0.45, scrap_rate: 0.15 });
  });

  it('matches header names case-insensitively after trimming, and warns on unknown ones with the nearest name', () => {
    const { csv } = parse(`${HEADER.replace('mass_kg', ' Mass_KG ').replace('source', 'sorce')}\nP1,L1,B,al,product,1,0,0,0,recycled,x\n`);
    const { table, problems } = parseTable(csv, bomCsv);
    expect(table.rows[0]!.value.mass_kg).toBe(1);
    expect(problems).toEqual([expect.objectContaining({ severity: 'warning', code: 'COLUMN_UNKNOWN', line: 1, columnIndex: 11, hint: 'did you mean "source"?' })]);
  });

  it('reports an unclosed quote once, on the line where it opens, and keeps csv-parse’s own code as data', () => {
    const load = parseCsvText('bom.csv', `${HEADER}\nP1,L1,"Billet,al,product,1,0,0,0,recycled,x\n`);
    expect(load.problems).toEqual([expect.objectContaining({ code: 'CSV_SYNTAX', file: 'bom.csv', line: 2, cause: 'CSV_QUOTE_NOT_CLOSED' })]);
    // Rows after it, a quoted line break, an escaped quote and a quote in a comment before it: still its own line, once, and the file is not used.
    const rows = Array.from({ length: 12 }, (_, k) => `P${k},L1,Blank,al,product,1,0,0,0,recycled,x`);
    const text = [`# a "comment`, HEADER, `P1,L1,"two\nlines",al,product,1,0,0,0,recycled,"say ""hi"""`, `P2,L1,Blank,al,product,1,0,0,0,recycled,"Mill report`, ...rows, ''].join('\n');
    const later = parseCsvText('bom.csv', text);
    expect(later.ok).toBe(false);
    expect(later.problems).toEqual([expect.objectContaining({ code: 'CSV_SYNTAX', line: 5, message: expect.stringMatching(/opened on this line is never closed/) })]);
  });

  it('refuses a file with more data rows than one build reads, naming the limit and the way to split', () => {
    const rows = Array.from({ length: 6 }, (_, k) => `P${k},L1,Blank,al,product,1,0,0,0,recycled,x`);
    const read = readCsvText('bom.csv', `# comment\n${HEADER}\n${rows.join('\n')}\n`, () => () => undefined, 5);
    expect(read).toEqual({ ok: false, problems: [expect.objectContaining({ code: 'FILE_TOO_LARGE', file: 'bom.csv', message: expect.stringMatching(/^bom\.csv has more than 5 data rows \(8 lines\)/), hint: expect.stringMatching(/split the products into several data folders/) })] });
    expect(readCsvText('bom.csv', `${HEADER}\n${rows.slice(0, 5).join('\n')}\n`, () => () => undefined, 5).ok).toBe(true);
    expect(MAX_ROWS).toBe(400_000);
  });

  it('names the line and byte of the first byte that is not UTF-8', async () => {
    const dir = await tempDir();
    // "Stahlträger" with ä saved as Windows-1252 (0xE4) on line 3.
    await writeFile(path.join(dir, 'products.csv'), Buffer.concat([Buffer.from('product_id,name\nP0,Blech ä\nP1,Stahltr'), Buffer.from([0xe4]), Buffer.from('ger\n')]));
    const read = await readText(dir, 'products.csv');
    expect(read.ok).toBe(false);
    if (!read.ok) expect(read.problem).toMatchObject({ code: 'FILE_UNREADABLE', line: 3, columnIndex: 11, value: '0xE4', message: expect.stringMatching(/byte 11 of line 3 \(0xE4, byte 39 of the file\)/) });
    await removeDir(dir);
  });

  it('applies defaults to empty optional cells and reads an empty factor cell as null, never 0', () => {
    const { csv } = parse(`${HEADER}\nP1,L1,B,al,,1,,,,,\n`);
    const { table } = parseTable(csv, bomCsv);
    expect(table.rows[0]!.value).toMatchObject({ role: 'product', recycled_pre: 0, recycled_post: 0, scrap_rate: 0, scrap_fate: 'recycled', source: undefined });
  });

  it('says once, at the cell, that a decimal comma in a comma-separated file split a number, instead of blaming the cells it moved', () => {
    // A spreadsheet in a decimal-comma locale exporting "CSV (comma)": 0,995 becomes two fields.
    const shifted = parseTable(parse(`${HEADER}\nP1,L1,Strip,cu,product,0,995,5%,7%,0.04,recycled\n`).csv, bomCsv);
    expect(shifted.problems).toEqual([expect.objectContaining({ code: 'DECIMAL_COMMA', line: 2, column: 'mass_kg', columnIndex: 6, value: '0,995', expected: expect.stringMatching(/^a decimal point \(0\.995\)/) })]);
    // Its ids still count (no knock-on reference errors), its values are not used.
    expect(shifted.table.written[0]!.raw).toMatchObject({ product_id: 'P1', mass_kg: '0.995', scrap_fate: 'recycled' });
    expect(shifted.table.rows).toEqual([]);
    // Two in one row, and more fields than the header.
    const twice = parseTable(parse(`${HEADER}\nP1,L1,Billet,al,product,0,83,30%,45%,0,15,recycled,x\n`).csv, bomCsv);
    expect(twice.problems.map((p) => [p.code, p.column, p.value])).toEqual([['DECIMAL_COMMA', 'mass_kg', '0,83'], ['DECIMAL_COMMA', 'scrap_rate', '0,15']]);
    expect(twice.problems[0]!.message).toMatch(/\(row has 13 fields, header has 11\)/);
    // Whole numbers side by side that do not make the row valid when joined: the extra field is the problem.
    const extra = parseTable(parse(`${HEADER}\nP1,L1,Billet,al,product,1,0,0,0,recycled,x,y\n`).csv, bomCsv);
    expect(extra.problems).toEqual([expect.objectContaining({ code: 'FIELD_COUNT', message: 'row has 12 fields, header has 11' })]);
  });
});
