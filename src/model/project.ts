import path from 'node:path';
import { readCsvText } from '../load/csv.ts';
import { readText } from '../load/text.ts';
import { jsonCells, loadJson, locate, jsonPath, type JsonFile } from '../load/json.ts';
import { sortProblems, type Problem } from '../problems.ts';
import { FACTOR_INDICATOR_CODES, INDICATORS, IndicatorSet, findIndicator } from '../reference/indicators.ts';
import { CSV_FILES, DECLARATION_FILE, productsCsv, bomCsv, materialsCsv, eolCsv, activitiesCsv, transportCsv, factorsCsv, processCsv, siteCsv, productionCsv, familiesCsv, excludedCsv } from '../schema/index.ts';
import { readFamilies } from './families.ts';
import { readSites } from './sites.ts';
import { columnsOf } from '../schema/csv-file.ts';
import { readProcesses } from './processes.ts';
import { crossKeyRules, declarationSchema, DECLARATION_KEYS, type Declaration } from '../schema/declaration.ts';
import { describeIssue } from '../schema/issues.ts';
import { cellProblem, tableReader, indicatorHeaderName, type Table, type TableOptions, type TableReader } from '../schema/table.ts';
import { optionalQuantity } from '../schema/cells.ts';
import type { FactorRow } from './rows.ts';
import type { CsvFileSchema, RowOf } from '../schema/csv-file.ts';
import { nearestName } from '../reference/nearest.ts';
import { crossFileChecks } from './checks/index.ts';
import { foldIdKnockOns } from './checks/root-causes.ts';
import { readSupplierDatasets } from './supplier-datasets.ts';
import { hashCurrentInputs, NO_INPUTS, readRecord, RECORD_FILE, type RecordState } from './verification-record.ts';

export * from './types.ts';
import type { Project } from './types.ts';
import { projectLookups } from './lookups.ts';

export interface ProjectLoad {
  /** Present when the project has no errors (warnings allowed). */
  project?: Project;
  problems: Problem[];
}

const FLOW_COLUMN_REASON = 'is computed from the product’s mass flows (EN 15804+A2), not read from factors.csv; the column is ignored';

/** Reads, parses and cross-checks a data folder; every problem of every file in one pass. */
export async function loadProject(dirArgument: string): Promise<ProjectLoad> {
  const dir = path.resolve(dirArgument);
  const problems: Problem[] = [];

  // Files are read together; their records are then validated one file at a time, each
  // record as csv-parse produces it, so no file's raw records are ever held in memory.
  const [declarationLoad, ...texts] = await Promise.all([loadJson(dir, DECLARATION_FILE), ...CSV_FILES.map((schema) => readText(dir, schema.file))]);
  const text = new Map(CSV_FILES.map((schema, index) => [schema.file, texts[index]!]));
  texts.length = 0;

  let declaration: Declaration | undefined;
  let declarationFile: JsonFile | undefined;
  if (declarationLoad.ok) {
    declarationFile = declarationLoad.json;
    const parsed = parseDeclaration(declarationLoad.json);
    problems.push(...parsed.problems);
    declaration = parsed.declaration;
  } else {
    problems.push(...declarationLoad.problems);
  }

  const tableOf = <S extends CsvFileSchema>(schema: S, options: TableOptions = {}): Table<RowOf<S>> | undefined => {
    let read = text.get(schema.file)!;
    text.delete(schema.file);
    // An optional file that is not there reads as its header alone: no rows, no problem.
    if (!read.ok && schema.optional && read.problem.code === 'FILE_MISSING') read = { ok: true, text: `${columnsOf(schema).map((column) => column.name).join(',')}\n`, bytes: Buffer.alloc(0) };
    if (!read.ok) {
      problems.push(read.problem);
      return undefined;
    }
    let reader: TableReader<RowOf<S>> | undefined;
    const csv = readCsvText(schema.file, read.text, (source) => {
      reader = tableReader(source, schema, options);
      return reader.add;
    });
    problems.push(...csv.problems);
    if (!csv.ok || !reader) return undefined;
    const { table, problems: found } = reader.finish();
    problems.push(...found);
    return table;
  };
  const products = tableOf(productsCsv);
  const bom = tableOf(bomCsv);
  const materials = tableOf(materialsCsv);
  const eol = tableOf(eolCsv);
  const activities = tableOf(activitiesCsv);
  const transport = tableOf(transportCsv);
  // The registry's indicators and the programme's own (declaration.json extra_indicators), read from factors.csv columns of their code.
  const indicatorSet = new IndicatorSet(declaration?.extra_indicators ?? []);
  const factors = tableOf(factorsCsv, {
    canonicalName: (header) => indicatorHeaderName(header) ?? indicatorSet.find(header)?.code,
    ignored: (name: string) => (findIndicator(name)?.basis === 'flows' ? `${name} ${FLOW_COLUMN_REASON}` : undefined),
  });
  if (factors) problems.push(...readExtraIndicators(factors, indicatorSet.extraCodes));

  const process = tableOf(processCsv);
  const processRead = process ? readProcesses(process) : undefined;
  if (processRead) problems.push(...processRead.problems);
  const site = tableOf(siteCsv);
  const production = tableOf(productionCsv, { extraColumns: true });
  const sitesRead = site && production && products ? readSites(site, production, products) : undefined;
  if (sitesRead) problems.push(...sitesRead.problems);
  const familyRows = tableOf(familiesCsv);
  const excluded = tableOf(excludedCsv);
  const familiesRead = familyRows && products && production ? readFamilies(familyRows, products, production) : undefined;
  if (familiesRead) problems.push(...familiesRead.problems);

  const extraCodes = indicatorSet.extraCodes;
  const factorIndicators = factors ? indicatorSet.inReportingOrder(Object.keys(factors.columns).filter((name) => FACTOR_INDICATOR_CODES.includes(name) || extraCodes.includes(name))) : [];
  // Default: every indicator factors.csv has a column for, and the flow indicators, which come from the product's own mass flows.
  // A programme's own indicators are reported wherever factors.csv has their column.
  const flowIndicators = INDICATORS.filter((i) => i.basis === 'flows').map((i) => i.code);
  const extras = extraCodes.filter((code) => factorIndicators.includes(code));
  const indicators = declaration?.indicators ? indicatorSet.inReportingOrder([...declaration.indicators, ...extras]) : indicatorSet.inReportingOrder([...factorIndicators, ...flowIndicators]);

  // Supplier declarations (factors.csv supplier_dataset) fill their rows' values before any check reads them.
  const supplierRead = factors ? await readSupplierDatasets(dir, factors, declaration, indicators) : undefined;
  if (supplierRead) problems.push(...supplierRead.problems);

  if (products && bom && materials && eol && activities && transport && factors && supplierRead && process && processRead && site && production && sitesRead && familyRows && familiesRead && excluded) {
    const processes = processRead.processes;
    const suppliers = supplierRead.suppliers;
    const lookups = projectLookups({ products, materials, eol, factors, process, processes, bom, activities, transport, site, excluded });
    const tables = { dir, indicators, factorIndicators, products, bom, materials, eol, activities, transport, factors, process, processes, site, production, allocation: sitesRead.allocation, familyRows, families: familiesRead.families, excluded, lookups, indicatorSet, suppliers };
    // Cross-file rules run even when declaration.json is broken, so one run shows every problem.
    problems.push(...crossFileChecks({ ...tables, declaration, declarationFile }));
    // The verifier's record: a declaration is verified only by a record whose signature checks.
    // The input files are hashed again only where there is a record to compare them with.
    const state = await readRecord(dir, declaration?.verification.public_key);
    const verification = { state, current: state.kind === 'none' ? NO_INPUTS : await hashCurrentInputs(dir, DECLARATION_FILE, [...suppliers.values()].map((s) => s.file)) };
    if (declaration?.verification.status === 'verified' && verification.state.kind !== 'valid' && declarationFile) problems.push(unsignedVerified(declarationFile, verification.state));
    const sorted = sortProblems(foldIdKnockOns(problems));
    if (declaration && declarationFile && !sorted.some((p) => p.severity === 'error')) {
      return { project: { ...tables, declaration, declarationFile, declarationCells: jsonCells(declarationFile), verification }, problems: sorted };
    }
    return { problems: sorted };
  }
  return { problems: sortProblems(problems) };
}

/** `verification.status: "verified"` set by hand: only a verifier's signed record makes a declaration verified. */
function unsignedVerified(json: JsonFile, state: RecordState): Problem {
  const where = locate(json, ['verification', 'status']);
  return {
    severity: 'warning', code: 'VERIFICATION_UNSIGNED', file: json.file, line: where.line, column: 'verification.status', columnIndex: where.column, value: 'verified',
    message: `says verified, but ${state.kind === 'invalid' ? state.reason : `the data folder has no verifier’s record (${RECORD_FILE})`}; every declaration is built as a draft`,
    expected: 'a verification record signed by the verifier (loopsheet verify)',
  };
}

function parseDeclaration(json: JsonFile): { declaration?: Declaration; problems: Problem[] } {
  const problems: Problem[] = [...unknownKeys(json)];
  const result = declarationSchema.safeParse(json.value);
  if (result.success) return { declaration: result.data, problems };
  // The rules between keys too, where the schema's own issues left them unchecked.
  const located = new Set(result.error.issues.map((issue) => issue.path.join('.')));
  const rules = crossKeyRules(json.value).filter((rule) => !located.has(rule.path.join('.')));
  for (const issue of [...result.error.issues, ...(rules as unknown as typeof result.error.issues)]) {
    const described = describeIssue(issue);
    const where = locate(json, issue.path as (string | number)[]);
    const value = where.node === undefined ? undefined : typeof where.node.value === 'string' ? where.node.value : json.text.slice(where.node.offset, where.node.offset + where.node.length);
    problems.push({
      severity: 'error',
      code: described.code,
      file: json.file,
      line: where.line,
      column: jsonPath(issue.path) || '(document)',
      columnIndex: where.column,
      ...(value === undefined ? {} : { value }),
      message: described.message,
      ...(described.expected ? { expected: described.expected } : {}),
      ...(described.hint ? { hint: described.hint } : {}),
    });
  }
  return { problems };
}

function unknownKeys(json: JsonFile): Problem[] {
  const problems: Problem[] = [];
  const visit = (value: unknown, at: (string | number)[], schemaKey: string) => {
    const known = DECLARATION_KEYS[schemaKey];
    if (!known || value === null || typeof value !== 'object' || Array.isArray(value)) return;
    for (const key of Object.keys(value)) {
      const keyPath = [...at, key];
      if (!known.includes(key)) {
        const where = locate(json, keyPath);
        const near = nearestName(key, known);
        problems.push({
          severity: 'warning', code: 'KEY_UNKNOWN', file: json.file, line: where.line, column: jsonPath(keyPath), columnIndex: where.column, value: key,
          message: 'is not a key loopsheet knows and is ignored',
          ...(near ? { hint: `did you mean "${near}"?` } : {}),
        });
        continue;
      }
      const child = (value as Record<string, unknown>)[key];
      if (Array.isArray(child)) child.forEach((item, index) => visit(item, [...keyPath, index], `${key}[]`));
      else visit(child, keyPath, schemaKey === '' ? key : `${schemaKey}.${key}`);
    }
  };
  visit(json.value, [], '');
  return problems;
}

/**
 * The values of a programme's own indicators: factors.csv cells of their columns, read as
 * every indicator cell is (a number, empty for not available), into each row's values.
 */
function readExtraIndicators(factors: Table<FactorRow>, codes: readonly string[]): Problem[] {
  const problems: Problem[] = [];
  const present = codes.filter((code) => factors.columns[code] !== undefined);
  if (present.length === 0) return problems;
  const cell = optionalQuantity({ decimalComma: factors.delimiter === ';' }, 'A programme’s own indicator.', 'its unit per row unit', { signed: true });
  for (const row of factors.rows) {
    for (const code of present) {
      const parsed = cell.safeParse(row.raw[code]);
      if (parsed.success) (row.value as unknown as Record<string, number | null>)[code] = parsed.data;
      else {
        const issue = describeIssue(parsed.error.issues[0]!);
        problems.push(cellProblem(factors, row, code, 'error', issue.code, issue.message, issue.expected ? { expected: issue.expected } : {}));
      }
    }
  }
  return problems;
}
