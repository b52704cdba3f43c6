import { changeReport, changeReportJson, changeReportMarkdown, type FailOverMethods } from '../diff/report.ts';
import { readResultsSet } from '../diff/results-set.ts';
import { EXIT, UsageError, type Io } from './io.ts';

export interface DiffOptions {
  old: string;
  new: string;
  threshold: number;
  failOver?: number;
  failOverMethods?: FailOverMethods;
  format: 'md' | 'json';
}

/** A share as written on the command line: `1%`, `0.5 %` or a fraction such as `0.01`. */
export function parseShare(text: string, option: string): number {
  const percent = /^\s*(\d+(?:\.\d+)?)\s*%\s*$/.exec(text);
  const fraction = /^\s*(\d+(?:\.\d+)?)\s*$/.exec(text);
  const value = percent ? Number(percent[1]) / 100 : fraction ? Number(fraction[1]) : NaN;
  if (!Number.isFinite(value)) throw new UsageError(`${option} ${text}: expected a percentage such as 1% or a fraction such as 0.01`);
  return value;
}

/** Exit 0, or 1 when `--fail-over` was given and a headline figure moved more than it allows. */
export async function runDiff(options: DiffOptions, io: Io): Promise<number> {
  const [old, now] = await Promise.all([readResultsSet(options.old), readResultsSet(options.new)]);
  const report = await changeReport(old, now, { threshold: options.threshold, ...(options.failOver !== undefined ? { failOver: options.failOver } : {}), ...(options.failOverMethods ? { failOverMethods: options.failOverMethods } : {}) });
  io.out(options.format === 'json' ? changeReportJson(report) : changeReportMarkdown(report));
  if (report.over.length > 0) {
    io.err(`loopsheet diff: ${report.over.length} ${report.fail_over_methods === 'all' ? '' : 'declared '}headline figure(s) moved more than ${options.failOver! * 100} %: ${report.over.slice(0, 5).map((o) => `${o.product_id} ${o.figure}`).join(', ')}${report.over.length > 5 ? ', …' : ''}`);
    return EXIT.input;
  }
  return EXIT.ok;
}
