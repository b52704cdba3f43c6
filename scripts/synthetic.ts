/**
 * Seeded synthetic catalogues for benchmarks: N products × L BOM lines × I indicators, all
 * valid input, written as the CSV files a user would keep. Same seed → same files.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { FACTOR_INDICATOR_CODES } from '../src/reference/indicators.ts';

/** mulberry32: a small, well-known seeded PRNG. */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The factor row read by 1 % of the products (every hundredth). */
export const RARE_FACTOR = 'powder-coating';

export interface SyntheticSize {
  products: number;
  linesPerProduct: number;
  indicators: number;
  seed?: number;
  /** Add gsd columns (every factor 1.2, every BOM mass 1.05, every activity 1.1), for the Monte Carlo benchmark. */
  gsd?: boolean;
}

export async function writeSyntheticProject(dir: string, size: SyntheticSize): Promise<void> {
  const rand = random(size.seed ?? 20261201);
  const codes = FACTOR_INDICATOR_CODES.slice(0, size.indicators);
  const materialCount = 100;
  const scenarios = 5;
  const fmt = (x: number) => String(Number(x.toPrecision(6)));
  await mkdir(dir, { recursive: true });

  const factorRows: string[] = [];
  const factor = (id: string, unit: string) => {
    const values = codes.map(() => fmt(rand() * 10));
    factorRows.push([id, `Synthetic ${id}`, unit, 'synthetic benchmark set', 'generated', ...values, ...(size.gsd ? ['1.2'] : [])].join(','));
  };
  for (let m = 0; m < materialCount; m++) for (const stage of ['virgin', 'recycled', 'eolrec', 'landfill']) factor(`m${m}-${stage}`, 'kg');
  factor('electricity', 'kWh');
  factor('gas', 'MJ');
  factor('lorry', 'tkm');
  factor('sorting', 'kg');
  // Read by 1 % of products only: the row the incremental-rebuild benchmark changes.
  factor('powder-coating', 'kg');

  const materials = ['material,name,family,virgin,recycled,eol_recycling,landfill,source'];
  for (let m = 0; m < materialCount; m++) materials.push(`mat${m},Material ${m},metal,m${m}-virgin,m${m}-recycled,m${m}-eolrec,m${m}-landfill,generated`);

  const eol = ['scenario,material,recycling,landfill,recycling_yield,transport_km,transport_factor,processing_factor,source'];
  for (let s = 0; s < scenarios; s++) eol.push(`s${s},*,0.9,0.1,0.95,50,lorry,sorting,generated`);

  const products = ['product_id,name,declared_unit,unit_mass_kg,eol_scenario'];
  const bom = [`product_id,line_id,component,material,role,mass_kg,recycled_pre,recycled_post,scrap_rate,scrap_fate,source${size.gsd ? ',gsd' : ''}`];
  const activities = [`product_id,module,activity,factor,amount,unit,source${size.gsd ? ',gsd' : ''}`];
  const transport = ['product_id,module,line_id,leg,factor,distance_km,source'];
  for (let p = 0; p < size.products; p++) {
    const id = `P${String(p).padStart(6, '0')}`;
    const masses = Array.from({ length: size.linesPerProduct - 2 }, () => Number((0.01 + rand()).toFixed(4)));
    const unitMass = masses.reduce((a, b) => a + b, 0);
    products.push(`${id},Synthetic product ${p},1 piece,${fmt(unitMass)},s${p % scenarios}`);
    masses.forEach((mass, l) => {
      const pre = (rand() * 0.4).toFixed(3);
      const post = (rand() * 0.4).toFixed(3);
      bom.push(`${id},L${l},Part ${l},mat${Math.floor(rand() * materialCount)},product,${mass},${pre},${post},${(rand() * 0.2).toFixed(3)},recycled,generated${size.gsd ? ',1.05' : ''}`);
    });
    bom.push(`${id},P1,Box,mat0,packaging,0.02,0,0,0,recycled,generated`);
    bom.push(`${id},P2,Film,mat1,packaging,0.005,0,0,0,recycled,generated`);
    activities.push(`${id},A3,Electricity,electricity,${fmt(rand() * 3)},kWh,generated${size.gsd ? ',1.1' : ''}`);
    activities.push(`${id},A3,Gas,gas,${fmt(rand() * 10)},MJ,generated`);
    activities.push(`${id},C1,Dismantling,gas,${fmt(rand())},MJ,generated`);
    if (p % 100 === 0) activities.push(`${id},A3,Powder coating,powder-coating,0.05,kg,generated`);
    transport.push(`${id},A2,L0,Inbound,lorry,${Math.round(rand() * 900)},generated`);
    transport.push(`${id},A2,,Whole product,lorry,${Math.round(rand() * 200)},generated`);
  }
  const declaration = {
    owner: { name: 'Synthetic benchmark owner' },
    standard: 'EN 15804+A2',
    pcr: 'synthetic',
    reference_year: 2025,
    issued: '2026-01-01',
    valid_until: '2030-12-31',
    verification: { status: 'draft' },
    background_data: [{ name: 'synthetic', version: '1' }],
    illustrative: true,
  };
  const files: Record<string, string[]> = {
    'products.csv': products,
    'bom.csv': bom,
    'materials.csv': materials,
    'eol.csv': eol,
    'activities.csv': activities,
    'transport.csv': transport,
    'factors.csv': [['factor_id', 'name', 'unit', 'dataset', 'source', ...codes, ...(size.gsd ? ['gsd'] : [])].join(','), ...factorRows],
  };
  for (const [name, lines] of Object.entries(files)) await writeFile(path.join(dir, name), `${lines.join('\n')}\n`);
  await writeFile(path.join(dir, 'declaration.json'), JSON.stringify(declaration, null, 2));
}
