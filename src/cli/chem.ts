import { ChemError } from '../chem/formula.ts';
import { atomEconomy, findSpecies, imbalances, massRatios, parseReaction } from '../chem/reaction.ts';
import { ATOMIC_WEIGHTS_SOURCE } from '../reference/atomic-weights.ts';
import { formatFixed, formatSignificant } from '../format.ts';
import { EXIT, UsageError, type Io } from './io.ts';

export interface ChemOptions {
  reaction: string;
  per?: string;
  unit: 'kg' | 't';
  json: boolean;
}

/**
 * `loopsheet chem`: weighs a reaction. Exit 0 when it balances, 1 when an element or the
 * charge does not (the imbalance is printed), 2 when it cannot be read.
 */
export async function runChem(options: ChemOptions, io: Io): Promise<number> {
  let reaction;
  try {
    reaction = parseReaction(options.reaction);
  } catch (error) {
    // The reaction is a command-line argument: a usage error here, shown with a caret under the place.
    if (error instanceof ChemError) throw new UsageError(`cannot read the reaction: ${error.message}\n  ${error.text}\n  ${' '.repeat(error.position)}^`);
    throw error;
  }
  const products = reaction.species.map((s, i) => ({ s, i })).filter(({ s }) => s.side === 'product');
  let per = products[0]?.i ?? 0;
  if (options.per !== undefined) {
    let found = -1;
    try {
      found = findSpecies(reaction, options.per);
    } catch {
      found = -1;
    }
    if (found === -1) throw new UsageError(`--per ${options.per}: not a species of the reaction (${reaction.species.map((s) => s.formula.text).join(', ')})`);
    per = found;
  }
  const wanted = reaction.species[per]!.side === 'product' ? per : (products[0]?.i ?? per);
  const unbalanced = imbalances(reaction);
  const ratios = massRatios(reaction, per);
  const economy = atomEconomy(reaction, wanted);
  const perName = reaction.species[per]!.formula.text;

  if (options.json) {
    io.out(
      JSON.stringify(
        {
          reaction: reaction.text,
          balanced: unbalanced.length === 0,
          imbalances: unbalanced,
          per: perName,
          unit: options.unit,
          species: reaction.species.map((s, i) => ({ formula: s.formula.text, side: s.side, coefficient: s.coefficient, molar_mass_g_per_mol: s.molarMass, mass_per_unit_of_per: ratios[i] })),
          atom_economy_pct: economy,
          atom_economy_product: reaction.species[wanted]!.formula.text,
          atomic_weights: ATOMIC_WEIGHTS_SOURCE,
        },
        null,
        1,
      ),
    );
  } else {
    const rows = reaction.species.map((s, i) => [s.formula.text, s.side, String(s.coefficient), formatSignificant(s.molarMass, 7), formatSignificant(ratios[i]!, 4)]);
    const head = ['species', 'side', 'coefficient', 'molar mass (g/mol)', `${options.unit} per ${options.unit} ${perName}`];
    const widths = head.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c]!.length)));
    const line = (cells: string[]) => cells.map((cell, c) => (c >= 2 ? cell.padStart(widths[c]!) : cell.padEnd(widths[c]!))).join('  ');
    io.out(
      [
        reaction.text,
        unbalanced.length === 0 ? 'balanced: every element and the charge' : `NOT balanced: ${unbalanced.map((u) => `${u.what} ${formatSignificant(u.reactants, 6)} → ${formatSignificant(u.products, 6)}`).join(', ')} (reactants → products)`,
        '',
        line(head),
        ...rows.map(line),
        '',
        `atom economy (${reaction.species[wanted]!.formula.text} of all reactants): ${formatFixed(economy, 1)} %`,
        `molar masses: ${ATOMIC_WEIGHTS_SOURCE}`,
      ].join('\n'),
    );
  }
  return unbalanced.length === 0 ? EXIT.ok : EXIT.input;
}
