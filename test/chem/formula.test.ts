import { describe, expect, it } from 'vitest';
import { MF } from 'mf-parser';
import { ChemError, molarMass, parseFormula } from '../../src/chem/formula.ts';
import { ATOMIC_WEIGHTS } from '../../src/reference/atomic-weights.ts';

/**
 * Molar masses against mf-parser, a general-purpose chemistry library from the npm registry
 * with its own table of atomic weights (chemical-elements). The two tables differ in the
 * last digits where IUPAC gives an interval and a conventional value (C 12.011 here,
 * 12.0107 there), hence the relative tolerance of 2·10⁻⁴. mf-parser reads a dot as a
 * separator of parts, so hydrates are given to it with parentheses.
 */
const FORMULAS: Array<[string, string?]> = [
  ['H2O'],
  ['Al2O3'],
  ['CO2'],
  ['Na3AlF6'],
  ['AlF3'],
  ['Ca(OH)2'],
  ['CuSO4·5H2O', 'CuSO4(H2O)5'],
  ['CuSO4.5H2O', 'CuSO4(H2O)5'],
  ['Al2(SO4)3'],
  ['Fe2O3'],
  ['Fe3O4'],
  ['ZnS'],
  ['Cu2S'],
  ['CuFeS2'],
  ['K4[Fe(CN)6]', 'K4Fe(CN)6'],
  ['Mg(NO3)2·6H2O', 'Mg(NO3)2(H2O)6'],
  ['NiSO4·6H2O', 'NiSO4(H2O)6'],
  ['Ca3(PO4)2'],
  ['SnO2'],
  ['PbS'],
  ['CF4'],
  ['C2F6'],
  ['SF6'],
];

describe('molar masses from the IUPAC standard atomic weights', () => {
  it.each(FORMULAS)('%s agrees with mf-parser', (formula, asMfParser) => {
    const expected = new MF(asMfParser ?? formula).getInfo().mass as number;
    const mass = molarMass(parseFormula(formula));
    expect(Math.abs(mass - expected) / expected).toBeLessThan(2e-4);
  });

  it('every element of the table agrees with mf-parser within 2·10⁻⁴', () => {
    for (const [symbol, weight] of Object.entries(ATOMIC_WEIGHTS)) {
      const expected = new MF(symbol).getInfo().mass as number;
      expect(Math.abs(weight - expected) / expected, symbol).toBeLessThan(2e-4);
    }
  });

  it('reads the atoms, groups and charges as written', () => {
    expect(Object.fromEntries(parseFormula('Ca(OH)2').elements)).toEqual({ Ca: 1, O: 2, H: 2 });
    expect(Object.fromEntries(parseFormula('CuSO4·5H2O').elements)).toEqual({ Cu: 1, S: 1, O: 9, H: 10 });
    expect(parseFormula('Al^3+').charge).toBe(3);
    expect(parseFormula('SO4^2-').charge).toBe(-2);
    expect(parseFormula('Al³⁺').charge).toBe(3);
    expect(parseFormula('Na+').charge).toBe(1);
    expect(parseFormula('Cl-').charge).toBe(-1);
    expect(parseFormula('e-')).toMatchObject({ charge: -1, elements: new Map() });
  });

  it.each([
    ['Xq2', /"Xq" is not an element/],
    ['Ca(OH2', /"\)" expected/],
    ['CaOH)2', /unexpected "\)"/],
    ['Al^3', /a charge is written/],
    ['', /a formula expected/],
  ])('refuses %j with a located message', (formula, message) => {
    expect(() => parseFormula(formula)).toThrow(ChemError);
    expect(() => parseFormula(formula)).toThrow(message);
  });
});
