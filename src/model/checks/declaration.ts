import { locate } from '../../load/json.ts';
import type { CheckContext } from './context.ts';

export function declarationRules(ctx: CheckContext): void {
  const { declaration, declarationFile } = ctx.project;
  if (!declaration || !declarationFile) return;
  const issued = new Date(`${declaration.issued}T00:00:00Z`);
  const limit = new Date(Date.UTC(issued.getUTCFullYear() + 5, issued.getUTCMonth(), issued.getUTCDate()));
  if (new Date(`${declaration.valid_until}T00:00:00Z`) > limit) {
    const where = locate(declarationFile, ['valid_until']);
    ctx.problems.push({
      severity: 'warning', code: 'VALIDITY_LONG', file: declarationFile.file, line: where.line, column: 'valid_until', columnIndex: where.column, value: declaration.valid_until,
      message: `is more than five years after issued (${declaration.issued}); EN 15804 and ISO 14025 practice is five years`,
      expected: `at most ${limit.toISOString().slice(0, 10)}`,
    });
  }
}
