import { createHash, createPublicKey, verify as verifySignature, type KeyObject } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { z } from 'zod';
import { TOOL_VERSION } from '../reference/tool.ts';
import { CSV_FILES } from '../schema/index.ts';
import type { Row, Table } from '../schema/table.ts';
import type { ProductRows } from './by-product.ts';
import { inputTables, productReach } from './reach.ts';
import type { Project } from './types.ts';

/**
 * A verifier's signed record (`loopsheet verify`): who verified what, when, under which
 * programme, with which tool, and the SHA-256 of every input file, of the configuration, of
 * each covered product's results.json and of every input row each product reads — signed with
 * the verifier's Ed25519 key. A product is verified only while the signature checks against the
 * verifier's public key and nothing it covers has changed; otherwise it is a draft, with the
 * reasons in words.
 */
export const RECORD_FILE = 'verification-record.json';
/** The verifier's public key, beside the record unless declaration.json `verification.public_key` names another file. */
export const PUBLIC_KEY_FILE = 'verifier.pub.pem';

const sha = z.string().regex(/^[0-9a-f]{64}$/);
const stamp = z.strictObject({ file: z.string(), line: z.int().min(1), key: z.string(), sha256: sha });
export const recordSchema = z.strictObject({
  verifier: z.string().min(1),
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/),
  programme: z.string(),
  tool: z.strictObject({ name: z.string(), version: z.string() }),
  scope: z.strictObject({ products: z.array(z.string()), families: z.array(z.string()) }),
  configuration: z.strictObject({ file: z.string(), sha256: sha }),
  inputs: z.array(z.strictObject({ file: z.string(), sha256: sha })),
  results: z.array(z.strictObject({ file: z.string(), sha256: sha })),
  rows: z.record(z.string(), z.array(stamp)),
});
export type VerificationRecord = z.output<typeof recordSchema>;
export type RowStamp = z.output<typeof stamp>;

export const recordFileSchema = z.strictObject({
  format: z.literal(1),
  record: recordSchema,
  /** Ed25519 signature of `canonicalJson(record)`, base64. */
  signature: z.string(),
});

/** JSON with keys in code-point order at every level and no spaces: the bytes that are signed. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined);
    entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  return JSON.stringify(value);
}

export const sha256 = (bytes: string | Buffer): string => createHash('sha256').update(bytes).digest('hex');

/** A public key's fingerprint: the SHA-256 of its DER (SubjectPublicKeyInfo) form, as people compare keys. */
export const keyFingerprint = (key: KeyObject): string => sha256(key.export({ type: 'spki', format: 'der' }));

/** The key of a row of an input file: its file's key columns as written (`al-primary-ingot`, `KV-EXT-6060 · L1`); `line N` where the file has no key. */
function rowKey(table: Table<unknown>, row: { line: number; raw: Record<string, string> }): string {
  const schema = CSV_FILES.find((file) => file.file === table.file);
  const columns = schema?.key.columns ?? [];
  return columns.length ? columns.map((column) => (row.raw[column] ?? '').trim()).join(' · ') : `line ${row.line}`;
}

const physical = new WeakMap<object, string[]>();
const linesOf = (table: Table<unknown>): string[] => {
  let lines = physical.get(table.csv);
  if (!lines) physical.set(table.csv, (lines = table.csv.text.replace(/\r\n?/g, '\n').split('\n')));
  return lines;
};

/** Every input row a product reads (its reach, as its input key counts it), each with its key and the SHA-256 of its text as written. */
export function productStamps(project: Project, rows: ProductRows): RowStamp[] {
  const tables = inputTables(project);
  const stamps: RowStamp[] = [];
  for (const [file, lines] of [...productReach(project, rows)].sort(([a], [b]) => (a < b ? -1 : 1))) {
    const table = tables.get(file);
    if (!table) continue;
    const byLine = new Map<number, Row<unknown>>(table.rows.map((row) => [row.line, row]));
    const text = linesOf(table);
    for (const line of [...lines].sort((a, b) => a - b)) {
      const row = byLine.get(line);
      if (!row) continue;
      stamps.push({ file, line, key: rowKey(table, row), sha256: sha256(text.slice(line - 1, row.lineEnd).join('\n')) });
    }
  }
  return stamps;
}

/** The record of a data folder as read: valid (signature and schema) or why not. */
export type RecordState =
  | { kind: 'none' }
  | { kind: 'invalid'; reason: string; date?: string }
  | { kind: 'valid'; record: VerificationRecord; fingerprint: string; publicKeyFile: string };

/** Reads and checks the record and the verifier's public key of a data folder. */
export async function readRecord(dir: string, publicKeyPath: string | undefined): Promise<RecordState> {
  const text = await readFile(path.join(dir, RECORD_FILE), 'utf8').catch(() => undefined);
  if (text === undefined) return { kind: 'none' };
  let parsed: z.output<typeof recordFileSchema>;
  try {
    const result = recordFileSchema.safeParse(JSON.parse(text));
    if (!result.success) return { kind: 'invalid', reason: `${RECORD_FILE} is not a verification record (${result.error.issues[0]?.path.join('.') || 'its shape'})` };
    parsed = result.data;
  } catch {
    return { kind: 'invalid', reason: `${RECORD_FILE} is not valid JSON` };
  }
  const keyFile = publicKeyPath ?? PUBLIC_KEY_FILE;
  const pem = await readFile(path.join(dir, keyFile), 'utf8').catch(() => undefined);
  if (pem === undefined) return { kind: 'invalid', reason: `the verifier’s public key ${keyFile} is not in the data folder`, date: parsed.record.date };
  let key: KeyObject;
  try {
    key = createPublicKey(pem);
  } catch {
    return { kind: 'invalid', reason: `${keyFile} is not a public key in PEM`, date: parsed.record.date };
  }
  if (key.asymmetricKeyType !== 'ed25519') return { kind: 'invalid', reason: `${keyFile} is not an Ed25519 key`, date: parsed.record.date };
  const ok = verifySignature(null, Buffer.from(canonicalJson(parsed.record)), key, Buffer.from(parsed.signature, 'base64'));
  if (!ok) return { kind: 'invalid', reason: 'signature does not match the verifier’s key', date: parsed.record.date };
  return { kind: 'valid', record: parsed.record, fingerprint: keyFingerprint(key), publicKeyFile: keyFile };
}

/** A declaration's verification status, and why it is a draft. */
export interface VerificationStatus {
  status: 'verified' | 'draft';
  /** Who and when (a verified declaration); the record's date where a draft has one. */
  verifier?: string;
  date?: string;
  /** Why it is a draft, in words; empty for a verified declaration. */
  reasons: string[];
}

const DRAFT_NO_RECORD: VerificationStatus = { status: 'draft', reasons: ['no verification record'] };

/** The input files' hashes now, as the record lists them, for comparison. */
export interface CurrentInputs {
  configuration: string;
  inputs: ReadonlyMap<string, string>;
}

/** What a project knows of its verification: the record as read and checked, and its input files' hashes now. */
export interface ProjectVerification {
  state: RecordState;
  current: CurrentInputs;
}

/** The SHA-256 of declaration.json, of each CSV input present and of each supplier dataset, as `verify` records them. */
export async function hashCurrentInputs(dir: string, declarationFile: string, supplierFiles: readonly string[]): Promise<CurrentInputs> {
  const read = async (file: string) => {
    const bytes = await readFile(path.join(dir, file)).catch(() => undefined);
    return bytes === undefined ? undefined : sha256(bytes);
  };
  const inputs = new Map<string, string>();
  for (const file of [...CSV_FILES.map((schema) => schema.file), ...[...new Set(supplierFiles)].sort()]) {
    const hash = await read(file);
    if (hash !== undefined) inputs.set(file, hash);
  }
  return { configuration: (await read(declarationFile)) ?? '', inputs };
}

/**
 * The status of a product: verified while the record is valid, covers it, was made with this
 * tool version, and every row it reads, the configuration and every supplier dataset are as
 * recorded (results.json is compared by the build, which has it: `resultsChanged`).
 */
export function productStatus(project: Project, state: RecordState, current: CurrentInputs, rows: ProductRows): VerificationStatus {
  const id = rows.product.value.product_id;
  if (state.kind === 'none') return DRAFT_NO_RECORD;
  if (state.kind === 'invalid') return { status: 'draft', ...(state.date ? { date: state.date } : {}), reasons: [state.reason] };
  const record = state.record;
  if (!record.scope.products.includes(id)) return { status: 'draft', date: record.date, reasons: [`not covered by the verification of ${record.date}`] };
  const changes: string[] = [];
  if (record.tool.version !== TOOL_VERSION) changes.push(`tool ${record.tool.version} → ${TOOL_VERSION}`);
  if (record.configuration.sha256 !== current.configuration) changes.push(record.configuration.file);
  const before = new Map((record.rows[id] ?? []).map((stamp) => [`${stamp.file}\u0000${stamp.key}`, stamp]));
  const seen = new Set<string>();
  for (const stamp of productStamps(project, rows)) {
    const key = `${stamp.file}\u0000${stamp.key}`;
    seen.add(key);
    const old = before.get(key);
    if (!old) changes.push(`${stamp.file} line ${stamp.line} (\`${stamp.key}\`, new)`);
    else if (old.sha256 !== stamp.sha256) changes.push(`${stamp.file} line ${stamp.line} (\`${stamp.key}\`)`);
  }
  for (const [key, old] of before) if (!seen.has(key)) changes.push(`${old.file} line ${old.line} (\`${old.key}\`, removed)`);
  for (const supplier of project.suppliers.values()) {
    const recorded = record.inputs.find((input) => input.file === supplier.file);
    if (recorded && recorded.sha256 !== current.inputs.get(supplier.file)) changes.push(supplier.file);
  }
  if (changes.length) return { status: 'draft', date: record.date, reasons: [`changed since verification on ${record.date}: ${changes.join(', ')}`] };
  return { status: 'verified', verifier: record.verifier, date: record.date, reasons: [] };
}

/** A product whose inputs are as verified, but whose results.json is not the one verified (the calculation changed): a draft. */
export function resultsChanged(state: RecordState, file: string, written: string, status: VerificationStatus): VerificationStatus {
  if (state.kind !== 'valid' || status.status !== 'verified') return status;
  const recorded = state.record.results.find((r) => r.file === file);
  if (recorded && recorded.sha256 === sha256(written)) return status;
  return { status: 'draft', date: state.record.date, reasons: [`changed since verification on ${state.record.date}: ${file} ${recorded ? 'differs from the verified one' : 'was not verified'}`] };
}

/** A family's status: verified when the record covers it and every member is verified. */
export function familyStatus(state: RecordState, familyId: string, members: ReadonlyArray<{ status: 'verified' | 'draft' }>, memberIds: readonly string[]): VerificationStatus {
  if (state.kind === 'none') return DRAFT_NO_RECORD;
  if (state.kind === 'invalid') return { status: 'draft', reasons: [state.reason] };
  const record = state.record;
  if (!record.scope.families.includes(familyId)) return { status: 'draft', date: record.date, reasons: [`not covered by the verification of ${record.date}`] };
  const drafts = memberIds.filter((_, k) => members[k]!.status !== 'verified');
  if (drafts.length) return { status: 'draft', date: record.date, reasons: [`members not as verified: ${drafts.join(', ')}`] };
  return { status: 'verified', verifier: record.verifier, date: record.date, reasons: [] };
}
