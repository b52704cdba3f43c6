import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { readdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { unzipSync } from 'fflate';
import { readEpdFile } from '../../src/load/ilcd.ts';
import { parseXml, childOf } from '../../src/load/xml.ts';
import { ilcdDatasets } from '../../src/report/ilcd-export.ts';
import { declaredQuantity, type ExportedDeclaration } from '../../src/report/ilcd-declaration.ts';
import { declarationSchema } from '../../src/schema/declaration.ts';
import { ROOT, buildFresh, hasCommand, missingTool, removeDir } from '../helpers.ts';

/**
 * The ILCD+EPD export, checked against things outside loopsheet: the format's published XML
 * schemas (validated by Debian's python3-xmlschema, test/fixtures/ilcd-epd/validate.py), the
 * published EN 15804+A2 indicator list (EF 3.1 UUIDs, read here from the CSV, not from the
 * registry), Python's zipfile (reads the archives), and results.json (every value read back).
 */
const FIXTURES = path.join(ROOT, 'test', 'fixtures', 'ilcd-epd');
const PYTHON = '/usr/bin/python3';
const skipValidation = missingTool('python3-xmlschema (validates the ILCD+EPD export)', hasCommand(PYTHON, ['-c', 'import xmlschema']), 'apt-get install python3-xmlschema, as .ci/run does.');

interface Validation {
  file: string;
  root: string;
  errors: Array<{ path: string; reason: string }>;
}
function validate(files: string[]): Validation[] {
  const run = spawnSync(PYTHON, [path.join(FIXTURES, 'validate.py'), ...files], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  if (run.status !== 0) throw new Error(`validate.py failed: ${run.stderr}`);
  return run.stdout.trim().split('\n').map((line) => JSON.parse(line) as Validation);
}

/** The published EF 3.1 list, code → UUID (the code in brackets at the end of the English name). */
const PUBLISHED = new Map(
  (parse(await readFile(path.join(ROOT, 'reference-data/ilcd-epd/identifiers/EN15804+A2_EF3.1_indicators.csv'), 'utf8'), { columns: true, relax_column_count: true }) as Array<Record<string, string>>)
    .filter((row) => row.UUID && /\(([^()]+)\)\s*$/.test(row['Name (en)'] ?? ''))
    .map((row) => [/\(([^()]+)\)\s*$/.exec(row['Name (en)']!)![1]!.replace(/^ADPE$/, 'ADP-minerals&metals').replace(/^ADPF$/, 'ADP-fossil'), row.UUID!]),
);

let built: Awaited<ReturnType<typeof buildFresh>>;
let archives: string[] = [];
beforeAll(async () => {
  built = await buildFresh();
  expect(built.result.code, built.result.stderr).toBe(0);
  const products = (await readdir(built.out, { withFileTypes: true })).filter((e) => e.isDirectory() && /^KV-/.test(e.name)).map((e) => path.join(built.out, e.name));
  const families = (await readdir(path.join(built.out, 'families'))).map((name) => path.join(built.out, 'families', name));
  archives = [...products, ...families].map((dir) => path.join(dir, 'declaration.ilcd.zip'));
}, 60_000);
afterAll(() => removeDir(built.dir));

describe('ILCD+EPD archives of the demo', () => {
  it('exist for every product and family, and every dataset in them validates against the published schemas', () => {
    expect(archives).toHaveLength(6);
    if (skipValidation) return;
    const results = validate(archives);
    // Per archive: the EPD process, its product flow, a contact, two sources, flow properties, unit groups.
    expect(results.length).toBeGreaterThan(6 * 20);
    for (const result of results) expect(result.errors, `${result.file}: ${JSON.stringify(result.errors.slice(0, 3))}`).toEqual([]);
    const roots = new Set(results.map((r) => r.root));
    expect([...roots].sort()).toEqual(['contactDataSet', 'flowDataSet', 'flowPropertyDataSet', 'processDataSet', 'sourceDataSet', 'unitGroupDataSet']);
  });

  it('are checked by a validator that does fail: a process dataset with an invalid type is reported', async () => {
    if (skipValidation) return;
    const entries = unzipSync(await readFile(archives[0]!));
    const name = Object.keys(entries).find((n) => n.startsWith('ILCD/processes/'))!;
    const broken = path.join(built.dir, 'broken.xml');
    await writeFile(broken, new TextDecoder().decode(entries[name]).replace('<typeOfDataSet>EPD</typeOfDataSet>', '<typeOfDataSet>EPD draft</typeOfDataSet>'));
    const [result] = validate([broken]);
    expect(result!.errors.map((e) => e.path).join('\n')).toMatch(/typeOfDataSet/);
  });

  it('read back to every value of results.json: each indicator in each declared module, nothing for modules not declared', async () => {
    for (const archive of archives) {
      const results = JSON.parse(await readFile(path.join(path.dirname(archive), 'results.json'), 'utf8'));
      const dataset = readEpdFile(archive, await readFile(archive));
      expect(dataset.uuid).toBe(results.ilcd_epd.process_uuid);
      expect(results.ilcd_epd.archive).toBe('declaration.ilcd.zip');
      const family = 'family_id' in results;
      const modules: Record<string, Record<string, number | { mean: number | null } | null>> = results.methods.cutoff.modules;
      const exported = Object.keys(modules).filter((m) => !['A1', 'A2', 'A3'].includes(m));
      let compared = 0;
      let available = 0;
      for (const indicator of results.indicators as Array<{ code: string }>) {
        const read = dataset.indicators.get(indicator.code);
        expect(read, `${archive} ${indicator.code}`).toBeDefined();
        // The UUID of the published EF 3.1 list.
        expect(read!.uuid).toBe(PUBLISHED.get(indicator.code));
        expect(read!.characterisation).toBe('EF 3.1');
        for (const module of exported) {
          const raw = modules[module]![indicator.code];
          const value = family ? (raw as { mean: number | null }).mean : (raw as number | null);
          const amounts = read!.amounts.filter((a) => a.module === module);
          if (value !== null) available++;
          if (value === null) expect(amounts).toEqual([]);
          else {
            expect(amounts.map((a) => a.value), `${archive} ${indicator.code} ${module}`).toEqual([value]);
            compared++;
          }
        }
        // Modules not declared are left out (never 0), and A1, A2 and A3 are not written beside A1-A3.
        for (const amount of read!.amounts) expect(exported).toContain(amount.module);
      }
      expect(compared).toBe(available);
      expect(compared).toBeGreaterThan(37 * 6);
    }
  });

  it('carry the declared unit with its mass and conversion to 1 kg, the biogenic carbon, the dates and the verification status', async () => {
    const declaration = JSON.parse(await readFile(path.join(ROOT, 'data', 'declaration.json'), 'utf8'));
    const products = parse(await readFile(path.join(ROOT, 'data', 'products.csv'), 'utf8'), { columns: true, comment: '#' }) as Array<Record<string, string>>;
    for (const product of products) {
      const archive = path.join(built.out, product.product_id!, 'declaration.ilcd.zip');
      const results = JSON.parse(await readFile(path.join(built.out, product.product_id!, 'results.json'), 'utf8'));
      const dataset = readEpdFile(archive, await readFile(archive));
      const flow = dataset.flow!;
      const byName = new Map(flow.properties.map((p) => [p.name, p.meanValue]));
      const [amount, unit] = product.declared_unit!.split(' ');
      // Flow property UUIDs of the published list (Flow_properties_and_unit_groups.csv).
      const reference = { m: ['Length', '838aaa23-0117-11db-92e3-0800200c9a66'], kg: ['Mass', '93a60a56-a3c8-11da-a746-0800200b9a66'], piece: ['Number of items', '01846770-4cfe-4a25-8ad9-919d8d378345'] }[unit!]!;
      expect([flow.properties[0]!.name, flow.properties[0]!.uuid, flow.properties[0]!.meanValue]).toEqual([reference[0], reference[1], 1]);
      expect(dataset.referenceFlow!.amount).toBe(Number(amount));
      expect(byName.get('Mass')).toBeCloseTo(Number(product.unit_mass_kg), 12);
      expect(flow.conversionToKg!.value).toBeCloseTo(1 / Number(product.unit_mass_kg), 12);
      expect(byName.get('Carbon content (biogenic)')).toBe(results.flows.biogenic_carbon_kg.product);
      expect(byName.get('Carbon content (biogenic) - packaging')).toBe(results.flows.biogenic_carbon_kg.packaging);
      expect(dataset.referenceYear).toBe(declaration.reference_year);
      expect(dataset.validUntil!.year).toBe(Number(declaration.valid_until.slice(0, 4)));
      expect(dataset.expiration!.date).toBe(declaration.valid_until);
      // The demo's record verifies KV-EXT-6060-T19 alone (test/model/verification-record.test.ts).
      expect(dataset.reviews.map((r) => r.type)).toEqual([product.product_id === 'KV-EXT-6060-T19' ? 'Independent external review' : 'Not reviewed']);
      expect(dataset.compliance.map((c) => c.uuid)).toEqual(['d4aa3ec7-b1d7-4a4a-a6cb-37af88dcc902']);
    }
  });

  it('are zips whose entries are all datasets, in path order, dated 1980-01-01 (read by Python’s zipfile)', () => {
    const run = spawnSync(PYTHON, ['-c', 'import sys, zipfile, json\nz = zipfile.ZipFile(sys.argv[1])\nprint(json.dumps([[i.filename, list(i.date_time)] for i in z.infolist()]))', archives[0]!], { encoding: 'utf8' });
    expect(run.status, run.stderr).toBe(0);
    const entries = JSON.parse(run.stdout) as Array<[string, number[]]>;
    const names = entries.map(([name]) => name);
    expect(names).toEqual([...names].sort());
    for (const [name, date] of entries) {
      expect(name).toMatch(/^ILCD\/(processes|flows|contacts|sources|unitgroups|flowproperties)\/[0-9a-f-]{36}\.xml$/);
      expect(date).toEqual([1980, 1, 1, 0, 0, 0]);
    }
  });
});

describe('ilcdDatasets', () => {
  const declaration = declarationSchema.parse({
    owner: { name: 'Owner <&> "Ltd"', contact: 'lca@owner.example' },
    standard: 'EN 15804+A2',
    pcr: 'PCR & rules',
    reference_year: 2025,
    issued: '2026-01-15',
    valid_until: '2031-01-14',
    verification: { status: 'verified', verifier: 'V. Erifier', date: '2026-01-10' },
    background_data: [{ name: 'DB', version: '1' }],
  });
  const exported: ExportedDeclaration = {
    kind: 'product',
    id: 'P-1',
    name: 'Bar <b>&amp; "x" \u0007 ]]>',
    description: 'desc',
    declaredUnit: '1 t',
    unitMassKg: 1000,
    indicators: [{ code: 'GWP-total', unit: 'kg CO2 eq.', name: 'x' }],
    modules: { 'A1-A3': { 'GWP-total': 1234.5 }, C3: { 'GWP-total': null }, D: { 'GWP-total': -1e-300 } },
    biogenicCarbonKg: { product: 0, packaging: null },
    endOfLife: undefined,
    verification: { status: 'verified', verifier: 'V. Erifier', date: '2026-01-10' },
  };

  it('escapes text from the inputs: names with markup read back as written (a control character replaced)', () => {
    const files = ilcdDatasets(declaration, exported);
    const process = files.find((f) => f.path.startsWith('ILCD/processes/'))!;
    const root = parseXml(process.xml);
    const name = childOf(childOf(childOf(childOf(root, root.ns, 'processInformation'), root.ns, 'dataSetInformation'), root.ns, 'name'), root.ns, 'baseName')!;
    expect(name.text).toBe('Bar <b>&amp; "x" \uFFFD ]]>');
    const contact = files.find((f) => f.path.startsWith('ILCD/contacts/') && f.xml.includes('Ltd'))!;
    expect(contact.xml, contact.xml).toContain('Owner &lt;&amp;&gt; &quot;Ltd&quot;');
  });

  it('gives the same UUIDs and bytes for the same inputs, and records a verified declaration’s verifier and report', () => {
    const a = ilcdDatasets(declaration, exported);
    expect(ilcdDatasets(declaration, exported)).toEqual(a);
    const process = a.find((f) => f.path.startsWith('ILCD/processes/'))!.xml;
    expect(process).toContain('<review type="Independent external review">');
    expect(process).toContain('V. Erifier');
    expect(a.filter((f) => f.path.startsWith('ILCD/contacts/'))).toHaveLength(2);
    // A value not available is left out; -1e-300 survives as written.
    expect(process).not.toMatch(/epd:module="C3"/);
    expect(process).toContain('>-1e-300<');
    // "1 t" is 1000 kg of the Mass property.
    expect(process).toMatch(/<meanAmount>1000\.0<\/meanAmount>/);
  });

  it('turns a declared unit into an amount of a published flow property', () => {
    // Conversions from the SI Brochure (BIPM, 9th ed.): 1 t = 1000 kg, 1 km = 1000 m.
    expect(declaredQuantity('1 t')).toMatchObject({ amount: 1000, property: { name: 'Mass' } });
    expect(declaredQuantity('2 km')).toMatchObject({ amount: 2000, property: { name: 'Length' } });
    expect(declaredQuantity('1 m2')).toMatchObject({ amount: 1, property: { name: 'Area' } });
    expect(declaredQuantity('1 piece')).toMatchObject({ amount: 1, property: { name: 'Number of items' } });
    expect(declaredQuantity('1 bracket')).toMatchObject({ amount: 1, property: { name: 'Number of items' } });
  });
});
