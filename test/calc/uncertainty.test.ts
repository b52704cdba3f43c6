import { afterAll, describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { lognormalMultipliers, normalStream, quantile } from '../../src/calc/uncertainty.ts';
import { compute, writeFixture } from './fixture.ts';
import { removeDir, runCli, tempDir } from '../helpers.ts';

const dirs: string[] = [];
afterAll(async () => Promise.all(dirs.map(removeDir)));

describe('the random numbers (fixed seed)', () => {
  it('standard normals by Box–Muller have mean 0 and variance 1 (N = 200 000, within 5 standard errors)', () => {
    const normal = normalStream(7);
    const n = 200_000;
    const xs = Float64Array.from({ length: n }, () => normal());
    const mean = xs.reduce((a, b) => a + b, 0) / n;
    const variance = xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1);
    expect(Math.abs(mean)).toBeLessThan(5 / Math.sqrt(n));
    expect(Math.abs(variance - 1)).toBeLessThan(5 * Math.sqrt(2 / n));
  });

  it('lognormal draws match the closed forms mean = exp(μ + σ²/2) and variance = (exp(σ²) − 1)·exp(2μ + σ²) (textbook lognormal moments; μ = 0, gsd 1.5)', () => {
    const n = 200_000;
    const sigma = Math.log(1.5);
    const xs = lognormalMultipliers(normalStream(11), 1.5, n);
    const mean = xs.reduce((a, b) => a + b, 0) / n;
    const variance = xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1);
    const expectedMean = Math.exp(sigma ** 2 / 2);
    const expectedVariance = (Math.exp(sigma ** 2) - 1) * Math.exp(sigma ** 2);
    // Tolerances: 0.5 % on the mean (about 5 standard errors here), 3 % on the variance.
    expect(mean / expectedMean - 1).toBeCloseTo(0, 2);
    expect(Math.abs(mean / expectedMean - 1)).toBeLessThan(0.005);
    expect(Math.abs(variance / expectedVariance - 1)).toBeLessThan(0.03);
    // The median of a lognormal is exp(μ) = 1.
    expect(Math.abs(quantile(Float64Array.from(xs).sort(), 0.5) - 1)).toBeLessThan(0.01);
  });

  it('quantiles interpolate between order statistics (Hyndman & Fan 1996, type 7, the default of R and NumPy)', () => {
    const sorted = Float64Array.from([1, 2, 3, 4]);
    expect(quantile(sorted, 0.5)).toBe(2.5);
    expect(quantile(sorted, 0.25)).toBe(1.75);
    expect(quantile(sorted, 0)).toBe(1);
    expect(quantile(sorted, 1)).toBe(4);
  });
});

/**
 * A linear model: P1 is 2 kg of one material at a virgin factor of 1 kg CO2 eq./kg, so
 * GWP-total A1-A3 = m × F = 2. With F lognormal (gsd_F) and m lognormal (gsd_m), independent,
 * the product is lognormal with σ² = σ_F² + σ_m² and median 2: E = 2·exp(σ²/2), and its 2.5 and
 * 97.5 percentiles are 2·exp(∓1.96σ) (lognormal quantiles).
 */
const linear = (options: { factorGsd?: string; massGsd?: string; iterations?: number; seed?: number; uncertainty?: boolean }) =>
  writeFixture({
    bom: `product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source,gsd
P1,L1,Part,m1,product,2,0,0,0,recycled,test,${options.massGsd ?? ''}`,
    products: 'product_id,name,declared_unit,unit_mass_kg,eol_scenario\nP1,Test product,1 kg,2,s1',
    materials: `material,name,family,virgin,landfill
m1,Metal,metal,ev,ed`,
    eol: `scenario,material,recycling,landfill,recycling_yield,transport_km
s1,*,0,1,1,0`,
    factors: `factor_id,name,unit,dataset,GWP-total,gsd
ev,virgin,kg,test,1,${options.factorGsd ?? ''}
ed,landfill,kg,test,0.1,`,
    declaration: { methods: ['cutoff'], ...(options.uncertainty === false ? {} : { uncertainty: { iterations: options.iterations ?? 20_000, seed: options.seed ?? 3 } }) },
  });

describe('Monte Carlo on a linear model', () => {
  it('gives the analytic expectation 2·exp(σ²/2) and the lognormal 95 % range with one factor varied (gsd 1.3)', async () => {
    const [p1] = await compute(await linear({ factorGsd: '1.3' }));
    const u = p1!.results.uncertainty!;
    const a13 = u.figures.find((f) => f.module === 'A1-A3')!;
    const sigma = Math.log(1.3);
    expect(a13.deterministic).toBe(2);
    // Standard error of the mean: 2·sqrt((e^{σ²} − 1)·e^{σ²}) / sqrt(N); tolerance 4 standard errors.
    const se = (2 * Math.sqrt((Math.exp(sigma ** 2) - 1) * Math.exp(sigma ** 2))) / Math.sqrt(20_000);
    expect(Math.abs(a13.mean! - 2 * Math.exp(sigma ** 2 / 2))).toBeLessThan(4 * se);
    expect(a13.median! / 2).toBeCloseTo(1, 2);
    expect(a13.p2_5! / (2 * Math.exp(-1.96 * sigma))).toBeCloseTo(1, 1);
    expect(a13.p97_5! / (2 * Math.exp(1.96 * sigma))).toBeCloseTo(1, 1);
    expect(u.varied).toEqual({ factors: ['ev'], bom: [], activities: [] });
    // The A1–C4 total adds C4, 2 kg landfilled at a fixed 0.1: mean 2·exp(σ²/2) + 0.2.
    const total = u.figures.find((f) => f.module === 'total')!;
    expect(total.deterministic).toBeCloseTo(2.2, 12);
    expect(Math.abs(total.mean! - (2 * Math.exp(sigma ** 2 / 2) + 0.2))).toBeLessThan(4 * se);
  });

  it('combines a varied factor and a varied mass as independent lognormals: σ² = σ_F² + σ_m²', async () => {
    const [p1] = await compute(await linear({ factorGsd: '1.3', massGsd: '1.2' }));
    const a13 = p1!.results.uncertainty!.figures.find((f) => f.module === 'A1-A3')!;
    const sigma = Math.sqrt(Math.log(1.3) ** 2 + Math.log(1.2) ** 2);
    const se = (2 * Math.sqrt((Math.exp(sigma ** 2) - 1) * Math.exp(sigma ** 2))) / Math.sqrt(20_000);
    expect(Math.abs(a13.mean! - 2 * Math.exp(sigma ** 2 / 2))).toBeLessThan(4 * se);
    expect(a13.p97_5! / (2 * Math.exp(1.96 * sigma))).toBeCloseTo(1, 1);
  });

  it('gives the same numbers for the same seed, other numbers for another, and fixed results when nothing has a gsd', async () => {
    const first = (await compute(await linear({ factorGsd: '1.3', iterations: 1000 })))[0]!.results.uncertainty!;
    const again = (await compute(await linear({ factorGsd: '1.3', iterations: 1000 })))[0]!.results.uncertainty!;
    const other = (await compute(await linear({ factorGsd: '1.3', iterations: 1000, seed: 4 })))[0]!.results.uncertainty!;
    expect(again).toEqual(first);
    expect(other.figures[0]!.median).not.toBe(first.figures[0]!.median);
    const fixed = (await compute(await linear({ iterations: 1000 })))[0]!.results.uncertainty!;
    const a13 = fixed.figures.find((f) => f.module === 'A1-A3')!;
    expect([a13.median, a13.p2_5, a13.p97_5, a13.mean]).toEqual([2, 2, 2, 2]);
    expect(fixed.varied).toEqual({ factors: [], bom: [], activities: [] });
  });

  it('runs only when asked: not without the setting, and with build --uncertainty (1 000 iterations, seed 1)', async () => {
    const data = await linear({ factorGsd: '1.3', uncertainty: false });
    const [plain] = await compute(data);
    expect(plain!.results.uncertainty).toBeUndefined();
    const work = await tempDir();
    dirs.push(work, data);
    const out = path.join(work, 'out');
    const built = await runCli(['build', '--data', data, '--out', out, '--no-pdf', '--uncertainty']);
    expect(built.code, built.stderr).toBe(0);
    const results = JSON.parse(await readFile(path.join(out, 'P1', 'results.json'), 'utf8'));
    expect(results.uncertainty).toMatchObject({ iterations: 1000, seed: 1 });
    const page = await readFile(path.join(out, 'P1', 'index.html'), 'utf8');
    expect(page).toContain('Monte Carlo, 1,000 iterations, seed 1');
  });
});
