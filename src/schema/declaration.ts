import { z } from 'zod';
import { findIndicator, INDICATOR_CODES } from '../reference/indicators.ts';
import { nearestName } from '../reference/nearest.ts';
import type { ProblemCode } from '../problems.ts';
import { isIsoDate, report } from './cells.ts';

export const METHODS = ['cutoff', 'cff', 'eol-recycling', 'fifty-fifty'] as const;
/** The modules a declaration may add to the mandatory A1–A3, C1–C4 and D. */
export const OPTIONAL_MODULES = ['A4', 'A5'] as const;
export type Method = (typeof METHODS)[number];

/** The methods a declaration reports: those it names, or every one (declaration.json `methods`, default: all). */
export const chosenMethods = (declaration: { methods?: readonly Method[] | undefined } | undefined): readonly Method[] => declaration?.methods ?? METHODS;

const nonEmpty = (description: string) => z.string().trim().min(1).meta({ description });

const isoDate = (description: string) =>
  z
    .string()
    .refine(isIsoDate, { params: { problem: 'BAD_DATE', expected: 'an ISO date, YYYY-MM-DD' }, message: 'is not an ISO date (YYYY-MM-DD)' })
    .meta({ description, format: 'date' });

const indicatorCode = z
  .string()
  .transform((code, ctx) => {
    const indicator = findIndicator(code);
    if (!indicator) {
      const near = nearestName(code, INDICATOR_CODES);
      return report(ctx, 'INDICATOR_UNKNOWN', 'is not an EN 15804+A2 indicator code', 'an EN 15804+A2 indicator code such as GWP-total', near ? `did you mean "${near}"?` : undefined);
    }
    return indicator.code;
  })
  .meta({ description: 'An EN 15804+A2 indicator code (GWP-total, AP, PENRT, …).', enum: [...INDICATOR_CODES] });

/**
 * declaration.json: who declares, under which standard and PCR, for which period, and
 * what is reported. The JSON Schema of this object is published by `loopsheet schema`.
 */
export const declarationSchema = z
  .object({
    owner: z
      .object({
        name: nonEmpty('Name of the manufacturer that owns the declaration.'),
        address: z.string().optional().meta({ description: 'Postal address.' }),
        contact: z.string().optional().meta({ description: 'Contact for questions on the declaration.' }),
      })
      .meta({ description: 'The declaration owner.' }),
    standard: z.literal('EN 15804+A2').meta({ description: 'The core product category rules followed. Only "EN 15804+A2" for now.' }),
    pcr: nonEmpty('The product category rules applied, e.g. a complementary PCR for metal products, with version.'),
    reference_year: z.int().min(1990).max(2100).meta({ description: 'Year the inventory data represent.' }),
    issued: isoDate('Date of issue.'),
    valid_until: isoDate('End of validity (normally five years after issue).'),
    verification: z
      .object({
        status: z.enum(['draft', 'verified']).meta({ description: 'draft until an independent verifier has verified the declaration under ISO 14025.' }),
        verifier: z.string().optional().meta({ description: 'Name of the independent verifier (required once verified).' }),
        date: isoDate('Date of verification (required once verified).').optional(),
        public_key: z.string().optional().meta({ description: 'The verifier’s Ed25519 public key (PEM), a path in the data folder; default verifier.pub.pem beside verification-record.json. Only a record signed with its private key (loopsheet verify) makes a declaration verified.' }),
      })
      .meta({ description: 'Verification status.' }),
    background_data: z
      .array(
        z.object({
          name: nonEmpty('Name of the background database or data source.'),
          version: nonEmpty('Its version.'),
          licence: z.string().optional().meta({ description: 'Licence under which it is used.' }),
        }),
      )
      .min(1)
      .meta({ description: 'Background data sources behind factors.csv.' }),
    indicators: z
      .array(indicatorCode)
      .optional()
      .meta({ description: 'Indicator codes to report; default: every code present in factors.csv, in EN 15804+A2 order.' }),
    extra_indicators: z
      .array(
        z.object({
          code: z
            .string()
            .regex(/^[A-Za-z][A-Za-z0-9&+.-]*$/)
            .refine((code) => findIndicator(code) === undefined, { params: { problem: 'DUPLICATE_ID', expected: 'a code that is not an EN 15804+A2 indicator' }, message: 'is an EN 15804+A2 indicator already' })
            .meta({ description: 'Its code, the header of its factors.csv column (e.g. GWP-GHG).' }),
          name: nonEmpty('Its name, as the programme writes it.'),
          unit: nonEmpty('Its unit per declared unit (e.g. kg CO2 eqv.).'),
        }),
      )
      .optional()
      .meta({ description: 'A programme operator’s own indicators beyond EN 15804+A2 (e.g. GWP-GHG): each read from a factors.csv column of its code and reported after the EN 15804+A2 indicators, in a table of its own.' }),
    methods: z
      .array(z.enum(METHODS))
      .optional()
      .meta({ description: 'Recycling-credit methods to report besides cut-off (always computed); default: all.' }),
    declared_modules: z
      .array(z.enum(OPTIONAL_MODULES))
      .optional()
      .meta({ description: 'Optional modules declared for every product besides A1–A3, C1–C4 and D: A4, A5. A product with activity rows or transport legs in A4 or A5 declares that module too. Where A5 is declared, the packaging’s end of life (waste processing, disposal, release of its biogenic carbon) is computed in A5; where it is not, check and the page say the packaging’s end of life is left out.' }),
    gwp_set: z.enum(['AR6', 'AR5']).default('AR6').meta({ description: 'GWP-100 set for direct greenhouse-gas emissions (ghg:… factors).' }),
    energy_recovery: z
      .object({
        electricity_efficiency: z.number().min(0).max(1).meta({ description: 'Net electrical efficiency of the incineration plant: MJ electricity exported per MJ (LHV) of waste.' }),
        heat_efficiency: z.number().min(0).max(1).meta({ description: 'Net thermal efficiency: MJ heat exported per MJ (LHV) of waste.' }),
        electricity_factor: z.string().min(1).meta({ description: 'Factor id (per kWh or MJ) of the electricity that exported electricity replaces.' }),
        heat_factor: z.string().min(1).meta({ description: 'Factor id (per MJ) of the heat that exported heat replaces.' }),
      })
      .optional()
      .meta({ description: 'Energy recovery beyond the system boundary (module D, CFF energy part); needed when a product material goes to energy recovery and has a heating value.' }),
    report: z
      .object({
        significant_figures: z.int().min(2).max(6).default(3).meta({ description: 'Significant figures of the results in the declaration tables (scientific notation); totals are always computed from unrounded values.' }),
        compare_indicators: z
          .array(indicatorCode)
          .min(1)
          .default(['GWP-total'])
          .meta({ description: 'Indicators shown side by side under every recycling method in the method comparison; default GWP-total.' }),
        family_tolerance: z
          .number()
          .min(0)
          .max(1)
          .default(0.1)
          .meta({ description: 'A family member whose GWP-total A1-A3 lies further than this share from the family’s weighted average is flagged on the family page and on stderr; default 0.1 (10 %, loopsheet’s default: set it from the applicable PCR).' }),
        sensitivity_step: z
          .number()
          .gt(0)
          .max(1)
          .default(0.1)
          .meta({ description: 'One-at-a-time sensitivity: each of the ten inputs that contribute most to GWP-total A1-A3 and to module D is moved by ± this share; default 0.1 (±10 %).' }),
      })
      .prefault({})
      .meta({ description: 'How the declaration pages present the results.' }),
    uncertainty: z
      .object({
        iterations: z.int().min(100).max(100_000).default(1000).meta({ description: 'Monte Carlo iterations; default 1 000.' }),
        seed: z.int().min(0).max(2 ** 31 - 1).default(1).meta({ description: 'Seed of the random numbers: the same seed gives the same numbers; default 1.' }),
      })
      .optional()
      .meta({ description: 'Run the Monte Carlo uncertainty analysis on every build (also `build --uncertainty`): inputs with a gsd column vary as lognormals around their values; the declarations show the median and the 2.5 and 97.5 percentiles of GWP-total A1-A3, D and the A1–C4 total.' }),
    illustrative: z
      .boolean()
      .default(false)
      .meta({ description: 'True when the data are invented (demo, training); every page then says the values are illustrative.' }),
  })
  .superRefine((declaration, ctx) => {
    for (const rule of crossKeyRules(declaration)) ctx.addIssue(rule);
  });

/**
 * The rules between keys of declaration.json (dates in order, a verified declaration's
 * verifier and date), as zod issues. They read the raw value defensively, so that they also
 * run when other keys fail the schema (zod runs a refinement only on a valid object): every
 * problem of the file comes in one run, not in rounds.
 */
export function crossKeyRules(value: unknown): Array<{ code: 'custom'; path: string[]; message: string; params: { problem: ProblemCode; expected: string } }> {
  const record = (v: unknown): Record<string, unknown> => (v !== null && typeof v === 'object' && !Array.isArray(v) ? (v as Record<string, unknown>) : {});
  const declaration = record(value);
  const rules: ReturnType<typeof crossKeyRules> = [];
  const { issued, valid_until: validUntil } = declaration;
  if (typeof issued === 'string' && typeof validUntil === 'string' && isIsoDate(issued) && isIsoDate(validUntil) && validUntil <= issued) {
    rules.push({ code: 'custom', path: ['valid_until'], message: `${validUntil} is not after issued ${issued}`, params: { problem: 'DATE_ORDER', expected: 'a date after issued' } });
  }
  const verification = record(declaration.verification);
  if (verification.status === 'verified') {
    if (typeof verification.verifier !== 'string' || !verification.verifier.trim()) {
      rules.push({ code: 'custom', path: ['verification', 'verifier'], message: 'a verified declaration names its verifier', params: { problem: 'VERIFICATION_INCOMPLETE', expected: 'the verifier’s name' } });
    }
    if (!verification.date) {
      rules.push({ code: 'custom', path: ['verification', 'date'], message: 'a verified declaration gives the date of verification', params: { problem: 'VERIFICATION_INCOMPLETE', expected: 'an ISO date, YYYY-MM-DD' } });
    }
  }
  return rules;
}

export type Declaration = z.output<typeof declarationSchema>;

/** An object, array, optional or defaulted schema, as far as its keys are concerned. */
type Walkable = z.ZodType & { shape?: Record<string, z.ZodType>; element?: z.ZodType; unwrap?: () => z.ZodType };

/**
 * The keys the schema knows, per object path (`report`, `background_data[]`), for "unknown
 * key" warnings: read from the schema itself, so a key added to it is known at once.
 */
function knownKeys(schema: Walkable, path = '', out: Record<string, string[]> = {}): Record<string, string[]> {
  let inner: Walkable = schema;
  while (typeof inner.unwrap === 'function' && inner.shape === undefined && inner.element === undefined) inner = inner.unwrap() as Walkable;
  if (inner.element !== undefined) return knownKeys(inner.element as Walkable, `${path}[]`, out);
  if (inner.shape === undefined) return out;
  out[path] = Object.keys(inner.shape);
  for (const [key, child] of Object.entries(inner.shape)) knownKeys(child as Walkable, path === '' ? key : `${path}.${key}`, out);
  return out;
}

/** The keys the schema knows, per object path; `$schema` may name the JSON Schema at the top. */
export const DECLARATION_KEYS: Record<string, readonly string[]> = (() => {
  const keys = knownKeys(declarationSchema as Walkable);
  return { ...keys, '': ['$schema', ...keys['']!] };
})();

export const declarationExample = {
  owner: { name: 'Your company', address: 'Street, town, country', contact: 'lca@example.invalid' },
  standard: 'EN 15804+A2',
  pcr: 'Name and version of the complementary PCR you follow',
  reference_year: 2025,
  issued: '2026-01-15',
  valid_until: '2031-01-14',
  verification: { status: 'draft' },
  background_data: [{ name: 'Your background database', version: '1.0' }],
  gwp_set: 'AR6',
};
