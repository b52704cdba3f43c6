import { describe, expect, it } from 'vitest';
import { fraction, lusolve, matrix } from 'mathjs';
import { balanceReaction } from '../../src/chem/balance.ts';
import { parseFormula } from '../../src/chem/formula.ts';
import { imbalances, parseReaction, withCoefficients } from '../../src/chem/reaction.ts';

const balance = (text: string) => balanceReaction(parseReaction(text));

describe('balancing a reaction written without coefficients (exact rational arithmetic)', () => {
  // Standard equations of general chemistry texts (common practice); each result is checked to balance too.
  it.each([
    ['C3H8 + O2 -> CO2 + H2O', [1, 5, 3, 4]],
    ['Al2O3 + C -> Al + CO2', [2, 3, 4, 3]],
    ['Fe2O3 + CO -> Fe + CO2', [1, 3, 2, 3]],
    ['Cu + HNO3 -> Cu(NO3)2 + NO + H2O', [3, 8, 3, 2, 4]],
    ['MnO4- + Fe2+ + H+ -> Mn2+ + Fe3+ + H2O', [1, 5, 8, 1, 5, 4]],
    ['Cr2O72- + Fe2+ + H+ -> Cr3+ + Fe3+ + H2O', [1, 6, 14, 2, 6, 7]],
    ['ZnS + O2 -> ZnO + SO2', [2, 3, 2, 2]],
  ])('%s → %j', (text, expected) => {
    const result = balance(text);
    expect(result).toEqual({ ok: true, coefficients: expected });
    expect(imbalances(withCoefficients(parseReaction(text), expected))).toEqual([]);
  });

  it('agrees with a general-purpose solver: the coefficients solve the element matrix with one coefficient fixed (mathjs lusolve on fractions)', () => {
    // Cu + HNO3 -> Cu(NO3)2 + NO + H2O with the last coefficient fixed at 4: Cu, H, N, O rows.
    const A = matrix([
      [1, 0, -1, 0].map((v) => fraction(v)),
      [0, 1, 0, 0].map((v) => fraction(v)),
      [0, 1, -2, -1].map((v) => fraction(v)),
      [0, 3, -6, -1].map((v) => fraction(v)),
    ]);
    const b = matrix([0, 8, 0, 4].map((v) => fraction(v)));
    const solved = (lusolve(A, b).valueOf() as unknown as Array<[{ valueOf(): number }]>).map(([x]) => x.valueOf());
    expect([...solved, 4]).toEqual((balance('Cu + HNO3 -> Cu(NO3)2 + NO + H2O') as { coefficients: number[] }).coefficients);
  });

  it('says when there is no balance, more than one, or only one with a species on the wrong side', () => {
    expect(balance('H2 -> O2')).toMatchObject({ ok: false, reason: 'none' });
    expect(balance('H2 + O2 -> H2O + H2O2')).toMatchObject({ ok: false, reason: 'not unique' });
    expect(balance('H2 + H2O -> O2')).toMatchObject({ ok: false, reason: 'sign' });
  });
});

describe('ions as ionic equations write them', () => {
  it.each([
    ['Cu2+', { Cu: 1 }, 2],
    ['Fe3+', { Fe: 1 }, 3],
    ['O2-', { O: 1 }, -2],
    ['NH4+', { N: 1, H: 4 }, 1],
    ['SO42-', { S: 1, O: 4 }, -2],
    ['Cr2O72-', { Cr: 2, O: 7 }, -2],
    ['Hg22+', { Hg: 2 }, 2],
    ['Fe+3', { Fe: 1 }, 3],
    ['SO4^2-', { S: 1, O: 4 }, -2],
    ['Al³⁺', { Al: 1 }, 3],
  ])('%s', (text, elements, charge) => {
    const formula = parseFormula(text);
    expect(Object.fromEntries(formula.elements)).toEqual(elements);
    expect(formula.charge).toBe(charge);
    expect(formula.text).toBe(text);
  });
});
