import { createPrivateKey, createPublicKey, generateKeyPairSync, sign } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdir, readFile, realpath, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { rowsByProduct } from '../model/by-product.ts';
import { loadProject } from '../model/project.ts';
import { canonicalJson, hashCurrentInputs, keyFingerprint, PUBLIC_KEY_FILE, RECORD_FILE, sha256, type VerificationRecord } from '../model/verification-record.ts';
import { productStamps } from '../model/verification-status.ts';
import { hasErrors } from '../problems.ts';
import { formatCounted } from '../format.ts';
import { TOOL_NAME, TOOL_VERSION } from '../reference/tool.ts';
import { DECLARATION_FILE } from '../schema/index.ts';
import { FAMILIES_DIR, MANIFEST_FILE, OUTPUT_MARKER, RESULTS_JSON, VERIFICATION_DIR } from '../files.ts';
import { EXIT, UsageError, type Io } from './io.ts';

/**
 * A verifier's commands. `keygen` makes an Ed25519 key pair (PEM); `verify` signs a record of
 * what the verifier checked — a build in --out made from the data folder — and writes it into
 * the data folder (verification-record.json, and the public key as verifier.pub.pem). The
 * private key never enters a data folder or a build's output: both commands refuse.
 */

/** Whether a path lies in a data folder (a folder with declaration.json) or a build's output (with the output marker), itself or above. */
async function insideProjectFolder(file: string): Promise<string | undefined> {
  let dir = path.dirname(path.resolve(file));
  dir = await realpath(dir).catch(() => dir);
  for (;;) {
    if (existsSync(path.join(dir, DECLARATION_FILE))) return `${dir} is a data folder (it holds ${DECLARATION_FILE})`;
    if (existsSync(path.join(dir, OUTPUT_MARKER))) return `${dir} is a build's output`;
    const up = path.dirname(dir);
    if (up === dir) return undefined;
    dir = up;
  }
}

export async function runKeygen(options: { out: string; name: string }, io: Io): Promise<number> {
  if (!/^[A-Za-z0-9._-]+$/.test(options.name)) throw new UsageError(`--name ${options.name}: letters, digits, ".", "_" and "-" only`);
  const privateFile = path.join(options.out, `${options.name}.key.pem`);
  const publicFile = path.join(options.out, `${options.name}.pub.pem`);
  const inside = await insideProjectFolder(privateFile);
  if (inside) throw new UsageError(`keygen --out ${options.out}: ${inside}; a private key is kept outside every data folder and output (use a folder of your own, e.g. ~/.loopsheet)`);
  if (existsSync(privateFile) || existsSync(publicFile)) throw new UsageError(`${privateFile} or ${publicFile} exists; keygen does not replace a key`);
  const { privateKey, publicKey } = generateKeyPairSync('ed25519');
  await mkdir(options.out, { recursive: true });
  await writeFile(privateFile, privateKey.export({ type: 'pkcs8', format: 'pem' }), { mode: 0o600 });
  await writeFile(publicFile, publicKey.export({ type: 'spki', format: 'pem' }));
  io.out(`keygen: ${privateFile} (private: keep it to yourself) and ${publicFile} (public: give it with your records)`);
  io.out(`fingerprint (SHA-256 of the public key): ${keyFingerprint(publicKey)}`);
  return EXIT.ok;
}

export interface VerifyOptions {
  data: string;
  out: string;
  key: string;
  verifier: string;
  date: string;
  programme: string;
  products?: string[];
  families?: string[];
}

/** Builds the record of what the verifier checked: the inputs, the configuration, the build's results and every row each covered product reads. */
export async function verificationRecord(options: Omit<VerifyOptions, 'key'>, toolVersion = TOOL_VERSION): Promise<{ record: VerificationRecord; problems: string[] }> {
  const { project, problems } = await loadProject(options.data);
  if (!project || hasErrors(problems)) throw new UsageError(`${options.data} has errors: run loopsheet check, fix them, build and check the build before verifying`);
  const manifest = JSON.parse(await readFile(path.join(options.out, VERIFICATION_DIR, MANIFEST_FILE), 'utf8').catch(() => 'null')) as { tool?: { version: string }; inputs?: Array<{ file: string; sha256: string }> } | null;
  if (!manifest?.inputs) throw new UsageError(`${options.out} is not a build (no ${VERIFICATION_DIR}/${MANIFEST_FILE}); verify the build you checked`);
  const current = await hashCurrentInputs(options.data, DECLARATION_FILE, [...project.suppliers.values()].map((supplier) => supplier.file));
  const now = new Map([[DECLARATION_FILE, current.configuration], ...current.inputs]);
  // The record and key of an earlier verification are in the pack too; they are not what is verified.
  const verifiedFiles = manifest.inputs.filter((input) => input.file !== RECORD_FILE && input.file !== (project.declaration.verification.public_key ?? PUBLIC_KEY_FILE));
  const differ = verifiedFiles.filter((input) => now.get(input.file) !== input.sha256).map((input) => input.file);
  const missing = [...now.keys()].filter((file) => !manifest.inputs!.some((input) => input.file === file));
  if (differ.length || missing.length) throw new UsageError(`the build in ${options.out} was made from other inputs (${[...differ, ...missing].join(', ')} differ); build again and check that build`);
  if (manifest.tool?.version !== toolVersion) throw new UsageError(`the build in ${options.out} was made by loopsheet ${manifest.tool?.version ?? '?'}, this is ${toolVersion}; build again with this version`);
  const all = rowsByProduct(project);
  const products = options.products ?? all.map((rows) => rows.product.value.product_id);
  const families = options.families ?? project.families.map((family) => family.id);
  for (const id of products) if (!all.some((rows) => rows.product.value.product_id === id)) throw new UsageError(`--products: ${id} is not a product of ${options.data}`);
  for (const id of families) if (!project.families.some((family) => family.id === id)) throw new UsageError(`--families: ${id} is not a family of ${options.data}`);
  const results: VerificationRecord['results'] = [];
  const rows: VerificationRecord['rows'] = {};
  for (const id of products) {
    const file = `${id}/${RESULTS_JSON}`;
    const text = await readFile(path.join(options.out, file)).catch(() => undefined);
    if (!text) throw new UsageError(`${options.out} has no ${file}; build every product you verify`);
    results.push({ file, sha256: sha256(text) });
    rows[id] = productStamps(project, all.find((r) => r.product.value.product_id === id)!);
  }
  for (const id of families) {
    const file = `${FAMILIES_DIR}/${id}/${RESULTS_JSON}`;
    const text = await readFile(path.join(options.out, file)).catch(() => undefined);
    if (!text) throw new UsageError(`${options.out} has no ${file}`);
    results.push({ file, sha256: sha256(text) });
  }
  const record: VerificationRecord = {
    verifier: options.verifier,
    date: options.date,
    programme: options.programme,
    tool: { name: TOOL_NAME, version: toolVersion },
    scope: { products, families },
    configuration: { file: DECLARATION_FILE, sha256: current.configuration },
    inputs: [...current.inputs].map(([file, hash]) => ({ file, sha256: hash })),
    results,
    rows,
  };
  return { record, problems: problems.map((p) => p.message) };
}

/** The record file's text: the record and its Ed25519 signature over canonicalJson(record). */
export function signedRecordText(record: VerificationRecord, privateKeyPem: string): string {
  const key = createPrivateKey(privateKeyPem);
  if (key.asymmetricKeyType !== 'ed25519') throw new UsageError('the key is not an Ed25519 private key (make one with loopsheet keygen)');
  const signature = sign(null, Buffer.from(canonicalJson(record)), key).toString('base64');
  return `${JSON.stringify({ format: 1, record, signature }, null, 1)}\n`;
}

export async function runVerify(options: VerifyOptions, io: Io): Promise<number> {
  const resolvedKey = path.resolve(options.key);
  for (const [dir, what] of [[options.data, 'data folder'], [options.out, 'output']] as const) {
    const root = await realpath(dir).catch(() => path.resolve(dir));
    const key = await realpath(resolvedKey).catch(() => resolvedKey);
    if (key === root || key.startsWith(root + path.sep)) throw new UsageError(`--key ${options.key} is inside the ${what} ${dir}; a private key never enters a data folder or an output`);
  }
  const inside = await insideProjectFolder(resolvedKey);
  if (inside) throw new UsageError(`--key ${options.key}: ${inside}; a private key never enters a data folder or an output`);
  const pem = await readFile(resolvedKey, 'utf8').catch(() => undefined);
  if (pem === undefined) throw new UsageError(`--key ${options.key}: no such file`);
  if (!/^\d{4}-\d{2}-\d{2}$/.test(options.date)) throw new UsageError(`--date ${options.date}: expected YYYY-MM-DD`);
  const { record } = await verificationRecord(options);
  const text = signedRecordText(record, pem);
  const publicPem = createPublicKey(createPrivateKey(pem)).export({ type: 'spki', format: 'pem' }).toString();
  const keyFile = path.join(options.data, PUBLIC_KEY_FILE);
  const existing = await readFile(keyFile, 'utf8').catch(() => undefined);
  if (existing !== undefined && createPublicKey(existing).export({ type: 'spki', format: 'der' }).compare(createPublicKey(publicPem).export({ type: 'spki', format: 'der' })) !== 0) {
    throw new UsageError(`${keyFile} is another verifier's key; remove it if you take over the verification`);
  }
  await writeFile(path.join(options.data, RECORD_FILE), text);
  if (existing === undefined) await writeFile(keyFile, publicPem);
  io.out(`verify: ${path.join(options.data, RECORD_FILE)} signed by ${options.verifier} (key ${keyFingerprint(createPublicKey(publicPem))}): ${formatCounted(record.scope.products.length, 'product', 'products')}, ${formatCounted(record.scope.families.length, 'family', 'families')}, ${formatCounted(record.inputs.length + 1, 'input file', 'input files')}`);
  return EXIT.ok;
}
