import { afterAll, describe, expect, it } from 'vitest';
import { cp, readFile } from 'node:fs/promises';
import path from 'node:path';
import { findBrowser } from '../../src/render/browser.ts';
import { reproduciblePdf } from '../../src/render/pdf.ts';
import { DEMO, hashTree, missingTool, removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

// Without a browser locally the PDFs are left out of the comparison; in CI the browser must be there.
const found = !missingTool('Chromium or Chrome (for the PDFs compared here)', (await findBrowser()) !== undefined, 'apt-get install chromium, as .ci/run does.');

describe('reproducible builds', () => {
  it('gives byte-identical output (PDFs included) for the same inputs, built from two places into two places', async () => {
    const a = await tempDir('loopsheet-repro-a-');
    const b = await tempDir('loopsheet-repro-b-');
    dirs.push(a, b);
    // The data sit in two different folders too: no absolute path may reach an output.
    const dataB = path.join(b, 'elsewhere', 'data');
    await cp(DEMO, dataB, { recursive: true });
    const pdf = found ? '--pdf' : '--no-pdf';
    const first = await runCli(['build', '--data', DEMO, '--out', path.join(a, 'out'), pdf]);
    expect(first.code, first.stderr).toBe(0);
    // In another time zone too: the ILCD archives' zip entries record local time.
    const second = await runCli(['build', '--data', dataB, '--out', path.join(b, 'site'), pdf], { env: { TZ: 'Pacific/Kiritimati' } });
    expect(second.code, second.stderr).toBe(0);

    const treeA = await hashTree(path.join(a, 'out'));
    const treeB = await hashTree(path.join(b, 'site'));
    expect(Object.keys(treeA).length).toBeGreaterThan(20);
    if (found) expect(Object.keys(treeA).filter((file) => file.endsWith('.pdf'))).toHaveLength(6);
    expect(treeB).toEqual(treeA);

    for (const file of Object.keys(treeA).filter((f) => /\.(html|json|csv|svg|css|js)$/.test(f))) {
      const text = await readFile(path.join(a, 'out', file), 'utf8');
      for (const absolute of [a, b, DEMO, path.dirname(DEMO)]) expect(text.includes(absolute), `${file} contains ${absolute}`).toBe(false);
    }
  });

  it('stamps a PDF with the declaration date and renumbers its structure ids without moving a byte', () => {
    // PDF date form D:YYYYMMDDHHmmSSOHH'mm' (ISO 32000-1 §7.9.4).
    const printed = Buffer.from(
      "<</Producer (x)\n/CreationDate (D:20261202050700+00'00')\n/ModDate (D:20261202050700+00'00')>>\n" +
        '<</S /P /ID (node00002957)>> <</S /P /ID (node00002956)>> <</IDTree <</Names [(node00002956) 1 0 R (node00002957) 2 0 R]>>>>',
      'latin1',
    );
    const out = reproduciblePdf(printed, '2026-03-02').toString('latin1');
    expect(out).toHaveLength(printed.length);
    expect(out).toContain("/CreationDate (D:20260302000000+00'00')");
    expect(out).toContain("/ModDate (D:20260302000000+00'00')");
    // Order kept: the smaller id stays the smaller, so the /IDTree stays sorted.
    expect(out).toContain('<</S /P /ID (node00000002)>> <</S /P /ID (node00000001)>>');
    expect(out).toContain('[(node00000001) 1 0 R (node00000002) 2 0 R]');
    expect(() => reproduciblePdf(printed, '02.03.2026')).toThrow(/YYYY-MM-DD/);
  });
});
