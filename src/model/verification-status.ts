import type { ProductRows } from './by-product.ts';
import { inputTables, productReach } from './reach.ts';
import type { Project } from './types.ts';
import { TOOL_VERSION } from '../reference/tool.ts';
import { CSV_FILES } from '../schema/index.ts';
import type { Row, Table } from '../schema/table.ts';
import { physicalLines } from '../load/lines.ts';
import { sha256, type RecordState, type RowStamp } from './verification-record.ts';
import { suppliersReached } from './supplier-datasets.ts';

/**
 * A declaration's status against its verifier's record (src/model/verification-record.ts):
 * verified, or a draft and why, in words.
 */
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

/** The key of a row of an input file: its file's key columns as written (`al-primary-ingot`, `KV-EXT-6060 · L1`); `line N` where the file has no key. */
function rowKey(table: Table<unknown>, row: { line: number; raw: Record<string, string> }): string {
  const schema = CSV_FILES.find((file) => file.file === table.file);
  const columns = schema?.key.columns ?? [];
  return columns.length ? columns.map((column) => (row.raw[column] ?? '').trim()).join(' · ') : `line ${row.line}`;
}

/** Every input row a product reads (its reach, as its input key counts it), each with its key and the SHA-256 of its text as written. */
export function productStamps(project: Project, rows: ProductRows, reach: ReadonlyMap<string, ReadonlySet<number>> = productReach(project, rows)): RowStamp[] {
  const tables = inputTables(project);
  const stamps: RowStamp[] = [];
  for (const [file, lines] of [...reach].sort(([a], [b]) => (a < b ? -1 : 1))) {
    const table = tables.get(file);
    if (!table) continue;
    const byLine = new Map<number, Row<unknown>>(table.rows.map((row) => [row.line, row]));
    const text = physicalLines(table.csv);
    for (const line of [...lines].sort((a, b) => a - b)) {
      const row = byLine.get(line);
      if (!row) continue;
      stamps.push({ file, line, key: rowKey(table, row), sha256: sha256(text.slice(line - 1, row.lineEnd).join('\n')) });
    }
  }
  return stamps;
}

/**
 * The status of a product: verified while the record is valid, covers it, was made with this
 * tool version, and every row it reads, the configuration and every supplier dataset it reads
 * are as recorded (results.json is compared by the build, which has it: `resultsChanged`).
 * `reach` is the product's reach where the caller has found it already.
 */
export function productStatus(project: Project, rows: ProductRows, reach?: ReadonlyMap<string, ReadonlySet<number>>): VerificationStatus {
  const { state, current } = project.verification;
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
  const reached = reach ?? productReach(project, rows);
  for (const stamp of productStamps(project, rows, reached)) {
    const key = `${stamp.file}\u0000${stamp.key}`;
    seen.add(key);
    const old = before.get(key);
    if (!old) changes.push(`${stamp.file} line ${stamp.line} (${stamp.key}, new)`);
    else if (old.sha256 !== stamp.sha256) changes.push(`${stamp.file} line ${stamp.line} (${stamp.key})`);
  }
  for (const [key, old] of before) if (!seen.has(key)) changes.push(`${old.file} line ${old.line} (${old.key}, removed)`);
  for (const supplier of suppliersReached(project, reached)) {
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
