/**
 * The one number formatter. Inputs are shown with up to six significant figures so a
 * reader can compare them with the file; results (later) in scientific notation with a
 * configurable number of significant figures. Locale-free on purpose: output must be
 * byte-identical on every machine.
 */
export function formatInput(value: number): string {
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e-3 && magnitude < 1e7) return String(Number(value.toPrecision(6)));
  return formatScientific(value, 6).replace(/\.?0+e/, 'e');
}

/** A figure's value as the audit trail shows it: six significant figures, or `n/a` where a value is not available (NaN). */
export const formatFigure = (value: number): string => (Number.isNaN(value) ? 'n/a' : formatInput(value));

/** 3 significant figures by default: `1.23e+1` style, as declarations print them. */
export function formatScientific(value: number, significant = 3): string {
  return value.toExponential(significant - 1);
}

/** A share as a percentage with up to three decimals: 0.45 → "45 %". */
export function formatShare(value: number): string {
  return `${Number((value * 100).toFixed(3))} %`;
}
