/**
 * The architecture's arrows, read from the source: no module imports itself round a
 * circle (type-only imports count: a circle of types is still two modules that cannot be
 * read apart), and the layers point one way, app and cli → engine → workers → core.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = resolve(import.meta.dirname, '../..');
const SCANNED = ['src', 'workers'];
const EXTENSIONS = ['.ts', '.tsx'];

function sourceFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
    const path = join(dir, entry.name);
    if (entry.isDirectory()) return sourceFiles(path);
    return EXTENSIONS.some((e) => entry.name.endsWith(e)) && !entry.name.endsWith('.d.ts') ? [path] : [];
  });
}

/** Relative specifiers of every `import … from`, `export … from` and `import(…)` in a file. */
function specifiers(text: string): string[] {
  const found: string[] = [];
  const pattern = /(?:^|\n)\s*(?:import|export)\s[^'";]*?from\s*['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;
  for (const m of text.matchAll(pattern)) {
    const spec = m[1] ?? m[2];
    if (spec !== undefined && spec.startsWith('.')) found.push(spec);
  }
  return found;
}

function resolveModule(from: string, spec: string, known: Set<string>): string | null {
  const base = resolve(dirname(from), spec);
  for (const candidate of [base, ...EXTENSIONS.map((e) => base + e), ...EXTENSIONS.map((e) => join(base, `index${e}`))]) {
    if (known.has(candidate)) return candidate;
  }
  return null;
}

function importGraph(): Map<string, string[]> {
  const files = SCANNED.flatMap((d) => sourceFiles(join(ROOT, d)));
  const known = new Set(files);
  const graph = new Map<string, string[]>();
  for (const file of files) {
    const targets = specifiers(readFileSync(file, 'utf8'))
      .map((spec) => resolveModule(file, spec, known))
      .filter((t): t is string => t !== null);
    graph.set(file, [...new Set(targets)]);
  }
  return graph;
}

/** Every strongly connected component of more than one module (Tarjan, 1972), or a module importing itself. */
function circles(graph: Map<string, string[]>): string[][] {
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const onStack = new Set<string>();
  const stack: string[] = [];
  const found: string[][] = [];
  let next = 0;
  const visit = (v: string) => {
    index.set(v, next);
    low.set(v, next);
    next++;
    stack.push(v);
    onStack.add(v);
    for (const w of graph.get(v) ?? []) {
      if (!index.has(w)) {
        visit(w);
        low.set(v, Math.min(low.get(v)!, low.get(w)!));
      } else if (onStack.has(w)) {
        low.set(v, Math.min(low.get(v)!, index.get(w)!));
      }
    }
    if (low.get(v) === index.get(v)) {
      const component: string[] = [];
      let w: string;
      do {
        w = stack.pop()!;
        onStack.delete(w);
        component.push(w);
      } while (w !== v);
      if (component.length > 1 || (graph.get(v) ?? []).includes(v)) found.push(component.map((f) => relative(ROOT, f)).sort());
    }
  };
  for (const v of graph.keys()) if (!index.has(v)) visit(v);
  return found;
}

const LAYER_ORDER = ['core', 'workers', 'engine', 'app-or-cli'] as const;
function layerOf(file: string): (typeof LAYER_ORDER)[number] {
  const rel = relative(ROOT, file);
  if (rel.startsWith('src/core/')) return 'core';
  if (rel.startsWith('workers/')) return 'workers';
  if (rel.startsWith('src/engine/')) return 'engine';
  return 'app-or-cli';
}

describe('the import graph of src/ and workers/', () => {
  const graph = importGraph();

  it('finds the modules and their imports (the scan itself works)', () => {
    expect(graph.size).toBeGreaterThan(50);
    const run = [...graph.entries()].find(([f]) => relative(ROOT, f) === 'src/engine/run.ts');
    expect(run?.[1].some((t) => relative(ROOT, t) === 'src/engine/environment.ts')).toBe(true);
    // The circle finder finds a planted circle.
    expect(circles(new Map([['a', ['b']], ['b', ['c']], ['c', ['a']], ['d', ['a']]]))).toEqual([['a', 'b', 'c']]);
  });

  it('has no circles', () => {
    expect(circles(graph)).toEqual([]);
  });

  it('points one way: app and cli → engine → workers → core', () => {
    const wrong: string[] = [];
    for (const [file, targets] of graph) {
      const from = LAYER_ORDER.indexOf(layerOf(file));
      for (const target of targets) {
        if (LAYER_ORDER.indexOf(layerOf(target)) > from) wrong.push(`${relative(ROOT, file)} → ${relative(ROOT, target)}`);
      }
    }
    expect(wrong).toEqual([]);
  });

  it('the app reaches workers only through the engine', () => {
    const wrong: string[] = [];
    for (const [file, targets] of graph) {
      if (!relative(ROOT, file).startsWith('src/app/')) continue;
      for (const target of targets) if (layerOf(target) === 'workers') wrong.push(`${relative(ROOT, file)} → ${relative(ROOT, target)}`);
    }
    expect(wrong).toEqual([]);
  });
});
