import type { Problem } from '../problems.ts';

/**
 * A process calculator's derivation as named steps: each with its value, unit, formula and
 * inputs — parameters (`param:<name>`), reference values (`ref:<name>`) or earlier steps —
 * so that the figure graph can show it down to the process.csv cells. Problems are data:
 * the parameter, its value, what is wrong and what was expected.
 */
export interface ProcessStep {
  id: string;
  value: number;
  unit: string;
  formula: string;
  description: string;
  inputs: string[];
}

/**
 * A problem a calculator finds, in the one problem type's terms: what is wrong, the value
 * and what was expected, named by its parameter. The calculator does not know where the
 * parameter is written; `readProcesses` (src/model/processes.ts) places it on its
 * process.csv cell and gives it its code.
 */
export type ProcessProblem = Required<Pick<Problem, 'value' | 'message' | 'expected'>> & { parameter: string };

export interface InventoryFlow {
  /** What flows: `electricity`, `alumina`, `CO2`, `CF4`, a reagent's factor id, … */
  flow: string;
  kind: 'energy' | 'material' | 'emission';
  /** Per tonne of metal. */
  amount: number;
  unit: string;
  step: string;
}

export interface ProcessResult {
  steps: ProcessStep[];
  inventory: InventoryFlow[];
  /** Which method a result rests on, for the report (e.g. "IPCC Tier 2 prebake equation"). */
  notes: string[];
  problems: ProcessProblem[];
}

export class StepRecorder {
  readonly steps: ProcessStep[] = [];
  readonly problems: ProcessProblem[] = [];
  readonly notes: string[] = [];
  readonly inventory: InventoryFlow[] = [];

  step(id: string, value: number, unit: string, formula: string, description: string, inputs: string[]): number {
    this.steps.push({ id, value, unit, formula, description, inputs });
    return value;
  }

  problem(parameter: string, value: number | string | undefined, message: string, expected: string): void {
    this.problems.push({ parameter, value: value === undefined ? '' : String(value), message, expected });
  }

  flow(flow: string, kind: InventoryFlow['kind'], step: string, unit: string): void {
    const found = this.steps.find((s) => s.id === step);
    if (found) this.inventory.push({ flow, kind, amount: found.value, unit, step });
  }

  result(): ProcessResult {
    // A calculation with problems yields no numbers: a located error, not a figure.
    return this.problems.length > 0 ? { steps: [], inventory: [], notes: [], problems: this.problems } : { steps: this.steps, inventory: this.inventory, notes: this.notes, problems: [] };
  }
}

/** Checks shared by the calculators. */
export function positive(rec: StepRecorder, parameter: string, value: number | undefined): value is number {
  if (value === undefined) return false;
  if (!(value > 0) || !Number.isFinite(value)) {
    rec.problem(parameter, value, 'must be greater than zero', 'a positive number');
    return false;
  }
  return true;
}

export function share(rec: StepRecorder, parameter: string, value: number | undefined, { allowZero = false } = {}): value is number {
  if (value === undefined) return false;
  if (!Number.isFinite(value) || value > 1 || value < 0 || (!allowZero && value === 0)) {
    rec.problem(parameter, value, 'is not a share', allowZero ? 'a share from 0 to 1 (0 % to 100 %)' : 'a share above 0 and at most 1 (100 %)');
    return false;
  }
  return true;
}

export function nonNegative(rec: StepRecorder, parameter: string, value: number | undefined): value is number {
  if (value === undefined) return false;
  if (!(value >= 0) || !Number.isFinite(value)) {
    rec.problem(parameter, value, 'must not be negative', 'zero or a positive number');
    return false;
  }
  return true;
}
