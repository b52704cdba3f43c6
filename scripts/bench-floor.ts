// The floor of the build benchmark (scripts/bench-build.ts): Eleventy alone writing the same
// pages — the same number, the same sizes — from precomputed strings, in runs of the build's
// shard size, and the results files' bytes written with fs. No calculation, no view models.
// usage: bench-floor.ts OUT PRODUCTS PER_PRODUCT_JSON WORKER WORKERS
import Eleventy from '@11ty/eleventy';
import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { SHARD_SIZE } from '../src/render/build-site.ts';

const [out, productsText, perProductJson, workerText, workersText] = process.argv.slice(2);
const products = Number(productsText);
const perProduct = JSON.parse(perProductJson!) as Record<string, number>;
const worker = Number(workerText);
const workers = Number(workersText);

const input = await mkdtemp(path.join(os.tmpdir(), 'loopsheet-floor-'));
await writeFile(path.join(input, 'page.njk'), '---\npagination:\n  data: pages\n  size: 1\n  alias: p\npermalink: "{{ p.path }}"\n---\n{{ p.html | safe }}');
const pageKinds = ['index.html', 'audit.html'];
const fileKinds = Object.keys(perProduct).filter((name) => !pageKinds.includes(name) && (name.endsWith('.json') || name.endsWith('.csv')));
const filler = (bytes: number) => 'x'.repeat(Math.round(bytes));

const ids = Array.from({ length: products }, (_, p) => `P${String(p).padStart(6, '0')}`);
for (let start = worker * SHARD_SIZE; start < products; start += workers * SHARD_SIZE) {
  const shard = ids.slice(start, start + SHARD_SIZE);
  for (const id of shard) {
    await mkdir(path.join(out!, id), { recursive: true });
    for (const name of fileKinds) await writeFile(path.join(out!, id, name), filler(perProduct[name]!));
  }
  const pages = shard.flatMap((id) => pageKinds.map((name) => ({ path: `${id}/${name}`, html: filler(perProduct[name] ?? 0) })));
  const eleventy = new Eleventy(input, out, {
    quietMode: true,
    config: (config: { addGlobalData: (name: string, value: unknown) => void }) => config.addGlobalData('pages', pages),
  });
  eleventy.disableLogger();
  await eleventy.write();
}
await rm(input, { recursive: true, force: true });
