import { createHash, createPublicKey, verify as verifySignature, type KeyObject } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { z } from 'zod';
import { CSV_FILES } from '../schema/index.ts';

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

/** The record and the public key of a project that has them, for the verification pack (and so for `merge`, which reads the pack). */
export const verificationFiles = (project: { verification: ProjectVerification; declaration: { verification: { public_key?: string | undefined } } }): string[] =>
  project.verification.state.kind === 'none' ? [] : [RECORD_FILE, project.declaration.verification.public_key ?? PUBLIC_KEY_FILE];

/** The input files' hashes now, as the record lists them, for comparison. */
export interface CurrentInputs {
  configuration: string;
  inputs: ReadonlyMap<string, string>;
}

/** The hashes of a project without a record: nothing to compare. */
export const NO_INPUTS: CurrentInputs = { configuration: '', inputs: new Map() };

/** What a project knows of its verification: the record as read and checked, and (where there is a record) its input files' hashes now. */
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

