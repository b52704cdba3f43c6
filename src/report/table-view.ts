import type { Table } from '../schema/table.ts';
import { formatAmount, formatShare } from '../format.ts';
import { physicalLines } from '../load/lines.ts';

/**
 * View models for the site: everything a template prints, already formatted, so the
 * templates only lay it out (no arithmetic in Nunjucks).
 */
export interface SourceRef {
  /** `bom.csv:12` */
  label: string;
  file: string;
  line: number;
  /** The record exactly as it appears in the file. */
  written: string;
  /** The row on the product's audit trail, where the page has one. */
  href?: string;
}

export interface Cell {
  text: string;
  /** Right-aligned number column. */
  numeric?: boolean;
  /** A link, relative to the page the cell is on. */
  href?: string;
  /** Links after the text (e.g. the products that read a factor row). */
  links?: Array<{ text: string; href: string }>;
}

export interface TableView {
  title: string;
  caption: string;
  headers: Array<{ text: string; numeric?: boolean }>;
  rows: Array<{ cells: Cell[]; source: SourceRef; anchor?: string }>;
  empty: string;
}

/** Where a table row comes from: its file and line, and the record as written. */
export function sourceOf(table: Table<unknown>, row: { line: number; lineEnd: number }): SourceRef {
  const lines = physicalLines(table.csv);
  return {
    label: `${table.file}:${row.line}`,
    file: table.file,
    line: row.line,
    written: lines.slice(row.line - 1, row.lineEnd).join('\n'),
  };
}

export const num = (value: number): Cell => ({ text: formatAmount(value), numeric: true });
export const pct = (value: number): Cell => ({ text: formatShare(value), numeric: true });
export const txt = (value: string | undefined): Cell => ({ text: value ?? '' });
