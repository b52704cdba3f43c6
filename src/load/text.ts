import { readFile } from 'node:fs/promises';
import path from 'node:path';
import type { Problem } from '../problems.ts';

export type ReadResult = { ok: true; text: string; bytes: Buffer } | { ok: false; problem: Problem };

const utf8 = new TextDecoder('utf-8', { fatal: true });

/** Reads an input file as UTF-8 text, dropping a byte-order mark. */
export async function readText(dir: string, file: string): Promise<ReadResult> {
  let bytes: Buffer;
  try {
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
    return {
      ok: false,
      problem: { severity: 'error', code: 'FILE_UNREADABLE', file, message: `${file} is not UTF-8 text`, expected: 'UTF-8 (in a spreadsheet: save as "CSV UTF-8")' },
    };
  }
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  return { ok: true, text, bytes };
}
