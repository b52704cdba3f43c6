/**
 * The one error type. Every problem with the input is data: a stable code, where it is
 * (file, physical line, column), the value as written and what was expected. Codes are a
 * public contract (tests and users' CI match on them): add codes, never rename one.
 */
export type Severity = 'error' | 'warning';

export const PROBLEM_CODES = {
  FILE_MISSING: 'a required input file is not in the data folder',
  FILE_TOO_LARGE: 'an input file has more rows (400 000) or bytes (200 MB) than one build reads',
  FILE_UNREADABLE: 'the file could not be read or is not UTF-8 text',
  CSV_SYNTAX: 'the CSV cannot be parsed (for example an unclosed quote)',
  JSON_SYNTAX: 'declaration.json is not valid JSON',
  JSON_NESTING: 'declaration.json nests objects or arrays deeper than 64 levels',
  NO_ROWS: 'a file that must have rows has none',
  COLUMN_MISSING: 'a required column is not in the header',
  COLUMN_DUPLICATE: 'two header cells name the same column',
  COLUMN_UNKNOWN: 'a header cell that loopsheet does not know (ignored); the nearest known name is suggested',
  COLUMN_IGNORED: 'a known column that is not read from this file (for example a flow indicator in factors.csv)',
  CELL_TOO_LONG: 'a cell longer than 10 000 characters (the file is not used)',
  FIELD_COUNT: 'a row has more fields than the header',
  DECIMAL_COMMA: 'a number written with a decimal comma in a comma-separated file: it reads as two cells and moves the rest of the row one column on',
  KEY_UNKNOWN: 'a key in declaration.json that loopsheet does not know (ignored)',
  VALUE_REQUIRED: 'a required cell or key is empty',
  NOT_A_NUMBER: 'a cell that must hold a number does not',
  THOUSANDS_SEPARATOR: 'a number is written with a thousands separator (or ambiguously)',
  NEGATIVE_VALUE: 'a quantity that cannot be negative is negative',
  OUT_OF_RANGE: 'a number or share is outside its allowed range',
  BAD_CHOICE: 'a cell holds a value that is not one of the allowed choices',
  BAD_ID: 'an identifier has characters that are not allowed',
  ID_TOO_LONG: 'an identifier is longer than its limit (100 characters for ids that name a folder, 200 for others)',
  ID_RESERVED: 'a product or family id is a name the build writes itself (results.json, factors, …) or a Windows device name (con, nul, …)',
  ID_CASE_CLASH: 'two product or family ids differ only in letter case: on Windows and macOS their folders would be one',
  BAD_DATE: 'a date is not an ISO date (YYYY-MM-DD)',
  BAD_UNIT: 'a unit that loopsheet does not know',
  UNIT_MISMATCH: 'a unit that cannot be converted to the unit the value is used in',
  DUPLICATE_ID: 'the same identifier is defined twice',
  UNKNOWN_REFERENCE: 'a reference to an id that does not exist; the nearest existing id is suggested',
  RECYCLED_CONTENT_SUM: 'recycled_pre + recycled_post exceeds 1',
  EOL_SHARES_SUM: 'end-of-life shares do not sum to 1 (tolerance 1e-6)',
  EOL_SCENARIO_GAP: 'a product material has no end-of-life row (neither its own nor `*`)',
  UNIT_MASS_MISMATCH: 'product-role BOM masses differ from unit_mass_kg by more than 1 %',
  DECLARED_UNIT_UNKNOWN: 'a declared unit that names no unit of mass, length, area, volume or items (the ILCD+EPD archive declares it per item)',
  DECLARED_UNIT_MASS: 'a declared unit of mass ("1 t") whose unit_mass_kg is another mass',
  NO_BOM_LINES: 'a product has no product-role BOM lines',
  FACTOR_REQUIRED: 'a material is used in a way that needs a factor its row does not name',
  FACTOR_VALUE_MISSING: 'a factor row used by the project has no value for an indicator the declaration reports',
  INDICATOR_NO_DATA: 'an indicator the declaration asks for has no column in factors.csv',
  INDICATOR_UNKNOWN: 'an indicator code that is not in the EN 15804+A2 registry',
  DATE_ORDER: 'valid_until is not after issued',
  VALIDITY_LONG: 'the validity period is longer than five years (EN 15804 / ISO 14025 practice)',
  VERIFICATION_INCOMPLETE: 'a verified declaration lacks its verifier or date',
  VERIFICATION_UNSIGNED: 'declaration.json says verified, but no verifier’s record with a valid signature says so (the declarations are built as drafts)',
  GWP_SUM_MISMATCH: 'a factor row whose GWP-total differs from GWP-fossil + GWP-biogenic + GWP-luluc (EN 15804+A2)',
  SOURCE_MISSING: 'a row has no source (where the figure comes from)',
  BIOGENIC_CARBON_MISSING: 'a wood or paper material has no biogenic carbon content',
  PARAMETER_UNKNOWN: 'a process.csv parameter that its kind does not have; the nearest known name is suggested',
  PROCESS_KIND_MIXED: 'rows of one process in process.csv name different kinds',
  PROCESS_INFEASIBLE: 'operating data that no real process can have (below a physical or stoichiometric floor)',
  ALLOCATION_KEY_UNKNOWN: 'a site.csv row shares its amount by a key that is neither mass, declared_unit nor a column of production.csv',
  ALLOCATION_KEY_ZERO: 'the allocation keys of a site and period add up to zero, so there is nothing to share by',
  SITE_NO_PRODUCTION: 'a site and period of site.csv has no production.csv rows to share its amounts among',
  PRODUCTION_UNUSED: 'production.csv rows of a site and period that site.csv has no amounts for (nothing is allocated)',
  FAMILY_INCONSISTENT: 'rows of one family in families.csv disagree: two names, or members with different declared units',
  MANDATORY_INDICATOR_MISSING: 'an indicator EN 15804+A2 requires (core, resource use, waste, output flows) is not reported',
  PACKAGING_EOL_UNDECLARED: 'products have packaging whose end of life belongs in A5, which they do not declare (left out of the declaration)',
  BIOGENIC_RELEASE_TWICE: 'a treatment factor of packaging with biogenic carbon releases biogenic CO2 that loopsheet already books from the carbon content',
  PRODUCTION_PERIODS: 'a product has output at the same site in more than one period; a declaration rests on one',
  SUPPLIER_DATASET_PATH: 'a factors.csv supplier_dataset that is not a relative path inside the data folder, or names no file there',
  SUPPLIER_DATASET_UNREADABLE: 'a supplier dataset that is not well-formed XML, not a readable ILCD archive, or holds no single EPD process dataset',
  SUPPLIER_VALUES_TWICE: 'a factors.csv row that names a supplier dataset and also gives indicator values of its own',
  SUPPLIER_NOT_A2: 'a supplier dataset of another EN 15804 version (EN 15804+A1 indicators where EN 15804+A2 ones are expected)',
  SUPPLIER_NO_A1_A3: 'a supplier dataset that declares no A1-A3 (nor A1, A2 and A3) for its product',
  SUPPLIER_INDICATOR_MISSING: 'a supplier dataset has no A1-A3 value for an indicator the declaration reports (not available, never 0)',
  SUPPLIER_UNIT: 'a supplier dataset whose declared unit cannot be converted to the unit of its factors.csv row',
  SUPPLIER_EXPIRED: 'a supplier dataset whose validity ended before the declaration is issued',
  SUPPLIER_UNVERIFIED: 'a supplier dataset that records no independent review, used as specific data',
  SUPPLIER_EF30: 'a supplier dataset characterised with EF 3.0 in a declaration of EF 3.1 indicators',
} as const satisfies Record<string, string>;

export type ProblemCode = keyof typeof PROBLEM_CODES;

export interface Problem {
  severity: Severity;
  code: ProblemCode;
  /** File name relative to the data folder, e.g. `bom.csv`. */
  file: string;
  /** Physical line in the file, 1-based (the header is line 1 when nothing precedes it). */
  line?: number;
  /** Column name as loopsheet knows it (or the JSON path in declaration.json). */
  column?: string;
  /** 1-based position of the column in the header (or the character column in JSON). */
  columnIndex?: number;
  /** The value exactly as written. */
  value?: string;
  /** What was expected, in words ("a number in kg"). */
  expected?: string;
  /** A human sentence: what is wrong. */
  message: string;
  /** A suggestion, such as the nearest known name. */
  hint?: string;
  /** The code of the library that found it, kept as data (csv-parse's `CSV_QUOTE_NOT_CLOSED`). */
  cause?: string;
}

/**
 * One problem on one line, as editors and CI annotations read it: `file:line:column` (the
 * column's number in the header; the character in declaration.json), the column and the value
 * as written, the message, what was expected (unless the message says it already), the hint,
 * and the code. `dir` puts the data folder in front of the file, so the location is a path
 * from where the command ran.
 */
export function formatProblem(problem: Problem, dir?: string): string {
  const file = dir === undefined ? problem.file : joinPath(dir, problem.file);
  const where = [file, problem.line, problem.line === undefined ? undefined : problem.columnIndex].filter((part) => part !== undefined).join(':');
  const subject = [problem.column, problem.value === undefined ? undefined : JSON.stringify(problem.value)].filter((part) => part !== undefined && part !== '');
  const expected = problem.expected && !problem.message.includes(problem.expected) ? `${/[?.!]$/.test(problem.message) ? ' Expected' : '; expected'} ${problem.expected}` : '';
  const hint = problem.hint ? ` (${problem.hint})` : '';
  const head = subject.length > 0 ? `${where}: ${subject.join(' ')}:` : `${where}:`;
  return `${problem.severity} ${head} ${problem.message}${expected}${hint} [${problem.code}]`;
}

/** `dir/file` with one separator, as the user wrote `dir` (problems.ts has no path module: it sits below every layer). */
const joinPath = (dir: string, file: string): string => (dir === '' || dir === '.' ? file : `${dir.replace(/[\\/]+$/, '')}/${file}`);

/** Stable order: by file, then line, then column position, then code. */
export function sortProblems(problems: Problem[]): Problem[] {
  return [...problems].sort(
    (a, b) =>
      a.file.localeCompare(b.file) ||
      (a.line ?? 0) - (b.line ?? 0) ||
      (a.columnIndex ?? 0) - (b.columnIndex ?? 0) ||
      a.code.localeCompare(b.code) ||
      a.message.localeCompare(b.message),
  );
}

export const hasErrors = (problems: readonly Problem[]): boolean => problems.some((p) => p.severity === 'error');

/**
 * What stops a command, one type with a kind: `usage`, the command was called wrongly (an
 * output folder it will not replace, a shard record, a build to compare; exit 2); `input`,
 * the input data (its problems are Problems, all reported in one run; exit 1); `internal`,
 * a failure of the tool itself, to be reported (exit 3). Raised anywhere below the CLI, which
 * maps the kind to the exit code.
 */
export type ToolErrorKind = 'usage' | 'input' | 'internal';

export class ToolError extends Error {
  constructor(
    readonly kind: ToolErrorKind,
    message: string,
  ) {
    super(kind === 'internal' ? `internal: ${message}` : message);
  }
}

/** A mistake in how a command was called: a ToolError of kind `usage`. */
export class UsageError extends ToolError {
  constructor(message: string) {
    super('usage', message);
  }
}
