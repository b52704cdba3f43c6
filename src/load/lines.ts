/**
 * An input file's physical lines, split once per file (not once per row or per product),
 * so a row can be shown exactly as it appears in the file. Line endings are normalised as
 * the readers normalise them, so line n here is line n of every problem message.
 */
const cache = new WeakMap<object, string[]>();

export function physicalLines(source: { text: string }): string[] {
  let lines = cache.get(source);
  if (!lines) cache.set(source, (lines = source.text.replace(/\r\n?/g, '\n').split('\n')));
  return lines;
}
