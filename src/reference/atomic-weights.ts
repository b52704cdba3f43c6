/**
 * Standard atomic weights of the elements, g/mol.
 *
 * Source: IUPAC Commission on Isotopic Abundances and Atomic Weights (CIAAW), "Standard
 * atomic weights of the elements 2021" (Prohaska et al., Pure Appl. Chem. 94 (2022)
 * 573–600). For the elements whose standard atomic weight is an interval (H, Li, B, C, N,
 * O, Mg, Si, S, Cl, Ar, Br, Tl) the table's conventional value is used; for the others the
 * standard value, rounded to at most five decimals. Written down from memory of the table
 * and checked against the independent table of the mf-parser package (test/chem).
 * Elements without a standard atomic weight (no stable isotope, e.g. Tc, Pm, Po) are absent.
 */
export const ATOMIC_WEIGHTS: Readonly<Record<string, number>> = {
  H: 1.008, He: 4.002602, Li: 6.94, Be: 9.0121831, B: 10.81, C: 12.011, N: 14.007, O: 15.999, F: 18.998403163, Ne: 20.1797,
  Na: 22.98976928, Mg: 24.305, Al: 26.9815384, Si: 28.085, P: 30.973761998, S: 32.06, Cl: 35.45, Ar: 39.95, K: 39.0983, Ca: 40.078,
  Sc: 44.955908, Ti: 47.867, V: 50.9415, Cr: 51.9961, Mn: 54.938043, Fe: 55.845, Co: 58.933194, Ni: 58.6934, Cu: 63.546, Zn: 65.38,
  Ga: 69.723, Ge: 72.63, As: 74.921595, Se: 78.971, Br: 79.904, Kr: 83.798, Rb: 85.4678, Sr: 87.62, Y: 88.90584, Zr: 91.224,
  Nb: 92.90637, Mo: 95.95, Ru: 101.07, Rh: 102.90549, Pd: 106.42, Ag: 107.8682, Cd: 112.414, In: 114.818, Sn: 118.71, Sb: 121.76,
  Te: 127.6, I: 126.90447, Xe: 131.293, Cs: 132.90545196, Ba: 137.327, La: 138.90547, Ce: 140.116, Pr: 140.90766, Nd: 144.242, Sm: 150.36,
  Eu: 151.964, Gd: 157.25, Tb: 158.925354, Dy: 162.5, Ho: 164.930328, Er: 167.259, Tm: 168.934218, Yb: 173.045, Lu: 174.9668, Hf: 178.486,
  Ta: 180.94788, W: 183.84, Re: 186.207, Os: 190.23, Ir: 192.217, Pt: 195.084, Au: 196.96657, Hg: 200.592, Tl: 204.38, Pb: 207.2,
  Bi: 208.9804, Th: 232.0377, Pa: 231.03588, U: 238.02891,
};

export const ATOMIC_WEIGHTS_SOURCE = 'IUPAC CIAAW standard atomic weights 2021 (conventional values where the standard weight is an interval)';
