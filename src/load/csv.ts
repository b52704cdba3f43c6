import { parse, CsvError } from 'csv-parse/sync';
import type { Problem } from '../problems.ts';
import { readText } from './text.ts';

/** One data record with the physical lines it spans in the file (1-based). */
export interface CsvRecord {
  line: number;
  lineEnd: number;
  fields: string[];
}

export interface CsvFile {
  file: string;
  delimiter: ',' | ';';
  /** Header cells as written (trimmed), with their line. */
  header: { names: string[]; line: number };
  records: CsvRecord[];
  /** The file's text, kept so a row can be shown exactly as it appears. */
  text: string;
  bytes: Buffer;
}

export type CsvLoad = { ok: true; csv: CsvFile; problems: Problem[] } | { ok: false; problems: Problem[] };

/**
 * Picks the delimiter from the header line: semicolon when it has more semicolons than
 * commas outside quotes (the spreadsheet export of locales that write decimal commas),
 * else comma.
 */
export function detectDelimiter(text: string): ',' | ';' {
  for (const rawLine of text.split(/\r?\n/)) {
    const line = rawLine.trim();
    if (line === '' || line.startsWith('#')) continue;
    let commas = 0;
    let semicolons = 0;
    let quoted = false;
    for (const char of line) {
      if (char === '"') quoted = !quoted;
      else if (!quoted && char === ',') commas++;
      else if (!quoted && char === ';') semicolons++;
    }
    return semicolons > commas ? ';' : ',';
  }
  return ',';
}

const countNewlines = (field: string): number => {
  let n = 0;
  for (let i = field.indexOf('\n'); i !== -1; i = field.indexOf('\n', i + 1)) n++;
  return n;
};

interface ParsedRecord {
  record: string[];
  info: { lines: number };
}

/**
 * Reads a CSV as users write it: UTF-8 with or without BOM, comma or semicolon, CRLF or
 * LF, quoted fields, blank lines skipped, `#` at the start of a line a comment.
 */
export async function loadCsv(dir: string, file: string): Promise<CsvLoad> {
  const read = await readText(dir, file);
  if (!read.ok) return { ok: false, problems: [read.problem] };
  return parseCsvText(file, read.text, read.bytes);
}

export function parseCsvText(file: string, original: string, bytes: Buffer = Buffer.from(original)): CsvLoad {
  // One line ending throughout, so that csv-parse's line count is the physical line.
  const text = original.replace(/^\ufeff/, '').replace(/\r\n?/g, '\n');
  const delimiter = detectDelimiter(text);
  const problems: Problem[] = [];
  let parsed: ParsedRecord[];
  try {
    parsed = parse(text, {
      delimiter,
      info: true,
      comment: '#',
      comment_no_infix: true,
      skip_empty_lines: true,
      relax_column_count: true,
      relax_quotes: false,
      skip_records_with_error: true,
      on_skip: (error: CsvError | undefined) => {
        if (error) problems.push(csvSyntaxProblem(file, error));
      },
    }) as unknown as ParsedRecord[];
  } catch (error) {
    if (error instanceof CsvError) return { ok: false, problems: [...problems, csvSyntaxProblem(file, error)] };
    throw error;
  }
  const records: CsvRecord[] = parsed
    .map(({ record, info }) => {
      const lineEnd = info.lines;
      const line = lineEnd - record.reduce((n, field) => n + countNewlines(field), 0);
      return { line, lineEnd, fields: record };
    })
    // A line of only delimiters (";;;" as spreadsheets export) is blank too.
    .filter((record) => record.fields.some((field) => field.trim() !== ''));
  const [headerRecord, ...dataRecords] = records;
  if (!headerRecord) {
    return { ok: false, problems: [...problems, { severity: 'error', code: 'COLUMN_MISSING', file, line: 1, message: `${file} has no header row`, expected: 'a header row naming the columns' }] };
  }
  const header = { names: headerRecord.fields.map((name) => name.trim()), line: headerRecord.line };
  return { ok: true, csv: { file, delimiter, header, records: dataRecords, text, bytes }, problems };
}

function csvSyntaxProblem(file: string, error: CsvError): Problem {
  const lines = (error as CsvError & { lines?: number }).lines;
  const messages: Record<string, string> = {
    CSV_QUOTE_NOT_CLOSED: 'a quoted field is never closed',
    CSV_INVALID_CLOSING_QUOTE: 'a quote is followed by text before the next delimiter',
    CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE: 'a quote is followed by text before the next delimiter',
  };
  const message = messages[error.code] ?? error.message;
  return {
    severity: 'error',
    code: 'CSV_SYNTAX',
    file,
    ...(lines === undefined ? {} : { line: lines }),
    message: `${message} (csv-parse ${error.code})`,
    expected: 'fields separated by the delimiter, quotes only around whole fields ("…"), "" for a quote inside',
  };
}
