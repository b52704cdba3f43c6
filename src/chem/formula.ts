import { ATOMIC_WEIGHTS } from '../reference/atomic-weights.ts';
import { nearestName } from '../reference/nearest.ts';
import { ToolError } from '../problems.ts';

/**
 * Chemical formulas as practitioners type them: parentheses and brackets (`Ca(OH)2`,
 * `[Fe(CN)6]`), hydrates and adducts after `·`, `.`, `*` or `•` with a leading count
 * (`CuSO4·5H2O`), and charges after `^` (`Al^3+`, `SO4^2-`), as Unicode superscripts
 * (`Al³⁺`), or as trailing signs (`Na+`, `Cl-`, `e-`). `e` is the electron.
 */
export interface Formula {
  text: string;
  /** Atoms per formula unit, by element, in order of first appearance. */
  elements: Map<string, number>;
  charge: number;
}

/**
 * A formula or reaction that cannot be read: an input error (the one error type, kind
 * `input`), with the text and the position to point at.
 */
export class ChemError extends ToolError {
  constructor(
    message: string,
    readonly text: string,
    readonly position: number,
  ) {
    super('input', message);
  }
}

const SUPERSCRIPT_DIGITS = '⁰¹²³⁴⁵⁶⁷⁸⁹';
const HYDRATE_SEPARATORS = new Set(['·', '.', '*', '•', '⋅']);
const ELEMENT_SYMBOLS = Object.keys(ATOMIC_WEIGHTS);

/**
 * Ion charges as plain text writes them in ionic equations, rewritten to `^`: a monatomic ion's
 * digit before the sign is its charge (`Cu2+` is Cu²⁺, `Fe3+`, `O2-`); a polyatomic ion's is
 * the count of its last atom unless a second digit follows (`NH4+` is NH₄⁺, `SO42-` is
 * SO₄²⁻, `Hg22+` is Hg₂²⁺); a sign before the digits is a charge too (`Fe+3`).
 */
function plainTextCharge(text: string): string {
  const signFirst = /^(.*[A-Za-z)\]])([+-])(\d+)$/.exec(text);
  if (signFirst) return `${signFirst[1]}^${signFirst[3]}${signFirst[2]}`;
  const digitsFirst = /^(.*?[A-Za-z)\]])(\d+)([+-])$/.exec(text);
  if (!digitsFirst) return text;
  const [, body, digits, sign] = digitsFirst as unknown as [string, string, string, string];
  if (digits.length >= 2) return `${body}${digits.slice(0, -1)}^${digits.at(-1)}${sign}`;
  return /^[A-Z][a-z]?$/.test(body) ? `${body}^${digits}${sign}` : text;
}

export function parseFormula(input: string): Formula {
  const written = input.trim();
  if (written === 'e' || written === 'e-' || written === 'e^-' || written === 'e⁻') return { text: written, elements: new Map(), charge: -1 };
  // Positions in problems point into the text as it was written; the charge is read from its ^ form.
  const text = plainTextCharge(written);
  let pos = 0;
  const fail = (message: string): never => {
    throw new ChemError(message, text, pos);
  };
  const readCount = (): number | undefined => {
    const start = pos;
    while (pos < text.length && /[0-9]/.test(text[pos]!)) pos++;
    return pos > start ? Number(text.slice(start, pos)) : undefined;
  };
  const add = (into: Map<string, number>, from: Map<string, number>, times: number) => {
    for (const [element, count] of from) into.set(element, (into.get(element) ?? 0) + count * times);
  };

  // group := (element | "(" group+ ")" | "[" group+ "]") count?
  const readGroups = (closing?: string): Map<string, number> => {
    const atoms = new Map<string, number>();
    while (pos < text.length) {
      const c = text[pos]!;
      if (c === '(' || c === '[') {
        pos++;
        const inner = readGroups(c === '(' ? ')' : ']');
        add(atoms, inner, readCount() ?? 1);
      } else if (c === ')' || c === ']') {
        if (c !== closing) fail(`unexpected "${c}"`);
        pos++;
        return atoms;
      } else if (/[A-Z]/.test(c)) {
        const next = text[pos + 1] ?? '';
        const symbol = /[a-z]/.test(next) ? c + next : c;
        if (ATOMIC_WEIGHTS[symbol] === undefined) {
          const near = nearestName(symbol, ELEMENT_SYMBOLS);
          fail(`"${symbol}" is not an element with a standard atomic weight${near ? ` (did you mean "${near}"?)` : ''}`);
        }
        pos += symbol.length;
        atoms.set(symbol, (atoms.get(symbol) ?? 0) + (readCount() ?? 1));
      } else break;
    }
    if (closing) fail(`"${closing}" expected`);
    return atoms;
  };

  const elements = new Map<string, number>();
  for (;;) {
    const multiplier = readCount() ?? 1;
    const start = pos;
    const part = readGroups();
    if (pos === start) fail(pos < text.length ? `unexpected "${text[pos]}"` : 'a formula expected');
    add(elements, part, multiplier);
    if (!HYDRATE_SEPARATORS.has(text[pos] ?? '')) break;
    pos++;
  }
  const charge = readCharge(text, pos, fail);
  return { text: written, elements, charge };
}

function readCharge(text: string, from: number, fail: (message: string) => never): number {
  const rest = text.slice(from);
  if (rest === '') return 0;
  let match = /^\^(\d*)([+-])$/.exec(rest);
  if (match) return (match[2] === '+' ? 1 : -1) * (match[1] ? Number(match[1]) : 1);
  match = /^([⁰¹²³⁴⁵⁶⁷⁸⁹]*)([⁺⁻])$/.exec(rest);
  if (match) {
    const digits = [...match[1]!].map((d) => SUPERSCRIPT_DIGITS.indexOf(d)).join('');
    return (match[2] === '⁺' ? 1 : -1) * (digits ? Number(digits) : 1);
  }
  if (/^\++$/.test(rest)) return rest.length;
  if (/^-+$/.test(rest)) return -rest.length;
  return fail(`unexpected "${rest}": a charge is written ^2+, ²⁺ or a trailing + or -`);
}

/** Molar mass in g/mol from the standard atomic weights. */
export function molarMass(formula: Formula): number {
  let mass = 0;
  for (const [element, count] of formula.elements) mass += ATOMIC_WEIGHTS[element]! * count;
  return mass;
}
