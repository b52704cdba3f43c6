/**
 * The one number formatter. Inputs are shown with up to six significant figures so a
 * reader can compare them with the file; results (later) in scientific notation with a
 * configurable number of significant figures. Locale-free on purpose: output must be
 * byte-identical on every machine.
 */
export function formatInput(value: number): string {
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e7) {
    // String(Number(value.toPrecision(6))) without its second conversion (an audit page formats thousands): trailing zeros cut.
    const text = value.toPrecision(6);
    if (text.includes('e')) return String(Number(text));
    if (!text.includes('.')) return text;
    let end = text.length;
    while (text.charCodeAt(end - 1) === 48) end--;
    if (text.charCodeAt(end - 1) === 46) end--;
    return text.slice(0, end);
  }
  return formatScientific(value, 6).replace(/\.?0+E/, 'E');
}

/**
 * An input amount on a page: as `formatInput`, with the thousands of a number of five or more
 * whole digits grouped as counts are (1200000 → "1,200,000"), so a large output or meter reading
 * reads at a glance. Pages only: files (results.csv, results.json) keep plain numbers.
 */
export function formatAmount(value: number): string {
  const text = formatInput(value);
  const match = /^(-?)(\d{5,})(\.\d+)?$/.exec(text);
  return match ? `${match[1]}${formatCount(Number(match[2]))}${match[3] ?? ''}` : text;
}

/**
 * How the pages say that something is missing, two ways and no more: a number that is not
 * available (an input it needs is empty: never a silent zero) is `n/a`; a cell the inputs
 * leave empty where nothing is required (no recycled factor named, no pedigree score) is `—`.
 */
export const NOT_AVAILABLE = 'n/a';
export const NOT_GIVEN = '—';

/** A figure's value as the audit trail shows it: six significant figures, or `n/a` where a value is not available (NaN). */
export const formatFigure = (value: number): string => (Number.isNaN(value) ? NOT_AVAILABLE : formatInput(value));

/** `digits` significant figures in the shortest form (0.0425, 1230), or `n/a`: what explain and diff print. */
export const formatSignificant = (value: number | null, digits: number): string => (value === null || Number.isNaN(value) ? NOT_AVAILABLE : String(Number(value.toPrecision(digits))));

/** A number with a fixed number of decimals (a DQR, 2.25), or `n/a`. */
export const formatFixed = (value: number | null, decimals: number): string => (value === null || !Number.isFinite(value) ? NOT_AVAILABLE : value.toFixed(decimals));

/** A whole number with thousands separated by commas, as English text writes a count: 10000 → "10,000". */
export const formatCount = (value: number): string => String(value).replace(/\B(?=(\d{3})+(?!\d))/g, ',');

/** A count with its noun: `1 product`, `7 products` (the count as formatCount writes it). */
export const formatCounted = (value: number, one: string, many: string): string => `${formatCount(value)} ${value === 1 ? one : many}`;

/** 3 significant figures by default, in the notation declarations print: `1.23E+01`, `-4.50E-03`. */
export function formatScientific(value: number, significant = 3): string {
  // toExponential writes 1.35e+0; declarations write 1.35E+00 (at least two exponent digits).
  return value.toExponential(significant - 1).replace(/e([+-])(\d)$/, 'e$10$2').replace('e', 'E');
}

/** A share as a percentage at one precision everywhere, one decimal: 0.45 → "45.0 %", 0.62998 → "63.0 %". */
export function formatShare(value: number): string {
  return `${(value * 100).toFixed(1)} %`;
}

/**
 * Text for a terminal, with control characters shown, not obeyed: input text (a column name,
 * an id in a message) may hold escape sequences that would recolour, move or clear the
 * user's terminal, or a carriage return that hides what came before. Line breaks and tabs
 * stay; every other C0 and C1 control and DEL is written as `\u001b` (the JSON escape, so
 * `check --json` stays valid JSON). Applied to everything the CLI writes (src/cli/main.ts `processIo`).
 */
export function showControls(text: string): string {
  return text.replace(/[\u0000-\u0008\u000b-\u001f\u007f-\u009f]/g, (char) => `\\u${char.charCodeAt(0).toString(16).padStart(4, '0')}`);
}
