import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { rm } from 'node:fs/promises';
import { compute, writeFixture } from './fixture.ts';

/** Property tests (fast-check, from the npm registry) over random one-product projects. */
const FACTORS = (ev: number, erec: number, eolrec: number, ed: number) => `factor_id,name,unit,dataset,GWP-total,AP
ev,virgin,kg,test,${ev},${ev / 100}
erec,recycled,kg,test,${erec},${erec / 100}
eolrec,recycling,kg,test,${eolrec},${eolrec / 100}
ed,landfill,kg,test,${ed},${ed / 100}
lorry,lorry,tkm,test,0.09,0.0004
elec,electricity,kWh,test,0.4,0.001
proc,processing,kg,test,0.03,0.0001`;

interface Case {
  masses: number[];
  r1: number[];
  scrap: number[];
  recycling: number;
  yieldShare: number;
  kwh: number;
  km: number;
  factors: [number, number, number, number];
  fate: 'recycled' | 'landfill';
}

const arbitraryCase = fc.record({
  masses: fc.array(fc.double({ min: 0.01, max: 50, noNaN: true }), { minLength: 1, maxLength: 4 }),
  r1: fc.array(fc.double({ min: 0, max: 0.9, noNaN: true }), { minLength: 4, maxLength: 4 }),
  scrap: fc.array(fc.double({ min: 0, max: 0.5, noNaN: true }), { minLength: 4, maxLength: 4 }),
  recycling: fc.double({ min: 0, max: 1, noNaN: true }),
  yieldShare: fc.double({ min: 0.5, max: 1, noNaN: true }),
  kwh: fc.double({ min: 0, max: 20, noNaN: true }),
  km: fc.double({ min: 0, max: 2000, noNaN: true }),
  factors: fc.tuple(fc.double({ min: 1, max: 20, noNaN: true }), fc.double({ min: 0.1, max: 3, noNaN: true }), fc.double({ min: 0.1, max: 2, noNaN: true }), fc.double({ min: 0, max: 0.5, noNaN: true })),
  fate: fc.constantFrom('recycled' as const, 'landfill' as const),
});

const n = (x: number) => x.toPrecision(12);

async function run(c: Case, scale: number) {
  const total = c.masses.reduce((a, b) => a + b, 0) * scale;
  const dir = await writeFixture({
    products: `product_id,name,declared_unit,unit_mass_kg,eol_scenario\nP1,Random,1 piece,${n(total)},s1`,
    bom: ['product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source', ...c.masses.map((m, i) => `P1,L${i},Part ${i},m1,product,${n(m * scale)},0,${n(c.r1[i]!)},${n(c.scrap[i]!)},${c.fate},test`)].join('\n'),
    materials: 'material,name,family,virgin,recycled,eol_recycling,landfill\nm1,Metal,metal,ev,erec,eolrec,ed',
    eol: `scenario,material,recycling,landfill,recycling_yield,transport_km,transport_factor,processing_factor\ns1,*,${n(c.recycling)},${n(1 - c.recycling)},${n(c.yieldShare)},50,lorry,proc`,
    activities: `product_id,module,activity,factor,amount,unit,source\nP1,A3,Electricity,elec,${n(c.kwh * scale)},kWh,test`,
    transport: `product_id,module,line_id,leg,factor,distance_km,source\nP1,A2,,Inbound,lorry,${n(c.km)},test`,
    factors: FACTORS(...c.factors),
  });
  try {
    const [first] = await compute(dir);
    return first!.results;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

const headline = (r: Awaited<ReturnType<typeof run>>) => [
  ...Object.values(r.methods.cutoff.modules).flatMap((v) => [v['GWP-total']!, v.AP!, v.SM!, v.MFR!]),
  r.methods.cutoff.total['GWP-total']!,
  r.methods.cff!.total['GWP-total']!,
  r.methods['eol-recycling']!.total['GWP-total']!,
  r.methods['fifty-fifty']!.total['GWP-total']!,
];

describe('properties', () => {
  it('results scale linearly with mass (masses, unit mass and per-unit activity amounts × k)', async () => {
    await fc.assert(
      fc.asyncProperty(arbitraryCase, fc.double({ min: 0.1, max: 10, noNaN: true }), async (c, k) => {
        const one = headline(await run(c, 1));
        const scaled = headline(await run(c, k));
        one.forEach((value, i) => expect(scaled[i]).toBeCloseTo(value * k, Math.max(1, 8 - Math.ceil(Math.log10(Math.abs(value * k) + 1)))));
      }),
      { numRuns: 25, seed: 20261201 },
    );
  });

  it('with R1 = 0, no end-of-life recycling and no recycled scrap, all four methods give the same total', async () => {
    await fc.assert(
      fc.asyncProperty(arbitraryCase, async (c) => {
        const r = await run({ ...c, r1: [0, 0, 0, 0], recycling: 0, fate: 'landfill' }, 1);
        const cutoffTotal = r.methods.cutoff.total['GWP-total']!;
        for (const method of ['cff', 'eol-recycling', 'fifty-fifty'] as const) expect(r.methods[method]!.total['GWP-total']).toBeCloseTo(cutoffTotal, 9);
        expect(r.methods.cutoff.modules.D!['GWP-total']).toBe(0);
      }),
      { numRuns: 25, seed: 20261202 },
    );
  });
});
