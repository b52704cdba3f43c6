import { ChemError, molarMass, parseFormula, type Formula } from './formula.ts';

/**
 * A reaction as written — `2Al2O3 + 3C -> 4Al + 3CO2` — weighed with the standard atomic
 * weights: element and charge balance, the mass of every species per unit mass of a chosen
 * one, and the atom economy. The process calculators take their stoichiometric floors from
 * here, not from hard-coded ratios.
 */
export interface Species {
  formula: Formula;
  coefficient: number;
  /** Whether the coefficient was written (a reaction written with none may be balanced by loopsheet). */
  written: boolean;
  side: 'reactant' | 'product';
  /** g/mol */
  molarMass: number;
}

export interface Reaction {
  text: string;
  species: Species[];
}

export interface Imbalance {
  /** An element symbol, or `charge`. */
  what: string;
  reactants: number;
  products: number;
}

const ARROW = /\s*(?:->|→|=>|⟶|=)\s*/;

/** The reaction with these coefficients (a balance found for it), written as a practitioner writes it. */
export function withCoefficients(reaction: Reaction, coefficients: readonly number[]): Reaction {
  const species = reaction.species.map((s, i) => ({ ...s, coefficient: coefficients[i]!, written: true }));
  const side = (which: Species['side']) => species.filter((s) => s.side === which).map((s) => `${s.coefficient === 1 ? '' : `${s.coefficient} `}${s.formula.text}`).join(' + ');
  return { text: `${side('reactant')} -> ${side('product')}`, species };
}

export function parseReaction(input: string): Reaction {
  const text = input.trim();
  const sides = text.split(ARROW);
  if (sides.length !== 2) throw new ChemError('a reaction is two sides joined by one arrow (->, →, = or =>)', text, 0);
  const species: Species[] = [];
  sides.forEach((sideText, index) => {
    const side = index === 0 ? 'reactant' : 'product';
    // Species are separated by a plus with spaces around it; a plus without spaces is a charge (Na+).
    for (const term of sideText.split(/\s+\+\s+/)) {
      const match = /^(\d+\/\d+|\d+(?:\.\d+)?)?\s*(.+)$/.exec(term.trim());
      if (!match || !match[2]) throw new ChemError(`an empty species on the ${side} side`, text, text.indexOf(sideText));
      const coefficient = match[1] === undefined ? 1 : match[1].includes('/') ? Number(match[1].split('/')[0]) / Number(match[1].split('/')[1]) : Number(match[1]);
      let formula: Formula;
      try {
        formula = parseFormula(match[2]);
      } catch (error) {
        if (error instanceof ChemError) throw new ChemError(`${match[2]}: ${error.message}`, text, text.indexOf(match[2]) + error.position);
        throw error;
      }
      species.push({ formula, coefficient, written: match[1] !== undefined, side, molarMass: molarMass(formula) });
    }
  });
  return { text, species };
}

/** Every element and the charge whose totals differ between the sides (empty: balanced). */
export function imbalances(reaction: Reaction): Imbalance[] {
  const totals = new Map<string, { reactants: number; products: number }>();
  const count = (what: string, side: Species['side'], amount: number) => {
    const entry = totals.get(what) ?? { reactants: 0, products: 0 };
    if (side === 'reactant') entry.reactants += amount;
    else entry.products += amount;
    totals.set(what, entry);
  };
  for (const s of reaction.species) {
    for (const [element, atoms] of s.formula.elements) count(element, s.side, atoms * s.coefficient);
    count('charge', s.side, s.formula.charge * s.coefficient);
  }
  const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
  return [...totals].filter(([, t]) => !close(t.reactants, t.products)).map(([what, t]) => ({ what, ...t }));
}

/** The species named `name` (as written, or by the same formula): its index in the reaction. */
export function findSpecies(reaction: Reaction, name: string): number {
  const index = reaction.species.findIndex((s) => s.formula.text === name);
  if (index !== -1) return index;
  const wanted = parseFormula(name);
  const key = (f: Formula) => `${[...f.elements].sort(([a], [b]) => (a < b ? -1 : 1)).map(([e, n]) => `${e}${n}`).join('')}|${f.charge}`;
  return reaction.species.findIndex((s) => key(s.formula) === key(wanted));
}

/** Mass of each species per unit mass of species `per` (kg per kg, or t per t). */
export function massRatios(reaction: Reaction, per: number): number[] {
  const base = reaction.species[per]!;
  const baseMass = base.coefficient * base.molarMass;
  return reaction.species.map((s) => (s.coefficient * s.molarMass) / baseMass);
}

/** Atom economy: mass of the wanted product over the mass of all reactants (%). */
export function atomEconomy(reaction: Reaction, wanted: number): number {
  const product = reaction.species[wanted]!;
  const reactants = reaction.species.filter((s) => s.side === 'reactant').reduce((sum, s) => sum + s.coefficient * s.molarMass, 0);
  return (100 * product.coefficient * product.molarMass) / reactants;
}
