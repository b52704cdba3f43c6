import { ABOVE_CARBON } from '../reference/smelting.ts';
import { CO2_PER_C } from '../reference/constants.ts';
import { nonNegative, share, StepRecorder, type ProcessResult } from './steps.ts';
import { formatFixed } from '../format.ts';

/** A carbon carrier in or out of the furnace, per tonne of metal. */
export interface CarbonStream {
  name: string;
  /** Tonnes per tonne of metal. */
  mass_t_per_t: number;
  /** Carbon content as a mass share. */
  carbon_share: number;
}

export interface CarbothermicReduction {
  metal: string;
  /** Reductants and fuels charged (coke, coal, electrode paste, natural gas as carbon). */
  inputs: CarbonStream[];
  /** Carbon leaving in the product and by-products (metal, slag, dust) — not as CO2. */
  outputs: CarbonStream[];
}

/**
 * CO2 by the IPCC 2006 carbon mass balance (Vol. 3, Ch. 4.2): (C in − C out)·44/12.
 * Metals above carbon in the reactivity series are refused: they are won by electrolysis.
 */
export function carbothermicReduction(p: CarbothermicReduction): ProcessResult {
  const rec = new StepRecorder();
  const symbol = p.metal.trim();
  if ((ABOVE_CARBON as readonly string[]).includes(symbol)) {
    rec.problem('metal', symbol, `${symbol} is above carbon in the reactivity series: carbon cannot reduce its oxide, it is won by electrolysis of a molten compound`, 'a metal below carbon (Zn, Fe, Sn, Pb, Cu, …), or the electrolysis calculator');
    return rec.result();
  }
  if (p.inputs.length === 0) rec.problem('reductant', '', 'no reductant or fuel is given', 'at least one reductant with its mass and carbon share');
  const carbon = (streams: CarbonStream[], direction: 'in' | 'out'): string[] =>
    streams.flatMap((s) => {
      const prefix = direction === 'in' ? 'reductant' : 'carbon_out';
      const massOk = nonNegative(rec, `${prefix}:${s.name}`, s.mass_t_per_t);
      const shareOk = share(rec, `${prefix}_carbon:${s.name}`, s.carbon_share, { allowZero: true });
      if (!massOk || !shareOk) return [];
      const id = `carbon_${direction}:${s.name}`;
      rec.step(id, s.mass_t_per_t * s.carbon_share, 't C/t', 'C = m·c', `Carbon ${direction === 'in' ? 'charged with' : 'leaving in'} ${s.name}.`, [`param:${prefix}:${s.name}`, `param:${prefix}_carbon:${s.name}`]);
      return [id];
    });
  const inIds = carbon(p.inputs, 'in');
  const outIds = carbon(p.outputs, 'out');
  if (rec.problems.length > 0) return rec.result();
  const value = (ids: string[]) => ids.reduce((sum, id) => sum + rec.steps.find((s) => s.id === id)!.value, 0);
  const cIn = rec.step('carbon_in_t_per_t', value(inIds), 't C/t', 'C_in = Σ m·c', 'Carbon charged.', inIds);
  const cOut = rec.step('carbon_out_t_per_t', value(outIds), 't C/t', 'C_out = Σ m·c', 'Carbon leaving in product and by-products.', outIds);
  if (cOut > cIn) {
    rec.problem('carbon_out', formatFixed(cOut, 4), `more carbon leaves (${formatFixed(cOut, 4)} t/t) than is charged (${formatFixed(cIn, 4)} t/t)`, 'carbon out at most carbon in');
    return rec.result();
  }
  rec.step('co2_t_per_t', (cIn - cOut) * CO2_PER_C, 't CO2/t', 'CO2 = (C_in − C_out)·44/12', 'Process CO2 by carbon mass balance (IPCC 2006 Vol. 3 Ch. 4.2).', ['carbon_in_t_per_t', 'carbon_out_t_per_t', 'ref:CO2_per_C']);
  rec.flow('CO2', 'emission', 'co2_t_per_t', 't');
  for (const s of p.inputs) {
    rec.step(`reductant:${s.name}`, s.mass_t_per_t, 't/t', 'm = measured', `${s.name} charged per tonne of metal.`, [`param:reductant:${s.name}`]);
    rec.flow(s.name, 'material', `reductant:${s.name}`, 't');
  }
  return rec.result();
}
