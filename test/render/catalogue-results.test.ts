import { afterAll, describe, expect, it } from 'vitest';
import { mkdir, readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { writeCatalogueResults } from '../../src/render/results-files.ts';
import { readCatalogueSummaries, summaryProductId } from '../../src/report/catalogue-results.ts';
import type { ResultsSummary } from '../../src/report/results.ts';
import { removeDir, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

const summary = (id: string): ResultsSummary => ({
  format: 2,
  product_id: id,
  declared_unit: '1 kg',
  indicators: [{ code: 'GWP-total', unit: 'kg CO2 eq.', name: 'Climate change – total', basis: 'factors' }],
  methods: { cutoff: { modules: { A1: { 'GWP-total': 1.5 } }, total: { 'GWP-total': null } } },
  flows: { recycled_content: { pre: 0, post: 0.5, total: 0.5 }, biogenic_carbon_kg: { product: 0, packaging: 0 }, biogenic_co2_kg: { product: 0, packaging: 0 } },
});

describe('the catalogue-wide results.json', () => {
  it('is one JSON document, a product per line, read back a product at a time', async () => {
    const dir = await tempDir();
    dirs.push(dir);
    // Product ids with a comma, a quote and a line break escaped by JSON stay on their line.
    const products = ['P1', 'P,2', 'P"3', 'P\n4'].map(summary);
    // writeCatalogueResults joins the products' results.csv files too: give it theirs.
    for (const p of products) {
      await mkdir(path.join(dir, p.product_id), { recursive: true });
      await writeFile(path.join(dir, p.product_id, 'results.csv'), 'product_id,method,module,indicator,unit,value,figure_id\n');
    }
    await writeCatalogueResults(dir, products.map((p) => ({ id: p.product_id, summaryJson: JSON.stringify(p) })));
    const text = await readFile(path.join(dir, 'results.json'), 'utf8');
    expect(JSON.parse(text)).toEqual({ format: 2, products });
    expect(text.split('\n')).toHaveLength(products.length + 3);
    expect(await readCatalogueSummaries(path.join(dir, 'results.json'))).toEqual({ format: 2, products });
    // The id of each line, read without parsing the line.
    expect(products.map((p) => summaryProductId(JSON.stringify(p)))).toEqual(['P1', 'P,2', 'P"3', 'P\n4']);
    // Laid out otherwise (a file edited or pretty-printed by someone), it is parsed whole.
    await writeFile(path.join(dir, 'pretty.json'), JSON.stringify({ format: 2, products }, null, 2));
    expect(await readCatalogueSummaries(path.join(dir, 'pretty.json'))).toEqual({ format: 2, products });
  });
});
