import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { resultsCsv } from '../../src/report/results-csv.ts';
import type { ResultsSummary } from '../../src/report/results.ts';

const summary = (productId: string): ResultsSummary => ({
  format: 2,
  product_id: productId,
  declared_unit: '1 kg',
  indicators: [{ code: 'GWP-total', unit: 'kg CO2 eq.', name: 'Climate change – total', basis: 'factors' }],
  methods: { cutoff: { modules: { A1: { 'GWP-total': -1.5 } }, total: { 'GWP-total': null } } },
  flows: { recycled_content: { pre: 0, post: 0, total: 0 }, biogenic_carbon_kg: { product: 0, packaging: 0 }, biogenic_co2_kg: { product: 0, packaging: 0 } },
});

describe('results.csv', () => {
  it('neutralises text that a spreadsheet would run as a formula (OWASP "CSV Injection"), and keeps numbers as numbers', () => {
    for (const hostile of ['=HYPERLINK("http://x","y")', '+1+1', '-2+3', '@SUM(A1)']) {
      const text = resultsCsv([summary(hostile)]);
      // Read back with csv-parse: the cell starts with an apostrophe, so it is text.
      const rows = parse(text, { columns: true }) as Array<Record<string, string>>;
      expect(rows[0]!.product_id).toBe(`'${hostile}`);
      // A negative result stays a number; an unavailable one is empty, never 0.
      expect(rows.find((r) => r.module === 'A1')!.value).toBe('-1.5');
      expect(rows.find((r) => r.module === 'total')!.value).toBe('');
    }
  });
});
