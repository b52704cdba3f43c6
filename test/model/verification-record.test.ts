import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { createPublicKey, verify } from 'node:crypto';
import { cp, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { unzipSync, zipSync } from 'fflate';
import { loadProject } from '../../src/model/project.ts';
import { canonicalJson, type VerificationRecord } from '../../src/model/verification-record.ts';
import { productStatus } from '../../src/model/verification-status.ts';
import { rowsByProduct } from '../../src/model/by-product.ts';
import { signedRecordText, verificationRecord } from '../../src/cli/verify.ts';
import { DEMO, ROOT, demoCopy, editLine, hasCommand, hashTree, missingTool, removeDir, runCli, tempDir } from '../helpers.ts';

/**
 * A verifier's signed record: made with a key pair made here (`loopsheet keygen`), checked
 * against Node's own crypto.verify with the PEM public key and against OpenSSL (`openssl
 * pkeyutl -verify`, Debian's openssl) as an implementation outside Node. Ed25519: RFC 8032.
 */
const VERIFIER = 'Dr. Test Verifier (fictional)';
const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

let keys: string;
let data: string;
let out: string;
const statuses = async (dir: string) => {
  const { project } = await loadProject(dir);
  return Object.fromEntries(rowsByProduct(project!).map((rows) => [rows.product.value.product_id, productStatus(project!, rows)]));
};
const pageStatus = async (site: string, id: string) => /Verification<\/dt><dd>([^<]*)/.exec(await readFile(path.join(site, id, 'index.html'), 'utf8'))![1]!;

beforeAll(async () => {
  keys = await tempDir('loopsheet-keys-');
  dirs.push(keys);
  data = await demoCopy();
  dirs.push(path.dirname(data));
  // The demo's own record and key are replaced by this test's.
  const work = await tempDir();
  dirs.push(work);
  out = path.join(work, 'out');
  const keygen = await runCli(['keygen', '--out', keys, '--name', 'test']);
  expect(keygen.code, keygen.stderr).toBe(0);
  await removeDir(path.join(data, 'verifier.pub.pem'));
  await removeDir(path.join(data, 'verification-record.json'));
  expect((await runCli(['build', '--data', data, '--out', out, '--no-pdf'])).code).toBe(0);
  const signed = await runCli(['verify', '--data', data, '--out', out, '--key', path.join(keys, 'test.key.pem'), '--verifier', VERIFIER, '--date', '2026-11-30', '--programme', 'Test programme']);
  expect(signed.code, signed.stderr).toBe(0);
  expect(signed.stdout).toMatch(/5 products, 1 family, 14 input files/);
}, 60_000);

describe('loopsheet verify and build', () => {
  it('signs a record that Node’s crypto.verify and OpenSSL accept with the PEM public key, and that a changed byte breaks', async () => {
    const file = JSON.parse(await readFile(path.join(data, 'verification-record.json'), 'utf8')) as { record: VerificationRecord; signature: string };
    const message = Buffer.from(canonicalJson(file.record));
    const signature = Buffer.from(file.signature, 'base64');
    expect(signature).toHaveLength(64); // an Ed25519 signature is 64 bytes (RFC 8032 §5.1.6)
    const publicPem = await readFile(path.join(data, 'verifier.pub.pem'), 'utf8');
    expect(publicPem).toBe(await readFile(path.join(keys, 'test.pub.pem'), 'utf8'));
    expect(verify(null, message, createPublicKey(publicPem), signature)).toBe(true);
    expect(verify(null, Buffer.from(canonicalJson({ ...file.record, verifier: 'Someone else' })), createPublicKey(publicPem), signature)).toBe(false);
    if (missingTool('openssl', hasCommand('openssl', ['version']), 'apt-get install openssl, as .ci/run does.')) return;
    await writeFile(path.join(keys, 'message'), message);
    await writeFile(path.join(keys, 'signature'), signature);
    const openssl = (messageFile: string) => spawnSync('openssl', ['pkeyutl', '-verify', '-pubin', '-inkey', path.join(data, 'verifier.pub.pem'), '-rawin', '-in', messageFile, '-sigfile', path.join(keys, 'signature')], { encoding: 'utf8' });
    const good = openssl(path.join(keys, 'message'));
    expect(good.status, good.stdout + good.stderr).toBe(0);
    expect(good.stdout).toMatch(/Signature Verified Successfully/);
    await writeFile(path.join(keys, 'other'), Buffer.concat([message, Buffer.from(' ')]));
    expect(openssl(path.join(keys, 'other')).status).not.toBe(0);
  });

  it('shows every covered product and family as verified; a build with nothing changed keeps them so, byte for byte', async () => {
    const second = path.join(path.dirname(out), 'second');
    for (const target of [out, second]) expect((await runCli(['build', '--data', data, '--out', target, '--no-pdf'])).code).toBe(0);
    for (const id of ['KV-EXT-6060', 'KV-CU-BB10', 'KV-BR-40', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22']) expect(await pageStatus(out, id)).toBe(`verified by ${VERIFIER} on 2026-11-30`);
    expect(await pageStatus(out, 'families/profiles-6060-mill')).toBe(`verified by ${VERIFIER} on 2026-11-30`);
    const page = await readFile(path.join(out, 'KV-EXT-6060', 'index.html'), 'utf8');
    expect(page).not.toContain('Draft — not verified');
    expect(await hashTree(second)).toEqual(await hashTree(out));
    const check = await runCli(['check', '--data', data]);
    expect(check.stdout).toContain(`verification: KV-EXT-6060 verified by ${VERIFIER} on 2026-11-30`);
  }, 60_000);

  it('turns one product back to draft when one input cell it reads changes, and names the row', async () => {
    const copy = await tempDir();
    dirs.push(copy);
    const changed = path.join(copy, 'data');
    await cp(data, changed, { recursive: true });
    // bom.csv line 10: KV-BR-40 · L2, scrap rate 0.05 → 0.06.
    await editLine(path.join(changed, 'bom.csv'), 10, ',0.05,landfill,', ',0.06,landfill,');
    const found = await statuses(changed);
    expect(found['KV-BR-40']).toMatchObject({ status: 'draft', reasons: ['changed since verification on 2026-11-30: bom.csv line 10 (KV-BR-40 · L2)'] });
    expect(found['KV-EXT-6060']!.status).toBe('verified');
    const site = path.join(copy, 'out');
    expect((await runCli(['build', '--data', changed, '--out', site, '--no-pdf'])).code).toBe(0);
    expect(await pageStatus(site, 'KV-BR-40')).toBe('draft — not verified (changed since verification on 2026-11-30: bom.csv line 10 (KV-BR-40 · L2))');
    const page = await readFile(path.join(site, 'KV-BR-40', 'index.html'), 'utf8');
    expect(page).toContain('Draft — not verified.');
    expect(await pageStatus(site, 'KV-CU-BB10')).toMatch(/^verified by/);
    // The family's members are verified, KV-BR-40 is not one of them.
    expect(await pageStatus(site, 'families/profiles-6060-mill')).toMatch(/^verified by/);
    // Against the verified build, diff names it as such and lists what moved since verification.
    const diff = await runCli(['diff', out, site, '--threshold', '0']);
    expect(diff.code, diff.stderr).toBe(0);
    expect(diff.stdout).toContain(`The old build is the one verified on 2026-11-30 by ${VERIFIER} (the 6 results.json files its record covers match): what follows moved since verification.`);
    expect(diff.stdout).toContain('`bom.csv` line 10 (`KV-BR-40 · L2`) `scrap_rate`: `0.05` → `0.06`');
    // Against another build, it says so.
    const other = await runCli(['diff', site, site]);
    expect(other.stdout).toMatch(/The old build is not the one verified on 2026-11-30: `KV-BR-40\/results.json` differ/);
  }, 60_000);

  it('turns the products back to draft for a changed tool version, a tampered record, a wrong key, a changed supplier dataset (only the product that reads it) and a declaration.json changed after signing', async () => {
    const copy = await tempDir();
    dirs.push(copy);
    const at = path.join(copy, 'data');
    await cp(data, at, { recursive: true });
    const recordFile = path.join(at, 'verification-record.json');
    const original = await readFile(recordFile, 'utf8');

    // Signed with a valid key, but by an earlier version of the tool.
    const { record } = await verificationRecord({ data: at, out, verifier: VERIFIER, date: '2026-11-30', programme: '' });
    await writeFile(recordFile, signedRecordText({ ...record, tool: { ...record.tool, version: '0.1.0' } }, await readFile(path.join(keys, 'test.key.pem'), 'utf8')));
    expect((await statuses(at))['KV-EXT-6060']).toMatchObject({ status: 'draft', reasons: ['changed since verification on 2026-11-30: tool 0.1.0 → 0.2.0'] });

    // Tampered: a product added to the scope without signing again.
    await writeFile(recordFile, original.replace('"verifier": "Dr. Test Verifier (fictional)"', '"verifier": "Dr. Someone Else"'));
    expect((await statuses(at))['KV-EXT-6060']).toMatchObject({ status: 'draft', reasons: ['signature does not match the verifier’s key'] });

    // Another key beside the record.
    await writeFile(recordFile, original);
    const other = await tempDir('loopsheet-keys-');
    dirs.push(other);
    expect((await runCli(['keygen', '--out', other, '--name', 'other'])).code).toBe(0);
    await cp(path.join(other, 'other.pub.pem'), path.join(at, 'verifier.pub.pem'));
    expect((await statuses(at))['KV-CU-BB10']).toMatchObject({ status: 'draft', reasons: ['signature does not match the verifier’s key'] });

    // The right key again.
    await cp(path.join(keys, 'test.pub.pem'), path.join(at, 'verifier.pub.pem'));
    expect((await statuses(at))['KV-CU-BB10']!.status).toBe('verified');

    // The supplier's dataset as other bytes (the same datasets zipped again): only the product that reads it is a draft.
    const archive = path.join(at, 'suppliers', 'KV-S-0117.ilcd.zip');
    await writeFile(archive, zipSync(unzipSync(await readFile(archive)), { level: 1 }));
    const afterSupplier = await statuses(at);
    expect(afterSupplier['KV-EXT-6060-T22']).toMatchObject({ status: 'draft', reasons: ['changed since verification on 2026-11-30: suppliers/KV-S-0117.ilcd.zip'] });
    expect(afterSupplier['KV-EXT-6060']!.status).toBe('verified');
    await cp(path.join(data, 'suppliers', 'KV-S-0117.ilcd.zip'), archive);

    // declaration.json edited after signing.
    await writeFile(path.join(at, 'declaration.json'), (await readFile(path.join(at, 'declaration.json'), 'utf8')).replace('"gwp_set": "AR6"', '"gwp_set": "AR5"'));
    expect((await statuses(at))['KV-CU-BB10']).toMatchObject({ status: 'draft', reasons: ['changed since verification on 2026-11-30: declaration.json'] });
  }, 60_000);

  it('reports a verified status set by hand without a valid record at its cell, and builds drafts', async () => {
    const dir = await demoCopy();
    dirs.push(path.dirname(dir));
    await removeDir(path.join(dir, 'verification-record.json'));
    await writeFile(path.join(dir, 'declaration.json'), (await readFile(path.join(dir, 'declaration.json'), 'utf8')).replace('"verification": { "status": "draft" }', '"verification": { "status": "verified", "verifier": "Anyone", "date": "2026-11-30" }'));
    const { problems, project } = await loadProject(dir);
    expect(problems).toContainEqual(expect.objectContaining({ code: 'VERIFICATION_UNSIGNED', file: 'declaration.json', column: 'verification.status', value: 'verified', severity: 'warning' }));
    expect(Object.values(await statuses(dir)).every((s) => s.status === 'draft')).toBe(true);
    expect(project).toBeDefined();
  });

  it('refuses a private key inside a data folder or an output, and keygen into one', async () => {
    await cp(path.join(keys, 'test.key.pem'), path.join(data, 'leaked.key.pem'));
    const inData = await runCli(['verify', '--data', data, '--out', out, '--key', path.join(data, 'leaked.key.pem'), '--verifier', VERIFIER]);
    expect(inData.code).toBe(2);
    expect(inData.stderr).toMatch(/never enters a data folder or an output/);
    await removeDir(path.join(data, 'leaked.key.pem'));
    const keygen = await runCli(['keygen', '--out', path.join(out, 'keys')]);
    expect(keygen.code).toBe(2);
    expect(keygen.stderr).toMatch(/output/);
  });
});

describe('the demo', () => {
  it('carries a record signed with the demo verifier’s key: KV-EXT-6060-T19 verified, KV-BR-40 changed since verification', async () => {
    const found = await statuses(DEMO);
    expect(found['KV-EXT-6060-T19']).toMatchObject({ status: 'verified', verifier: 'Dr. Ada Invented (fictional demo verifier)', date: '2026-11-30' });
    expect(found['KV-BR-40']).toMatchObject({ status: 'draft', reasons: ['changed since verification on 2026-11-30: bom.csv line 9 (KV-BR-40 · L1)'] });
    expect(found['KV-EXT-6060']!.status).toBe('draft');
    // The demo key is the fixtures' public key, and its private key is not in data/.
    expect(await readFile(path.join(DEMO, 'verifier.pub.pem'), 'utf8')).toBe(await readFile(path.join(ROOT, 'test/fixtures/verifier/DEMO-ONLY-verifier.pub.pem'), 'utf8'));
    const text = JSON.stringify(await hashTree(DEMO));
    expect(text).not.toMatch(/key\.pem/);
  });
});
