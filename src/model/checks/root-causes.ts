import { formatCounted } from '../../format.ts';
import type { Problem } from '../../problems.ts';
import { CSV_FILES } from '../../schema/index.ts';
import { columnsOf } from '../../schema/csv-file.ts';

/** The codes of an id that is not one (its characters, its length, a reserved name). */
const BAD_ID_CODES: ReadonlySet<Problem['code']> = new Set(['BAD_ID', 'ID_TOO_LONG', 'ID_RESERVED']);

/** Each id and reference column, by `file column`: its kind and, for a reference, the `file column` it names. */
const COLUMNS = new Map(
  CSV_FILES.flatMap((schema) =>
    columnsOf(schema)
      .filter((column) => column.kind === 'id' || column.kind === 'reference')
      .map((column) => [`${schema.file} ${column.name}`, { kind: column.kind, references: column.references }] as const),
  ),
);

const DID_YOU_MEAN = /^did you mean "(.*)"\?$/;

/**
 * One invalid id is one problem. Where an id is refused where it is defined (a product id with
 * a space), every row that refers to it — by the same text, refused again, or by a valid id
 * whose nearest match is the invalid one — is a consequence, not a mistake of its own: those
 * problems are folded into the definition's, which says how many rows of which files refer to
 * it. A suggestion is never an invalid id.
 */
export function foldIdKnockOns(problems: readonly Problem[]): Problem[] {
  const definitions = new Map<string, Map<string, { problem: Problem; files: Map<string, number> }>>();
  for (const problem of problems) {
    const column = problem.column === undefined ? undefined : COLUMNS.get(`${problem.file} ${problem.column}`);
    if (!column || column.kind !== 'id' || !BAD_ID_CODES.has(problem.code) || problem.value === undefined) continue;
    const target = `${problem.file} ${problem.column}`;
    if (!definitions.has(target)) definitions.set(target, new Map());
    definitions.get(target)!.set(problem.value.trim(), { problem, files: new Map() });
  }
  if (definitions.size === 0) return [...problems];
  const kept: Problem[] = [];
  for (const problem of problems) {
    const column = problem.column === undefined ? undefined : COLUMNS.get(`${problem.file} ${problem.column}`);
    const invalid = column?.kind === 'reference' && column.references ? definitions.get(column.references) : undefined;
    const meant = invalid && problem.value !== undefined ? (BAD_ID_CODES.has(problem.code) ? problem.value.trim() : problem.code === 'UNKNOWN_REFERENCE' ? DID_YOU_MEAN.exec(problem.hint ?? '')?.[1] : undefined) : undefined;
    const definition = meant === undefined ? undefined : invalid!.get(meant);
    if (!definition) {
      kept.push(problem);
      continue;
    }
    definition.files.set(problem.file, (definition.files.get(problem.file) ?? 0) + 1);
  }
  return kept.map((problem) => {
    const column = problem.column === undefined ? undefined : definitions.get(`${problem.file} ${problem.column}`);
    const folded = problem.value === undefined ? undefined : column?.get(problem.value.trim());
    if (!folded || folded.problem !== problem || folded.files.size === 0) return problem;
    const count = [...folded.files.values()].reduce((a, b) => a + b, 0);
    const files = [...folded.files.keys()].sort();
    const where = files.length === 1 ? files[0] : `${files.slice(0, -1).join(', ')} and ${files.at(-1)}`;
    return { ...problem, message: `${problem.message}; ${formatCounted(count, 'row', 'rows')} of ${where} refer to it (not reported again: fix the id here, and there if they differ)` };
  });
}
