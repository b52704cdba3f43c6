/**
 * The life-cycle modules of EN 15804+A2 (§6.2, the modular system of building
 * assessment), in reporting order, with the standard's short names. Module D lies beyond
 * the system boundary and is reported apart, never added to A–C.
 */
export interface LifeCycleModule {
  code: string;
  stage: string;
  name: string;
  /** Module D: beyond the system boundary, reported apart and never added to A–C. */
  apart?: true;
}

export const LIFE_CYCLE_MODULES: readonly LifeCycleModule[] = [
  { code: 'A1', stage: 'Product stage', name: 'Raw material supply' },
  { code: 'A2', stage: 'Product stage', name: 'Transport to the manufacturer' },
  { code: 'A3', stage: 'Product stage', name: 'Manufacturing' },
  { code: 'A4', stage: 'Construction stage', name: 'Transport to the site' },
  { code: 'A5', stage: 'Construction stage', name: 'Installation' },
  { code: 'B1', stage: 'Use stage', name: 'Use' },
  { code: 'B2', stage: 'Use stage', name: 'Maintenance' },
  { code: 'B3', stage: 'Use stage', name: 'Repair' },
  { code: 'B4', stage: 'Use stage', name: 'Replacement' },
  { code: 'B5', stage: 'Use stage', name: 'Refurbishment' },
  { code: 'B6', stage: 'Use stage', name: 'Operational energy use' },
  { code: 'B7', stage: 'Use stage', name: 'Operational water use' },
  { code: 'C1', stage: 'End-of-life stage', name: 'De-construction, demolition' },
  { code: 'C2', stage: 'End-of-life stage', name: 'Transport to waste processing' },
  { code: 'C3', stage: 'End-of-life stage', name: 'Waste processing' },
  { code: 'C4', stage: 'End-of-life stage', name: 'Disposal' },
  { code: 'D', stage: 'Beyond the system boundary', name: 'Reuse, recovery and recycling potential', apart: true },
];
