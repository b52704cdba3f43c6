import { readFile, stat } from 'node:fs/promises';
import path from 'node:path';
import type { Problem } from '../problems.ts';
import { formatCount } from '../format.ts';

export type ReadResult = { ok: true; text: string; bytes: Buffer } | { ok: false; problem: Problem };

const utf8 = new TextDecoder('utf-8', { fatal: true });

/** Largest input file read: far above the largest row count read (src/load/csv.ts MAX_ROWS) at any sensible row length. */
export const MAX_FILE_BYTES = 200e6;

/** Reads an input file as UTF-8 text, dropping a byte-order mark. */
export async function readText(dir: string, file: string): Promise<ReadResult> {
  let bytes: Buffer;
  try {
    const size = (await stat(path.join(dir, file))).size;
    if (size > MAX_FILE_BYTES) {
      return {
        ok: false,
        problem: { severity: 'error', code: 'FILE_TOO_LARGE', file, message: `${file} is ${formatCount(Math.round(size / 1e6))} MB; an input file has at most ${formatCount(MAX_FILE_BYTES / 1e6)} MB`, expected: `at most ${formatCount(MAX_FILE_BYTES / 1e6)} MB`, hint: 'split the catalogue into data folders of fewer products and build each' },
      };
    }
    bytes = await readFile(path.join(dir, file));
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') {
      return { ok: false, problem: { severity: 'error', code: 'FILE_MISSING', file, message: `${file} is missing from the data folder`, expected: `a file named ${file}` } };
    }
    return { ok: false, problem: { severity: 'error', code: 'FILE_UNREADABLE', file, message: `${file} cannot be read (${code ?? String(error)})` } };
  }
  let text: string;
  try {
    text = utf8.decode(bytes);
  } catch {
    const offset = firstInvalidUtf8(bytes) ?? 0;
    const lineStart = bytes.lastIndexOf(0x0a, offset - 1) + 1;
    let line = 1;
    for (let at = bytes.indexOf(0x0a); at !== -1 && at < offset; at = bytes.indexOf(0x0a, at + 1)) line++;
    const byte = `0x${bytes[offset]!.toString(16).toUpperCase().padStart(2, '0')}`;
    return {
      ok: false,
      problem: {
        severity: 'error',
        code: 'FILE_UNREADABLE',
        file,
        line,
        columnIndex: offset - lineStart + 1,
        value: byte,
        message: `${file} is not UTF-8 text: byte ${offset - lineStart + 1} of line ${line} (${byte}, byte ${offset + 1} of the file) is not valid UTF-8`,
        expected: 'UTF-8 (in a spreadsheet: save as "CSV UTF-8")',
        hint: 'a file saved as Windows-1252 or ISO 8859-1 (Latin-1) has bytes like this for ä, é or °',
      },
    };
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  return { ok: true, text, bytes };
}

/**
 * The offset of the first byte that is not part of a well-formed UTF-8 sequence, per the
 * table of well-formed byte sequences in the Unicode Standard (Table 3-7; RFC 3629 §4):
 * no overlong forms, no surrogates, nothing above U+10FFFF. Undefined when all are.
 */
export function firstInvalidUtf8(bytes: Uint8Array): number | undefined {
  let i = 0;
  const inRange = (at: number, low: number, high: number) => at < bytes.length && bytes[at]! >= low && bytes[at]! <= high;
  while (i < bytes.length) {
    const lead = bytes[i]!;
    let length: number;
    let second: [number, number] = [0x80, 0xbf];
    if (lead <= 0x7f) length = 1;
    else if (lead >= 0xc2 && lead <= 0xdf) length = 2;
    else if (lead >= 0xe0 && lead <= 0xef) {
      length = 3;
      if (lead === 0xe0) second = [0xa0, 0xbf];
      else if (lead === 0xed) second = [0x80, 0x9f];
    } else if (lead >= 0xf0 && lead <= 0xf4) {
      length = 4;
      if (lead === 0xf0) second = [0x90, 0xbf];
      else if (lead === 0xf4) second = [0x80, 0x8f];
    } else return i;
    if (length > 1 && !inRange(i + 1, second[0], second[1])) return i;
    for (let k = 2; k < length; k++) if (!inRange(i + k, 0x80, 0xbf)) return i;
    i += length;
  }
  return undefined;
}
