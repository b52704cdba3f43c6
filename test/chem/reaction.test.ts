import { describe, expect, it } from 'vitest';
import { chargeAhPerKg, dcEnergyKwhPerKg } from '../../src/chem/electrochemistry.ts';
import { molarMass, parseFormula } from '../../src/chem/formula.ts';
import { atomEconomy, findSpecies, imbalances, massRatios, parseReaction } from '../../src/chem/reaction.ts';
import { FARADAY_C_PER_MOL } from '../../src/reference/constants.ts';

describe('reactions', () => {
  it('Hall–Héroult, 2Al2O3 + 3C → 4Al + 3CO2: 0.334 kg C, 1.223 kg CO2 and 1.889 kg Al2O3 per kg Al', () => {
    // Stoichiometric floors of primary aluminium (field guide §4; follow from the balanced equation).
    const reaction = parseReaction('2Al2O3 + 3C -> 4Al + 3CO2');
    expect(imbalances(reaction)).toEqual([]);
    const ratios = massRatios(reaction, findSpecies(reaction, 'Al'));
    expect(ratios[findSpecies(reaction, 'C')]).toBeCloseTo(0.334, 3);
    expect(ratios[findSpecies(reaction, 'CO2')]).toBeCloseTo(1.223, 3);
    expect(ratios[findSpecies(reaction, 'Al2O3')]).toBeCloseTo(1.889, 3);
  });

  it('atom economy of 2Al2O3 → 4Al + 3O2 is 52.9 %', () => {
    // Atom economy = mass of wanted product / mass of all reactants (field guide §4).
    const reaction = parseReaction('2Al2O3 → 4Al + 3O2');
    expect(atomEconomy(reaction, findSpecies(reaction, 'Al'))).toBeCloseTo(52.9, 1);
  });

  it('names every element and the charge that do not balance', () => {
    const reaction = parseReaction('Al2O3 + C -> Al + CO2');
    expect(imbalances(reaction)).toEqual([
      { what: 'Al', reactants: 2, products: 1 },
      { what: 'O', reactants: 3, products: 2 },
    ]);
    expect(imbalances(parseReaction('Cu^2+ + e- -> Cu'))).toEqual([{ what: 'charge', reactants: 1, products: 0 }]);
    expect(imbalances(parseReaction('Cu^2+ + 2e- -> Cu'))).toEqual([]);
  });

  it('reads coefficients as integers, decimals and fractions, and species by formula', () => {
    const reaction = parseReaction('H2 + 1/2O2 = H2O');
    expect(reaction.species.map((s) => s.coefficient)).toEqual([1, 0.5, 1]);
    expect(imbalances(reaction)).toEqual([]);
    expect(findSpecies(parseReaction('2 Al2O3 + 3 C -> 4 Al + 3 CO2'), 'O2C')).toBe(3);
  });
});

describe("Faraday's law", () => {
  it('F = 96 485.332 12 C/mol (CODATA 2018, e·N_A, exact in the 2019 SI)', () => {
    expect(FARADAY_C_PER_MOL).toBeCloseTo(96485.33212, 5);
  });

  it('2 980 Ah per kg Al (z = 3), 843.5 Ah per kg Cu (z = 2)', () => {
    // Field guide §4 (Q = z·F·m/M).
    expect(chargeAhPerKg(3, molarMass(parseFormula('Al')))).toBeCloseTo(2980, 0);
    expect(chargeAhPerKg(2, molarMass(parseFormula('Cu')))).toBeCloseTo(843.5, 1);
  });

  it('13.2 kWh DC per kg Al at 4.2 V and 95 % current efficiency', () => {
    // Field guide §4: specific energy = charge × voltage / current efficiency.
    expect(dcEnergyKwhPerKg(3, molarMass(parseFormula('Al')), 4.2, 0.95)).toBeCloseTo(13.2, 1);
  });
});
