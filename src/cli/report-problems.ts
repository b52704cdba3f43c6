import { formatProblem, type Problem } from '../problems.ts';
import type { Io } from './io.ts';

/** Prints problems one a line on stderr, then a count. */
export function printProblems(problems: readonly Problem[], dir: string, io: Io): void {
  for (const problem of problems) io.err(formatProblem(problem, dir));
  const errors = problems.filter((p) => p.severity === 'error').length;
  const warnings = problems.length - errors;
  io.err(`${dir}: ${plural(errors, 'error')}, ${plural(warnings, 'warning')}`);
}

const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;
