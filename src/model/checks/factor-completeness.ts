import { locate } from '../../load/json.ts';
import { parameterMeta } from '../../schema/process-kinds.ts';
import { indicatorValue } from '../types.ts';
import type { CheckContext } from './context.ts';
import { MATERIAL_FACTOR_COLUMNS } from '../../schema/materials.ts';
import { MANDATORY_INDICATORS } from '../../reference/indicators.ts';
import { formatCounted } from '../../format.ts';

/** Factor ids the project uses, with the first place each is used. */
function usedFactors(ctx: CheckContext): Map<string, string> {
  const p = ctx.project;
  const used = new Map<string, string>();
  const use = (id: string | undefined, where: string) => {
    if (id !== undefined && !used.has(id)) used.set(id, where);
  };
  const materialIds = new Set(p.bom.rows.map((row) => row.value.material));
  for (const row of p.materials.rows) {
    if (!materialIds.has(row.value.material)) continue;
    for (const column of MATERIAL_FACTOR_COLUMNS) use(row.value[column], `materials.csv line ${row.line}`);
  }
  for (const row of p.eol.rows) {
    use(row.value.transport_factor, `eol.csv line ${row.line}`);
    use(row.value.processing_factor, `eol.csv line ${row.line}`);
  }
  for (const row of p.activities.rows) use(row.value.factor, `activities.csv line ${row.line}`);
  for (const row of p.site.rows) use(row.value.factor, `site.csv line ${row.line}`);
  for (const row of p.transport.rows) use(row.value.factor, `transport.csv line ${row.line}`);
  for (const row of p.process.rows) if (parameterMeta(row.value.kind, row.value.parameter)?.type === 'factor') use(row.value.value, `process.csv line ${row.line}`);
  return used;
}

export function factorCompleteness(ctx: CheckContext): void {
  const p = ctx.project;
  const present = new Set(p.factorIndicators);
  const asked = p.indicators.filter((code) => p.indicatorSet.find(code)?.basis === 'factors');
  const requested = p.declaration?.indicators;
  if (requested && p.declarationFile) {
    for (const code of asked) {
      if (present.has(code)) continue;
      const where = locate(p.declarationFile, ['indicators', requested.indexOf(code)]);
      ctx.problems.push({
        severity: 'warning', code: 'INDICATOR_NO_DATA', file: p.declarationFile.file, line: where.line, column: 'indicators', columnIndex: where.column, value: code,
        message: `is asked for, but factors.csv has no ${code} column; every ${code} figure will be incomplete`,
        expected: `a ${code} column in factors.csv`,
      });
    }
  }
  // A programme's own indicator needs a column of its code.
  (p.declaration?.extra_indicators ?? []).forEach((extra, index) => {
    if (present.has(extra.code) || !p.declarationFile) return;
    const where = locate(p.declarationFile, ['extra_indicators', index, 'code']);
    ctx.problems.push({
      severity: 'warning', code: 'INDICATOR_NO_DATA', file: p.declarationFile.file, line: where.line, column: `extra_indicators[${index}].code`, columnIndex: where.column, value: extra.code,
      message: `is declared, but factors.csv has no ${extra.code} column; it is not reported`,
      expected: `a ${extra.code} column in factors.csv`,
    });
  });
  // The method comparison can only show indicators the declaration computes from factors.
  const compared = p.declaration?.report.compare_indicators ?? [];
  if (p.declarationFile) {
    compared.forEach((code, index) => {
      if (asked.includes(code)) return;
      const where = locate(p.declarationFile!, ['report', 'compare_indicators', index]);
      ctx.problems.push({
        severity: 'warning', code: 'INDICATOR_NO_DATA', file: p.declarationFile!.file, line: where.line, column: 'report.compare_indicators', columnIndex: where.column, value: code,
        message: `is asked for in the method comparison, but the declaration does not report ${code} from factors.csv; the comparison leaves it out`,
        expected: `an indicator reported from factors.csv (${asked.slice(0, 3).join(', ')}, …)`,
      });
    });
  }
  // EN 15804+A2: every core, resource use, waste and output indicator, in every declared module.
  const unreported = MANDATORY_INDICATORS.filter((code) => !p.indicators.includes(code));
  if (unreported.length > 0) {
    const byDeclaration = requested !== undefined && p.declarationFile !== undefined;
    const where = byDeclaration ? locate(p.declarationFile!, ['indicators']) : { line: p.factors.csv.header.line, column: 1 };
    ctx.problems.push({
      severity: 'warning', code: 'MANDATORY_INDICATOR_MISSING', file: byDeclaration ? p.declarationFile!.file : p.factors.file, line: where.line, column: byDeclaration ? 'indicators' : '(header)', columnIndex: where.column, value: unreported.join(' '),
      message: `${formatCounted(unreported.length, 'mandatory indicator is', 'mandatory indicators are')} not reported (${unreported.join(', ')}): ${byDeclaration ? 'declaration.json indicators leaves them out' : 'factors.csv has no column for them'}; every declaration says so and the catalogue marks it incomplete`,
      expected: byDeclaration ? 'every core impact, resource use, waste and output indicator in indicators' : 'a column in factors.csv for each (EN 15804+A2 codes)',
    });
  }
  const used = usedFactors(ctx);
  for (const row of p.factors.rows) {
    const where = used.get(row.value.factor_id);
    // A supplier dataset's missing indicators are reported where they are missing, in the dataset.
    if (!where || row.value.supplier_dataset !== undefined) continue;
    const missing = asked.filter((code) => present.has(code) && indicatorValue(row.value, code) === null);
    if (missing.length === 0) continue;
    const first = missing[0]!;
    ctx.at(p.factors, row.line, row.raw, first, 'warning', 'FACTOR_VALUE_MISSING',
      `factor ${row.value.factor_id} (used by ${where}) has no value for ${missing.join(', ')}; figures using it will be marked incomplete`,
      { value: row.raw[first] ?? '', expected: 'a number (an empty cell means "not available", never 0)' });
  }
}
