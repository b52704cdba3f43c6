import { FS_CONCURRENCY, mapLimit } from './each-limit.ts';
import { createHash } from 'node:crypto';
import { copyFile, mkdir, readdir, readFile, stat, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { CSV_FILES, DECLARATION_FILE } from '../schema/index.ts';
import { TOOL_NAME, TOOL_VERSION } from '../reference/tool.ts';
import { CACHE_FILE, OUTPUT_MARKER } from '../files.ts';

/**
 * The verification pack, `out/verification/`: a copy of every input file, and
 * `manifest.json` with the SHA-256 of every input, of the configuration and of every
 * output, so a verifier can confirm later that a published file came from given inputs.
 */
import { MANIFEST_FILE, VERIFICATION_DIR } from '../files.ts';

export interface HashedFile {
  file: string;
  sha256: string;
  bytes: number;
}

const sha256 = (bytes: Buffer | string): string => createHash('sha256').update(bytes).digest('hex');

/** A file's entry in the manifest from the text written to it (UTF-8), without reading it back. */
export const hashText = (file: string, text: string): HashedFile => ({ file, sha256: sha256(text), bytes: Buffer.byteLength(text) });
/** A file's entry in the manifest from the bytes written to it. */
export const hashBytes = (file: string, bytes: Uint8Array): HashedFile => ({ file, sha256: sha256(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)), bytes: bytes.byteLength });

/**
 * The input files, in contract order, with their checksums (declaration.json first: it is
 * also the configuration), then the other files the project reads (`extra`, paths relative to
 * the data folder: the supplier datasets factors.csv names, the verifier's record and public
 * key), in path order; an extra file that is not there is not part of the pack.
 */
export async function hashInputs(dataDir: string, extra: readonly string[] = []): Promise<HashedFile[]> {
  const files = [
    { file: DECLARATION_FILE, optional: false },
    ...CSV_FILES.map((schema) => ({ file: schema.file, optional: schema.optional })),
    ...[...new Set(extra)].sort().map((file) => ({ file, optional: true })),
  ];
  const hashed = await Promise.all(
    files.map(async ({ file, optional }): Promise<HashedFile | undefined> => {
      let bytes: Buffer;
      try {
        bytes = await readFile(path.join(dataDir, file));
      } catch (error) {
        // An optional input the project does not have is not part of the pack.
        if (optional && (error as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
        throw error;
      }
      return { file, sha256: sha256(bytes), bytes: bytes.length };
    }),
  );
  return hashed.filter((input): input is HashedFile => input !== undefined);
}

export async function copyInputs(dataDir: string, outDir: string, inputs: readonly HashedFile[]): Promise<void> {
  const dir = path.join(outDir, VERIFICATION_DIR, 'inputs');
  await mkdir(dir, { recursive: true });
  for (const input of inputs) {
    await mkdir(path.dirname(path.join(dir, input.file)), { recursive: true });
    await copyFile(path.join(dataDir, input.file), path.join(dir, input.file));
  }
}

async function listFiles(root: string, dir = ''): Promise<string[]> {
  const entries = await readdir(path.join(root, dir), { withFileTypes: true });
  const relative = (name: string) => (dir ? `${dir}/${name}` : name);
  const nested = await mapLimit(entries.filter((entry) => entry.isDirectory()), FS_CONCURRENCY, (entry) => listFiles(root, relative(entry.name)));
  return [...entries.filter((entry) => !entry.isDirectory()).map((entry) => relative(entry.name)), ...nested.flat()];
}

/** Files about the build rather than the declarations: the output marker and the build cache. */
const NOT_IN_MANIFEST = new Set([OUTPUT_MARKER, CACHE_FILE]);

/** Written last: every other output exists by then. Paths are relative and sorted, so the manifest is reproducible. */
export async function writeManifest(outDir: string, inputs: readonly HashedFile[], known: ReadonlyMap<string, HashedFile> = new Map()): Promise<void> {
  const self = `${VERIFICATION_DIR}/${MANIFEST_FILE}`;
  const files = (await listFiles(outDir)).filter((f) => f !== self && !NOT_IN_MANIFEST.has(f)).sort();
  const outputs = await mapLimit(files, FS_CONCURRENCY, async (file): Promise<HashedFile> => {
    // A file hashed as it was written, or kept from the previous build (build --changed), keeps its hash while its size matches.
    const kept = known.get(file);
    if (kept && (await stat(path.join(outDir, file))).size === kept.bytes) return kept;
    const bytes = await readFile(path.join(outDir, file));
    return { file, sha256: sha256(bytes), bytes: bytes.length };
  });
  const configuration = inputs.find((input) => input.file === DECLARATION_FILE)!;
  const manifest = { tool: { name: TOOL_NAME, version: TOOL_VERSION }, algorithm: 'SHA-256', configuration, inputs, outputs };
  await mkdir(path.join(outDir, VERIFICATION_DIR), { recursive: true });
  await writeFile(path.join(outDir, self), `${JSON.stringify(manifest, null, 1)}\n`);
}
