import { createHash } from 'node:crypto';
import { readFile, realpath } from 'node:fs/promises';
import path from 'node:path';
import { DatasetError, readEpdFile, type EpdAmount, type EpdDataset, type Located } from '../load/ilcd.ts';
import type { Problem, ProblemCode, Severity } from '../problems.ts';
import { dimensionOfProperty, MASS, SOURCES } from '../reference/ilcd.ts';
import { INDICATORS } from '../reference/indicators.ts';
import { canonicalUnit, conversionFactor, dimensionOf, type Dimension } from '../reference/units.ts';
import { cellProblem, type Table } from '../schema/table.ts';
import type { Declaration } from '../schema/declaration.ts';
import type { FactorRow } from './rows.ts';

/**
 * Supplier declarations as upstream data: a factors.csv row whose `supplier_dataset` names an
 * ILCD+EPD dataset takes its indicator values from the supplier's declared A1-A3 (never C or
 * D), converted from the supplier's declared unit to the row's unit through the dataset's own
 * reference amount and mass. Every value keeps the element it was read from (file, line,
 * column, module, indicator), for the audit trail and `explain`; what is wrong with a dataset
 * is reported where it is, in the dataset.
 */
export interface SupplierValue {
  /** The value per row unit; null where the dataset has none (not available, never 0). */
  value: number | null;
  /** The amount element read (A1-A3, or the first of A1, A2 and A3 where they are added). */
  amount?: EpdAmount;
  /** The declared value per declared unit, as written (A1+A2+A3 where added). */
  declared: number | null;
  /** The elements added, where A1-A3 is the sum of A1, A2 and A3. */
  parts?: EpdAmount[];
}

export interface SupplierFactor {
  factorId: string;
  /** As written in factors.csv, relative to the data folder (forward slashes). */
  file: string;
  /** SHA-256 and size of the dataset file: part of each product's input key. */
  sha256: string;
  bytes: number;
  dataset: EpdDataset;
  /** Declared units per one unit of the row: value per row unit = declared value × perUnit. */
  perUnit: number;
  /** How perUnit was found, in words, and the dataset elements it rests on. */
  conversion: { text: string; elements: Array<Located & { what: string; value: string }> };
  /** Per indicator code of the declaration. */
  values: Map<string, SupplierValue>;
}

const located = (where: Located, severity: Severity, code: ProblemCode, column: string, value: string | undefined, message: string, extra: { expected?: string; hint?: string } = {}): Problem => ({
  severity,
  code,
  file: where.file,
  line: where.line,
  column,
  columnIndex: where.column,
  ...(value === undefined ? {} : { value }),
  message,
  ...extra,
});

const referenceUnitOf = (dimension: Dimension): string => ({ mass: 'kg', length: 'm', area: 'm2', volume: 'm3', count: 'piece', energy: 'MJ', transport: 'tkm' })[dimension];

/**
 * Reads every supplier dataset factors.csv names, and writes the converted values into the
 * rows' values (so every use of the factor sees them). Returns the datasets by factor id and
 * the problems found, located in factors.csv or in the dataset.
 */
export async function readSupplierDatasets(dir: string, factors: Table<FactorRow>, declaration: Declaration | undefined, indicators: readonly string[]): Promise<{ suppliers: Map<string, SupplierFactor>; problems: Problem[] }> {
  const suppliers = new Map<string, SupplierFactor>();
  const problems: Problem[] = [];
  const root = await realpath(dir).catch(() => path.resolve(dir));
  const asked = indicators.filter((code) => INDICATORS.some((i) => i.code === code && i.basis === 'factors'));
  for (const row of factors.rows) {
    const written = row.value.supplier_dataset;
    if (written === undefined) continue;
    const at = (code: ProblemCode, message: string, extra: { expected?: string; hint?: string } = {}) => problems.push(cellProblem(factors, row, 'supplier_dataset', 'error', code, message, extra));
    const filled = INDICATORS.filter((i) => i.basis === 'factors' && (row.raw[i.code] ?? '').trim() !== '').map((i) => i.code);
    if (filled.length > 0) {
      at('SUPPLIER_VALUES_TWICE', `names a supplier dataset, and the row also gives values for ${filled.slice(0, 4).join(', ')}${filled.length > 4 ? ', …' : ''}; the values come from one place`, { expected: 'empty indicator cells on a row with a supplier dataset' });
      continue;
    }
    const relative = written.replace(/\\/g, '/');
    if (path.isAbsolute(written) || /^[a-zA-Z]:/.test(written) || relative.split('/').includes('..')) {
      at('SUPPLIER_DATASET_PATH', 'is not a path inside the data folder', { expected: 'a relative path inside the data folder, e.g. suppliers/billet.ilcd.zip' });
      continue;
    }
    const full = path.join(root, relative);
    // A link that leads out of the data folder is refused as a path that does.
    const real = await realpath(full).catch(() => undefined);
    if (real === undefined) {
      at('SUPPLIER_DATASET_PATH', 'names no file in the data folder', { expected: 'the path of the supplier’s dataset, relative to the data folder' });
      continue;
    }
    if (real !== root && !real.startsWith(root + path.sep)) {
      at('SUPPLIER_DATASET_PATH', 'leads outside the data folder (through a link)', { expected: 'a file inside the data folder' });
      continue;
    }
    const bytes = await readFile(real).catch(() => undefined);
    if (!bytes) {
      at('SUPPLIER_DATASET_PATH', 'could not be read', { expected: 'a readable file' });
      continue;
    }
    let dataset: EpdDataset;
    try {
      dataset = readEpdFile(relative, bytes);
    } catch (error) {
      if (!(error instanceof DatasetError)) throw error;
      problems.push(located(error.where, 'error', 'SUPPLIER_DATASET_UNREADABLE', '(dataset)', undefined, `${error.where.file} ${error.message}`, { expected: 'an ILCD+EPD process dataset (.xml) or an ILCD archive (.zip) holding one' }));
      continue;
    }
    const found = judge(dataset, row.value.factor_id, declaration, asked, problems);
    if (!found) continue;
    const conversion = convert(dataset, row.value.unit);
    if ('problem' in conversion) {
      problems.push(located(conversion.where, 'error', 'SUPPLIER_UNIT', '(declared unit)', undefined, `${conversion.problem}; factor ${row.value.factor_id} is per ${row.value.unit}`, { expected: `a declared unit convertible to ${row.value.unit}` }));
      continue;
    }
    // The supplier's reference year where the row gives none.
    if (row.value.reference_year === null && dataset.referenceYear !== undefined) (row.value as { reference_year: number | null }).reference_year = dataset.referenceYear;
    const values = new Map<string, SupplierValue>();
    for (const code of asked) {
      const declared = found.get(code);
      const value = declared && declared.declared !== null ? declared.declared * conversion.perUnit : null;
      values.set(code, { ...(declared ?? { declared: null }), value });
      (row.value as unknown as Record<string, number | null>)[code] = value;
    }
    suppliers.set(row.value.factor_id, { factorId: row.value.factor_id, file: relative, sha256: createHash('sha256').update(bytes).digest('hex'), bytes: bytes.byteLength, dataset, perUnit: conversion.perUnit, conversion: { text: conversion.text, elements: conversion.elements }, values });
  }
  return { suppliers, problems };
}

/**
 * The dataset's A1-A3 per indicator, and the problems that stop or qualify its use: another
 * EN 15804 version, no A1-A3, an indicator missing, EF 3.0 in an EF 3.1 declaration, an
 * expired validity, no independent review.
 */
function judge(dataset: EpdDataset, factorId: string, declaration: Declaration | undefined, asked: readonly string[], problems: Problem[]): Map<string, Omit<SupplierValue, 'value'>> | undefined {
  const rootAt: Located = { file: dataset.file, line: 1, column: 1 };
  const a1 = dataset.compliance.find((c) => c.uuid === SOURCES.en15804A1.uuid);
  if (a1 || (dataset.indicators.size === 0 && dataset.unlisted.length > 0)) {
    const where = a1 ?? dataset.unlisted[0]!;
    problems.push(
      located(where, 'error', 'SUPPLIER_NOT_A2', a1 ? 'referenceToComplianceSystem' : 'indicator', a1 ? a1.text || a1.uuid : dataset.unlisted[0]!.text || dataset.unlisted[0]!.uuid, `${a1 ? 'declares compliance with EN 15804+A1' : 'has none of the EN 15804+A2 indicators of the published lists'}: its indicators are not the EN 15804+A2 ones this declaration reports (factor ${factorId})`, {
        expected: 'a supplier dataset under EN 15804+A2 (EF 3.1 or EF 3.0 indicator UUIDs)',
        hint: 'ask the supplier for its EN 15804+A2 declaration',
      }),
    );
    return undefined;
  }
  const values = new Map<string, Omit<SupplierValue, 'value'>>();
  let anyA1A3 = false;
  const missing: string[] = [];
  for (const code of asked) {
    const indicator = dataset.indicators.get(code);
    const amounts = indicator?.amounts ?? [];
    const whole = amounts.find((a) => a.module === 'A1-A3');
    const parts = ['A1', 'A2', 'A3'].map((module) => amounts.find((a) => a.module === module));
    if (whole) {
      anyA1A3 = true;
      values.set(code, { amount: whole, declared: whole.value });
      if (whole.value === null) missing.push(code);
    } else if (parts.every((part) => part !== undefined)) {
      anyA1A3 = true;
      const sum = parts.some((part) => part!.value === null) ? null : parts.reduce((total, part) => total + part!.value!, 0);
      values.set(code, { amount: parts[0]!, declared: sum, parts: parts as EpdAmount[] });
      if (sum === null) missing.push(code);
    } else missing.push(code);
  }
  if (!anyA1A3 && asked.length > 0) {
    problems.push(located(rootAt, 'error', 'SUPPLIER_NO_A1_A3', '(dataset)', undefined, `declares no A1-A3 (nor A1, A2 and A3) for any indicator this declaration reports; factor ${factorId} needs the supplier’s cradle-to-gate values`, { expected: 'epd:amount elements of module A1-A3' }));
    return undefined;
  }
  if (missing.length > 0) {
    const first = dataset.indicators.get(missing[0]!);
    problems.push(
      located(first ?? rootAt, 'warning', 'SUPPLIER_INDICATOR_MISSING', first ? 'epd:amount' : '(dataset)', missing[0], `has no A1-A3 value for ${missing.join(', ')}: factor ${factorId} is not available for ${missing.length === 1 ? 'it' : 'them'} (never read as 0), and figures using it will be marked incomplete`, {
        expected: 'an A1-A3 amount for every indicator the declaration reports',
      }),
    );
  }
  // EN 15804+A2: GWP-total = GWP-fossil + GWP-biogenic + GWP-luluc; rounding within 0.1 % is tolerated (as for factors.csv rows).
  const gwp = ['GWP-total', 'GWP-fossil', 'GWP-biogenic', 'GWP-luluc'].map((code) => values.get(code)?.declared ?? null);
  if (gwp.every((v) => v !== null)) {
    const [total, ...parts] = gwp as number[];
    const sum = parts.reduce((a, b) => a + b, 0);
    if (Math.abs(total! - sum) > 1e-3 * Math.max(Math.abs(total!), Math.abs(sum)) + 1e-12) {
      const element = values.get('GWP-total')!.amount!;
      problems.push(located(element, 'warning', 'GWP_SUM_MISMATCH', 'A1-A3 GWP-total', element.text, `is not GWP-fossil + GWP-biogenic + GWP-luluc = ${sum} in the supplier’s A1-A3 (factor ${factorId})`, { expected: `${sum} (within 0.1 %)` }));
    }
  }
  const ef30 = [...dataset.indicators.values()].find((indicator) => indicator.characterisation === 'EF 3.0' && asked.includes(indicator.code));
  if (ef30) {
    problems.push(located(ef30, 'warning', 'SUPPLIER_EF30', 'indicator', ef30.code, `is characterised with EF 3.0 (its UUID is on the EF 3.0 list); this declaration reports EF 3.1 indicators, so factor ${factorId} mixes two characterisations`, { hint: 'ask the supplier for EF 3.1 results, or state the difference in the declaration' }));
  }
  if (declaration) {
    const expired = dataset.expiration && /^\d{4}-\d{2}-\d{2}/.test(dataset.expiration.date) ? (dataset.expiration.date.slice(0, 10) < declaration.issued ? dataset.expiration : undefined) : dataset.validUntil && dataset.validUntil.year < Number(declaration.issued.slice(0, 4)) ? dataset.validUntil : undefined;
    if (expired) {
      const until = 'date' in expired ? String(expired.date) : String(expired.year);
      problems.push(located(expired, 'warning', 'SUPPLIER_EXPIRED', 'date' in expired ? 'expirationDateOfEPD' : 'dataSetValidUntil', until, `the supplier’s declaration was valid until ${until}, before this declaration is issued (${declaration.issued}); factor ${factorId} rests on expired data`, { hint: 'ask the supplier for its current declaration' }));
    }
  }
  const reviewed = dataset.reviews.some((review) => review.type !== '' && review.type !== 'Not reviewed');
  if (!reviewed) {
    const where = dataset.reviews[0] ?? rootAt;
    problems.push(located(where, 'warning', 'SUPPLIER_UNVERIFIED', 'review', dataset.reviews[0]?.type, `records no independent review, yet factor ${factorId} counts as specific data; a verifier will ask for the supplier’s verification`, { expected: 'a review of type "Independent external review" (or another independent review)' }));
  }
  return values;
}

/** Declared units per one unit of the row, from the dataset's reference amount and product flow. */
function convert(dataset: EpdDataset, rowUnit: string): { perUnit: number; text: string; elements: SupplierFactor['conversion']['elements'] } | { problem: string; where: Located } {
  const reference = dataset.referenceFlow;
  const rootAt: Located = { file: dataset.file, line: 1, column: 1 };
  if (!reference || reference.amount === null || !(reference.amount > 0)) return { problem: 'has no reference flow with a positive amount: its declared unit cannot be read', where: reference ?? rootAt };
  const flow = dataset.flow;
  if (!flow) return { problem: `does not hold its product flow (${reference.uuid}), which says what the declared unit is`, where: reference };
  const property = flow.properties[0];
  const dimension = property ? dimensionOfProperty(property.uuid) : undefined;
  if (!property || !dimension) return { problem: `measures its product by ${property ? `"${property.name || property.uuid}"` : 'no flow property'}, which loopsheet does not convert (mass, length, area, volume or number of items)`, where: property ?? { file: flow.file, line: 1, column: 1 } };
  const unit = canonicalUnit(rowUnit);
  const rowDimension = unit ? dimensionOf(unit) : undefined;
  const referenceUnit = referenceUnitOf(dimension);
  const amountText = `${reference.amount} ${referenceUnit}`;
  const elements: SupplierFactor['conversion']['elements'] = [{ ...reference, what: 'reference flow amount', value: String(reference.amount) }];
  if (unit && rowDimension === dimension) {
    const perUnit = conversionFactor(unit, referenceUnit) / reference.amount;
    return { perUnit, text: `declared per ${amountText}; one ${unit} is ${conversionFactor(unit, referenceUnit)} ${referenceUnit}`, elements };
  }
  if (unit && rowDimension === 'mass') {
    const mass = flow.properties.find((p) => p.uuid === MASS.uuid);
    const massPerReference = dimension === 'mass' ? 1 : mass?.meanValue ?? (flow.conversionToKg?.value ? 1 / (flow.conversionToKg.value * reference.amount) : null);
    if (massPerReference === null || !(massPerReference > 0)) return { problem: `declares its product per ${amountText} and gives no mass for it (no Mass flow property, no conversion factor to 1 kg)`, where: property };
    if (mass?.meanValue) elements.push({ ...mass, what: `kg per ${referenceUnit} (Mass flow property)`, value: String(mass.meanValue) });
    else if (flow.conversionToKg) elements.push({ ...flow.conversionToKg, what: 'conversion factor to 1 kg', value: String(flow.conversionToKg.value) });
    const perUnit = conversionFactor(unit, 'kg') / (reference.amount * massPerReference);
    return { perUnit, text: `declared per ${amountText} of ${massPerReference} kg per ${referenceUnit}`, elements };
  }
  return { problem: `declares its product per ${amountText}, which cannot be converted to ${rowUnit}${dimension === 'mass' ? ' (the dataset gives no size per kg)' : ''}`, where: property };
}

/** The supplier datasets whose factors.csv rows a product reaches (its reach: file → start lines), in factor-row order. */
export function suppliersReached(project: { suppliers: ReadonlyMap<string, SupplierFactor>; factors: { file: string }; lookups: { factors: ReadonlyMap<string, { line: number }> } }, reach: ReadonlyMap<string, ReadonlySet<number>>): SupplierFactor[] {
  const lines = reach.get(project.factors.file);
  if (!lines || project.suppliers.size === 0) return [];
  return [...project.suppliers.values()].filter((supplier) => lines.has(project.lookups.factors.get(supplier.factorId)?.line ?? -1));
}
