import type { z } from 'zod';
import type { ProblemCode } from '../problems.ts';
import type { IssueParams } from './cells.ts';

/** A zod issue as loopsheet's problem code, message and expectation. */
export function describeIssue(issue: z.core.$ZodIssue): { code: ProblemCode; message: string; expected?: string; hint?: string } {
  const params = (issue as { params?: Partial<IssueParams> }).params;
  if (issue.code === 'custom' && params?.problem) {
    return { code: params.problem, message: issue.message, ...(params.expected ? { expected: params.expected } : {}), ...(params.hint ? { hint: params.hint } : {}) };
  }
  switch (issue.code) {
    case 'invalid_type':
      if ((issue as { input?: unknown }).input === undefined) return { code: 'VALUE_REQUIRED', message: 'is missing', expected: issue.expected };
      return { code: issue.expected === 'number' || issue.expected === 'int' ? 'NOT_A_NUMBER' : 'BAD_CHOICE', message: `expected ${issue.expected}`, expected: issue.expected };
    case 'invalid_value':
      return { code: 'BAD_CHOICE', message: `is not one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}`, expected: `one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}` };
    case 'too_small':
      if (issue.origin === 'string') return { code: 'VALUE_REQUIRED', message: 'is empty', expected: 'a non-empty text' };
      if (issue.origin === 'array') return { code: 'VALUE_REQUIRED', message: `needs at least ${String(issue.minimum)} entr${issue.minimum === 1 ? 'y' : 'ies'}`, expected: `at least ${String(issue.minimum)}` };
      return { code: 'OUT_OF_RANGE', message: `is below ${String(issue.minimum)}`, expected: `at least ${String(issue.minimum)}` };
    case 'too_big':
      return { code: 'OUT_OF_RANGE', message: `is above ${String(issue.maximum)}`, expected: `at most ${String(issue.maximum)}` };
    case 'invalid_format':
      return { code: 'BAD_DATE', message: issue.message, expected: issue.format };
    default:
      return { code: 'BAD_CHOICE', message: issue.message };
  }
}
