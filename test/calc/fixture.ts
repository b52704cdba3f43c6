import { mkdtemp, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { CalcContext } from '../../src/calc/context.ts';
import type { ProductResult } from '../../src/calc/product.ts';
import { loadProject } from '../../src/model/project.ts';
import type { ResultsJson } from '../../src/report/results.ts';
import { ProductPipeline } from '../../src/pipeline/product.ts';
import { figureMap, writtenFrom, type FlatFigure } from '../figures.ts';

/** A small project written to a temporary folder, for hand-worked examples. */
export interface FixtureFiles {
  products?: string;
  bom: string;
  materials: string;
  eol: string;
  activities?: string;
  transport?: string;
  factors: string;
  declaration?: Record<string, unknown>;
}

export const DECLARATION = {
  owner: { name: 'Test owner' },
  standard: 'EN 15804+A2',
  pcr: 'test',
  reference_year: 2025,
  issued: '2026-01-01',
  valid_until: '2030-12-31',
  verification: { status: 'draft' },
  background_data: [{ name: 'test factors', version: '1' }],
};

export async function writeFixture(files: FixtureFiles): Promise<string> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'loopsheet-calc-'));
  const write = (name: string, text: string) => writeFile(path.join(dir, name), text.trim() + '\n');
  await Promise.all([
    write('products.csv', files.products ?? 'product_id,name,declared_unit,unit_mass_kg,eol_scenario\nP1,Test product,1 kg,1,s1'),
    write('bom.csv', files.bom),
    write('materials.csv', files.materials),
    write('eol.csv', files.eol),
    write('activities.csv', files.activities ?? 'product_id,module,activity,factor,amount,unit,source'),
    write('transport.csv', files.transport ?? 'product_id,module,line_id,leg,factor,distance_km,source'),
    write('factors.csv', files.factors),
    writeFile(path.join(dir, 'declaration.json'), JSON.stringify({ ...DECLARATION, ...files.declaration })),
  ]);
  return dir;
}

export interface Computed {
  results: ResultsJson;
  /** Every figure of results.json by id, read back through the format's reader. */
  figures: Record<string, FlatFigure>;
  result: ProductResult;
  ctx: CalcContext;
}

/** Loads, validates (must be error-free) and computes every product. */
export async function compute(dir: string): Promise<Computed[]> {
  const { project, problems } = await loadProject(dir);
  if (!project) throw new Error(`fixture has errors:\n${problems.map((p) => `${p.file}:${p.line} ${p.column} ${p.code} ${p.message}`).join('\n')}`);
  const pipeline = new ProductPipeline(project);
  return pipeline.products().map((rows) => {
    const computed = pipeline.compute(rows);
    const results = pipeline.resultsJson(computed);
    return { result: computed.result, ctx: pipeline.ctx, results, figures: figureMap(results, writtenFrom(project)) };
  });
}
