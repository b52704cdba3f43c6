import { balanceReaction } from '../chem/balance.ts';
import { ChemError } from '../chem/formula.ts';
import { atomEconomy, findSpecies, imbalances, massRatios, parseReaction, withCoefficients, type Reaction } from '../chem/reaction.ts';
import { ATOMIC_WEIGHTS_SOURCE } from '../reference/atomic-weights.ts';
import { formatFixed, formatSignificant } from '../format.ts';
import { EXIT, UsageError, type Io } from './io.ts';

export interface ChemOptions {
  reaction: string;
  per?: string;
  unit: 'kg' | 't';
  json: boolean;
}

/** How the coefficients came about: as written, or found by loopsheet for a reaction written without any. */
type Coefficients = { by: 'as written' } | { by: 'loopsheet'; written: string } | { by: 'none'; why: string };

/**
 * `loopsheet chem`: weighs a reaction. A reaction written without coefficients is balanced
 * first. Exit 0 when it balances, 1 when an element or the charge does not, or no balance
 * exists (the imbalance or the reason is printed, and no masses), 2 when it cannot be read.
 */
export async function runChem(options: ChemOptions, io: Io): Promise<number> {
  let reaction: Reaction;
  try {
    reaction = parseReaction(options.reaction);
  } catch (error) {
    // The reaction is a command-line argument: a usage error here, shown with a caret under the place.
    if (error instanceof ChemError) throw new UsageError(`cannot read the reaction: ${error.message}\n  ${error.text}\n  ${' '.repeat(error.position)}^`);
    throw error;
  }
  let coefficients: Coefficients = { by: 'as written' };
  if (!reaction.species.some((s) => s.written) && imbalances(reaction).length > 0) {
    const balanced = balanceReaction(reaction);
    if (balanced.ok) {
      coefficients = { by: 'loopsheet', written: reaction.text };
      reaction = withCoefficients(reaction, balanced.coefficients);
    } else coefficients = { by: 'none', why: balanced.message };
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
  const balanced = unbalanced.length === 0;
  // Masses of an unbalanced reaction would be numbers of nothing: none are printed.
  const ratios = balanced ? massRatios(reaction, per) : undefined;
  const economy = balanced ? atomEconomy(reaction, wanted) : undefined;
  const perName = reaction.species[per]!.formula.text;

  if (options.json) {
    io.out(
      JSON.stringify(
        {
          reaction: reaction.text,
          balanced,
          coefficients_by: coefficients.by,
          ...(coefficients.by === 'loopsheet' ? { written: coefficients.written } : {}),
          ...(coefficients.by === 'none' ? { no_balance: coefficients.why } : {}),
          imbalances: unbalanced,
          per: perName,
          unit: options.unit,
          species: reaction.species.map((s, i) => ({ formula: s.formula.text, side: s.side, coefficient: s.coefficient, molar_mass_g_per_mol: s.molarMass, mass_per_unit_of_per: ratios ? ratios[i] : null })),
          atom_economy_pct: economy ?? null,
          atom_economy_product: reaction.species[wanted]!.formula.text,
          atomic_weights: ATOMIC_WEIGHTS_SOURCE,
        },
        null,
        1,
      ),
    );
  } else {
    const rows = reaction.species.map((s, i) => [s.formula.text, s.side, String(s.coefficient), formatSignificant(s.molarMass, 7), ...(ratios ? [formatSignificant(ratios[i]!, 4)] : [])]);
    const head = ['species', 'side', 'coefficient', 'molar mass (g/mol)', ...(ratios ? [`${options.unit} per ${options.unit} ${perName}`] : [])];
    const widths = head.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c]!.length)));
    const line = (cells: string[]) => cells.map((cell, c) => (c >= 2 ? cell.padStart(widths[c]!) : cell.padEnd(widths[c]!))).join('  ');
    const status = balanced
      ? `balanced: every element and the charge${coefficients.by === 'loopsheet' ? ` (coefficients found by loopsheet, exact arithmetic, for ${coefficients.written})` : ''}`
      : `NOT balanced: ${unbalanced.map((u) => `${u.what} ${formatSignificant(u.reactants, 6)} → ${formatSignificant(u.products, 6)}`).join(', ')} (reactants → products)${coefficients.by === 'none' ? `; ${coefficients.why}` : ''}; no masses are given for an unbalanced reaction`;
    io.out(
      [
        reaction.text,
        status,
        '',
        line(head),
        ...rows.map(line),
        '',
        ...(economy !== undefined ? [`atom economy (${reaction.species[wanted]!.formula.text} of all reactants): ${formatFixed(economy, 1)} %`] : []),
        `molar masses: ${ATOMIC_WEIGHTS_SOURCE}`,
      ].join('\n'),
    );
  }
  return balanced ? EXIT.ok : EXIT.input;
}
