import { afterAll, describe, expect, it } from 'vitest';
import { mkdir, readFile, readdir, writeFile, stat } from 'node:fs/promises';
import path from 'node:path';
import { declaredNotation, demoCopy, editFile, editLine, hashTree, removeDir, runCli, tempDir, DEMO } from '../helpers.ts';
import { resultsCsv } from '../../src/report/results-csv.ts';
import type { ResultsSummary } from '../../src/report/results.ts';
import { figureMap } from '../figures.ts';

const declared = (value: number) => declaredNotation(value);

const cleanup: string[] = [];
afterAll(async () => Promise.all(cleanup.map(removeDir)));
const scratch = async () => {
  const dir = await tempDir();
  cleanup.push(dir);
  return dir;
};

describe('loopsheet usage', () => {
  it.each(['check', 'build', 'explain', 'chem', 'init', 'schema'])('%s --help prints its usage and exits 0', async (command) => {
    const result = await runCli([command, '--help']);
    expect(result.code).toBe(0);
    expect(result.stdout).toContain(`loopsheet ${command}`);
  });

  it('--help lists the commands; no command is a usage error (exit 2)', async () => {
    const help = await runCli(['--help']);
    expect(help.code).toBe(0);
    expect(help.stdout).toMatch(/check[\s\S]*build[\s\S]*init[\s\S]*schema/);
    const none = await runCli([]);
    expect(none.code).toBe(2);
    expect(none.stderr).toContain('usage: loopsheet COMMAND');
  });

  it.each([
    [['frobnicate'], /unknown command "frobnicate"/],
    [['check', '--dat', 'data'], /Unknown option '--dat'/],
    [['init'], /expected 1 argument, got 0/],
    [['check', 'extra'], /expected 0 arguments, got 1/],
  ])('%j is a usage error (exit 2) on stderr', async (args, message) => {
    const result = await runCli(args);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(message);
    expect(result.stdout).toBe('');
  });
});

describe('loopsheet check', () => {
  it('passes the demo (exit 0, warnings allowed), prints problems to stderr and the site shares to stdout', async () => {
    const result = await runCli(['check', '--data', DEMO]);
    expect(result.code).toBe(0);
    // Mass keys: 1 200 000 m × 0.83 kg = 996 000 kg, 450 000 × 0.78 = 351 000, 260 000 × 0.9 = 234 000; Σ 1 581 000 kg.
    expect(result.stdout.split('\n')[0]).toBe('site norwick-press-shop, 2025, shared by mass (ISO 14044 §4.3.4): KV-EXT-6060 63.0 %, KV-EXT-6060-T19 22.2 %, KV-EXT-6060-T22 14.8 %');
    // Then each product's verification against the demo's record.
    expect(result.stdout).toContain('verification: KV-EXT-6060-T19 verified by Dr. Ada Invented (fictional demo verifier) on 2026-11-30\n');
    expect(result.stdout).toContain('verification: KV-BR-40 draft: changed since verification on 2026-11-30: bom.csv line 9 (KV-BR-40 · L1)\n');
    expect(result.stderr).toContain('0 errors, 1 warning');
    // file:line:column (the column's number in the header), then what was expected.
    expect(result.stderr).toContain(`warning ${DEMO}/factors.csv:23:10: ODP "":`);
    expect(result.stderr).toContain('; expected a number (an empty cell means "not available", never 0) [FACTOR_VALUE_MISSING]');
  });

  it('--json prints the problems as a JSON array on stdout', async () => {
    const result = await runCli(['check', '--data', DEMO, '--json']);
    expect(result.code).toBe(0);
    const problems = JSON.parse(result.stdout);
    expect(problems).toEqual([expect.objectContaining({ code: 'FACTOR_VALUE_MISSING', file: 'factors.csv', line: 23, column: 'ODP', severity: 'warning' })]);
  });

  it('reports every error planted in a broken copy of the demo, each at its file and line, in one run', async () => {
    const dir = await demoCopy();
    cleanup.push(path.dirname(dir));
    await editLine(path.join(dir, 'bom.csv'), 6, '0.995', '"0,995"');
    await editLine(path.join(dir, 'bom.csv'), 9, ',3%,22%,', ',83%,22%,');
    await editLine(path.join(dir, 'products.csv'), 3, 'building-metals', 'building-metal');
    await editLine(path.join(dir, 'materials.csv'), 6, 'steel-hot-rolled-bof', 'steel-hot-roled-bof');
    await editLine(path.join(dir, 'eol.csv'), 5, '90%,0,0,10%', '90%,0,0,20%');
    await editLine(path.join(dir, 'activities.csv'), 9, ',MJ,', ',kg,');
    await editLine(path.join(dir, 'transport.csv'), 7, ',260,', ',260 km,');
    await editLine(path.join(dir, 'factors.csv'), 26, 'illustrative),0.41,', 'illustrative),zero,');
    await editFile(path.join(dir, 'declaration.json'), (t) => t.replace('"status": "draft"', '"status": "drafted"'));
    const result = await runCli(['check', '--data', dir]);
    expect(result.code).toBe(1);
    const planted = [
      ['bom.csv:6:6: mass_kg "0,995"', 'NOT_A_NUMBER'],
      ['bom.csv:9:8: recycled_post "22%"', 'RECYCLED_CONTENT_SUM'],
      ['products.csv:3:5: eol_scenario "building-metal"', 'UNKNOWN_REFERENCE'],
      ['materials.csv:6:4: virgin "steel-hot-roled-bof"', 'UNKNOWN_REFERENCE'],
      ['eol.csv:5:7: landfill "20%"', 'EOL_SHARES_SUM'],
      ['activities.csv:9:6: unit "kg"', 'UNIT_MISMATCH'],
      ['transport.csv:7:6: distance_km "260 km"', 'NOT_A_NUMBER'],
      ['factors.csv:26:6: GWP-total "zero"', 'NOT_A_NUMBER'],
      ['declaration.json:12:31: verification.status "drafted"', 'BAD_CHOICE'],
    ];
    for (const [where, code] of planted) {
      expect(result.stderr.split('\n').some((line) => line.startsWith('error ') && line.includes(where!) && line.endsWith(`[${code}]`)), `${where} [${code}] in\n${result.stderr}`).toBe(true);
    }
    expect(result.stderr).toContain('(did you mean "building-metals"?)');
    expect(result.stderr).toContain('(did you mean "steel-hot-rolled-bof"?)');
  });

  it('a data folder that does not exist is one usage error (exit 2); an empty one names each missing file (exit 1)', async () => {
    const nowhere = path.join(await scratch(), 'nowhere');
    const missing = await runCli(['check', '--data', nowhere]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toBe(`loopsheet check: the data folder ${nowhere} does not exist\n`);
    const defaulted = await runCli(['build'], { cwd: await scratch() });
    expect(defaulted.stderr).toBe('loopsheet build: the data folder data does not exist (the default; give --data DIR)\n');
    // A folder given without --data.
    const positional = await runCli(['check', nowhere]);
    expect(positional.code).toBe(2);
    expect(positional.stderr).toMatch(`expected 0 arguments, got 1; did you mean --data ${nowhere}?`);
    const empty = await scratch();
    const result = await runCli(['check', '--data', empty]);
    expect(result.code).toBe(1);
    for (const file of ['declaration.json', 'products.csv', 'bom.csv', 'materials.csv', 'eol.csv', 'activities.csv', 'transport.csv', 'factors.csv']) {
      expect(result.stderr).toContain(`error ${empty}/${file}: ${file} is missing from the data folder; expected a file named ${file} [FILE_MISSING]`);
    }
  });

  it('prints escape sequences from input text as escapes, never raw to the terminal (ECMA-48 CSI and OSC)', async () => {
    const data = await demoCopy();
    cleanup.push(path.dirname(data));
    await editLine(path.join(data, 'bom.csv'), 2, 'mass_kg', 'mass\u001b[31mRED');
    await editLine(path.join(data, 'bom.csv'), 3, ',al-6060,', ',al\u001b]0;title\u0007,');
    for (const args of [['check', '--data', data], ['check', '--data', data, '--json']]) {
      const result = await runCli(args);
      expect(result.code).toBe(1);
      const printed = result.stdout + result.stderr;
      expect(printed).not.toMatch(/[\u001b\u0007]/);
      expect(printed).toContain('mass\\u001b[31mRED');
      if (args.includes('--json')) expect(JSON.parse(result.stdout).some((p: { column?: string }) => p.column === 'mass\u001b[31mRED')).toBe(true);
    }
  });
});

describe('loopsheet explain', () => {
  it('walks a figure down to the CSV cells, with values at each step', async () => {
    const result = await runCli(['explain', 'KV-EXT-6060', 'cutoff/D/GWP-total', '--data', DEMO]);
    expect(result.code, result.stderr).toBe(0);
    expect(result.stdout.split('\n')[0]).toMatch(/^cutoff\/D\/GWP-total = -2\.19\d* kg CO2 eqv\.$/);
    expect(result.stdout).toContain('bom.csv:3 mass_kg = "0.83"');
    expect(result.stdout).toContain('eol.csv:3 recycling = "96%"');
    expect(result.stdout).toContain('factors.csv:3 GWP-total = "11.85"  (factor al-primary-ingot)');
  });

  it('an unknown figure or product is a usage error (exit 2) with the nearest ids', async () => {
    const figure = await runCli(['explain', 'KV-EXT-6060', 'cutoff/A1/GWP-totl', '--data', DEMO]);
    expect(figure.code).toBe(2);
    expect(figure.stderr).toMatch(/has no figure "cutoff\/A1\/GWP-totl"; the nearest: cutoff\/A1\/GWP-total, /);
    // Part of an id: the figures it names.
    const module = await runCli(['explain', 'KV-EXT-6060', 'cutoff/D', '--data', DEMO]);
    expect(module.stderr).toMatch(/; the nearest: cutoff\/D\/[\w-]+(, cutoff\/D\/[\w-]+){7} /);
    const product = await runCli(['explain', 'KV-EXT-606', 'cutoff/A1/GWP-total', '--data', DEMO]);
    expect(product.code).toBe(2);
    expect(product.stderr).toContain('did you mean "KV-EXT-6060"?');
  });
});

describe('loopsheet init', () => {
  it('scaffolds every input file with its header and a commented example row, plus a README of the columns', async () => {
    const dir = path.join(await scratch(), 'my-project');
    const result = await runCli(['init', dir]);
    expect(result.code).toBe(0);
    expect((await readdir(dir)).sort()).toEqual(['README.md', 'activities.csv', 'bom.csv', 'declaration.json', 'eol.csv', 'excluded.csv', 'factors.csv', 'families.csv', 'materials.csv', 'process.csv', 'production.csv', 'products.csv', 'site.csv', 'transport.csv']);
    const bom = await readFile(path.join(dir, 'bom.csv'), 'utf8');
    expect(bom.split('\n')[2]).toBe('product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source,gsd');
    expect(bom.split('\n')[3]).toMatch(/^# EXT-6060-40,L1,/);
    const readme = await readFile(path.join(dir, 'README.md'), 'utf8');
    expect(readme).toContain('| `mass_kg` | number (kg) | required |');
    JSON.parse(await readFile(path.join(dir, 'declaration.json'), 'utf8'));

    // The scaffold is a valid skeleton: its only errors are the files that still need rows.
    const check = await runCli(['check', '--data', dir, '--json']);
    expect(check.code).toBe(1);
    const codes = new Set(JSON.parse(check.stdout).map((p: { code: string }) => p.code));
    expect(codes).toEqual(new Set(['NO_ROWS']));
  });

  it('refuses a non-empty folder (exit 2) unless --force, which keeps existing files', async () => {
    const dir = await scratch();
    await writeFile(path.join(dir, 'products.csv'), 'mine\n');
    const refused = await runCli(['init', dir]);
    expect(refused.code).toBe(2);
    expect(refused.stderr).toMatch(/not empty/);
    const forced = await runCli(['init', dir, '--force']);
    expect(forced.code).toBe(0);
    expect(await readFile(path.join(dir, 'products.csv'), 'utf8')).toBe('mine\n');
    expect(forced.stdout).toContain('kept products.csv');
  });
});

describe('loopsheet schema', () => {
  it('writes a JSON Schema for declaration.json and each CSV row, and the column reference', async () => {
    const dir = await scratch();
    const result = await runCli(['schema', '--out', dir]);
    expect(result.code).toBe(0);
    const declaration = JSON.parse(await readFile(path.join(dir, 'declaration.schema.json'), 'utf8'));
    expect(declaration.$schema).toMatch(/json-schema\.org\/draft\/2020-12/);
    expect(declaration.required).toEqual(expect.arrayContaining(['owner', 'standard', 'pcr', 'reference_year', 'issued', 'valid_until', 'verification', 'background_data']));
    expect(declaration.properties.verification.properties.status.enum).toEqual(['draft', 'verified']);
    const bom = JSON.parse(await readFile(path.join(dir, 'bom.row.schema.json'), 'utf8'));
    expect(Object.keys(bom.properties)).toContain('scrap_fate');
    expect(await readFile(path.join(dir, 'columns.md'), 'utf8')).toContain('### `factors.csv`');
  });
});

describe('loopsheet build', () => {
  it('builds the demo into --out from any working directory (exit 0)', async () => {
    const cwd = await scratch();
    const result = await runCli(['build', '--data', DEMO, '--out', 'site', '--no-pdf'], { cwd });
    expect(result.code, result.stderr).toBe(0);
    expect(result.stdout).toContain('built 5 products into site');
    const site = path.join(cwd, 'site');
    expect((await readdir(site)).sort()).toEqual(['.loopsheet-cache.json', '.loopsheet-output', 'KV-BR-40', 'KV-CU-BB10', 'KV-EXT-6060', 'KV-EXT-6060-T19', 'KV-EXT-6060-T22', 'assets', 'factors', 'families', 'index.html', 'results.csv', 'results.json', 'verification']);
    expect((await readdir(path.join(site, 'KV-BR-40'))).sort()).toEqual(['audit.html', 'declaration.ilcd.zip', 'index.html', 'results.csv', 'results.json']);
    const factors = await readFile(path.join(site, 'factors', 'index.html'), 'utf8');
    expect(factors).toContain('id="f-grid-electricity"');
    const page = await readFile(path.join(site, 'KV-CU-BB10', 'index.html'), 'utf8');
    expect(page).toContain('href="../factors/index.html#f-cu-cathode-primary"');
    expect(page).toContain('Copper busbar 10 × 100 mm, Cu-ETP, tin-plated');
    expect(page).toContain('bom.csv:6');
    expect(page).toContain('Draft — not verified.');
    expect(page).toContain('Illustrative data.');
    expect(page).toContain('href="../assets/style.css"');
    // The results table shows results.json rounded to three significant figures.
    const results = JSON.parse(await readFile(path.join(site, 'KV-CU-BB10', 'results.json'), 'utf8'));
    for (const module of ['A1', 'A1-A3', 'D']) expect(page).toContain(`>${declared(results.methods.cutoff.modules[module]['GWP-total'])}<`);
    expect(page).toContain(`>${declared(results.methods.cff.total['GWP-total'])}<`);
    expect(figureMap(results)['cutoff/A1/GWP-total']!.value).toBe(results.methods.cutoff.modules.A1['GWP-total']);
    const catalogueCsv = await readFile(path.join(site, 'results.csv'), 'utf8');
    expect(catalogueCsv.split('\n')[0]).toBe('product_id,method,module,indicator,unit,value,figure_id');
    // The catalogue's CSV joins the products' own files; it must equal the formatter's output for all of them.
    const catalogue = JSON.parse(await readFile(path.join(site, 'results.json'), 'utf8')) as { products: ResultsSummary[] };
    expect(catalogueCsv).toBe(resultsCsv(catalogue.products));
    // Eleventy's own summary must not reach stdout, which is for results.
    expect(result.stdout).not.toMatch(/\[11ty\]/);
  });

  it('is deterministic: two builds of the same inputs are byte-identical', async () => {
    const cwd = await scratch();
    const a = await runCli(['build', '--data', DEMO, '--out', path.join(cwd, 'a'), '--no-pdf']);
    const b = await runCli(['build', '--data', DEMO, '--out', path.join(cwd, 'b'), '--no-pdf']);
    expect([a.code, b.code]).toEqual([0, 0]);
    expect(await hashTree(path.join(cwd, 'a'))).toEqual(await hashTree(path.join(cwd, 'b')));
  });

  it('writes nothing when validation fails, and leaves an earlier output byte-identical', async () => {
    const cwd = await scratch();
    const out = path.join(cwd, 'out');
    const first = await runCli(['build', '--data', DEMO, '--out', out, '--no-pdf']);
    expect(first.code).toBe(0);
    const before = await hashTree(out);
    const dir = await demoCopy();
    cleanup.push(path.dirname(dir));
    await editLine(path.join(dir, 'bom.csv'), 3, '0.83', '-0.83');
    await editFile(path.join(dir, 'products.csv'), (t) => t.replace('Extruded profile', 'Changed profile'));
    const failed = await runCli(['build', '--data', dir, '--out', out, '--no-pdf']);
    expect(failed.code).toBe(1);
    expect(failed.stderr).toContain(`nothing was written to ${out}`);
    expect(await hashTree(out)).toEqual(before);
    expect((await readdir(cwd)).sort()).toEqual(['out']);

    const fresh = path.join(cwd, 'never');
    const none = await runCli(['build', '--data', dir, '--out', fresh, '--no-pdf']);
    expect(none.code).toBe(1);
    await expect(stat(fresh)).rejects.toThrow();
  });

  it('refuses to replace a folder it did not write (exit 2), and keeps it', async () => {
    const cwd = await scratch();
    const precious = path.join(cwd, 'thesis');
    await mkdir(precious);
    await writeFile(path.join(precious, 'chapter1.md'), 'years of work\n');
    const result = await runCli(['build', '--data', DEMO, '--out', precious, '--no-pdf']);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/did not write/);
    expect(await readFile(path.join(precious, 'chapter1.md'), 'utf8')).toBe('years of work\n');
    const data = await runCli(['build', '--data', DEMO, '--out', DEMO, '--no-pdf']);
    expect(data.code).toBe(2);
  });

  it('without a browser builds the HTML, lists the missing PDFs on stderr and exits 0; with --pdf it exits 1', async () => {
    const cwd = await scratch();
    const env = { PATH: '/nonexistent', PUPPETEER_EXECUTABLE_PATH: '', PUPPETEER_CACHE_DIR: cwd };
    const auto = await runCli(['build', '--data', DEMO, '--out', path.join(cwd, 'out')], { env });
    expect(auto.code, auto.stderr).toBe(0);
    expect(auto.stderr).toContain('KV-EXT-6060/declaration.pdf');
    expect(auto.stderr).toMatch(/no browser found/);
    const required = await runCli(['build', '--data', DEMO, '--out', path.join(cwd, 'out2'), '--pdf'], { env });
    expect(required.code).toBe(1);
    await expect(stat(path.join(cwd, 'out2'))).rejects.toThrow();
  });
});

describe('loopsheet chem', () => {
  it('weighs a balanced reaction per kg of the chosen species (exit 0)', async () => {
    const result = await runCli(['chem', '2Al2O3 + 3C -> 4Al + 3CO2', '--per', 'Al']);
    expect(result.code, result.stderr).toBe(0);
    expect(result.stdout).toContain('balanced: every element and the charge');
    // Per kg Al: 1.889 kg Al2O3, 0.3339 kg C, 1.223 kg CO2 (field guide §4, from the equation).
    expect(result.stdout).toMatch(/Al2O3\s+reactant\s+2\s+101\.96\d*\s+1\.889/);
    expect(result.stdout).toMatch(/CO2\s+product\s+3\s+44\.009\s+1\.223/);
    expect(result.stdout).toContain('atom economy (Al of all reactants): 45.0 %');
  });

  it('names what does not balance (exit 1) and gives no masses for it; prints JSON on request', async () => {
    const result = await runCli(['chem', '2Al2O3 + C -> Al + CO2', '--json']);
    expect(result.code).toBe(1);
    const json = JSON.parse(result.stdout);
    expect(json.balanced).toBe(false);
    expect(json.coefficients_by).toBe('as written');
    expect(json.imbalances).toEqual([
      { what: 'Al', reactants: 4, products: 1 },
      { what: 'O', reactants: 6, products: 2 },
    ]);
    expect(json.species.map((s: { formula: string }) => s.formula)).toEqual(['Al2O3', 'C', 'Al', 'CO2']);
    expect(json.species.every((s: { mass_per_unit_of_per: number | null }) => s.mass_per_unit_of_per === null)).toBe(true);
    expect(json.atom_economy_pct).toBeNull();
    const text = await runCli(['chem', '2Al2O3 + C -> Al + CO2']);
    expect(text.stdout).toContain('no masses are given for an unbalanced reaction');
    expect(text.stdout).not.toContain('kg per kg');
  });

  it('balances a reaction written without coefficients, and reads ions as ionic equations write them', async () => {
    // Permanganate titration of iron(II): MnO4⁻ + 5 Fe²⁺ + 8 H⁺ → Mn²⁺ + 5 Fe³⁺ + 4 H2O (a standard redox equation of general chemistry texts; common practice).
    const result = await runCli(['chem', 'MnO4- + Fe2+ + H+ -> Mn2+ + Fe3+ + H2O', '--json']);
    expect(result.code, result.stderr).toBe(0);
    const json = JSON.parse(result.stdout);
    expect(json).toMatchObject({ balanced: true, coefficients_by: 'loopsheet', reaction: 'MnO4- + 5 Fe2+ + 8 H+ -> Mn2+ + 5 Fe3+ + 4 H2O' });
    const none = await runCli(['chem', 'H2 + O2 -> H2O + H2O2']);
    expect(none.code).toBe(1);
    expect(none.stdout).toContain('it balances in 2 independent ways');
  });

  it('points at what it cannot read (exit 2)', async () => {
    const result = await runCli(['chem', '2Al2O3 + 3Xq -> 4Al']);
    expect(result.code).toBe(2);
    expect(result.stderr).toContain('"Xq" is not an element with a standard atomic weight (did you mean "Xe"?)');
    expect(result.stderr).toMatch(/2Al2O3 \+ 3Xq -> 4Al\n\s{12}\^/);
    const per = await runCli(['chem', '2Al2O3 + 3C -> 4Al + 3CO2', '--per', 'Fe']);
    expect(per.code).toBe(2);
    expect(per.stderr).toContain('--per Fe: not a species of the reaction (Al2O3, C, Al, CO2)');
  });
});
