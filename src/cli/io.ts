/** Exit codes, a public contract for CI scripts. */
export const EXIT = { ok: 0, input: 1, usage: 2, internal: 3 } as const;

/** Where a command writes: results to `out` (stdout), messages to `err` (stderr). */
export interface Io {
  out: (text: string) => void;
  err: (text: string) => void;
  isTty: boolean;
}

export { UsageError } from '../problems.ts';
