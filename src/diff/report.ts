import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { sha256, type VerificationRecord } from '../model/verification-record.ts';
import { ChangedCells, type CellChange } from './attribute.ts';
import { compareProduct, relativeChange, reviewOrder, type FigureChange } from './compare.ts';
import type { ResultsSet } from './results-set.ts';
import { formatCounted, formatSignificant, NOT_AVAILABLE } from '../format.ts';

/**
 * The change report between two builds: every figure that moved beyond the threshold, with
 * the input cells that changed underneath it, the products added and removed, and whether a
 * headline figure moved more than `--fail-over` allows.
 */
export interface ChangeReport {
  old: string;
  new: string;
  threshold: number;
  fail_over: number | null;
  /** Whose headline figures --fail-over guards: the declared result (default), or every method's. */
  fail_over_methods: FailOverMethods;
  products: { compared: number; changed: string[]; added: string[]; removed: string[] };
  /** Input files whose SHA-256 differs between the two verification manifests (when both have one). */
  changed_files: string[] | null;
  tool: { old: string | null; new: string | null };
  changes: Array<FigureChange & { inputs: number[] | null }>;
  /** The input cells the changes point to (`inputs` of a change are indices into this list). */
  inputs: CellChange[];
  /** Headline figures that moved more than `fail_over`. */
  over: Array<{ product_id: string; figure: string; relative: number | null }>;
  /**
   * Where the new build carries a verifier's valid record: whether the old build is the one
   * verified (each results.json the record covers, by SHA-256), so that the report lists what
   * moved since verification.
   */
  verification: { date: string; verifier: string; covered: number; differing: string[] } | null;
}

export type FailOverMethods = 'declared' | 'all';

export async function changeReport(old: ResultsSet, now: ResultsSet, options: { threshold: number; failOver?: number; failOverMethods?: FailOverMethods }): Promise<ChangeReport> {
  const guarded = options.failOverMethods ?? 'declared';
  const changes: ChangeReport['changes'] = [];
  const inputs: CellChange[] = [];
  const inputIndex = new Map<string, number>();
  const changed: string[] = [];
  const over: ChangeReport['over'] = [];
  let compared = 0;
  for (const [id, summary] of now.products) {
    const before = old.products.get(id);
    if (!before) continue;
    compared += 1;
    // Every change once; the report keeps those beyond its threshold, the guard reads every headline figure.
    const all = compareProduct(before, summary, 0);
    const moved = all.filter((change) => relativeChange(change.old, change.new) > options.threshold);
    if (options.failOver !== undefined) {
      for (const change of all) {
        if (change.headline && (guarded === 'all' || change.declared) && relativeChange(change.old, change.new) > options.failOver) over.push({ product_id: id, figure: change.figure, relative: change.relative });
      }
    }
    if (moved.length === 0) continue;
    changed.push(id);
    const [oldGraph, newGraph] = await Promise.all([old.graph(id), now.graph(id)]);
    const cells = oldGraph && newGraph ? new ChangedCells(oldGraph, newGraph, old.rowKey, now.rowKey) : undefined;
    for (const change of moved.sort(reviewOrder)) {
      const under = cells?.under(change.figure).map((k) => {
        const cell = cells.cells[k]!;
        const key = `${cell.file}\u0000${cell.row}\u0000${cell.column}\u0000${cell.old?.value ?? ''}\u0000${cell.new?.value ?? ''}`;
        let index = inputIndex.get(key);
        if (index === undefined) {
          index = inputs.length;
          inputIndex.set(key, index);
          inputs.push(cell);
        }
        return index;
      });
      changes.push({ ...change, inputs: under ?? null });
    }
  }
  const added = [...now.products.keys()].filter((id) => !old.products.has(id));
  const removed = [...old.products.keys()].filter((id) => !now.products.has(id));
  let changedFiles: string[] | null = null;
  if (old.manifest && now.manifest) {
    const files = new Set([...old.manifest.inputs.keys(), ...now.manifest.inputs.keys()]);
    changedFiles = [...files].filter((file) => old.manifest!.inputs.get(file) !== now.manifest!.inputs.get(file)).sort();
  }
  return {
    old: old.label,
    new: now.label,
    threshold: options.threshold,
    fail_over: options.failOver ?? null,
    fail_over_methods: guarded,
    products: { compared, changed, added, removed },
    changed_files: changedFiles,
    tool: { old: old.manifest?.toolVersion ?? null, new: now.manifest?.toolVersion ?? null },
    changes,
    inputs,
    over,
    verification: now.record ? await sinceVerification(old.root, now.record) : null,
  };
}

async function sinceVerification(oldRoot: string, record: VerificationRecord): Promise<NonNullable<ChangeReport['verification']>> {
  const differing: string[] = [];
  for (const result of record.results) {
    const bytes = await readFile(path.join(oldRoot, result.file)).catch(() => undefined);
    if (!bytes || sha256(bytes) !== result.sha256) differing.push(result.file);
  }
  return { date: record.date, verifier: record.verifier, covered: record.results.length, differing };
}

/** The report as JSON: numbers as computed (no rounding), for scripts. */
export const changeReportJson = (report: ChangeReport): string => `${JSON.stringify(report, null, 1)}\n`;

const MAX_PRODUCTS = 15;
const MAX_ROWS = 8;
const MAX_CELLS = 8;

const number = (value: number | null): string => formatSignificant(value, 4);
const signed = (value: number | null): string => (value === null ? NOT_AVAILABLE : `${value > 0 ? '+' : ''}${number(value)}`);
const percent = (change: FigureChange): string => {
  if (change.old === null || change.new === null) return change.new === null ? 'now incomplete' : 'now complete';
  if (change.relative === null) return 'from 0';
  return `${change.relative > 0 ? '+' : ''}${formatSignificant(change.relative * 100, 3)} %`;
};
const share = (value: number) => `${formatSignificant(value * 100, 3)} %`;
const code = (text: string) => `\`${text.replace(/`/g, "'")}\``;
const cellText = (cell: CellChange): string => {
  const where = `${code(cell.file)} ${cell.new ? `line ${cell.new.line}` : `old line ${cell.old!.line}`}${cell.row && !cell.row.startsWith('line ') ? ` (${code(cell.row)})` : ''} ${code(cell.column)}`;
  if (!cell.old) return `${where}: new, ${code(cell.new!.value)}`;
  if (!cell.new) return `${where}: no longer read (was ${code(cell.old.value)})`;
  return `${where}: ${code(cell.old.value)} → ${code(cell.new.value)}${cell.old.line !== cell.new.line ? ` (was line ${cell.old.line})` : ''}`;
};
const guardedWhat = (report: ChangeReport) => (report.fail_over_methods === 'all' ? 'headline figure' : 'declared headline figure');
const figureLabel = (change: FigureChange) => (change.method === 'flows' ? `${change.module} ${change.indicator}` : `${change.method} ${change.module} ${change.indicator}`);

/**
 * Markdown short enough to paste as a review comment: a summary, then per product its
 * largest moves (headline figures first) and the input cells underneath; the rest is
 * counted and left to `--format json`.
 */
export function changeReportMarkdown(report: ChangeReport): string {
  const lines: string[] = ['### loopsheet change report', ''];
  const { products } = report;
  lines.push(
    `${formatCounted(products.compared, 'product', 'products')} compared; ${products.changed.length} with figures that moved more than ${share(report.threshold)}; ${products.added.length} added; ${products.removed.length} removed.`,
  );
  const verified = report.verification;
  if (verified) {
    lines.push(
      verified.differing.length === 0
        ? `The old build is the one verified on ${verified.date} by ${verified.verifier} (the ${formatCounted(verified.covered, 'results.json', 'results.json files')} its record covers match): what follows moved since verification.`
        : `The old build is not the one verified on ${verified.date}: ${verified.differing.map(code).join(', ')} differ from the verifier’s record.`,
    );
  }
  if (report.changed_files) lines.push(report.changed_files.length > 0 ? `Input files changed: ${report.changed_files.map(code).join(', ')}.` : 'No input file changed.');
  if (report.tool.old !== report.tool.new) lines.push(`Tool version: ${report.tool.old ?? 'unknown'} → ${report.tool.new ?? 'unknown'}.`);
  if (report.fail_over !== null) {
    lines.push(
      report.over.length > 0
        ? `**${report.over.length} ${guardedWhat(report)}${report.over.length === 1 ? '' : 's'} moved more than ${share(report.fail_over)}** (the --fail-over limit).`
        : `No ${guardedWhat(report)} moved more than ${share(report.fail_over)} (the --fail-over limit).`,
    );
  }
  if (products.added.length > 0) lines.push('', `Added: ${products.added.map(code).join(', ')}`);
  if (products.removed.length > 0) lines.push('', `Removed: ${products.removed.map(code).join(', ')}`);

  const byProduct = new Map<string, ChangeReport['changes']>();
  for (const change of report.changes) byProduct.set(change.product_id, [...(byProduct.get(change.product_id) ?? []), change]);
  const ranked = [...byProduct.entries()].sort((a, b) => largest(b[1]) - largest(a[1]) || (a[0] < b[0] ? -1 : 1));
  for (const [id, changes] of ranked.slice(0, MAX_PRODUCTS)) {
    const sorted = [...changes].sort(reviewOrder);
    lines.push('', `#### ${code(id)}`, '', '| figure | old | new | change | |', '|---|---:|---:|---:|---:|');
    for (const change of sorted.slice(0, MAX_ROWS)) {
      lines.push(`| ${change.headline ? '**' : ''}${figureLabel(change)}${change.headline ? '**' : ''} ${change.unit ? `(${change.unit})` : ''} | ${number(change.old)} | ${number(change.new)} | ${signed(change.absolute)} | ${percent(change)} |`);
    }
    if (sorted.length > MAX_ROWS) lines.push('', `…and ${sorted.length - MAX_ROWS} more figures of this product.`);
    const cells = [...new Set(changes.flatMap((change) => change.inputs ?? []))].map((k) => report.inputs[k]!);
    if (changes.every((change) => change.inputs === null)) lines.push('', 'Input cells: not available (a side has no figure graph for this product).');
    else if (cells.length === 0) lines.push('', 'No input cell under these figures changed: a setting of declaration.json or the tool itself did.');
    else {
      lines.push('', 'Input cells that changed underneath:');
      for (const cell of cells.slice(0, MAX_CELLS)) lines.push(`- ${cellText(cell)}`);
      if (cells.length > MAX_CELLS) lines.push(`- …and ${cells.length - MAX_CELLS} more cells.`);
    }
  }
  if (ranked.length > MAX_PRODUCTS) lines.push('', `…and ${ranked.length - MAX_PRODUCTS} more changed products (--format json lists every change).`);
  if (report.changes.length === 0) lines.push('', `No figure moved more than ${share(report.threshold)}.`);
  return `${lines.join('\n')}\n`;
}

/** A product's largest move among its declared headline figures (the comparison methods do not rank products). */
function largest(changes: readonly FigureChange[]): number {
  return Math.max(...changes.filter((c) => c.headline && c.declared).map((c) => relativeChange(c.old, c.new)), 0);
}
