// One benchmark measurement in a fresh process, so peak memory belongs to it alone.
// usage: bench-one.ts DATA_DIR [--build OUT_DIR]
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { loadProject } from '../src/model/project.ts';
import { CSV_FILES } from '../src/schema/index.ts';

const [dir, flag, out] = process.argv.slice(2);
const started = performance.now();
let floorMs = 0;
if (flag !== '--build') {
  // Floor: csv-parse alone reading the same files, no schema, no checks.
  const floorStart = performance.now();
  for (const schema of CSV_FILES) parse(await readFile(path.join(dir!, schema.file), 'utf8'), { comment: '#', skip_empty_lines: true });
  floorMs = performance.now() - floorStart;
}
const loadStart = performance.now();
const { project, problems } = await loadProject(dir!);
const loadMs = performance.now() - loadStart;
if (!project) throw new Error(`synthetic project has errors: ${JSON.stringify(problems.slice(0, 3))}`);
let renderMs = 0;
if (flag === '--build') {
  const { buildSiteView } = await import('../src/report/site-view.ts');
  const { renderSite } = await import('../src/render/site.ts');
  const { withStagedOutput } = await import('../src/render/output.ts');
  const renderStart = performance.now();
  await withStagedOutput(out!, async (staging) => renderSite(buildSiteView(project, problems), staging));
  renderMs = performance.now() - renderStart;
}
process.stdout.write(
  JSON.stringify({
    loadMs,
    floorMs,
    renderMs,
    totalMs: performance.now() - started,
    peakRssMb: process.resourceUsage().maxRSS / 1024,
    rows: project.bom.rows.length + project.products.rows.length + project.factors.rows.length,
  }),
);
