import type { Problem } from '../../problems.ts';
import { CheckContext, type CheckInput } from './context.ts';
import { caseClashes, duplicateKeys } from './duplicate-keys.ts';
import { references } from './references.ts';
import { productRules } from './product-rules.ts';
import { factorRequirements } from './factor-requirements.ts';
import { unitRules } from './units.ts';
import { factorCompleteness } from './factor-completeness.ts';
import { gwpConsistency } from './gwp-consistency.ts';
import { energyRecoveryRules } from './energy-recovery.ts';
import { packagingRules } from './packaging.ts';
import { provenanceWarnings } from './provenance.ts';
import { declarationRules } from './declaration.ts';

export type { CheckInput } from './context.ts';

/**
 * Rules that need more than one row or file: duplicate ids, references across files,
 * the BOM against the declared unit, end-of-life coverage, factors a use requires, unit
 * compatibility and factor completeness. Each rule reports at the cell a user must edit.
 */
export function crossFileChecks(project: CheckInput): Problem[] {
  const problems: Problem[] = [];
  const ctx = new CheckContext(project, problems);
  duplicateKeys(ctx);
  caseClashes(ctx);
  references(ctx);
  productRules(ctx);
  factorRequirements(ctx);
  unitRules(ctx);
  factorCompleteness(ctx);
  gwpConsistency(ctx);
  energyRecoveryRules(ctx);
  packagingRules(ctx);
  provenanceWarnings(ctx);
  declarationRules(ctx);
  return problems;
}
