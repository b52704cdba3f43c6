import type { Problem, ProblemCode, Severity } from '../../problems.ts';
import { cellProblem, type Row, type Table } from '../../schema/table.ts';
import type { Activity, BomLine, EolRow, FactorRow, Material, Project, TransportLeg } from '../types.ts';
import { eolRowFor, groupBy } from '../lookups.ts';
import { declaresModule } from '../declared-modules.ts';

/** The tables, and the declaration when it parsed. */
export type CheckInput = Omit<Project, 'declaration' | 'declarationFile' | 'declarationCells' | 'verification'> & Partial<Pick<Project, 'declaration' | 'declarationFile'>>;

export type AnyTable = Table<unknown>;

/** What every rule reads: the project's tables, its lookups (built once, src/model/lookups.ts), and where problems go. */
export class CheckContext {
  constructor(
    readonly project: CheckInput,
    readonly problems: Problem[],
  ) {}

  at(table: AnyTable, line: number, raw: Record<string, string>, column: string, severity: Severity, code: ProblemCode, message: string, extra: Partial<Problem> = {}): void {
    this.problems.push(cellProblem(table, { line, raw }, column, severity, code, message, extra));
  }

  /** The project's table read from a file (by its name in src/schema), if the project has that file. */
  table(file: string): AnyTable | undefined {
    const p = this.project;
    return [p.products, p.bom, p.materials, p.eol, p.activities, p.transport, p.factors, p.process, p.site, p.production, p.familyRows, p.excluded].find((table) => table.file === file);
  }

  /** Ids written in a table's column, valid rows or not, so one bad cell elsewhere in a row does not make references to it dangle. */
  ids(table: AnyTable, column: string): Set<string> {
    return new Set(table.written.map((row) => (row.raw[column] ?? '').trim()).filter((id) => id !== ''));
  }

  factor(id: string | undefined): Row<FactorRow> | undefined {
    return id === undefined ? undefined : this.project.lookups.factors.get(id);
  }

  /** The end-of-life row that applies to a BOM line: its product's scenario, its material's row, else `*`. */
  eolRowOf(line: BomLine): Row<EolRow> | undefined {
    const product = this.project.lookups.products.get(line.product_id);
    return product && eolRowFor(this.project.lookups, product.value.eol_scenario, line.material);
  }

  material(id: string): Row<Material> | undefined {
    return this.project.lookups.materials.get(id);
  }

  private moduleRows: { activities: Map<string, Row<Activity>[]>; transport: Map<string, Row<TransportLeg>[]> } | undefined;
  /** Whether a product declares an optional module (src/model/declared-modules.ts). */
  declares(productId: string, module: 'A4' | 'A5'): boolean {
    this.moduleRows ??= { activities: groupBy(this.project.activities.rows, (row) => row.value.product_id), transport: groupBy(this.project.transport.rows, (row) => row.value.product_id) };
    return declaresModule(this.project.declaration, { activities: this.moduleRows.activities.get(productId) ?? [], transport: this.moduleRows.transport.get(productId) ?? [], site: this.project.allocation.byProduct.get(productId) ?? [] }, module);
  }
}
