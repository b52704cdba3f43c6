import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cp, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { unzipSync, strFromU8 } from 'fflate';
import { readEpdFile } from '../../src/load/ilcd.ts';
import { loadProject } from '../../src/model/project.ts';
import { ROOT, buildFresh, demoCopy, editLine, removeDir, runCli, tempDir } from '../helpers.ts';

/**
 * Supplier declarations read as factors (factors.csv supplier_dataset), checked against
 * things outside loopsheet: the format's own published sample dataset (values extracted by
 * hand from test/fixtures/ilcd-epd/sample/EPDv1.3_example_57a4ae65-d305-421e-b21f-a3f0c35b8abe.xml),
 * the SI definition of the tonne (1 t = 1000 kg, SI Brochure, BIPM, 9th ed.), and the bytes
 * of the supplier's dataset as committed.
 */
const SAMPLE = path.join(ROOT, 'test', 'fixtures', 'ilcd-epd', 'sample', 'EPDv1.3_example_57a4ae65-d305-421e-b21f-a3f0c35b8abe.xml');
const SUPPLIER_FILE = 'suppliers/KV-S-0117.ilcd.zip';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map((d) => removeDir(d))));

describe('the format’s published sample, read as a supplier dataset', () => {
  it('gives the values written in the file, element by element (hand-extracted, with their lines)', async () => {
    const dataset = readEpdFile('sample.xml', await readFile(SAMPLE));
    expect(dataset.uuid).toBe('57a4ae65-d305-421e-b21f-a3f0c35b8abe');
    expect(dataset.name).toBe('Wood panel');
    expect(dataset.typeOfDataSet).toBe('EPD');
    expect(dataset.referenceYear).toBe(2020);
    expect(dataset.validUntil?.year).toBe(2025);
    expect(dataset.expiration?.date).toBe('2024-05-08');
    expect(dataset.reviews.map((r) => r.type)).toEqual(['Independent external review']);
    // The reference exchange is dataSetInternalID 42 (line 146), amount 1.0 (line 299).
    expect(dataset.referenceFlow).toMatchObject({ uuid: 'a7432abd-0881-4977-a817-f8aaf627fb91', amount: 1, line: 299 });
    // EN 15804+A2 with the EF 3.0 characterisation (compliance c0016b33-…, EF 3.0 indicator UUIDs).
    expect(dataset.compliance.map((c) => c.uuid)).toEqual(['c0016b33-8cf7-415c-ac6e-deba0d21440d']);
    const gwp = dataset.indicators.get('GWP-total')!;
    expect(gwp).toMatchObject({ uuid: '6a37f984-a4b3-458a-a20a-64418c145fa2', characterisation: 'EF 3.0', line: 820 });
    expect(gwp.amounts.find((a) => a.module === 'A1-A3')).toMatchObject({ value: 15.559479677163699, line: 825, text: '15.559479677163699' });
    expect(gwp.amounts.filter((a) => a.module === 'D').map((a) => [a.scenario, a.value])).toEqual([
      ['100% recycling', 3.890472762252513],
      ['100% incineration', 21.473728298846915],
    ]);
    expect(dataset.indicators.get('ADP-minerals&metals')!.amounts.find((a) => a.module === 'A1-A3')).toMatchObject({ value: 4.168822415416439, line: 705 });
    expect(dataset.indicators.get('FW')!.amounts.find((a) => a.module === 'A1-A3')).toMatchObject({ value: 39.73666632421776, line: 441 });
    expect(dataset.indicators.get('PERE')!.amounts.find((a) => a.module === 'A1-A3')!.value).toBe(40.065309300477296);
    // The sample is a bare process dataset: its product flow (and so its declared unit) is not in it.
    expect(dataset.flow).toBeUndefined();
  });

  it('as a factor: its declared unit cannot be read without its product flow, and EF 3.0, expiry and review are judged', async () => {
    const dir = await demoCopy();
    dirs.push(path.dirname(dir));
    await cp(SAMPLE, path.join(dir, 'suppliers', 'wood-panel.xml'));
    await editLine(path.join(dir, 'factors.csv'), 38, SUPPLIER_FILE, 'suppliers/wood-panel.xml');
    const { problems, project } = await loadProject(dir);
    expect(project).toBeUndefined();
    const codes = problems.filter((p) => p.file.startsWith('suppliers/wood-panel.xml')).map((p) => `${p.code} ${p.line}`);
    expect(codes).toContain('SUPPLIER_UNIT 299');
    expect(codes).toContain('SUPPLIER_EF30 820');
    // Valid until 2024-05-08 (line 153), before the demo is issued (2026-03-02).
    expect(codes).toContain('SUPPLIER_EXPIRED 153');
    // Reviewed independently: no warning.
    expect(codes.some((c) => c.startsWith('SUPPLIER_UNVERIFIED'))).toBe(false);
  });
});

describe('a declaration per 1 m read back as a supplier dataset per kg', () => {
  it('is converted through its own Mass flow property (kg per m), and A1 + A2 + A3 are added where A1-A3 is not given', async () => {
    const built = await buildFresh();
    dirs.push(built.dir);
    expect(built.result.code, built.result.stderr).toBe(0);
    const dir = await demoCopy();
    dirs.push(path.dirname(dir));
    // loopsheet's own export of KV-EXT-6060, declared per 1 m of 0.83 kg (products.csv).
    const archive = path.join(dir, 'suppliers', 'profile.ilcd.zip');
    await cp(path.join(built.out, 'KV-EXT-6060', 'declaration.ilcd.zip'), archive);
    await editLine(path.join(dir, 'factors.csv'), 38, SUPPLIER_FILE, 'suppliers/profile.ilcd.zip');
    const results = JSON.parse(await readFile(path.join(built.out, 'KV-EXT-6060', 'results.json'), 'utf8'));
    const first = await loadProject(dir);
    expect(first.problems.filter((p) => p.severity === 'error')).toEqual([]);
    const row = first.project!.lookups.factors.get('kvs-billet-6060')!.value as unknown as Record<string, number>;
    // Per kg = per m / (kg per m).
    expect(row['GWP-total']).toBeCloseTo(results.methods.cutoff.modules['A1-A3']['GWP-total'] / 0.83, 12);
    expect(row.AP).toBeCloseTo(results.methods.cutoff.modules['A1-A3'].AP / 0.83, 12);

    // GWP-total written as A1, A2 and A3 instead of A1-A3.
    const { zipSync, strToU8 } = await import('fflate');
    const entries = unzipSync(await readFile(archive));
    const name = Object.keys(entries).find((n) => n.startsWith('ILCD/processes/'))!;
    const text = strFromU8(entries[name]!);
    const a13 = results.methods.cutoff.modules['A1-A3']['GWP-total'];
    const [a1, a2, a3] = ['A1', 'A2', 'A3'].map((m) => results.methods.cutoff.modules[m]['GWP-total'] as number) as [number, number, number];
    const written = `<epd:amount epd:module="A1-A3">${a13}</epd:amount>`;
    expect(text).toContain(written);
    entries[name] = strToU8(text.replace(written, `<epd:amount epd:module="A1">${a1}</epd:amount><epd:amount epd:module="A2">${a2}</epd:amount><epd:amount epd:module="A3">${a3}</epd:amount>`));
    await writeFile(archive, zipSync(entries));
    const second = await loadProject(dir);
    const summed = second.project!.lookups.factors.get('kvs-billet-6060')!.value as unknown as Record<string, number>;
    expect(summed['GWP-total']).toBeCloseTo((a1 + a2 + a3) / 0.83, 12);
    expect(second.project!.suppliers.get('kvs-billet-6060')!.values.get('GWP-total')!.parts).toHaveLength(3);
  }, 60_000);

  it('refuses an archive whose dataset inflates beyond 50 MB (a zip bomb), before inflating it', async () => {
    const { zipSync } = await import('fflate');
    const bomb = zipSync({ 'ILCD/processes/x.xml': new Uint8Array(51e6).fill(32) }, { level: 9 });
    expect(bomb.byteLength).toBeLessThan(1e6);
    expect(() => readEpdFile('bomb.zip', bomb)).toThrow(/larger than 50 MB once inflated/);
  });
});

describe('the demo’s billet supplier (examples/billet-supplier)', () => {
  let built: Awaited<ReturnType<typeof buildFresh>>;
  let supplier: { dir: string; out: string };
  beforeAll(async () => {
    built = await buildFresh();
    expect(built.result.code, built.result.stderr).toBe(0);
    const work = await tempDir();
    supplier = { dir: work, out: path.join(work, 'out') };
    const result = await runCli(['build', '--data', path.join(ROOT, 'examples', 'billet-supplier'), '--out', supplier.out, '--no-pdf']);
    expect(result.code, result.stderr).toBe(0);
  }, 60_000);
  afterAll(async () => {
    await removeDir(built.dir);
    await removeDir(supplier.dir);
  });

  it('delivers the dataset the demo reads, byte for byte as loopsheet exports it', async () => {
    const exported = await readFile(path.join(supplier.out, 'KV-S-0117', 'declaration.ilcd.zip'));
    const committed = await readFile(path.join(ROOT, 'data', SUPPLIER_FILE));
    expect(committed.equals(exported), 'data/suppliers/KV-S-0117.ilcd.zip differs from the build of examples/billet-supplier: copy it again').toBe(true);
    // Labelled as illustrative inside.
    const entries = unzipSync(committed);
    const process = strFromU8(entries[Object.keys(entries).find((n) => n.startsWith('ILCD/processes/'))!]!);
    expect(process).toMatch(/ILLUSTRATIVE/);
  });

  it('feeds KV-EXT-6060-T22 its declared A1-A3 per kg: the value per t over 1000 kg (SI: 1 t = 1000 kg), module C and D left out', async () => {
    const upstream = JSON.parse(await readFile(path.join(supplier.out, 'KV-S-0117', 'results.json'), 'utf8'));
    const results = JSON.parse(await readFile(path.join(built.out, 'KV-EXT-6060-T22', 'results.json'), 'utf8'));
    const codes = (results.indicators as Array<{ code: string; basis: string }>).filter((i) => i.basis === 'factors').map((i) => i.code);
    const step = results.graph.steps.find((s: { id: string }) => s.id === 'supplier/kvs-billet-6060');
    expect(step).toBeDefined();
    codes.forEach((code, i) => {
      const declared = upstream.methods.cutoff.modules['A1-A3'][code];
      expect(step.values[i], code).toBeCloseTo(declared / 1000, 12);
    });
    const k = results.graph.steps.find((s: { id: string }) => s.id === 'supplier/kvs-billet-6060/k');
    expect(k.value).toBe(1 / 1000);
    // Specific data in the data quality; the row's reference year from the dataset.
    expect(results.data_quality.factors.find((f: { factor_id: string }) => f.factor_id === 'kvs-billet-6060')).toMatchObject({ data_type: 'specific' });
  });

  it('walks in explain and in the audit trail to the dataset’s element: file, line, module and indicator', async () => {
    const explain = await runCli(['explain', 'KV-EXT-6060-T22', 'cutoff/A1/GWP-total', '--data', path.join(ROOT, 'data')]);
    expect(explain.code, explain.stderr).toBe(0);
    const match = /V {2}(suppliers\/KV-S-0117\.ilcd\.zip!(ILCD\/processes\/[0-9a-f-]{36}\.xml)):(\d+) A1-A3 GWP-total = "([^"]+)"/.exec(explain.stdout);
    expect(match, explain.stdout).not.toBeNull();
    const entries = unzipSync(await readFile(path.join(ROOT, 'data', SUPPLIER_FILE)));
    const lines = strFromU8(entries[match![2]!]!).split('\n');
    // That line of the dataset is the A1-A3 amount of GWP-total, with that text.
    expect(lines[Number(match![3]) - 1]!.trim()).toBe(`<epd:amount epd:module="A1-A3">${match![4]}</epd:amount>`);
    const gwpBlock = lines.slice(0, Number(match![3])).reverse().find((l) => l.includes('refObjectId'));
    expect(gwpBlock).toContain('a7ea142a-9749-11ed-a8fc-0242ac120002');
    const audit = await readFile(path.join(built.out, 'KV-EXT-6060-T22', 'audit.html'), 'utf8');
    expect(audit).toContain(match![1]);
    expect(audit).toContain(`&lt;epd:amount epd:module=&quot;A1-A3&quot;&gt;${match![4]}&lt;/epd:amount&gt;`);
  });

  it('is part of the verification pack and of the product’s input key: a changed dataset rebuilds the products that read it, and diff names the element', async () => {
    const manifest = JSON.parse(await readFile(path.join(built.out, 'verification', 'manifest.json'), 'utf8'));
    expect(JSON.stringify(manifest)).toContain(SUPPLIER_FILE);
    expect((await readFile(path.join(built.out, 'verification', 'inputs', SUPPLIER_FILE))).equals(await readFile(path.join(ROOT, 'data', SUPPLIER_FILE)))).toBe(true);

    // The supplier declares a different GWP-total A1-A3.
    const data = await demoCopy();
    dirs.push(path.dirname(data));
    const entries = unzipSync(await readFile(path.join(data, SUPPLIER_FILE)));
    const name = Object.keys(entries).find((n) => n.startsWith('ILCD/processes/'))!;
    const text = strFromU8(entries[name]!);
    const declared = /<epd:amount epd:module="A1-A3">([^<]+)<\/epd:amount>\s*<epd:amount epd:module="C1"[^>]*>[^<]*<\/epd:amount>\s*<epd:amount epd:module="C2"[^>]*>4\.65</.exec(text)![1]!;
    const { zipSync, strToU8 } = await import('fflate');
    entries[name] = strToU8(text.replace(`>${declared}<`, '>2500<'));
    await writeFile(path.join(data, SUPPLIER_FILE), zipSync(entries));
    const work = await tempDir();
    dirs.push(work);
    const out = path.join(work, 'out');
    await cp(built.out, out, { recursive: true });
    const changed = await runCli(['build', '--data', data, '--out', out, '--no-pdf', '--changed']);
    expect(changed.code, changed.stderr).toBe(0);
    expect(changed.stdout).toMatch(/KV-EXT-6060-T22: a supplier dataset it reads \(suppliers\/KV-S-0117\.ilcd\.zip\) changed/);
    expect(changed.stdout).not.toMatch(/ {2}KV-EXT-6060: /);
    const diff = await runCli(['diff', built.out, out]);
    expect(diff.stdout).toContain('A1-A3 GWP-total');
    expect(diff.stdout).toContain('2500');
  }, 60_000);
});
