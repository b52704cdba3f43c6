import { locate } from '../../load/json.ts';
import { formatCounted, formatSignificant } from '../../format.ts';
import type { CheckContext } from './context.ts';
import { indicatorValue } from '../rows.ts';
import { CO2_PER_C } from '../../reference/constants.ts';

/**
 * The packaging's end of life: where A5 is not declared it is left out, which the run says
 * once (not once per product); where it is, loopsheet books the release of the packaging's
 * biogenic carbon from its carbon content, so a treatment factor that releases biogenic CO2
 * too would count it twice.
 */
export function packagingRules(ctx: CheckContext): void {
  const p = ctx.project;
  const undeclared = new Set<string>();
  const declaredMaterials = new Set<string>();
  for (const line of p.bom.rows) {
    if (line.value.role !== 'packaging') continue;
    if (ctx.declares(line.value.product_id, 'A5')) declaredMaterials.add(line.value.material);
    else undeclared.add(line.value.product_id);
  }
  if (undeclared.size > 0 && p.declaration && p.declarationFile) {
    const present = p.declaration.declared_modules !== undefined;
    const where = locate(p.declarationFile, present ? ['declared_modules'] : []);
    const ids = [...undeclared];
    ctx.problems.push({
      severity: 'warning', code: 'PACKAGING_EOL_UNDECLARED', file: p.declarationFile.file, line: where.line, column: present ? 'declared_modules' : '(document)', columnIndex: where.column,
      message: `${formatCounted(ids.length, 'product has', 'products have')} packaging whose end of life belongs in A5, which they do not declare (${ids.slice(0, 5).join(', ')}${ids.length > 5 ? ', …' : ''}): its waste processing and the release of its biogenic carbon are left out of the declaration`,
      expected: '"declared_modules": ["A5"] in declaration.json, or A5 activity rows for these products',
    });
  }
  for (const materialId of declaredMaterials) {
    const material = ctx.material(materialId);
    const carbon = material?.value.biogenic_c_kg_per_kg;
    if (!material || carbon === null || carbon === undefined || !(carbon > 0)) continue;
    for (const column of ['landfill', 'incineration'] as const) {
      const factorRow = ctx.factor(material.value[column]);
      const released = factorRow ? indicatorValue(factorRow.value, 'GWP-biogenic') : null;
      // A treatment's own biogenic emissions are small; a tenth of the waste's carbon as CO2 is the waste's own carbon (common practice).
      if (released === null || !(released > 0.1 * carbon * CO2_PER_C)) continue;
      ctx.at(p.materials, material.line, material.raw, column, 'warning', 'BIOGENIC_RELEASE_TWICE',
        `names ${factorRow!.value.factor_id}, which releases ${formatSignificant(released, 3)} kg CO2 eq. of biogenic CO2 per kg; loopsheet books the release of this packaging's biogenic carbon in A5 from its carbon content (${formatSignificant(carbon, 3)} kg C per kg), so it counts twice`,
        { expected: `a ${column} factor without the waste's own biogenic CO2 (GWP-biogenic of its treatment only)` });
    }
  }
}
