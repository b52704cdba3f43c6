import { describe, expect, it } from 'vitest';
import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import ts from 'typescript';
import { ROOT } from './helpers.ts';

/**
 * Imports run one way: each folder of `src/` sits on a layer and imports from another folder
 * only if that folder is on a layer below (not up, not sideways), and no file reaches itself through its imports (no cycle, type-only
 * imports included). The imports are read with TypeScript's own pre-processor
 * (`ts.preProcessFile`: static, re-export and dynamic imports), not with a pattern.
 * Run alone: `npx vitest run test/architecture.test.ts`.
 */
export const LAYERS: ReadonlyArray<readonly string[]> = [
  // The vocabulary: problems, published reference tables, output names, the number formatter, ambient types.
  ['problems.ts', 'files.ts', 'format.ts', 'reference', 'types'],
  // Reading text, CSV and JSON; chemistry.
  ['load', 'chem'],
  // The input contract (zod schemas), process kinds and their parameters included.
  ['schema'],
  // The process models' arithmetic, on the parameters the kinds' schemas type.
  ['process'],
  // The validated project.
  ['model'],
  // Figure ids and the figure graph.
  ['trace'],
  // Everything computed.
  ['calc'],
  // Results into view models and published formats.
  ['report'],
  // One product computed, the one way (build, its workers, explain, the tests).
  ['pipeline'],
  // Writing files, pages and PDFs; comparing two builds.
  ['render', 'diff'],
  // The command line.
  ['cli'],
];

const SRC = path.join(ROOT, 'src');

async function sources(dir = SRC): Promise<string[]> {
  const files: string[] = [];
  for (const entry of await readdir(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) files.push(...(await sources(full)));
    else if (/\.ts$/.test(entry.name)) files.push(full);
  }
  return files.sort();
}

/** The part of `src/` a file belongs to: its first folder, or its own name at the top. */
const placeOf = (file: string): string => path.relative(SRC, file).split(path.sep)[0]!;
const layerOf = (file: string): number => LAYERS.findIndex((places) => places.includes(placeOf(file)));

/** Each source file's imports of other source files. */
async function importGraph(): Promise<Map<string, string[]>> {
  const graph = new Map<string, string[]>();
  for (const file of await sources()) {
    const info = ts.preProcessFile(await readFile(file, 'utf8'), true, true);
    graph.set(
      file,
      info.importedFiles.map((f) => f.fileName).filter((name) => name.startsWith('.')).map((name) => path.resolve(path.dirname(file), name)),
    );
  }
  return graph;
}

/** Strongly connected components with more than one file, or a file importing itself (Tarjan). */
function cycles(graph: Map<string, string[]>): string[][] {
  let index = 0;
  const indices = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const found: string[][] = [];
  const visit = (file: string) => {
    indices.set(file, index);
    low.set(file, index);
    index++;
    stack.push(file);
    onStack.add(file);
    for (const next of graph.get(file) ?? []) {
      if (!graph.has(next)) continue;
      if (!indices.has(next)) {
        visit(next);
        low.set(file, Math.min(low.get(file)!, low.get(next)!));
      } else if (onStack.has(next)) {
        low.set(file, Math.min(low.get(file)!, indices.get(next)!));
      }
    }
    if (low.get(file) === indices.get(file)) {
      const component: string[] = [];
      let member: string;
      do {
        member = stack.pop()!;
        onStack.delete(member);
        component.push(member);
      } while (member !== file);
      if (component.length > 1 || (graph.get(file) ?? []).includes(file)) found.push(component.map((f) => path.relative(SRC, f)).sort());
    }
  };
  for (const file of graph.keys()) if (!indices.has(file)) visit(file);
  return found;
}

describe('the import direction of src/', () => {
  it('places every file of src/ on a layer', async () => {
    const unplaced = (await sources()).filter((file) => layerOf(file) < 0).map((file) => path.relative(SRC, file));
    expect(unplaced).toEqual([]);
  });

  it('imports from another folder only on a layer below (not up, not sideways)', async () => {
    const upward: string[] = [];
    for (const [file, imports] of await importGraph()) {
      for (const target of imports) {
        // Within a folder anything goes (but cycles); across folders, strictly down.
        if (placeOf(target) !== placeOf(file) && layerOf(target) >= layerOf(file)) upward.push(`${path.relative(SRC, file)} → ${path.relative(SRC, target)}`);
      }
    }
    expect(upward).toEqual([]);
  });

  it('has no import cycle', async () => {
    expect(cycles(await importGraph())).toEqual([]);
  });

  it('finds an upward import and a cycle when there is one (the check itself)', () => {
    const a = path.join(SRC, 'calc', 'a.ts');
    const b = path.join(SRC, 'calc', 'b.ts');
    const c = path.join(SRC, 'model', 'c.ts');
    expect(cycles(new Map([[a, [b]], [b, [a]], [c, []]]))).toEqual([['calc/a.ts', 'calc/b.ts']]);
    expect(layerOf(c) < layerOf(a)).toBe(true);
  });
});
