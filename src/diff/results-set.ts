import { readRecord, type VerificationRecord } from '../model/verification-record.ts';
import { readdir, readFile, stat } from 'node:fs/promises';
import path from 'node:path';
import { UsageError } from '../problems.ts';
import { readCsvText } from '../load/csv.ts';
import { readText } from '../load/text.ts';
import { RESULTS_FORMAT, type ResultsJson, type ResultsSummary } from '../report/results.ts';
import { GraphReader, type GraphJson, type WrittenCell } from '../trace/graph-json.ts';
import { CSV_FILES, DECLARATION_FILE } from '../schema/index.ts';
import { MANIFEST_FILE, RESULTS_JSON, VERIFICATION_DIR } from '../files.ts';
import { readCatalogueSummaries } from '../report/catalogue-results.ts';
import type { RowKeyOf } from './attribute.ts';

/**
 * One side of a change report: a build folder (its `results.json`, each product's
 * `results.json` with the figure graph, and the input copies of its verification pack), a
 * folder of per-product results.json files, or a single results.json file.
 */
export interface ResultsSet {
  /** As the user named it. */
  label: string;
  products: Map<string, ResultsSummary>;
  /** A product's figure graph, when this set has it. */
  graph(productId: string): Promise<GraphReader | undefined>;
  /** The key of the row at a line of an input file (from the build's copy of its inputs). */
  rowKey: RowKeyOf;
  /** From the verification manifest, when there is one: tool version and the SHA-256 of each input. */
  manifest?: { toolVersion: string; inputs: Map<string, string> };
  /** The folder the results were read from (a build folder, or a results.json's folder). */
  root: string;
  /** The verifier's record in the build's verification pack, where it has one whose signature checks. */
  record?: VerificationRecord;
}

const isFile = async (file: string) => (await stat(file).catch(() => undefined))?.isFile() ?? false;

/** A results.json: a catalogue's is read a product at a time (it runs to hundreds of megabytes), a product's whole. */
async function readResults(file: string): Promise<unknown> {
  try {
    return await readCatalogueSummaries(file);
  } catch (error) {
    throw new UsageError(`${file}: ${(error as Error).message}; expected a results.json written by loopsheet build`);
  }
}

async function readJson(file: string): Promise<unknown> {
  try {
    return JSON.parse(await readFile(file, 'utf8'));
  } catch (error) {
    throw new UsageError(`${file}: ${(error as Error).message}; expected a results.json written by loopsheet build`);
  }
}

const summaryOf = ({ graph: _graph, ...summary }: ResultsJson): ResultsSummary => summary;

/** Format 1 listed every step once per indicator; its figure ids and terms are not those of format 2, so compare only builds of this format. */
function requireFormat(json: { format?: unknown }, file: string): void {
  if (json.format === RESULTS_FORMAT) return;
  const found = json.format === undefined ? 'results format 1 (an earlier loopsheet)' : `results format ${JSON.stringify(json.format)}`;
  throw new UsageError(`${file}: ${found}; expected results format ${RESULTS_FORMAT}: build that side again with this loopsheet, then compare`);
}

export async function readResultsSet(label: string): Promise<ResultsSet> {
  const info = await stat(label).catch(() => undefined);
  if (!info) throw new UsageError(`${label}: no such file or folder; expected a build folder or a results.json`);
  const root = info.isDirectory() ? label : path.dirname(label);
  const products = new Map<string, ResultsSummary>();
  const inline = new Map<string, GraphJson & { indicators: ResultsJson['indicators'] }>();
  const inputs = await inputCopies(path.join(root, VERIFICATION_DIR, 'inputs'));
  const take = (json: unknown, file: string) => {
    const value = json as Partial<ResultsJson> & { products?: ResultsSummary[] };
    if (Array.isArray(value.products)) {
      requireFormat(value, file);
      for (const product of value.products) products.set(product.product_id, product);
    } else if (typeof value.product_id === 'string' && value.methods) {
      requireFormat(value, file);
      products.set(value.product_id, summaryOf(value as ResultsJson));
      if (value.graph) inline.set(value.product_id, { ...value.graph, indicators: value.indicators ?? [] });
    } else throw new UsageError(`${file}: neither a catalogue results.json ("products") nor a product's ("product_id"); expected a results.json written by loopsheet build`);
  };

  if (!info.isDirectory()) take(await readResults(label), label);
  else if (await isFile(path.join(label, RESULTS_JSON))) take(await readResults(path.join(label, RESULTS_JSON)), path.join(label, RESULTS_JSON));
  else {
    // A folder of results.json sets: one per product folder.
    for (const entry of (await readdir(label, { withFileTypes: true })).filter((e) => e.isDirectory()).sort((a, b) => (a.name < b.name ? -1 : 1))) {
      const file = path.join(label, entry.name, RESULTS_JSON);
      if (await isFile(file)) take(await readResults(file), file);
    }
    if (products.size === 0) throw new UsageError(`${label}: no results.json in it or in its sub-folders; expected a build folder`);
  }

  const graph = async (productId: string) => {
    const given = inline.get(productId);
    if (given) return new GraphReader(given, given.indicators, inputs.written);
    const file = path.join(root, productId, RESULTS_JSON);
    if (!(await isFile(file))) return undefined;
    const json = (await readJson(file)) as ResultsJson;
    requireFormat(json, file);
    return new GraphReader(json.graph, json.indicators, inputs.written);
  };
  const manifestFile = path.join(root, VERIFICATION_DIR, MANIFEST_FILE);
  let manifest: ResultsSet['manifest'];
  if (await isFile(manifestFile)) {
    const json = (await readJson(manifestFile)) as { tool: { version: string }; inputs: Array<{ file: string; sha256: string }> };
    manifest = { toolVersion: json.tool.version, inputs: new Map(json.inputs.map((input) => [input.file, input.sha256])) };
  }
  // The record and the key as the build's pack copied them (the key where declaration.json names one).
  const copies = path.join(root, VERIFICATION_DIR, 'inputs');
  const declared = (await readFile(path.join(copies, DECLARATION_FILE), 'utf8').then((text) => JSON.parse(text) as { verification?: { public_key?: unknown } }).catch(() => undefined))?.verification?.public_key;
  const state = await readRecord(copies, typeof declared === 'string' ? declared : undefined);
  return { label, products, graph, rowKey: inputs.rowKey, manifest, root, ...(state.kind === 'valid' ? { record: state.record } : {}) };
}

/**
 * The input copies in a build's verification pack. Each CSV row is named by its file's key
 * columns (as the duplicate check defines them), a repeated key by its occurrence; without
 * the copies a row is named by its line. Cells as written, by line and column, for the factor
 * rows the graph names by row (without the copies, none).
 */
async function inputCopies(inputsDir: string): Promise<{ rowKey: RowKeyOf; written: WrittenCell }> {
  const byFile = new Map<string, Map<number, string>>();
  const cells = new Map<string, Map<number, Map<string, string>>>();
  for (const schema of CSV_FILES) {
    if (!(await isFile(path.join(inputsDir, schema.file)))) continue;
    // Read as the build read it (UTF-8, a byte-order mark dropped).
    const read = await readText(inputsDir, schema.file);
    if (!read.ok) continue;
    const keys = new Map<number, string>();
    const seen = new Map<string, number>();
    readCsvText(schema.file, read.text, (source) => {
      const names = source.header.names.map((name) => name.toLowerCase());
      const positions = schema.key.columns.map((column) => names.indexOf(column.toLowerCase()));
      const fields = new Map<number, Map<string, string>>();
      cells.set(schema.file, fields);
      return (record) => {
        fields.set(record.line, new Map(names.map((name, i) => [name, record.fields[i] ?? ''])));
        if (positions.some((p) => p < 0)) return;
        const key = positions.map((p) => (record.fields[p] ?? '').trim()).join(' · ');
        const count = (seen.get(key) ?? 0) + 1;
        seen.set(key, count);
        keys.set(record.line, count === 1 ? key : `${key} #${count}`);
      };
    });
    byFile.set(schema.file, keys);
  }
  const rowKey: RowKeyOf = (file, line) => {
    // declaration.json cells are named by their JSON path (the column), not by a row.
    if (!file.endsWith('.csv')) return '';
    return byFile.get(file)?.get(line) ?? `line ${line}`;
  };
  return { rowKey, written: (file, line, column) => cells.get(file)?.get(line)?.get(column.toLowerCase()) };
}
