import { describe, expect, it } from 'vitest';
import { factorContributions } from '../../src/calc/contributions.ts';
import { compute } from './fixture.ts';
import { DEMO } from '../helpers.ts';

/**
 * The factor uses that leaf figures record are an account of the calculation independent of
 * its sums: for a model linear in its factors (every formula of EN 15804+A2 cut-off and
 * module D is), the contributions Σ amount × F of every factor must add up to each module's
 * value, for every indicator — process factors opened into the factors of their flows.
 */
const demo = await compute(DEMO);

describe('factor contributions add up to the modules they come from', () => {
  it.each(demo.map((d) => [d.results.product_id, d] as const))('%s: A1-A3, D and the A1–C4 total, every indicator', (_id, d) => {
    for (const [modules, module] of [[['A1', 'A2', 'A3'], 'A1-A3'], [['D'], 'D'], [['A1', 'A2', 'A3', 'A4', 'A5', 'C1', 'C2', 'C3', 'C4'], 'total']] as const) {
      const parts = factorContributions(d.ctx, d.result.graph, modules);
      d.ctx.indicators.forEach((code, i) => {
        const expected = module === 'total' ? d.results.methods.cutoff.total[code] : d.results.methods.cutoff.modules[module]![code];
        const sum = parts.reduce((total, c) => total + c.values[i]!, 0);
        if (expected === null || expected === undefined) expect(Number.isNaN(sum) || sum === 0, `${module} ${code}`).toBe(true);
        else expect(sum, `${module} ${code}`).toBeCloseTo(expected, 9);
      });
    }
  });

  it('opens the smelter process behind the profile’s virgin aluminium into grid electricity, alumina, anodes and direct CO2 and PFCs', () => {
    const profile = demo.find((d) => d.results.product_id === 'KV-EXT-6060')!;
    const factors = factorContributions(profile.ctx, profile.result.graph, ['A1', 'A2', 'A3']).map((c) => c.factor);
    expect(factors).not.toContain('process:glenmoor-potline');
    for (const id of ['grid-electricity', 'alumina-smelter-grade', 'prebaked-anode', 'ghg:CO2', 'ghg:CF4']) expect(factors).toContain(id);
  });
});
