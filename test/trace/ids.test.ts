import { describe, expect, it } from 'vitest';
import { cutoffStep, figureId, inventoryStep, lineKey, methodStep, parseFigureId, resultStep } from '../../src/trace/ids.ts';

// The figure-id grammar of docs/results-format.md: a step id, or a vector step's id + "/" + indicator code.
describe('figure ids', () => {
  const steps = new Map<string, 'vector' | 'scalar'>([
    ['cutoff/A1', 'vector'],
    ['cutoff/A1/line:L3', 'vector'],
    ['cutoff/A1/SM', 'scalar'],
    ['inventory/line:L3/G', 'scalar'],
  ]);
  const parse = (id: string) => parseFigureId(id, (s) => steps.get(s) === 'vector', (s) => steps.has(s), ['GWP-total', 'AP']);

  it('builds the ids the calculation makes', () => {
    expect(figureId(cutoffStep.line('A1', lineKey('product', 'L3')), 'AP')).toBe('cutoff/A1/line:L3/AP');
    expect(inventoryStep.line(lineKey('packaging', 'P1'), 'G')).toBe('inventory/packaging:P1/G');
    expect(methodStep.line('fifty-fifty', 'material', 'line:L1')).toBe('fifty-fifty/material/line:L1');
    expect(resultStep('eol-recycling', 'energy')).toBe('eol-recycling/energy');
    expect(figureId('inventory/line:L3/G')).toBe('inventory/line:L3/G');
  });

  it('reads step/indicator back to its step and indicator, and a scalar step as itself', () => {
    expect(parse('cutoff/A1/GWP-total')).toEqual({ step: 'cutoff/A1', indicator: 'GWP-total' });
    expect(parse('cutoff/A1/line:L3/AP')).toEqual({ step: 'cutoff/A1/line:L3', indicator: 'AP' });
    expect(parse('inventory/line:L3/G')).toEqual({ step: 'inventory/line:L3/G' });
    // A flow indicator of a module is a step of its own, not an indicator of the module's values.
    expect(parse('cutoff/A1/SM')).toEqual({ step: 'cutoff/A1/SM' });
  });

  it('refuses an unknown indicator, an indicator on a scalar step and an unknown step', () => {
    expect(parse('cutoff/A1/GWP-totl')).toBeUndefined();
    expect(parse('inventory/line:L3/G/AP')).toBeUndefined();
    expect(parse('cutoff/A9/AP')).toBeUndefined();
    expect(parse('AP')).toBeUndefined();
  });
});
