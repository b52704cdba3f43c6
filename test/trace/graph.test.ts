import { describe, expect, it } from 'vitest';
import { FigureGraph } from '../../src/trace/graph.ts';
import { ToolError } from '../../src/problems.ts';

describe('the figure graph', () => {
  it('refuses an infinite figure, naming it and its indicator, as an input error', () => {
    const graph = new FigureGraph(['GWP-total', 'ODP']);
    // 1E+200 × 1E+200 overflows a double (IEEE 754 binary64: largest finite about 1.797E+308).
    const overflow = 1e200 * 1e200;
    expect(overflow).toBe(Infinity);
    const add = () => graph.add({ kind: 'vector', id: 'cutoff/A2/transport:3', formula: 'd × m × F', description: 'A leg.', terms: [], values: [1, overflow] });
    expect(add).toThrow(ToolError);
    expect(add).toThrow(/figure cutoff\/A2\/transport:3 is infinite for ODP/);
    // Not available (NaN) is a value a figure may have.
    expect(graph.add({ kind: 'scalar', id: 'x', formula: 'x', description: 'x', terms: [], value: Number.NaN, unit: 'kg' }).value).toBeNaN();
  });
});
