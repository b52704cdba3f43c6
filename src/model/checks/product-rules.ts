import type { CheckContext } from './context.ts';
import { formatFixed, formatInput } from '../../format.ts';
import { conversionFactor, parseDeclaredUnit, type Dimension } from '../../reference/units.ts';
import type { Row } from '../../schema/table.ts';
import type { Product } from '../rows.ts';

/** EN 15804+A2 declares per declared unit: the BOM must add up to it. */
const UNIT_MASS_TOLERANCE = 0.01;

/** The flow properties a declared unit may be measured in, in the exchange format declarations are published in (ILCD+EPD). */
const MEASURABLE: readonly Dimension[] = ['mass', 'length', 'area', 'volume', 'count'];

/**
 * A declared unit names an amount of a unit loopsheet knows (the ILCD+EPD archive declares it
 * as an amount of a flow property; text it cannot read is declared as items), and a declared
 * unit of mass is the product's mass: "1 t" of 900 kg declares one thing and weighs another.
 */
function declaredUnitRules(ctx: CheckContext, row: Row<Product>): void {
  const p = ctx.project;
  const product = row.value;
  const parsed = parseDeclaredUnit(product.declared_unit);
  if (!parsed || !MEASURABLE.includes(parsed.dimension)) {
    ctx.at(p.products, row.line, row.raw, 'declared_unit', 'warning', 'DECLARED_UNIT_UNKNOWN',
      parsed ? `is a quantity of ${parsed.dimension}, which a declared unit is not measured in; the ILCD+EPD archive declares the product per item` : 'names no unit loopsheet knows; the ILCD+EPD archive declares the product per item',
      { expected: 'an amount and a unit of mass, length, area, volume or items, e.g. "1 kg", "1 t", "1 m", "1 m2", "1 piece"' });
    return;
  }
  if (parsed.dimension === 'mass') {
    const kg = parsed.amount * conversionFactor(parsed.unit, 'kg');
    if (Math.abs(kg - product.unit_mass_kg) > UNIT_MASS_TOLERANCE * kg) {
      ctx.at(p.products, row.line, row.raw, 'unit_mass_kg', 'warning', 'DECLARED_UNIT_MASS', `is not the mass of the declared unit ${product.declared_unit} (${formatInput(kg)} kg)`, { expected: `${formatInput(kg)} (within 1 %)` });
    }
  }
}

export function productRules(ctx: CheckContext): void {
  const p = ctx.project;
  const writtenLines = new Map<string, number>();
  for (const row of p.bom.written) {
    const product = (row.raw.product_id ?? '').trim();
    writtenLines.set(product, (writtenLines.get(product) ?? 0) + 1);
  }
  const validLines = new Map<string, typeof p.bom.rows>();
  for (const row of p.bom.rows) {
    const list = validLines.get(row.value.product_id) ?? [];
    list.push(row);
    validLines.set(row.value.product_id, list);
  }
  const scenarioMaterials = new Map<string, Set<string>>();
  for (const row of p.eol.written) {
    const scenario = (row.raw.scenario ?? '').trim();
    if (!scenarioMaterials.has(scenario)) scenarioMaterials.set(scenario, new Set());
    scenarioMaterials.get(scenario)!.add((row.raw.material ?? '').trim());
  }

  for (const productRow of p.products.rows) {
    const product = productRow.value;
    declaredUnitRules(ctx, productRow);
    const lines = validLines.get(product.product_id) ?? [];
    const complete = lines.length === (writtenLines.get(product.product_id) ?? 0);
    const productLines = lines.filter((line) => line.value.role === 'product');
    if (complete && productLines.length === 0) {
      ctx.at(p.products, productRow.line, productRow.raw, 'product_id', 'error', 'NO_BOM_LINES', 'has no product-role lines in bom.csv', { expected: 'at least one bom.csv line with role product' });
      continue;
    }
    if (complete) {
      const sum = productLines.reduce((total, line) => total + line.value.mass_kg, 0);
      const deviation = Math.abs(sum - product.unit_mass_kg) / product.unit_mass_kg;
      if (deviation > UNIT_MASS_TOLERANCE) {
        ctx.at(p.products, productRow.line, productRow.raw, 'unit_mass_kg', 'error', 'UNIT_MASS_MISMATCH',
          `differs from the sum of its product-role BOM masses, ${formatInput(sum)} kg (bom.csv lines ${productLines.map((l) => l.line).join(', ')}), by ${formatFixed(deviation * 100, 1)} %`,
          { expected: `within 1 % of ${formatInput(sum)} kg` });
      }
    }
    const covered = scenarioMaterials.get(product.eol_scenario);
    if (covered && !covered.has('*')) {
      // The packaging's end of life too, where A5 is declared (it is computed there).
      const atEndOfLife = ctx.declares(product.product_id, 'A5') ? lines : productLines;
      const missing = [...new Set(atEndOfLife.map((line) => line.value.material))].filter((material) => !covered.has(material));
      for (const material of missing) {
        ctx.at(p.products, productRow.line, productRow.raw, 'eol_scenario', 'error', 'EOL_SCENARIO_GAP', `has no eol.csv row for material ${material} and no * row`, { expected: `an eol.csv row with scenario ${product.eol_scenario} and material ${material} or *` });
      }
    }
  }
}

