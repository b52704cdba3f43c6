import { createReadStream } from 'node:fs';
import { open, readFile } from 'node:fs/promises';
import { createInterface } from 'node:readline';
import { RESULTS_FORMAT, type ResultsSummary } from './results.ts';

/**
 * The catalogue-wide results.json on disk: how it is laid out (a product per line) and read
 * back, by `build --changed` and `diff` alike. The results format is defined in results.ts;
 * this is its layout as a file.
 */

/** The first line of the catalogue-wide results.json; then one product per line. */
const CATALOGUE_HEAD = `{"format":${RESULTS_FORMAT},"products":[`;

/**
 * `{"format":2,"products":[…]}` with one product per line, written a product at a time: at
 * 10 000 products the file is some hundreds of megabytes, beyond what one JavaScript string
 * may hold (JSON.stringify of the whole failed there), and a reader can take it a line at a
 * time (`readCatalogueSummaries`).
 */
export async function writeCatalogueJson(file: string, summaries: readonly string[]): Promise<void> {
  const handle = await open(file, 'w');
  try {
    let chunk = `${CATALOGUE_HEAD}\n`;
    for (let i = 0; i < summaries.length; i++) {
      chunk += `${summaries[i]}${i < summaries.length - 1 ? ',' : ''}\n`;
      if (chunk.length > 1 << 20) {
        await handle.write(chunk);
        chunk = '';
      }
    }
    await handle.write(`${chunk}]}\n`);
  } finally {
    await handle.close();
  }
}

/**
 * Reads a catalogue-wide results.json a product at a time, as `writeCatalogueJson` lays it
 * out; a file laid out otherwise (edited by hand, or small) is parsed whole. `format` is
 * undefined for a file of results format 1.
 */
export async function readCatalogueSummaries(file: string): Promise<{ format: unknown; products: ResultsSummary[] }> {
  const texts = await readCatalogueTexts(file);
  return Array.isArray(texts.products) ? { format: texts.format, products: texts.products.map((text) => JSON.parse(text) as ResultsSummary) } : (texts.whole as { format: unknown; products: ResultsSummary[] });
}

/** The product id of a summary's JSON text (it opens with format and product_id), without parsing the rest. */
export function summaryProductId(text: string): string {
  const match = /^\{"format":\d+,"product_id":("(?:[^"\\]|\\.)*")/.exec(text);
  return match ? (JSON.parse(match[1]!) as string) : (JSON.parse(text) as ResultsSummary).product_id;
}

/** The products of a catalogue-wide results.json as JSON text, a line each; a file laid out otherwise is returned parsed whole. */
export async function readCatalogueTexts(file: string): Promise<{ format: unknown; products?: string[]; whole?: unknown }> {
  const lines = createInterface({ input: createReadStream(file, 'utf8'), crlfDelay: Infinity });
  const products: string[] = [];
  let first = true;
  for await (const line of lines) {
    if (first) {
      first = false;
      if (line !== CATALOGUE_HEAD) {
        lines.close();
        const whole = JSON.parse(await readFile(file, 'utf8')) as { format: unknown };
        return { format: whole.format, whole };
      }
      continue;
    }
    if (line === ']}' || line === '') continue;
    products.push(line.endsWith(',') ? line.slice(0, -1) : line);
  }
  return { format: RESULTS_FORMAT, products };
}
