import type { Problem, ProblemCode, Severity } from '../../problems.ts';
import { cellProblem, type Row, type Table } from '../../schema/table.ts';
import type { BomLine, EolRow, FactorRow, Material, Product, Project } from '../types.ts';

/** The tables, and the declaration when it parsed. */
export type CheckInput = Omit<Project, 'declaration' | 'declarationFile' | 'declarationCells'> & Partial<Pick<Project, 'declaration' | 'declarationFile'>>;

export type AnyTable = Table<unknown>;

/** What every rule reads: the project's tables, lookups built once, and where problems go. */
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
    return [p.products, p.bom, p.materials, p.eol, p.activities, p.transport, p.factors, p.process, p.site, p.production, p.familyRows].find((table) => table.file === file);
  }

  /** Ids written in a table's column, valid rows or not, so one bad cell elsewhere in a row does not make references to it dangle. */
  ids(table: AnyTable, column: string): Set<string> {
    return new Set(table.written.map((row) => (row.raw[column] ?? '').trim()).filter((id) => id !== ''));
  }

  factor(id: string | undefined): Row<FactorRow> | undefined {
    return id === undefined ? undefined : this.factorIndex().get(id);
  }

  private factorsById: Map<string, Row<FactorRow>> | undefined;
  factorIndex(): Map<string, Row<FactorRow>> {
    this.factorsById ??= new Map(this.project.factors.rows.map((row) => [row.value.factor_id, row]));
    return this.factorsById;
  }

  private scenarioRows: Map<string, Map<string, Row<EolRow>>> | undefined;
  private productsById: Map<string, Row<Product>> | undefined;

  /** The end-of-life row that applies to a BOM line: its product's scenario, its material's row, else `*`. */
  eolRowOf(line: BomLine): Row<EolRow> | undefined {
    if (!this.scenarioRows) {
      this.scenarioRows = new Map();
      for (const row of this.project.eol.rows) {
        if (!this.scenarioRows.has(row.value.scenario)) this.scenarioRows.set(row.value.scenario, new Map());
        this.scenarioRows.get(row.value.scenario)!.set(row.value.material, row);
      }
    }
    this.productsById ??= new Map(this.project.products.rows.map((row) => [row.value.product_id, row]));
    const product = this.productsById.get(line.product_id);
    const scenario = product && this.scenarioRows.get(product.value.eol_scenario);
    return scenario?.get(line.material) ?? scenario?.get('*');
  }

  private materialsById: Map<string, Row<Material>> | undefined;
  material(id: string): Row<Material> | undefined {
    this.materialsById ??= new Map(this.project.materials.rows.map((row) => [row.value.material, row]));
    return this.materialsById.get(id);
  }
}
