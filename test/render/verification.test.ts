import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { DEMO, buildFresh, hashTree, removeDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

interface Manifest {
  tool: { name: string; version: string };
  algorithm: string;
  configuration: { file: string; sha256: string };
  inputs: Array<{ file: string; sha256: string; bytes: number }>;
  outputs: Array<{ file: string; sha256: string; bytes: number }>;
}

describe('the verification pack', () => {
  it('copies every input and records the SHA-256 of every input, the configuration and every other output', async () => {
    const { dir, out, result } = await buildFresh();
    dirs.push(dir);
    expect(result.code, result.stderr).toBe(0);
    const manifest = JSON.parse(await readFile(path.join(out, 'verification', 'manifest.json'), 'utf8')) as Manifest;
    const pkg = JSON.parse(await readFile(path.join(DEMO, '..', 'package.json'), 'utf8')) as { version: string };
    expect(manifest.tool).toEqual({ name: 'loopsheet', version: pkg.version });
    expect(manifest.algorithm).toBe('SHA-256');

    // Checked against node:crypto over the files on disk, not against the tool's own hashing.
    const sha = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');
    // The CSV files and declaration.json, the supplier dataset factors.csv names, and the verifier's record and public key.
    const inputFiles = ['declaration.json', 'products.csv', 'bom.csv', 'materials.csv', 'eol.csv', 'activities.csv', 'transport.csv', 'factors.csv', 'process.csv', 'site.csv', 'production.csv', 'families.csv', 'excluded.csv', 'suppliers/KV-S-0117.ilcd.zip', 'verification-record.json', 'verifier.pub.pem'];
    expect(manifest.inputs.map((i) => i.file).sort()).toEqual([...inputFiles].sort());
    for (const input of manifest.inputs) {
      const original = await readFile(path.join(DEMO, input.file));
      expect(input.sha256, input.file).toBe(sha(original));
      expect(input.bytes).toBe(original.length);
      expect(await readFile(path.join(out, 'verification', 'inputs', input.file))).toEqual(original);
    }
    expect(manifest.configuration).toEqual(manifest.inputs.find((i) => i.file === 'declaration.json'));

    const tree = await hashTree(out);
    const expected = Object.keys(tree)
      .map((file) => file.split(path.sep).join('/'))
      .filter((file) => file !== 'verification/manifest.json' && file !== '.loopsheet-output' && file !== '.loopsheet-cache.json')
      .sort();
    expect(manifest.outputs.map((o) => o.file)).toEqual(expected);
    for (const output of manifest.outputs) expect(output.sha256, output.file).toBe(tree[output.file.split('/').join(path.sep)]);
    // No absolute path of this machine in the manifest.
    expect(JSON.stringify(manifest)).not.toContain(dir);
  });

  it('lists every assumption, data source and warning of the build on its page', async () => {
    const { dir, out, result } = await buildFresh();
    dirs.push(dir);
    expect(result.code).toBe(0);
    const page = await readFile(path.join(out, 'verification', 'index.html'), 'utf8');
    for (const text of ['Assumptions', 'loopsheet illustrative factor set', 'FACTOR_VALUE_MISSING', 'factors.csv', 'manifest.json', 'not verified']) expect(page).toContain(text);
    // The warning the demo raises on the command line is on the page too.
    expect(result.stderr).toContain('FACTOR_VALUE_MISSING');
  });
});
