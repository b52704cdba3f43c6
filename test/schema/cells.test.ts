import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { choice, gsdCell, id, isIsoDate, optionalQuantity, pedigreeScore, folderId, quantity, share, unitCell } from '../../src/schema/cells.ts';
import { describeIssue } from '../../src/schema/issues.ts';

const point = { decimalComma: false };
const comma = { decimalComma: true };

/** The problem a cell gives for a written value, as loopsheet reports it. */
function problemOf(schema: z.ZodType, written: string | undefined) {
  const result = schema.safeParse(written);
  if (result.success) return undefined;
  return describeIssue(result.error.issues[0]!);
}

describe('cell schemas: one CSV cell into a typed value or a located problem', () => {
  it('reads a quantity, with a decimal comma only in a semicolon file, and refuses what is not one', () => {
    const mass = quantity(point, 'Mass.', 'kg');
    expect(mass.parse('0.85')).toBe(0.85);
    expect(mass.parse(' 12 ')).toBe(12);
    expect(quantity(comma, 'Mass.', 'kg').parse('0,85')).toBe(0.85);
    expect(problemOf(mass, '0.85 kg')?.code).toBe('NOT_A_NUMBER');
    expect(problemOf(mass, '-1')?.code).toBe('NEGATIVE_VALUE');
    expect(problemOf(mass, '')?.code).toBe('VALUE_REQUIRED');
    expect(problemOf(quantity(point, 'Unit mass.', 'kg', { positive: true }), '0')?.code).toBe('OUT_OF_RANGE');
    expect(quantity(point, 'Credit.', 'kg', { signed: true }).parse('-2.5')).toBe(-2.5);
    expect(quantity(point, 'Distance.', 'km', { default: 0 }).parse('')).toBe(0);
  });

  it('reads an empty optional quantity as not available (null), never as zero', () => {
    expect(optionalQuantity(point, 'ODP.', 'kg CFC-11 eq').parse('')).toBeNull();
    expect(optionalQuantity(point, 'ODP.', 'kg CFC-11 eq').parse('0')).toBe(0);
  });

  it('reads a share as a fraction or a percentage (ISO 80000-1: % is 0.01), within 0–1', () => {
    const recycled = share(point, 'Recycled share.', { default: 0 });
    expect(recycled.parse('0.35')).toBe(0.35);
    expect(recycled.parse('35%')).toBeCloseTo(0.35, 15);
    expect(recycled.parse('')).toBe(0);
    expect(problemOf(recycled, '1.2')?.code).toBe('OUT_OF_RANGE');
    // A scrap rate of 100 % leaves no product: gross input = net / (1 − rate).
    expect(problemOf(share(point, 'Scrap rate.', { default: 0, belowOne: true }), '1')?.code).toBe('OUT_OF_RANGE');
  });

  it('matches a choice case-insensitively and suggests the nearest word otherwise', () => {
    const role = choice('Role.', ['product', 'packaging'], 'product');
    expect(role.parse('Packaging')).toBe('packaging');
    expect(role.parse('')).toBe('product');
    expect(problemOf(role, 'packagign')).toMatchObject({ code: 'BAD_CHOICE', hint: 'did you mean "packaging"?' });
  });

  it('keeps ids that name folders to one safe path segment the build does not write itself', () => {
    const folder = folderId('Product.');
    expect(folder.parse('KV-EXT-6060')).toBe('KV-EXT-6060');
    for (const hostile of ['a/b', '../x', '..', '.hidden', 'a\\b', 'a b', 'a:b', 'dot.']) expect(problemOf(folder, hostile)?.code, hostile).toBe('BAD_ID');
    // Names the build writes beside the products (src/files.ts), in any case.
    for (const reserved of ['results.json', 'RESULTS.CSV', 'verification', 'factors', 'Families', 'assets', 'index.html']) expect(problemOf(folder, reserved)?.code, reserved).toBe('ID_RESERVED');
    // Windows device names, with or without an extension (Microsoft, "Naming Files, Paths, and Namespaces").
    for (const device of ['con', 'NUL', 'aux.txt', 'com1', 'LPT9']) expect(problemOf(folder, device)?.code, device).toBe('ID_RESERVED');
    expect(folder.parse('console')).toBe('console');
    // 255 bytes is the longest name ext4, NTFS and APFS take (from memory); a folder id stops well short.
    expect(problemOf(folder, 'a'.repeat(101))).toMatchObject({ code: 'ID_TOO_LONG' });
    expect(folder.parse('a'.repeat(100))).toHaveLength(100);
    expect(problemOf(folder, 'a'.repeat(5000))?.message).toMatch(/5000 characters long; an identifier has at most 100/);
    expect(id('Line.').parse('L1:a/b')).toBe('L1:a/b');
    expect(problemOf(id('Line.'), 'L 1')?.code).toBe('BAD_ID');
    expect(problemOf(id('Line.'), 'x'.repeat(201))?.code).toBe('ID_TOO_LONG');
  });

  it('gives a unit its canonical spelling and refuses one of another dimension', () => {
    expect(unitCell('Unit.').parse('KWH')).toBe('kWh');
    expect(problemOf(unitCell('Unit.', 'mass'), 'kWh')?.code).toBe('UNIT_MISMATCH');
    expect(problemOf(unitCell('Unit.'), 'kwhh')?.code).toBe('BAD_UNIT');
  });

  it('reads pedigree scores as whole numbers 1–5 and a GSD of at least 1, empty meaning not given', () => {
    const score = pedigreeScore('Score.');
    expect(score.parse('3')).toBe(3);
    expect(score.parse('')).toBeNull();
    expect(problemOf(score, '6')?.code).toBe('OUT_OF_RANGE');
    expect(problemOf(score, '2.5')?.code).toBe('NOT_A_NUMBER');
    expect(gsdCell(point, 'GSD.').parse('1.1')).toBe(1.1);
    expect(gsdCell(point, 'GSD.').parse('')).toBeNull();
    // A lognormal's geometric standard deviation is exp(σ) ≥ 1 (common practice).
    expect(problemOf(gsdCell(point, 'GSD.'), '0.9')?.code).toBe('OUT_OF_RANGE');
  });

  it('accepts calendar dates as ISO 8601 writes them, with the Gregorian leap-year rule (divisible by 4, centuries only by 400)', () => {
    expect(isIsoDate('2024-02-29')).toBe(true);
    expect(isIsoDate('2000-02-29')).toBe(true);
    expect(isIsoDate('2023-02-29')).toBe(false);
    expect(isIsoDate('1900-02-29')).toBe(false);
    expect(isIsoDate('2026-04-31')).toBe(false);
    expect(isIsoDate('2026-12-31')).toBe(true);
    expect(isIsoDate('2026-1-5')).toBe(false);
    expect(isIsoDate('31/12/2026')).toBe(false);
  });
});
