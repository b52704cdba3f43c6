import { parse, CsvError } from 'csv-parse/sync';
import type { Problem } from '../problems.ts';
import { formatCount } from '../format.ts';

/** One data record with the physical lines it spans in the file (1-based). */
export interface CsvRecord {
  line: number;
  lineEnd: number;
  fields: string[];
}

/** A CSV file as read, without its records (they are handed over one at a time). */
export interface CsvSource {
  file: string;
  delimiter: ',' | ';';
  /** Header cells as written (trimmed), with their line. */
  header: { names: string[]; line: number };
  /** The file's text (one line ending throughout), kept so a row can be shown exactly as it appears. */
  text: string;
}

/** A CSV file with all its records, for callers that want them at once (tests, small files). */
export interface CsvFile extends CsvSource {
  records: CsvRecord[];
}

/** Receives the source once its header is read, and returns what takes each data record. */
export type CsvSink = (source: CsvSource) => (record: CsvRecord) => void;

export type CsvRead = { ok: true; source: CsvSource; problems: Problem[] } | { ok: false; problems: Problem[] };
export type CsvLoad = { ok: true; csv: CsvFile; problems: Problem[] } | { ok: false; problems: Problem[] };

/**
 * Picks the delimiter from the header line: semicolon when it has more semicolons than
 * commas outside quotes (the spreadsheet export of locales that write decimal commas),
 * else comma.
 */
export function detectDelimiter(text: string): ',' | ';' {
  for (const rawLine of text.split(/\r?\n/, 200)) {
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

/**
 * Most data rows read from one file: the largest catalogue the benchmark builds within its
 * memory (npm run bench: 10 000 products of 40 BOM lines, 400 000 rows; docs/performance.md).
 * A larger file is refused before it is read into rows.
 */
export const MAX_ROWS = 400_000;

class TooManyRows extends Error {}

/** Longest cell read: a long citation in a source column fits; a megabyte of text is not data. */
export const MAX_CELL_LENGTH = 10_000;

function tooManyRows(file: string, text: string, maxRows: number): Problem {
  let lines = 0;
  for (let at = text.indexOf('\n'); at !== -1; at = text.indexOf('\n', at + 1)) lines++;
  return {
    severity: 'error',
    code: 'FILE_TOO_LARGE',
    file,
    message: `${file} has more than ${formatCount(maxRows)} data rows (${formatCount(lines)} lines); one build reads at most ${formatCount(maxRows)} rows of a file, the largest catalogue measured to build within memory (docs/performance.md)`,
    expected: `at most ${formatCount(maxRows)} data rows`,
    hint: 'split the products into several data folders and build each, one CI job per folder',
  };
}

function cellTooLong(file: string, line: number, index: number, field: string, column: string | undefined): Problem {
  return {
    severity: 'error',
    code: 'CELL_TOO_LONG',
    file,
    line,
    ...(column ? { column } : {}),
    columnIndex: index + 1,
    value: `${field.slice(0, 40)}…`,
    message: `a cell of ${field.length} characters; a cell has at most ${MAX_CELL_LENGTH}`,
    expected: `at most ${MAX_CELL_LENGTH} characters`,
  };
}

const countNewlines = (field: string): number => {
  let n = 0;
  for (let i = field.indexOf('\n'); i !== -1; i = field.indexOf('\n', i + 1)) n++;
  return n;
};

/**
 * Reads a CSV as users write it: comma or semicolon, CRLF or LF, quoted fields, blank lines
 * skipped, `#` at the start of a line a comment. The text is the file decoded by `readText`
 * (src/load/text.ts), which has dropped a byte-order mark.
 * Records are handed to the sink as csv-parse produces them and are not collected, so a
 * large file's records never pile up in memory beside the rows made from them.
 */
export function readCsvText(file: string, original: string, sink: CsvSink, maxRows = MAX_ROWS): CsvRead {
  // One line ending throughout, so that csv-parse's line count is the physical line.
  const text = original.replace(/\r\n?/g, '\n');
  const delimiter = detectDelimiter(text);
  const problems: Problem[] = [];
  const tooLong: Problem[] = [];
  let rows = 0;
  // Where an unclosed quote opens, found once when csv-parse reports one (null: not looked for yet).
  let opened: number | undefined | null = null;
  const openedOn = (): number | undefined => (opened === null ? (opened = unclosedQuoteLine(text, delimiter)) : opened);
  let source: CsvSource | undefined;
  let take: ((record: CsvRecord) => void) | undefined;
  try {
    parse(text, {
      delimiter,
      comment: '#',
      comment_no_infix: true,
      skip_empty_lines: true,
      relax_column_count: true,
      relax_quotes: false,
      skip_records_with_error: true,
      on_skip: (error: CsvError | undefined) => {
        if (error) problems.push(csvSyntaxProblem(file, error, openedOn));
      },
      // Each record is handled here and dropped (returning nothing keeps it out of csv-parse's result).
      on_record: (fields: string[], context: { lines: number }) => {
        // A line of only delimiters (";;;" as spreadsheets export) is blank too.
        if (!fields.some((field) => field.trim() !== '')) return undefined;
        const lineEnd = context.lines;
        let line = lineEnd;
        for (const field of fields) line -= countNewlines(field);
        const long = fields.findIndex((field) => field.length > MAX_CELL_LENGTH);
        if (long >= 0) {
          tooLong.push(cellTooLong(file, line, long, fields[long]!, source?.header.names[long]));
          return undefined;
        }
        if (!take) {
          source = { file, delimiter, header: { names: fields.map((name) => name.trim()), line }, text };
          take = sink(source);
        } else {
          if (++rows > maxRows) throw new TooManyRows();
          take({ line, lineEnd, fields });
        }
        return undefined;
      },
    });
  } catch (error) {
    if (error instanceof TooManyRows) return { ok: false, problems: [tooManyRows(file, text, maxRows)] };
    if (error instanceof CsvError) return { ok: false, problems: [...problems, csvSyntaxProblem(file, error, openedOn)] };
    throw error;
  }
  // A cell too long for any column is not data; the file is not used, so nothing downstream blames its row's absence.
  if (tooLong.length > 0) return { ok: false, problems: [...problems, ...tooLong] };
  // An unclosed quote swallows the rest of the file into one field: the records after it are
  // lost, and every check of them would blame something else. The file is not used.
  // (Where the quotes all close as RFC 4180 reads them, csv-parse's own problems stand.)
  const unclosed = problems.find((problem) => problem.cause === 'CSV_QUOTE_NOT_CLOSED');
  if (unclosed && openedOn() !== undefined) {
    return { ok: false, problems: problems.filter((problem) => problem.code !== 'CSV_SYNTAX' || problem === unclosed) };
  }
  if (!source) {
    return { ok: false, problems: [...problems, { severity: 'error', code: 'COLUMN_MISSING', file, line: 1, message: `${file} has no header row`, expected: 'a header row naming the columns' }] };
  }
  return { ok: true, source, problems };
}

/** All records at once (tests, small files). */
export function parseCsvText(file: string, original: string): CsvLoad {
  const records: CsvRecord[] = [];
  const read = readCsvText(file, original, () => (record) => records.push(record));
  return read.ok ? { ok: true, csv: { ...read.source, records }, problems: read.problems } : read;
}

/**
 * The line of the quote that opens a field and is never closed, read as RFC 4180 writes
 * fields (a quote opens a field only at its start; "" inside is a quote); comment lines are
 * skipped as the parser skips them. Undefined when every quote closes.
 */
export function unclosedQuoteLine(text: string, delimiter: ',' | ';'): number | undefined {
  let line = 1;
  let openedOn: number | undefined;
  let atFieldStart = true;
  let atLineStart = true;
  for (let i = 0; i < text.length; i++) {
    const char = text[i];
    if (openedOn !== undefined) {
      if (char === '\n') line++;
      else if (char === '"') {
        if (text[i + 1] === '"') i++;
        else openedOn = undefined;
      }
      continue;
    }
    if (char === '\n') {
      line++;
      atFieldStart = atLineStart = true;
      continue;
    }
    if (atLineStart && char === '#') {
      const end = text.indexOf('\n', i);
      if (end === -1) break;
      i = end - 1;
      continue;
    }
    atLineStart = false;
    if (char === delimiter) atFieldStart = true;
    else if (char === '"' && atFieldStart) {
      openedOn = line;
      atFieldStart = false;
    } else atFieldStart = false;
  }
  return openedOn;
}

function csvSyntaxProblem(file: string, error: CsvError, openedOn: () => number | undefined): Problem {
  const opened = error.code === 'CSV_QUOTE_NOT_CLOSED' ? openedOn() : undefined;
  if (opened !== undefined) {
    return {
      severity: 'error',
      code: 'CSV_SYNTAX',
      file,
      line: opened,
      message: `a quoted field opened on this line is never closed, so the rest of the file would be read into it (csv-parse ${error.code})`,
      cause: error.code,
      expected: 'a closing quote at the end of the field ("…"), "" for a quote inside',
    };
  }
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
    cause: error.code,
    expected: 'fields separated by the delimiter, quotes only around whole fields ("…"), "" for a quote inside',
  };
}
