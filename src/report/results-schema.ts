import { z } from 'zod';
import type { ResultsJson } from './results.ts';

/**
 * results.json format 2 as a zod schema: `loopsheet schema` writes it as
 * `results.schema.json` (JSON Schema) for users who check the files they script against, and
 * the tests parse every results.json the demo build writes with it. The type checks at the
 * end fail to compile when the schema and the contract's TypeScript types (src/report/
 * results.ts) part ways.
 */
const number = z.number();
const maybe = z.number().nullable();
const indicatorValues = z.record(z.string(), maybe).describe('Indicator code → value; null where not available (never a silent 0).');
const methodParts = z.strictObject({ parts: z.record(z.string(), indicatorValues), total: indicatorValues });

const cell = z.strictObject({
  file: z.string(),
  line: z.number().int().describe('Physical line of the file (1-based), as an editor shows it.'),
  column: z.string(),
  value: z.string().describe('The cell exactly as written.'),
});
const row = z.strictObject({
  file: z.string(),
  line: z.number().int(),
  factor_id: z.string().describe('A factor row stands for its cell of whichever indicator is read (its factor_id cell for a scalar step).'),
  elements: z
    .record(z.string(), z.strictObject({ line: z.number().int(), column: z.number().int(), module: z.string(), value: z.string() }))
    .optional()
    .describe("A supplier's ILCD+EPD dataset read as a factor: file is the dataset (archive.zip!ILCD/processes/<uuid>.xml inside an archive), and each indicator's value is the element at line and column, of the module named, with its text as written."),
});
const term = z.union([
  z.string().describe('Another step, by id.'),
  z.strictObject({ cell: z.number().int().describe('Index into graph.cells.') }),
  z.strictObject({ row: z.number().int().describe('Index into graph.rows.') }),
]);
const step = z.strictObject({
  id: z.string().describe('The step id; a figure id is the step id, followed by /<indicator> for a step with values.'),
  formula: z.string(),
  description: z.string(),
  unit: z.string().nullable().describe("A scalar step's unit; null for a step with one value per indicator (each in its indicator's unit)."),
  value: maybe.optional().describe("A scalar step's value."),
  values: z.array(maybe).optional().describe('One value per entry of `indicators`, in that order; null where not available, and at indicators of basis flows, which are steps of their own (cutoff/<module>/<code>).'),
  terms: z.array(term),
  symbols: z.array(z.string()).describe('The symbol each term stands for in the formula, in the order of terms.'),
});

const factorQuality = z.strictObject({
  factor_id: z.string(),
  line: z.number().int().nullable(),
  scores: z.strictObject({ ter: maybe, ger: maybe, tir: maybe, p: maybe }),
  dqr: maybe,
  rating: z.string().nullable(),
  data_type: z.enum(['specific', 'generic']).nullable(),
  unscored_reason: z.string().nullable(),
  share_of_gwp_total: maybe,
});
const dataQuality = z.strictObject({
  scope: z.string(),
  indicators: z.record(z.string(), z.strictObject({ dqr: maybe, rating: z.string().nullable(), scored_share: maybe })),
  gwp_total_by_data_type: z.strictObject({ specific: maybe, generic: maybe, not_stated: maybe }),
  factors: z.array(factorQuality),
  unscored: z.array(z.string()),
});
const sensitivityInput = z.strictObject({
  kind: z.enum(['factor', 'bom', 'activity', 'transport', 'site']),
  file: z.string(),
  line: z.number().int(),
  column: z.string(),
  label: z.string(),
  contribution: number,
  share: maybe,
  minus: number,
  plus: number,
});
const sensitivity = z.strictObject({
  step: number,
  indicator: z.string(),
  scopes: z.array(z.strictObject({ module: z.enum(['A1-A3', 'D']), value: maybe, inputs: z.array(sensitivityInput) })),
});
const uncertainty = z.strictObject({
  iterations: z.number().int(),
  seed: z.number().int(),
  varied: z.strictObject({ factors: z.array(z.string()), bom: z.array(z.number().int()), activities: z.array(z.number().int()) }),
  fixed: z.number().int(),
  figures: z.array(z.strictObject({ module: z.string(), indicator: z.string(), deterministic: maybe, mean: maybe, median: maybe, p2_5: maybe, p97_5: maybe })),
});

export const ilcdLink = z.strictObject({
  archive: z.string().describe('File name of the archive, in the folder of this results.json (declaration.ilcd.zip).'),
  process_uuid: z.string().describe('UUID of the EPD process dataset in it: name-based, the same from build to build.'),
});

export const resultsSchema = z
  .strictObject({
    format: z.literal(2).describe('The version of this contract. Format 1 (loopsheet 0.1) listed every step once per indicator under "figures".'),
    product_id: z.string(),
    declared_unit: z.string(),
    indicators: z.array(z.strictObject({ code: z.string(), unit: z.string(), name: z.string(), basis: z.enum(['factors', 'flows']).describe('factors: characterised from factor rows, one of the values of every step that has values; flows: from the product’s own mass flows (SM, CRU, MFR, MER), steps of their own, cutoff/<module>/<code>.') })),
    methods: z.strictObject({
      cutoff: z.strictObject({ modules: z.record(z.string(), indicatorValues), total: indicatorValues }),
      cff: methodParts.optional(),
      'eol-recycling': methodParts.optional(),
      'fifty-fifty': methodParts.optional(),
    }),
    flows: z.strictObject({
      recycled_content: z.strictObject({ pre: number, post: number, total: number }),
      biogenic_carbon_kg: z.strictObject({ product: maybe, packaging: maybe }),
      biogenic_co2_kg: z.strictObject({ product: maybe, packaging: maybe }),
    }),
    checklist: z
      .strictObject({
        items: z.array(
          z.strictObject({ id: z.string(), title: z.string(), status: z.enum(['holds', 'warning', 'fails']), detail: z.string(), figures: z.array(z.string()), rows: z.array(z.strictObject({ file: z.string(), line: z.number().int() })).optional(), source: z.string() }),
        ),
      })
      .optional()
      .describe('The checks a verifier makes first (mass balance, GWP sum, biogenic carbon, module D on net flows, mandatory modules and indicators, disclaimers, data age, the cut-off rule, validity), each with its status, what was found, the figure ids that are the evidence and its source. Absent in results written before it was added.'),
    scenarios: z
      .strictObject({
        end_of_life: z.array(
          z.strictObject({
            material: z.string(),
            stage: z.enum(['C1-C4', 'A5']),
            mass_kg: number,
            collected_separately_kg: number,
            collected_with_mixed_waste_kg: number,
            reuse_kg: number,
            recycling_kg: number,
            energy_recovery_kg: number,
            incineration_kg: number,
            landfill_kg: number,
            recycling_yield: number,
            transport_km: number,
            transport_factor: z.string().nullable(),
            processing_factor: z.string().nullable(),
            figures: z.record(z.string(), z.string()),
          }),
        ),
        module_d: z.array(z.strictObject({ material: z.string(), m_mr_out_kg: number, m_mr_in_kg: number, net_kg: number, substituted_factor: z.string(), q_out: number, figures: z.record(z.string(), z.string()) })),
        exported_energy: z.strictObject({ electricity_mj: maybe, heat_mj: maybe, electricity_factor: z.string().nullable(), heat_factor: z.string().nullable(), figures: z.record(z.string(), z.string()) }),
      })
      .optional()
      .describe('The scenario information EN 15804+A2 asks for beside C1–C4 (A5 for the packaging) and D: per material the kg collected separately and with mixed waste, for re-use, recycling and energy recovery, incinerated and landfilled, with the transport and processing assumptions; the net secondary flows of D and what they substitute; the energy exported. figures names the figure id of each number. Absent in results written before it was added.'),
    completeness: z
      .strictObject({
        complete: z.boolean(),
        mandatory: z.string(),
        missing: z.array(z.strictObject({ indicator: z.string(), modules: z.array(z.string()).nullable(), reason: z.string() })),
      })
      .optional()
      .describe('Whether every mandatory indicator of EN 15804+A2 (core, resource use, waste, output flows) is reported in every declared module; what is missing and why (never a silent gap). Absent in results written before it was added.'),
    data_quality: dataQuality.optional(),
    sensitivity: sensitivity.optional(),
    uncertainty: uncertainty.optional(),
    ilcd_epd: ilcdLink.optional().describe('The declaration as an ILCD+EPD archive (the open exchange format programme operators take) beside this file, and the UUID of its EPD process dataset. Absent in results written before it was added.'),
    graph: z.strictObject({ steps: z.array(step), cells: z.array(cell), rows: z.array(row) }),
  })
  .describe('out/<product_id>/results.json, format 2: every method, module and indicator of one product, and the graph of calculation steps behind every number (docs/results-format.md).');

/** The JSON Schema `loopsheet schema` writes. */
export const resultsJsonSchema = (): Record<string, unknown> => ({ ...z.toJSONSchema(resultsSchema, { io: 'output', unrepresentable: 'any' }), title: 'results.json (format 2)' });

// The schema and the TypeScript contract say the same thing: each must be assignable to the other.
type Parsed = z.output<typeof resultsSchema>;
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const schemaMatchesContract: Same<Parsed, ResultsJson> = true;
void schemaMatchesContract;
