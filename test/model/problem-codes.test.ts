import { afterAll, describe, expect, it } from 'vitest';
import { rm, truncate, writeFile, readFile } from 'node:fs/promises';
import path from 'node:path';
import { loadProject } from '../../src/model/project.ts';
import { PROBLEM_CODES, type Problem, type ProblemCode } from '../../src/problems.ts';
import { strFromU8, strToU8, unzipSync, zipSync } from 'fflate';
import { demoCopy, editFile, editLine, removeDir } from '../helpers.ts';

/**
 * One planted mistake per problem code, in a copy of the demo project; each must be
 * reported with the right file, physical line and column. Line numbers below are the
 * demo files' physical lines (comment line 1, header line 2).
 */
interface Case {
  code: ProblemCode;
  plant: (dir: string) => Promise<void>;
  expected: Partial<Problem>;
}

const at = (dir: string, file: string) => path.join(dir, file);
/** process.csv is optional and the demo has none: these cases write one (header on line 1). */
const processCsv = (d: string, rows: string[]) => writeFile(at(d, 'process.csv'), ['process_id,kind,parameter,value,unit,source', ...rows].join('\n') + '\n');
const potline = ['potline-1,electrolysis-aluminium,technology,CWPB,,log', 'potline-1,electrolysis-aluminium,cell_voltage_v,4.2,V,log'];

/** The demo's supplier dataset, data/suppliers/KV-S-0117.ilcd.zip: its EPD process dataset edited in place, the archive written again. */
const SUPPLIER = 'suppliers/KV-S-0117.ilcd.zip';
const SUPPLIER_PROCESS = /^suppliers\/KV-S-0117\.ilcd\.zip!ILCD\/processes\/[0-9a-f-]{36}\.xml$/;
async function editSupplier(dir: string, edit: (xml: string) => string): Promise<void> {
  const entries = unzipSync(await readFile(at(dir, SUPPLIER)));
  const name = Object.keys(entries).find((entry) => entry.startsWith('ILCD/processes/'))!;
  const before = strFromU8(entries[name]!);
  const after = edit(before);
  if (after === before) throw new Error('the supplier dataset edit changed nothing');
  entries[name] = strToU8(after);
  await writeFile(at(dir, SUPPLIER), zipSync(entries));
}
/** The demo's supplier row, the last of factors.csv. */
const SUPPLIER_ROW = 38;

const cases: Case[] = [
  { code: 'FILE_MISSING', plant: (d) => rm(at(d, 'transport.csv')), expected: { file: 'transport.csv', severity: 'error' } },
  {
    code: 'FILE_UNREADABLE',
    plant: async (d) => writeFile(at(d, 'products.csv'), Buffer.concat([Buffer.from('product_id,name\nP1,Stahltr'), Buffer.from([0xe4]), Buffer.from('ger\n')])),
    expected: { file: 'products.csv' },
  },
  // A sparse file: its size is what is checked, before a byte is read.
  { code: 'FILE_TOO_LARGE', plant: (d) => truncate(at(d, 'products.csv'), 201e6), expected: { file: 'products.csv', message: 'products.csv is 201 MB; an input file has at most 200 MB' } },
  { code: 'CSV_SYNTAX', plant: (d) => editLine(at(d, 'bom.csv'), 6, 'Mill yield report', '"Mill" yield report'), expected: { file: 'bom.csv', line: 6 } },
  { code: 'JSON_SYNTAX', plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"illustrative": true', '"illustrative": true,')), expected: { file: 'declaration.json', line: 21, columnIndex: 1, message: expect.stringMatching(/comma too many/) } },
  { code: 'JSON_NESTING', plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"illustrative": true', `"illustrative": ${'['.repeat(5000)}${']'.repeat(5000)}`)), expected: { file: 'declaration.json', line: 20, columnIndex: 82, value: '['.repeat(20) } },
  { code: 'NO_ROWS', plant: (d) => editFile(at(d, 'products.csv'), (t) => t.split('\n').slice(0, 2).join('\n') + '\n'), expected: { file: 'products.csv', line: 2 } },
  { code: 'COLUMN_MISSING', plant: (d) => editLine(at(d, 'bom.csv'), 2, 'mass_kg', 'mass'), expected: { file: 'bom.csv', line: 2, column: 'mass_kg' } },
  { code: 'COLUMN_UNKNOWN', plant: (d) => editLine(at(d, 'bom.csv'), 2, 'mass_kg', 'mass'), expected: { file: 'bom.csv', line: 2, column: 'mass', columnIndex: 6, hint: 'did you mean "mass_kg"?', severity: 'warning' } },
  { code: 'COLUMN_DUPLICATE', plant: (d) => editLine(at(d, 'products.csv'), 2, 'description', 'NAME'), expected: { file: 'products.csv', line: 2, column: 'name', columnIndex: 6 } },
  { code: 'COLUMN_IGNORED', plant: (d) => editLine(at(d, 'factors.csv'), 2, ',FW', ',MFR'), expected: { file: 'factors.csv', line: 2, column: 'MFR', columnIndex: 18, severity: 'warning' } },
  { code: 'CELL_TOO_LONG', plant: (d) => editLine(at(d, 'bom.csv'), 6, 'Mill yield report 2025 (illustrative)', 'x'.repeat(20_000)), expected: { file: 'bom.csv', line: 6, column: 'source', columnIndex: 11, message: 'a cell of 20000 characters; a cell has at most 10000' } },
  { code: 'FIELD_COUNT', plant: (d) => editLine(at(d, 'bom.csv'), 6, '(illustrative)', '(illustrative),,extra'), expected: { file: 'bom.csv', line: 6, columnIndex: 13 } },
  { code: 'DECIMAL_COMMA', plant: (d) => editLine(at(d, 'bom.csv'), 6, ',0.995,', ',0,995,'), expected: { file: 'bom.csv', line: 6, column: 'mass_kg', columnIndex: 6, value: '0,995' } },
  { code: 'KEY_UNKNOWN', plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"gwp_set"', '"gwp_sett"')), expected: { file: 'declaration.json', line: 16, column: 'gwp_sett', hint: 'did you mean "gwp_set"?', severity: 'warning' } },
  { code: 'VALUE_REQUIRED', plant: (d) => editLine(at(d, 'products.csv'), 4, '"Copper busbar 10 × 100 mm, Cu-ETP, tin-plated"', ''), expected: { file: 'products.csv', line: 4, column: 'name', columnIndex: 2 } },
  { code: 'NOT_A_NUMBER', plant: (d) => editLine(at(d, 'bom.csv'), 6, '0.995', '0.995kg'), expected: { file: 'bom.csv', line: 6, column: 'mass_kg', columnIndex: 6, value: '0.995kg' } },
  { code: 'THOUSANDS_SEPARATOR', plant: (d) => editLine(at(d, 'activities.csv'), 3, ',1.05,', ',"1,050.5",'), expected: { file: 'activities.csv', line: 3, column: 'amount', value: '1,050.5' } },
  { code: 'NEGATIVE_VALUE', plant: (d) => editLine(at(d, 'transport.csv'), 3, ',420,', ',-420,'), expected: { file: 'transport.csv', line: 3, column: 'distance_km', value: '-420' } },
  { code: 'OUT_OF_RANGE', plant: (d) => editLine(at(d, 'bom.csv'), 3, ',0.15,recycled', ',1.5,recycled'), expected: { file: 'bom.csv', line: 3, column: 'scrap_rate', value: '1.5' } },
  { code: 'BAD_CHOICE', plant: (d) => editLine(at(d, 'bom.csv'), 4, ',packaging,', ',packagin,'), expected: { file: 'bom.csv', line: 4, column: 'role', hint: 'did you mean "packaging"?' } },
  { code: 'BAD_ID', plant: (d) => editLine(at(d, 'products.csv'), 5, 'KV-BR-40,', 'KV BR/40,'), expected: { file: 'products.csv', line: 5, column: 'product_id' } },
  { code: 'ID_RESERVED', plant: (d) => editLine(at(d, 'products.csv'), 5, 'KV-BR-40,', 'Verification,'), expected: { file: 'products.csv', line: 5, column: 'product_id', value: 'Verification' } },
  { code: 'ID_TOO_LONG', plant: (d) => editLine(at(d, 'families.csv'), 3, 'profiles-6060-mill,', `${'p'.repeat(5000)},`), expected: { file: 'families.csv', line: 3, column: 'family_id' } },
  { code: 'ID_CASE_CLASH', plant: (d) => editFile(at(d, 'products.csv'), (t) => `${t}kv-br-40,New product,1 kg,1,building-metals,\n`), expected: { file: 'products.csv', line: 8, column: 'product_id', value: 'kv-br-40' } },
  { code: 'BAD_DATE', plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"2026-03-02"', '"2026-02-30"')), expected: { file: 'declaration.json', line: 10, column: 'issued' } },
  { code: 'BAD_UNIT', plant: (d) => editLine(at(d, 'activities.csv'), 3, ',kWh,', ',kwhh,'), expected: { file: 'activities.csv', line: 3, column: 'unit', hint: 'did you mean "kWh"?' } },
  { code: 'UNIT_MISMATCH', plant: (d) => editLine(at(d, 'activities.csv'), 4, ',MJ,', ',kg,'), expected: { file: 'activities.csv', line: 4, column: 'unit', value: 'kg' } },
  { code: 'DUPLICATE_ID', plant: (d) => editLine(at(d, 'materials.csv'), 5, 'tin,Tin', 'zinc,Tin'), expected: { file: 'materials.csv', line: 7, column: 'material', hint: 'line 5 has it already: change one, or delete the row that repeats it' } },
  { code: 'UNKNOWN_REFERENCE', plant: (d) => editLine(at(d, 'bom.csv'), 3, ',al-6060,', ',al-6061,'), expected: { file: 'bom.csv', line: 3, column: 'material', value: 'al-6061', hint: 'did you mean "al-6060"?' } },
  { code: 'RECYCLED_CONTENT_SUM', plant: (d) => editLine(at(d, 'bom.csv'), 3, '30%,45%', '60%,45%'), expected: { file: 'bom.csv', line: 3, column: 'recycled_post' } },
  { code: 'EOL_SHARES_SUM', plant: (d) => editLine(at(d, 'eol.csv'), 3, '96%,0,0,4%', '96%,0,0,5%'), expected: { file: 'eol.csv', line: 3, column: 'landfill' } },
  { code: 'MANDATORY_INDICATOR_MISSING', plant: (d) => editLine(at(d, 'factors.csv'), 2, ',RWD,', ',RWDX,'), expected: { file: 'factors.csv', line: 2, column: '(header)', value: 'RWD', severity: 'warning' } },
  { code: 'PACKAGING_EOL_UNDECLARED', plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('  "declared_modules": ["A5"],\n', '')), expected: { file: 'declaration.json', column: '(document)', severity: 'warning', message: expect.stringMatching(/^5 products have packaging/) } },
  { code: 'BIOGENIC_RELEASE_TWICE', plant: (d) => editLine(at(d, 'factors.csv'), 24, '0.015,0.015,0,0,', '1.65,0.015,1.635,0,'), expected: { file: 'materials.csv', line: 10, column: 'incineration', severity: 'warning' } },
  { code: 'EOL_SCENARIO_GAP', plant: (d) => editLine(at(d, 'eol.csv'), 8, 'steel-construction,zinc', 'steel-construction,tin'), expected: { file: 'products.csv', line: 5, column: 'eol_scenario' } },
  { code: 'UNIT_MASS_MISMATCH', plant: (d) => editLine(at(d, 'products.csv'), 5, ',0.46,', ',0.5,'), expected: { file: 'products.csv', line: 5, column: 'unit_mass_kg', value: '0.5' } },
  { code: 'NO_BOM_LINES', plant: (d) => editFile(at(d, 'products.csv'), (t) => `${t}KV-NEW,New product,1 kg,1,building-metals,\n`), expected: { file: 'products.csv', line: 8, column: 'product_id' } },
  { code: 'FACTOR_REQUIRED', plant: (d) => editLine(at(d, 'materials.csv'), 3, 'process:glenmoor-potline,al-remelted-ingot,', 'process:glenmoor-potline,,'), expected: { file: 'materials.csv', line: 3, column: 'recycled' } },
  { code: 'FACTOR_VALUE_MISSING', plant: async () => undefined, expected: { file: 'factors.csv', line: 23, column: 'ODP', severity: 'warning' } },
  {
    code: 'INDICATOR_NO_DATA',
    // The demo has a column for every indicator: this case takes PM's away and asks for it.
    plant: async (d) => {
      await editLine(at(d, 'factors.csv'), 2, ',PM,', ',PMX,');
      await editFile(at(d, 'declaration.json'), (t) => t.replace('"gwp_set": "AR6",', '"gwp_set": "AR6",\n  "indicators": ["GWP-total", "PM"],'));
    },
    expected: { file: 'declaration.json', line: 17, column: 'indicators', value: 'PM', severity: 'warning' },
  },
  {
    code: 'INDICATOR_UNKNOWN',
    plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"gwp_set": "AR6",', '"gwp_set": "AR6",\n  "indicators": ["GWP-totl"],')),
    expected: { file: 'declaration.json', line: 17, column: 'indicators[0]', hint: 'did you mean "GWP-total"?' },
  },
  { code: 'DATE_ORDER', plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"2031-03-01"', '"2025-01-01"')), expected: { file: 'declaration.json', line: 11, column: 'valid_until' } },
  { code: 'VALIDITY_LONG', plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"2031-03-01"', '"2032-01-01"')), expected: { file: 'declaration.json', line: 11, column: 'valid_until', severity: 'warning' } },
  {
    code: 'VERIFICATION_INCOMPLETE',
    plant: (d) => editFile(at(d, 'declaration.json'), (t) => t.replace('"status": "draft"', '"status": "verified"')),
    expected: { file: 'declaration.json', line: 12, column: 'verification.verifier' },
  },
  // products.csv line 4: KV-CU-BB10, declared per 1 kg of 1.0 kg.
  { code: 'DECLARED_UNIT_UNKNOWN', plant: (d) => editLine(at(d, 'products.csv'), 4, ',1 kg,', ',1 busbar,'), expected: { file: 'products.csv', line: 4, column: 'declared_unit', value: '1 busbar', severity: 'warning' } },
  { code: 'DECLARED_UNIT_MASS', plant: (d) => editLine(at(d, 'products.csv'), 4, ',1 kg,', ',1 t,'), expected: { file: 'products.csv', line: 4, column: 'unit_mass_kg', value: '1.0', severity: 'warning' } },
  {
    code: 'VERIFICATION_UNSIGNED',
    plant: async (d) => {
      await rm(at(d, 'verification-record.json'));
      await editFile(at(d, 'declaration.json'), (t) => t.replace('"status": "draft"', '"status": "verified", "verifier": "Anyone", "date": "2026-11-30"'));
    },
    expected: { file: 'declaration.json', line: 12, column: 'verification.status', value: 'verified', severity: 'warning' },
  },
  { code: 'GWP_SUM_MISMATCH', plant: (d) => editLine(at(d, 'factors.csv'), 26, 'illustrative),0.41,', 'illustrative),0.45,'), expected: { file: 'factors.csv', line: 26, column: 'GWP-total', value: '0.45', severity: 'warning' } },
  { code: 'SOURCE_MISSING', plant: (d) => editLine(at(d, 'transport.csv'), 3, 'Route planner (illustrative)', ''), expected: { file: 'transport.csv', line: 3, column: 'source', severity: 'warning' } },
  {
    code: 'PARAMETER_UNKNOWN',
    plant: (d) => processCsv(d, [...potline, 'potline-1,electrolysis-aluminium,current_eficiency,95%,%,log']),
    expected: { file: 'process.csv', line: 4, column: 'parameter', value: 'current_eficiency', hint: 'did you mean "current_efficiency"?' },
  },
  { code: 'PROCESS_KIND_MIXED', plant: (d) => processCsv(d, [...potline, 'potline-1,electrowinning,current_efficiency,95%,%,log']), expected: { file: 'process.csv', line: 4, column: 'kind', value: 'electrowinning' } },
  {
    // Faraday floor at 4.2 V and 100 % current efficiency: 2 980 Ah/kg × 4.2 V = 12 516 kWh/t (field guide §4).
    code: 'PROCESS_INFEASIBLE',
    plant: (d) => processCsv(d, [...potline, 'potline-1,electrolysis-aluminium,electricity_kwh_per_t,12000,kWh/t,meters']),
    expected: { file: 'process.csv', line: 4, column: 'value', value: '12000', message: expect.stringMatching(/below the Faraday-law floor of 1251\d kWh\/t/) },
  },
  { code: 'BIOGENIC_CARBON_MISSING', plant: (d) => editLine(at(d, 'materials.csv'), 8, ',14,0.42,', ',14,,'), expected: { file: 'materials.csv', line: 8, column: 'biogenic_c_kg_per_kg', severity: 'warning' } },
  // site.csv and production.csv (demo: site.csv rows on lines 3–5, production.csv rows on lines 3–5).
  { code: 'ALLOCATION_KEY_UNKNOWN', plant: (d) => editLine(at(d, 'site.csv'), 3, ',kWh,mass,', ',kWh,masss,'), expected: { file: 'site.csv', line: 3, column: 'allocation', columnIndex: 8, value: 'masss', hint: 'did you mean "mass"?' } },
  {
    code: 'ALLOCATION_KEY_ZERO',
    plant: async (d) => {
      await editFile(at(d, 'production.csv'), (t) => t.replace('output,source', 'output,source,press_hours').replace(/\(illustrative\)\n/g, '(illustrative),0\n'));
      await editLine(at(d, 'site.csv'), 3, ',kWh,mass,', ',kWh,press_hours,');
    },
    expected: { file: 'site.csv', line: 3, column: 'allocation', value: 'press_hours' },
  },
  { code: 'SITE_NO_PRODUCTION', plant: (d) => editLine(at(d, 'site.csv'), 5, 'norwick-press-shop,2025,', 'norwick-press-shop,2024,'), expected: { file: 'site.csv', line: 5, column: 'period', columnIndex: 2, value: '2024' } },
  { code: 'PRODUCTION_UNUSED', plant: (d) => editFile(at(d, 'production.csv'), (t) => `${t}norwick-press-shop,2024,KV-EXT-6060,1100000,records 2024\n`), expected: { file: 'production.csv', line: 6, column: 'period', value: '2024', severity: 'warning' } },
  // families.csv: the demo's family of three profiles (rows on lines 3–5).
  { code: 'FAMILY_INCONSISTENT', plant: (d) => editLine(at(d, 'families.csv'), 4, 'profiles-6060-mill,,KV-EXT-6060-T19,', 'profiles-6060-mill,,KV-BR-40,'), expected: { file: 'families.csv', line: 4, column: 'product_id', value: 'KV-BR-40' } },
  {
    code: 'PRODUCTION_PERIODS',
    plant: async (d) => {
      await editFile(at(d, 'site.csv'), (t) => `${t}norwick-press-shop,2024,A3,"Compressed air, electricity",grid-electricity,400000,kWh,mass,meter 2024\n`);
      await editFile(at(d, 'production.csv'), (t) => `${t}norwick-press-shop,2024,KV-EXT-6060,1100000,records 2024\n`);
    },
    expected: { file: 'production.csv', line: 6, column: 'period', value: '2024' },
  },
  { code: 'SUPPLIER_DATASET_PATH', plant: (d) => editLine(at(d, 'factors.csv'), SUPPLIER_ROW, SUPPLIER, '../elsewhere/billet.ilcd.zip'), expected: { file: 'factors.csv', line: SUPPLIER_ROW, column: 'supplier_dataset', value: '../elsewhere/billet.ilcd.zip' } },
  { code: 'SUPPLIER_DATASET_UNREADABLE', plant: (d) => editSupplier(d, (x) => x.replace('</processDataSet>', '')), expected: { file: expect.stringMatching(SUPPLIER_PROCESS), message: expect.stringMatching(/not well-formed XML/) } },
  { code: 'SUPPLIER_VALUES_TWICE', plant: (d) => editLine(at(d, 'factors.csv'), SUPPLIER_ROW, 'ILCD+EPD dataset (illustrative)",,', 'ILCD+EPD dataset (illustrative)",3.1,'), expected: { file: 'factors.csv', line: SUPPLIER_ROW, column: 'supplier_dataset', message: expect.stringMatching(/GWP-total/) } },
  // EN 15804+A1 and EN 15804+A2 (EF 3.1): their UUIDs in the published Common_references.csv.
  { code: 'SUPPLIER_NOT_A2', plant: (d) => editSupplier(d, (x) => x.replace('d4aa3ec7-b1d7-4a4a-a6cb-37af88dcc902', 'b00f9ec0-7874-11e3-981f-0800200c9a66')), expected: { file: expect.stringMatching(SUPPLIER_PROCESS), column: 'referenceToComplianceSystem' } },
  { code: 'SUPPLIER_NO_A1_A3', plant: (d) => editSupplier(d, (x) => x.replaceAll('epd:module="A1-A3"', 'epd:module="A4"')), expected: { file: expect.stringMatching(SUPPLIER_PROCESS) } },
  { code: 'SUPPLIER_INDICATOR_MISSING', plant: (d) => editSupplier(d, (x) => x.replace(/(<epd:amount epd:module="A1-A3">)[^<]*(<\/epd:amount>)/, '$1$2')), expected: { file: expect.stringMatching(SUPPLIER_PROCESS), severity: 'warning', value: 'PERE' } },
  { code: 'SUPPLIER_UNIT', plant: (d) => editLine(at(d, 'factors.csv'), SUPPLIER_ROW, 'KV-S-0117,kg,Supplier', 'KV-S-0117,m,Supplier'), expected: { file: expect.stringMatching(/^suppliers\/KV-S-0117\.ilcd\.zip!ILCD\/flows\//), message: expect.stringMatching(/1000 kg, which cannot be converted to m/) } },
  { code: 'SUPPLIER_EXPIRED', plant: (d) => editSupplier(d, (x) => x.replace('<epd24:expirationDateOfEPD>2031-01-11<', '<epd24:expirationDateOfEPD>2025-12-31<')), expected: { file: expect.stringMatching(SUPPLIER_PROCESS), severity: 'warning', value: '2025-12-31' } },
  { code: 'SUPPLIER_UNVERIFIED', plant: (d) => editSupplier(d, (x) => x.replace('type="Independent external review"', 'type="Not reviewed"')), expected: { file: expect.stringMatching(SUPPLIER_PROCESS), severity: 'warning', value: 'Not reviewed' } },
  // GWP-total: a7ea142a-… on the published EF 3.1 list, 6a37f984-… on the EF 3.0 list.
  { code: 'SUPPLIER_EF30', plant: (d) => editSupplier(d, (x) => x.replace('a7ea142a-9749-11ed-a8fc-0242ac120002', '6a37f984-a4b3-458a-a20a-64418c145fa2')), expected: { file: expect.stringMatching(SUPPLIER_PROCESS), severity: 'warning', value: 'GWP-total' } },
];

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((d) => removeDir(path.dirname(d)))));

describe('every problem code is reported where the mistake is', () => {
  it('covers every code in the catalogue', () => {
    expect(new Set(cases.map((c) => c.code))).toEqual(new Set(Object.keys(PROBLEM_CODES)));
  });

  it.each(cases)('$code', async ({ code, plant, expected }) => {
    const dir = await demoCopy();
    dirs.push(dir);
    await plant(dir);
    const { problems, project } = await loadProject(dir);
    const found = problems.filter((p) => p.code === code);
    expect(found, JSON.stringify(problems, null, 1)).toContainEqual(expect.objectContaining(expected));
    const severity = expected.severity ?? 'error';
    expect(found.every((p) => p.message.length > 0)).toBe(true);
    if (severity === 'error') expect(project).toBeUndefined();
  });
});

describe('the demo project', () => {
  it('is clean: no errors, one deliberate FACTOR_VALUE_MISSING warning', async () => {
    const { problems, project } = await loadProject(path.resolve('data'));
    expect(problems.filter((p) => p.severity === 'error')).toEqual([]);
    expect(problems.map((p) => p.code)).toEqual(['FACTOR_VALUE_MISSING']);
    expect(project?.products.rows.map((r) => r.value.product_id)).toEqual(['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22']);
  });

  it('labels its factor values as illustrative', async () => {
    const text = await readFile(path.resolve('data/factors.csv'), 'utf8');
    expect(text).toMatch(/ILLUSTRATIVE/);
    const { project } = await loadProject(path.resolve('data'));
    expect(project?.factors.rows.every((r) => /illustrative/i.test(`${r.value.dataset} ${r.value.source}`))).toBe(true);
    expect(project?.declaration.illustrative).toBe(true);
  });
});
