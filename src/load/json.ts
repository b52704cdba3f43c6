import { createScanner, findNodeAtLocation, getNodeValue, parseTree, printParseErrorCode, type Node, type ParseError } from 'jsonc-parser';
import type { Problem } from '../problems.ts';
import { readText } from './text.ts';

/** A JSON document with the position of every value, so problems can name line and column. */
export interface JsonFile {
  file: string;
  text: string;
  bytes: Buffer;
  value: unknown;
  root: Node;
}

export type JsonLoad = { ok: true; json: JsonFile } | { ok: false; problems: Problem[] };

export function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = text.indexOf('\n'); i !== -1 && i < offset; i = text.indexOf('\n', i + 1)) {
    line++;
    lineStart = i + 1;
  }
  return { line, column: offset - lineStart + 1 };
}

export async function loadJson(dir: string, file: string): Promise<JsonLoad> {
  const read = await readText(dir, file);
  if (!read.ok) return { ok: false, problems: [read.problem] };
  return parseJsonText(file, read.text, read.bytes);
}

const JSON_ERRORS: Record<string, string> = {
  InvalidSymbol: 'a character that JSON does not allow here',
  InvalidNumberFormat: 'a badly written number',
  PropertyNameExpected: 'a "key" was expected (is there a comma too many before this?)',
  ValueExpected: 'a value was expected',
  ColonExpected: 'a colon was expected after the key',
  CommaExpected: 'a comma was expected between entries',
  CloseBraceExpected: 'a closing } was expected',
  CloseBracketExpected: 'a closing ] was expected',
  EndOfFileExpected: 'text after the end of the JSON object',
  InvalidCommentToken: 'comments are not allowed in JSON',
  UnexpectedEndOfComment: 'comments are not allowed in JSON',
  UnexpectedEndOfString: 'a string is not closed',
  UnexpectedEndOfNumber: 'a number is cut off',
  InvalidUnicode: 'a bad \\u escape',
  InvalidEscapeCharacter: 'a bad escape in a string',
  InvalidCharacter: 'a character that JSON does not allow in a string',
};

/** Deepest nesting read: declaration.json needs 3 levels; the parser and the checks recurse once per level. */
export const MAX_JSON_DEPTH = 64;

/** jsonc-parser's SyntaxKind values (a const enum its types declare and its code inlines). */
const TOKEN = { OpenBrace: 1, CloseBrace: 2, OpenBracket: 3, CloseBracket: 4, EOF: 17 } as const;

/** The offset of the first `{` or `[` nested deeper than the limit, found with the scanner (which does not recurse). */
function tooDeepAt(text: string): number | undefined {
  const scanner = createScanner(text, true);
  let depth = 0;
  for (let token: number = scanner.scan(); token !== TOKEN.EOF; token = scanner.scan()) {
    if (token === TOKEN.OpenBrace || token === TOKEN.OpenBracket) {
      if (++depth > MAX_JSON_DEPTH) return scanner.getTokenOffset();
    } else if (token === TOKEN.CloseBrace || token === TOKEN.CloseBracket) depth--;
  }
  return undefined;
}

export function parseJsonText(file: string, text: string, bytes: Buffer = Buffer.from(text)): JsonLoad {
  const deep = tooDeepAt(text);
  if (deep !== undefined) {
    const at = lineAndColumn(text, deep);
    return { ok: false, problems: [{ severity: 'error', code: 'JSON_NESTING', file, line: at.line, columnIndex: at.column, value: text.slice(deep, deep + 20), message: `nested deeper than ${MAX_JSON_DEPTH} levels here`, expected: `objects and arrays nested at most ${MAX_JSON_DEPTH} deep (declaration.json needs 3)` }] };
  }
  const errors: ParseError[] = [];
  const root = parseTree(text, errors, { disallowComments: true, allowTrailingComma: false, allowEmptyContent: false });
  if (errors.length > 0 || root === undefined) {
    // One mistake often raises several parse errors at the same place; report the first.
    const firstAt = new Map<number, ParseError>();
    for (const error of errors) if (!firstAt.has(error.offset)) firstAt.set(error.offset, error);
    const problems = [...firstAt.values()].map((error): Problem => {
      const at = lineAndColumn(text, error.offset);
      return {
        severity: 'error', code: 'JSON_SYNTAX', file, line: at.line, columnIndex: at.column,
        value: text.slice(error.offset, error.offset + Math.max(1, Math.min(error.length, 20))),
        message: `JSON syntax: ${JSON_ERRORS[printParseErrorCode(error.error)] ?? printParseErrorCode(error.error)}`,
        expected: 'valid JSON (no comments, no trailing commas)',
      };
    });
    if (problems.length === 0) problems.push({ severity: 'error', code: 'JSON_SYNTAX', file, line: 1, message: 'the file is empty', expected: 'a JSON object' });
    return { ok: false, problems };
  }
  return { ok: true, json: { file, text, bytes, value: getNodeValue(root), root } };
}

/** A value of a JSON file as written: its line, its JSON path (`energy_recovery.heat_efficiency`), its text. */
export interface JsonCell {
  file: string;
  line: number;
  column: string;
  value: string;
}

/**
 * Every value of a JSON file that is not an object or an array, by JSON path, located once
 * when the file is read: the calculation cites declaration.json values as cells without
 * going back to the parser.
 */
export function jsonCells(json: JsonFile): Map<string, JsonCell> {
  const cells = new Map<string, JsonCell>();
  const lineStarts = [0];
  for (let i = json.text.indexOf('\n'); i !== -1; i = json.text.indexOf('\n', i + 1)) lineStarts.push(i + 1);
  const lineOf = (offset: number) => {
    let low = 0;
    let high = lineStarts.length - 1;
    while (low < high) {
      const mid = (low + high + 1) >> 1;
      if (lineStarts[mid]! <= offset) low = mid;
      else high = mid - 1;
    }
    return low + 1;
  };
  const walk = (node: Node, path: Array<string | number>) => {
    if (node.type === 'object') {
      for (const property of node.children ?? []) {
        const [key, value] = property.children ?? [];
        if (key && value) walk(value, [...path, key.value as string]);
      }
    } else if (node.type === 'array') {
      (node.children ?? []).forEach((child, i) => walk(child, [...path, i]));
    } else {
      const column = jsonPath(path);
      cells.set(column, { file: json.file, line: lineOf(node.offset), column, value: json.text.slice(node.offset, node.offset + node.length) });
    }
  };
  walk(json.root, []);
  return cells;
}

/** Where a JSON path points: the value if present, else the nearest enclosing value. */
export function locate(json: JsonFile, path: ReadonlyArray<string | number>): { line: number; column: number; node: Node | undefined } {
  for (let depth = path.length; depth >= 0; depth--) {
    const node = findNodeAtLocation(json.root, path.slice(0, depth) as (string | number)[]);
    if (node) {
      const at = lineAndColumn(json.text, node.offset);
      return { ...at, node: depth === path.length ? node : undefined };
    }
  }
  return { line: 1, column: 1, node: undefined };
}

export const jsonPath = (path: ReadonlyArray<PropertyKey>): string =>
  path.reduce<string>((text, key) => (typeof key === 'number' ? `${text}[${key}]` : text ? `${text}.${String(key)}` : String(key)), '');
