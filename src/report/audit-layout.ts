import type { BomLine } from '../model/types.ts';
import type { FigureNode } from '../trace/graph.ts';

/**
 * How the audit page lays its steps out (src/report/audit-view.ts makes them): an entry per
 * step, or for steps of one kind — one per line or material — a run, one table with the
 * formula, description and term names once and a row per step; a sum over lines or
 * materials with its terms in a table by key. Layout only: every step and every term the
 * graph has is shown (test/report/audit-view.test.ts).
 */
export interface AuditTerm {
  symbol: string;
  href: string;
  /** Another step, an input cell, a factor row. */
  kind: 'step' | 'cell' | 'factor';
  /** What a table cell shows: a scalar step's value, the cell as written (`“”` when empty), the factor id; empty for a step with a value per indicator. */
  text: string;
  /** A scalar step's unit; the column of a cell not named by its symbol. */
  qualifier: string;
  /** All of it in one line, as a step entry shows it: ` = 1.25 kg`, ` mass_kg “0.83”`, ` factor al-primary-ingot`. */
  note: string;
}

export interface AuditStep {
  /** Its element id. */
  anchor: string;
  id: string;
  description: string;
  formula: string;
  /** A scalar step's value and unit, formatted. */
  value?: string;
  unit?: string;
  /** Its terms; in a run, those its rows do not share; with `keyed`, those before the first keyed one. */
  terms: AuditTerm[];
  /**
   * A sum over lines or materials whose terms are named `X(key)` (`G(L3)`, `M_eol(al-6060)`),
   * each maybe followed by terms of the same key without one (`recycling`): a row per key and
   * a column per symbol, instead of a list that repeats each symbol and unit for every key.
   */
  keyed?: { columns: Array<{ symbol: string; qualifier: string }>; rows: Array<{ key: string; cells: Array<AuditTerm | undefined> }>; after: AuditTerm[] };
  /** A step with one value per indicator: its row of the group's values table. */
  values?: { anchor: string; numbers: readonly number[]; linked: boolean };
}

/**
 * Steps of one kind, one per line or per material (`cutoff/A1/line:*`), with the same formula
 * and the same description but for the part or material they are about: one table, a row per
 * step (anchored `s<k>` as a step entry would be) with its terms' values and, for a step with
 * a value per indicator, its values. Written once instead of once per line, the formula,
 * description and term names cost a few hundred bytes instead of tens of kilobytes.
 */
export interface AuditRun {
  /** The members' id with the varying segment as `*`. */
  pattern: string;
  /** The members' description with what varies as ‹part› (the line's component) or ‹material›. */
  description: string;
  formula: string;
  /** Scalar steps: their unit. */
  unit?: string;
  /** Which of part and material a row names besides its id (what the description varies by and the id does not say). */
  subjects: Array<'part' | 'material'>;
  /**
   * Where every member has the same terms by symbol: a column per term, with what all its rows
   * share (a unit, a column name, `factor`; empty where they differ, and then each cell says
   * it). Undefined where the members' terms differ (a sum over a material's lines): each row
   * lists its terms in one cell.
   */
  columns?: Array<{ symbol: string; qualifier: string }>;
  /** Terms that are the same in every row (same step or input row, same value): said once, above the table; their columns are left out. */
  shared: AuditTerm[];
  /** Steps with a value per indicator: each row carries its values. */
  vector: boolean;
  /** Each step, what its id puts for the pattern's `*` (`L3`), and its subjects. */
  rows: Array<{ step: AuditStep; key: string; subjects: string[] }>;
}

export type AuditItem = { step: AuditStep; run?: undefined } | { run: AuditRun; step?: undefined };

export interface AuditGroup {
  title: string;
  items: AuditItem[];
}

/** Fewer steps of a kind than this stay entries of their own. */
const MIN_RUN = 3;

/** `line:L3`, `packaging:P1` or `material:al-6060` as a segment of a step id: what a run of steps varies by. */
const SUBJECT = /(^|\/)(line|packaging|material):([^/]+)/;

/** A group as the view builds it: its items in page order, and its runs by what makes steps one kind. */
export interface GroupDraft {
  title: string;
  items: AuditItem[];
  runs: Map<string, AuditRun>;
}

/**
 * Puts a step in its group: as an entry of its own, or as a row of the run of its kind —
 * steps whose ids differ only in their line, packaging line or material, with the same
 * formula, unit and description once the part and material are named generically. A step
 * other pages link to by its id (`anchoredById`) stays an entry.
 */
export function placeStep(group: GroupDraft, node: FigureNode, step: AuditStep, anchoredById: boolean, lines: ReadonlyMap<string, BomLine>): void {
  const subject = anchoredById ? null : SUBJECT.exec(node.id);
  if (!subject) {
    keyTerms(step);
    group.items.push({ step });
    return;
  }
  // The description with the line's component and material (or the material) named generically.
  const line = subject[2] !== 'material' ? lines.get(subject[3]!) : undefined;
  const said: Array<['part' | 'material', string]> = line ? [['part', line.component], ['material', line.material]] : subject[2] === 'material' ? [['material', subject[3]!]] : [];
  let description = node.description;
  const subjects: Array<'part' | 'material'> = [];
  const values: string[] = [];
  for (const [what, text] of said) {
    const generic = replaceWord(description, text, `‹${what}›`);
    if (generic === description) continue;
    description = generic;
    if (!(what === 'material' && subject[2] === 'material')) {
      subjects.push(what);
      values.push(text);
    }
  }
  const pattern = node.id.replace(SUBJECT, '$1$2:*');
  const runKey = [pattern, node.kind, step.unit ?? '', node.formula, description, subjects.join()].join('\u0000');
  let run = group.runs.get(runKey);
  if (!run) {
    run = { pattern, description, formula: node.formula, ...(step.unit !== undefined ? { unit: step.unit } : {}), subjects, shared: [], vector: node.kind === 'vector', rows: [] };
    group.runs.set(runKey, run);
    group.items.push({ run });
  }
  run.rows.push({ step, key: subject[3]!, subjects: values });
}

/** The groups as the page shows them: runs too short to be tables back to entries, shared terms and columns settled, parts and materials named once. */
export function layOut(groups: readonly GroupDraft[]): AuditGroup[] {
  return describedOnce(groups.map((group) => ({ title: group.title, items: group.items.flatMap(runOrSteps) })));
}

/**
 * A run of a few steps is shown as their entries. A run whose members' terms have the same
 * symbols gets a column per term, and a term that is the same in every row is said once; a
 * column's qualifier that differs between rows is said in each cell.
 */
function runOrSteps(item: AuditItem): AuditItem[] {
  if (!item.run) return [item];
  const run = item.run;
  if (run.rows.length < MIN_RUN) return run.rows.map((row) => ({ step: keyTerms(row.step) }));
  const first = run.rows[0]!.step.terms;
  const symbols = (step: AuditStep) => step.terms.map((t) => `${t.kind}:${t.symbol}`).join('\u0000');
  if (!run.rows.every((row) => symbols(row.step) === symbols(run.rows[0]!.step))) {
    for (const row of run.rows) keyTerms(row.step);
    return [item];
  }
  const same = first.map((term, i) => run.rows.every(({ step }) => step.terms[i]!.href === term.href && step.terms[i]!.note === term.note));
  run.shared = first.filter((_, i) => same[i]);
  run.columns = first.flatMap((term, i) => (same[i] ? [] : [{ symbol: term.symbol, qualifier: run.rows.every(({ step }) => step.terms[i]!.qualifier === term.qualifier) ? term.qualifier : '' }]));
  for (const row of run.rows) row.step.terms = row.step.terms.filter((_, i) => !same[i]);
  return [item];
}

/** A run names each row's part and material only where no run above it on the page has named them for all its rows. */
function describedOnce(groups: AuditGroup[]): AuditGroup[] {
  const described = new Set<string>();
  for (const { items } of groups) {
    for (const { run } of items) {
      if (!run || run.subjects.length === 0) continue;
      const keys = run.rows.map((row) => `${run.subjects.join()}\u0000${row.key}`);
      if (keys.every((key) => described.has(key))) {
        run.subjects = [];
        for (const row of run.rows) row.subjects = [];
      }
      for (const key of keys) described.add(key);
    }
  }
  return groups;
}

const KEYED = /^(.+)\(([^()]+)\)$/;

/** Lays out a step's terms by key where they are a sum over keys (`AuditStep.keyed`); otherwise leaves them a list. */
function keyTerms(step: AuditStep): AuditStep {
  const columns: string[] = [];
  const unkeyed = new Set<string>();
  const rows: Array<{ key: string; cells: Map<string, AuditTerm> }> = [];
  let lead = 0;
  // Terms after the last keyed one whose names the first key does not have are terms of the whole sum (`Σ G·R1 / G_product`).
  let end = step.terms.length;
  const firstKey = step.terms.map((t) => KEYED.exec(t.symbol)?.[2]).find((key) => key !== undefined);
  let lastKeyed = -1;
  step.terms.forEach((t, i) => {
    if (KEYED.test(t.symbol)) lastKeyed = i;
  });
  const ofFirstKey = new Set<string>();
  for (let i = step.terms.findIndex((t) => KEYED.test(t.symbol)); i >= 0 && i < step.terms.length; i++) {
    const keyed = KEYED.exec(step.terms[i]!.symbol);
    if (keyed && keyed[2] !== firstKey) break;
    ofFirstKey.add(keyed ? keyed[1]! : step.terms[i]!.symbol);
  }
  while (end > lastKeyed + 1 && !ofFirstKey.has(step.terms[end - 1]!.symbol)) end--;
  const after = step.terms.slice(end);
  for (const term of step.terms.slice(0, end)) {
    const keyed = KEYED.exec(term.symbol);
    if (keyed) {
      const [, symbol, key] = keyed as unknown as [string, string, string];
      if (rows.at(-1)?.key !== key) rows.push({ key, cells: new Map() });
      if (rows.at(-1)!.cells.has(symbol)) return step;
      rows.at(-1)!.cells.set(symbol, term);
      if (!columns.includes(symbol)) columns.push(symbol);
    } else if (rows.length === 0) {
      lead++;
    } else {
      if (rows.at(-1)!.cells.has(term.symbol)) return step;
      rows.at(-1)!.cells.set(term.symbol, term);
      unkeyed.add(term.symbol);
      if (!columns.includes(term.symbol)) columns.push(term.symbol);
    }
  }
  if (rows.length < MIN_RUN || new Set(rows.map((row) => row.key)).size !== rows.length) return step;
  // A term without a key belongs to the key before it only if every key has one of its name (else it may be a term of the whole sum).
  if ([...unkeyed].some((symbol) => rows.some((row) => !row.cells.has(symbol)))) return step;
  const cells = rows.map((row) => columns.map((column) => row.cells.get(column)));
  step.keyed = {
    columns: columns.map((symbol, i) => {
      const qualifiers = new Set(cells.flatMap((row) => (row[i] ? [row[i]!.qualifier] : [])));
      return { symbol, qualifier: qualifiers.size === 1 ? [...qualifiers][0]! : '' };
    }),
    rows: rows.map((row, r) => ({ key: row.key, cells: cells[r]! })),
    after,
  };
  step.terms = step.terms.slice(0, lead);
  return step;
}

/** `text` replaced where it stands as a word of its own (a material id inside another word is left alone). */
function replaceWord(description: string, text: string, by: string): string {
  if (!text) return description;
  const inWord = (char: string | undefined) => char !== undefined && /[\w-]/.test(char);
  let out = '';
  let from = 0;
  for (let at = description.indexOf(text); at >= 0; at = description.indexOf(text, at + text.length)) {
    if (inWord(description[at - 1]) || inWord(description[at + text.length])) continue;
    out += description.slice(from, at) + by;
    from = at + text.length;
  }
  return from === 0 ? description : out + description.slice(from);
}
