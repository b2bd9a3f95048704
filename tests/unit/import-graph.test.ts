/**
 * The import graph of the sources (layers/, data-pipeline/, web/, bin/) has no cycle. Runtime imports
 * only: `import type` and `export type` vanish when compiled, so they cannot make an initialisation
 * cycle. The direction between folders is the lint rule boundaries/import-direction.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(__dirname, '../..');
const FOLDERS = ['layers', 'data-pipeline', 'web', 'bin'];

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    if (statSync(p).isDirectory()) out.push(...sourceFiles(p));
    else if (/\.(ts|tsx|mjs)$/.test(name) && !name.endsWith('.d.ts')) out.push(p);
  }
  return out;
}

const IMPORT = /(?:^|\n)\s*(?:import|export)\s+(type\s+)?(?:[^'"]*?\sfrom\s+)?['"]([^'"]+)['"]/g;
const DYNAMIC = /\bimport\(\s*['"]([^'"]+)['"]\s*\)/g;

function resolveImport(from: string, spec: string): string | null {
  const base = resolve(dirname(from), spec);
  for (const c of [base, `${base}.ts`, `${base}.tsx`, join(base, 'index.ts')]) {
    if (existsSync(c) && statSync(c).isFile()) return c;
  }
  return null;
}

/** Runtime import edges file -> files, relative imports only. */
export function importGraph(files: string[]): Map<string, string[]> {
  const graph = new Map<string, string[]>();
  for (const file of files) {
    const text = readFileSync(file, 'utf8');
    const specs: string[] = [];
    for (const m of text.matchAll(IMPORT)) if (!m[1]) specs.push(m[2]);
    for (const m of text.matchAll(DYNAMIC)) specs.push(m[1]);
    const targets = specs
      .filter((s) => s.startsWith('.'))
      .map((s) => resolveImport(file, s))
      .filter((t): t is string => t !== null);
    graph.set(file, [...new Set(targets)]);
  }
  return graph;
}

/** Strongly connected components with more than one file, or a file importing itself (Tarjan 1972). */
export function cycles(graph: Map<string, string[]>): string[][] {
  let index = 0;
  const idx = new Map<string, number>();
  const low = new Map<string, number>();
  const stack: string[] = [];
  const onStack = new Set<string>();
  const found: string[][] = [];
  const visit = (v: string) => {
    idx.set(v, index);
    low.set(v, index++);
    stack.push(v);
    onStack.add(v);
    for (const w of graph.get(v) ?? []) {
      if (!idx.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) low.set(v, Math.min(low.get(v)!, idx.get(w)!));
    }
    if (low.get(v) === idx.get(v)) {
      const scc: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        scc.push(w);
      } while (w !== v);
      if (scc.length > 1 || (graph.get(v) ?? []).includes(v)) found.push(scc);
    }
  };
  for (const v of graph.keys()) if (!idx.has(v)) visit(v);
  return found;
}

describe('import graph', () => {
  it('finds a cycle when there is one (hand-made graph a -> b -> c -> a, d -> a)', () => {
    const g = new Map([
      ['a', ['b']],
      ['b', ['c']],
      ['c', ['a']],
      ['d', ['a']],
    ]);
    expect(cycles(g).map((c) => c.sort())).toEqual([['a', 'b', 'c']]);
  });

  it('has no import cycle among the sources', () => {
    const files = FOLDERS.flatMap((f) => sourceFiles(join(ROOT, f)));
    expect(files.length).toBeGreaterThan(100);
    const graph = importGraph(files);
    const edges = [...graph.values()].reduce((a, t) => a + t.length, 0);
    expect(edges).toBeGreaterThan(files.length);
    const found = cycles(graph).map((c) => c.map((f) => relative(ROOT, f)).sort());
    expect(found).toEqual([]);
  });
});
