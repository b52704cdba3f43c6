import type { z } from 'zod';
import type { Problem } from '../problems.ts';
import { nearestName } from '../reference/nearest.ts';
import { describeIssue } from '../schema/issues.ts';
import type { Dialect } from '../schema/numbers.ts';
import type { processCsv } from '../schema/process.ts';
import { kindSchema, knownParameters, parameterMeta, type ParameterMeta } from '../schema/process-kinds.ts';
import type { RowOf } from '../schema/csv-file.ts';
import type { Row, Table } from '../schema/table.ts';
import { flowFactor, runProcess, type ProcessInput } from '../process/run.ts';
import type { ProcessResult } from '../process/steps.ts';
import { formatSignificant } from '../format.ts';

export type ProcessRow = RowOf<typeof processCsv>;

/** One process of process.csv: its kind, its typed parameters, and the row each was read from. */
export type ProcessDefinition = ProcessInput & {
  id: string;
  /** The first row of the process (where a missing parameter is reported). */
  first: Row<ProcessRow>;
  /** The row of each parameter, by its name in process.csv (`reagent:acid` for a family member). */
  rows: Map<string, Row<ProcessRow>>;
  /** Its calculator's derivation and inventory, computed once at validation. */
  result: ProcessResult;
};

const unitAccepted = (meta: ParameterMeta, written: string | undefined): boolean => {
  const unit = (written ?? '').trim();
  if (meta.type === 'share') return unit === '' || unit === 'share' || unit === '%';
  return unit === meta.unit;
};

/**
 * Reads process.csv into processes: every row's parameter checked against its kind's
 * schema (name, unit, value), a process with rows of two kinds refused, a required
 * parameter missing reported on the process's first row.
 */
export function readProcesses(table: Table<ProcessRow>): { processes: ProcessDefinition[]; problems: Problem[] } {
  const problems: Problem[] = [];
  const file = table.file;
  const dialect: Dialect = { decimalComma: table.delimiter === ';' };
  const at = (row: Row<ProcessRow>, column: 'parameter' | 'value' | 'unit' | 'kind', problem: Omit<Problem, 'file' | 'line' | 'column' | 'columnIndex' | 'severity'> & { severity?: Problem['severity'] }) =>
    problems.push({ severity: 'error', file, line: row.line, column, ...(table.columns[column] === undefined ? {} : { columnIndex: table.columns[column] }), ...problem });

  const byProcess = new Map<string, Array<Row<ProcessRow>>>();
  for (const row of table.rows) {
    const list = byProcess.get(row.value.process_id) ?? [];
    list.push(row);
    byProcess.set(row.value.process_id, list);
  }
  const processes: ProcessDefinition[] = [];
  for (const [id, rows] of byProcess) {
    const first = rows[0]!;
    const kind = first.value.kind;
    // The written values, shaped as the kind's schema reads them: a family member under its family.
    const raw: Record<string, string | Record<string, string>> = {};
    const rowOf = new Map<string, Row<ProcessRow>>();
    let ok = true;
    for (const row of rows) {
      const name = row.value.parameter;
      if (row.value.kind !== kind) {
        at(row, 'kind', { code: 'PROCESS_KIND_MIXED', value: row.raw.kind ?? '', message: `process ${id} is ${kind} on line ${first.line}; one process has one kind`, expected: kind });
        ok = false;
        continue;
      }
      if (rowOf.has(name)) {
        // Reported by the duplicate-key check (process.csv's key rule); the process is not computed.
        ok = false;
        continue;
      }
      rowOf.set(name, row);
      const meta = parameterMeta(kind, name);
      if (!meta) {
        const known = knownParameters(kind);
        const near = nearestName(name, known);
        at(row, 'parameter', { code: 'PARAMETER_UNKNOWN', value: name, message: `is not a parameter of ${kind}`, expected: `one of ${known.join(', ')}`, ...(near ? { hint: `did you mean "${near}"?` } : {}) });
        ok = false;
        continue;
      }
      if (!unitAccepted(meta, row.value.unit)) {
        at(row, 'unit', { code: 'UNIT_MISMATCH', value: row.value.unit ?? '', message: `is not the unit ${name} is written in`, expected: meta.type === 'share' ? 'share or %' : meta.unit === '' ? 'empty (the value is a word or a count)' : meta.unit });
        ok = false;
      }
      if (meta.family) {
        const colon = name.indexOf(':');
        ((raw[name.slice(0, colon)] ??= {}) as Record<string, string>)[name.slice(colon + 1)] = row.value.value;
      } else raw[name] = row.value.value;
    }
    const parsed = kindSchema(kind, dialect).safeParse(raw);
    if (!parsed.success) {
      ok = false;
      for (const issue of parsed.error.issues) {
        const name = issue.path.length > 1 ? `${String(issue.path[0])}:${String(issue.path[1])}` : String(issue.path[0] ?? '');
        const row = rowOf.get(name);
        const meta = parameterMeta(kind, name);
        if (row) cellProblem(at, row, issue);
        else at(first, 'parameter', { code: 'VALUE_REQUIRED', value: name, message: `${kind} needs ${name}: ${meta?.description ?? ''}`.trim(), expected: `a row ${id},${kind},${name},<value>,${meta?.unit ?? ''}` });
      }
    }
    if (!ok || !parsed.success) continue;
    const input = { kind, values: parsed.data } as ProcessInput;
    // Operating data below a physical or stoichiometric floor are refused here, at their row, not computed.
    const result = runProcess(input);
    const definition: ProcessDefinition = { id, first, rows: rowOf, result, ...input };
    for (const flow of result.inventory) {
      const { factor, parameter } = flowFactor(definition, flow.flow);
      if (factor === undefined) {
        at(first, 'parameter', { code: 'FACTOR_REQUIRED', value: parameter, message: `${id} (${kind}) uses ${flow.flow} (${formatSignificant(flow.amount, 4)} ${flow.unit} per t) but names no factor for it`, expected: `a row ${id},${kind},${parameter},<factor id in factors.csv>` });
        ok = false;
      }
    }
    for (const problem of result.problems) {
      const row = rowOf.get(problem.parameter);
      if (row) at(row, 'value', { code: 'PROCESS_INFEASIBLE', value: row.value.value, message: problem.message, expected: problem.expected });
      else at(first, 'parameter', { code: problem.value === '' ? 'VALUE_REQUIRED' : 'PROCESS_INFEASIBLE', value: problem.parameter, message: `${id} (${kind}): ${problem.parameter} ${problem.message}`, expected: problem.expected });
      ok = false;
    }
    if (ok) processes.push(definition);
  }
  return { processes, problems };
}

function cellProblem(at: (row: Row<ProcessRow>, column: 'value', problem: Omit<Problem, 'file' | 'line' | 'column' | 'columnIndex' | 'severity'>) => void, row: Row<ProcessRow>, issue: z.core.$ZodIssue): void {
  const described = describeIssue(issue);
  at(row, 'value', { code: described.code, value: row.value.value, message: described.message, ...(described.expected ? { expected: described.expected } : {}), ...(described.hint ? { hint: described.hint } : {}) });
}

