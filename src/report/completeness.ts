import type { CalcContext } from '../calc/context.ts';
import { MANDATORY_INDICATORS } from '../reference/indicators.ts';

/** results.json `completeness`: every mandatory indicator in every declared module, or what is missing and why. */
export interface CompletenessJson {
  complete: boolean;
  mandatory: string;
  /** A mandatory indicator not reported at all (`modules` null), or not available in some modules. */
  missing: Array<{ indicator: string; modules: string[] | null; reason: string }>;
}

/**
 * Never a silent gap: a mandatory indicator the declaration does not report says why (no
 * column in factors.csv, or left out by declaration.json `indicators`), and one that is not
 * available (n/a) in a declared module names the modules.
 */
export function productCompleteness(ctx: CalcContext, summary: { methods: { cutoff: { modules: Record<string, Record<string, number | null>> } } }): CompletenessJson {
  const project = ctx.project;
  const reported = new Set(project.indicators);
  const missing: CompletenessJson['missing'] = [];
  for (const code of MANDATORY_INDICATORS) {
    if (!reported.has(code)) {
      const reason = project.declaration.indicators ? 'declaration.json indicators leaves it out' : 'factors.csv has no column for it';
      missing.push({ indicator: code, modules: null, reason });
      continue;
    }
    const modules = Object.entries(summary.methods.cutoff.modules)
      .filter(([, values]) => values[code] === null)
      .map(([module]) => module);
    if (modules.length > 0) missing.push({ indicator: code, modules, reason: 'not available: a factor behind the figure has no value for it (its audit trail names the factor)' });
  }
  return { complete: missing.length === 0, mandatory: 'every core impact, resource use, waste and output flow indicator of EN 15804+A2 in every declared module', missing };
}

/** The completeness in a sentence, for the page and the catalogue. */
export function completenessText(completeness: CompletenessJson): string | undefined {
  if (completeness.complete) return undefined;
  const unreported = completeness.missing.filter((m) => m.modules === null);
  const partial = completeness.missing.filter((m) => m.modules !== null);
  const parts: string[] = [];
  for (const reason of [...new Set(unreported.map((m) => m.reason))]) parts.push(`${unreported.filter((m) => m.reason === reason).map((m) => m.indicator).join(', ')} not reported (${reason})`);
  if (partial.length > 0) parts.push(`${partial.map((m) => `${m.indicator} in ${m.modules!.join(', ')}`).join('; ')} not available (a factor behind the figure has no value)`);
  return `Incomplete: mandatory indicators of EN 15804+A2 are missing. ${parts.join('. ')}.`;
}
