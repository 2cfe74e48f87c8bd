/**
 * Generated linkage files through the whole `loci analyze` path, in process: the reader,
 * compile and the report, as the command runs them. Each input is a valid linkage file
 * of our own families, bent by a few random edits (a value replaced by any JSON value,
 * huge, tiny, negative or a string with control characters; a field or element removed
 * or repeated; a joint moved; the whole drawing scaled), or its text cut or spliced.
 *
 * Sometimes a driver range comes too (--from/--to), ordinary or absurd.
 *
 * For every input the command must end with exit 0 and a report of finite numbers, or
 * exit 2 with every line naming the file (and field) or the flag; never exit 1 (a bug),
 * a thrown error, a hang or unbounded output. Source: common practice for a command
 * line (the exit codes `loci analyze --help` states: 0 done, 2 bad input, 1 a bug).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { run } from '../../src/cli/analyze';
import type { CliIo } from '../../src/cli/command';
import { toLinkageFile } from '../../src/core/io/linkageFile';
import { fourBar, sliderCrank, stephensonIII, wattII } from '../../src/core/linkage/families';
import { dyadChain } from '../unit/hostileLinkages';

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

/** A shock-driven rocker: a length driver from a ground mount (the reader's other driver kind). */
const shockRocker: Json = {
  format: 'loci-linkage', version: 1, units: 'mm',
  joints: [{ id: 'R0', x: 0, y: 0, ground: true }, { id: 'S0', x: 90, y: -10, ground: true }, { id: 'S', x: 30, y: 40 }],
  bodies: [{ id: 'rocker', joints: ['R0', 'S'] }],
  driver: { kind: 'length', from: 'S0', to: 'S' },
};

const SEEDS: readonly Json[] = [
  toLinkageFile(fourBar(), 'four-bar') as unknown as Json,
  toLinkageFile(sliderCrank()) as unknown as Json,
  toLinkageFile(stephensonIII()) as unknown as Json,
  toLinkageFile(wattII()) as unknown as Json,
  shockRocker,
  dyadChain(3) as unknown as Json,
];

/** Every place in a JSON value, as a path of keys. */
function paths(value: Json, at: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(at);
  if (Array.isArray(value)) value.forEach((v, i) => paths(v, [...at, i], out));
  else if (value !== null && typeof value === 'object') for (const [k, v] of Object.entries(value)) paths(v, [...at, k], out);
  return out;
}

function parentOf(root: Json, path: (string | number)[]): { parent: Json; key: string | number } | null {
  if (path.length === 0) return null;
  let node = root;
  for (const key of path.slice(0, -1)) node = (node as Record<string | number, Json>)[key];
  return { parent: node, key: path[path.length - 1] };
}

const nasty = fc.oneof(
  fc.constantFrom(1e308, -1e308, 1e-308, 5e-324, 0, -0, 1e6, 1e6 + 1, -1e7, 1e15, 2 * Math.PI, 7, 90, -1),
  fc.double({ noNaN: true, noDefaultInfinity: true }),
  fc.integer({ min: -3, max: 3 }),
  fc.constantFrom('', 'ground', 'A', 'B', 'A0', 'crank', 'coupler', 'rotation', 'length', 'x\u001b[2Jy', 'nul\u0000', 'rtl\u202eevil', 'a'.repeat(300)),
  fc.string({ unit: 'binary', maxLength: 12 }),
  fc.boolean(),
  fc.constant(null),
  fc.constant([] as Json),
  fc.constant({} as Json),
  fc.jsonValue({ maxDepth: 2 }) as fc.Arbitrary<Json>,
) as fc.Arbitrary<Json>;

type Edit =
  | { kind: 'set'; pick: number; value: Json }
  | { kind: 'delete'; pick: number }
  | { kind: 'repeat'; pick: number; times: number }
  | { kind: 'move'; pick: number; dx: number; dy: number }
  | { kind: 'scale'; factor: number };

const edit: fc.Arbitrary<Edit> = fc.oneof(
  fc.record({ kind: fc.constant('set' as const), pick: fc.nat(), value: nasty }),
  fc.record({ kind: fc.constant('delete' as const), pick: fc.nat() }),
  fc.record({ kind: fc.constant('repeat' as const), pick: fc.nat(), times: fc.integer({ min: 1, max: 3 }) }),
  fc.record({ kind: fc.constant('move' as const), pick: fc.nat(), dx: fc.double({ min: -200, max: 200, noNaN: true }), dy: fc.double({ min: -200, max: 200, noNaN: true }) }),
  fc.record({ kind: fc.constant('scale' as const), factor: fc.constantFrom(1e-9, 1e-3, 0.5, 2, 1e3, 1e5, 1e9, -1) }),
);

function applyEdit(root: Json, e: Edit): Json {
  if (e.kind === 'scale') {
    const scaleAll = (v: Json, key?: string): Json => {
      if (typeof v === 'number' && (key === 'x' || key === 'y')) return v * e.factor;
      if (Array.isArray(v)) return v.map((x) => scaleAll(x));
      if (v !== null && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, scaleAll(x, k)]));
      return v;
    };
    return scaleAll(root);
  }
  const all = paths(root);
  const path = all[e.pick % all.length];
  const place = parentOf(root, path);
  if (e.kind === 'set') {
    if (place === null) return e.value;
    (place.parent as Record<string | number, Json>)[place.key] = e.value;
    return root;
  }
  if (place === null) return root;
  const parent = place.parent as Record<string | number, Json> & Json[];
  if (e.kind === 'delete') {
    if (Array.isArray(parent)) parent.splice(place.key as number, 1);
    else delete parent[place.key];
  } else if (e.kind === 'repeat') {
    if (Array.isArray(parent)) parent.splice(place.key as number, 0, ...Array.from({ length: e.times }, () => structuredClone(parent[place.key as number])));
  } else {
    const node = parent[place.key];
    if (node !== null && typeof node === 'object' && !Array.isArray(node) && typeof node.x === 'number' && typeof node.y === 'number') {
      node.x += e.dx;
      node.y += e.dy;
    }
  }
  return root;
}

/** The text of a file: an edited seed, sometimes cut short or with a character spliced in. */
const fileText: fc.Arbitrary<string> = fc
  .tuple(fc.nat({ max: SEEDS.length - 1 }), fc.array(edit, { minLength: 0, maxLength: 3 }), fc.oneof(
    fc.constant(null),
    fc.record({ at: fc.nat(), insert: fc.constantFrom('', '{', ']', ',', '"', '\u0000', 'e999') }),
  ))
  .map(([seed, edits, splice]) => {
    let doc = structuredClone(SEEDS[seed]);
    for (const e of edits) doc = applyEdit(doc, e);
    const text = JSON.stringify(doc, null, 1);
    if (splice === null) return text;
    const at = splice.at % (text.length + 1);
    return `${text.slice(0, at)}${splice.insert}${text.slice(at + (splice.insert === '' ? 1 : 0))}`;
  });

/** Mostly no range (the default); sometimes one, ordinary or absurd. */
const driverRange: fc.Arbitrary<readonly string[]> = fc.oneof(
  { weight: 4, arbitrary: fc.constant([]) },
  { weight: 1, arbitrary: fc.tuple(
    fc.constantFrom(-1e300, -3601, -90, 0, 1e-12, 30, 150, 3600, 1e7),
    fc.constantFrom(-90, 0, 10, 45, 150, 359, 3600, 1e300),
  ).map(([a, b]) => ['--from', String(a), '--to', String(b)]) },
);

/** The command in process, on one file's text; output is collected, and bounded by the test. */
async function analyzeText(text: string, flags: readonly string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  let stdout = '';
  let stderr = '';
  const io: CliIo = {
    stdout: (t) => { stdout += t; },
    stderr: (t) => { stderr += t; },
    readTextFile: () => Promise.resolve({ ok: true, text }),
  };
  const code = await run(['x.json', '--steps', '9', ...flags], io);
  return { code, stdout, stderr };
}

/** Every number in a parsed JSON value. */
function numbersIn(value: unknown, out: number[] = []): number[] {
  if (typeof value === 'number') out.push(value);
  else if (Array.isArray(value)) for (const v of value) numbersIn(v, out);
  else if (value !== null && typeof value === 'object') for (const v of Object.values(value)) numbersIn(v, out);
  return out;
}

/** Generous bound on the output of a 9-step report of a small linkage, or of a capped list of problems. */
const MAX_OUTPUT_CHARS = 1_000_000;

describe('loci analyze on generated linkage files', () => {
  it('ends with exit 0 and a finite report, or exit 2 naming the file and field; never 1, a throw or unbounded output', async () => {
    await fc.assert(
      fc.asyncProperty(fileText, driverRange, async (text, flags) => {
        const { code, stdout, stderr } = await analyzeText(text, flags);
        expect(stdout.length + stderr.length).toBeLessThan(MAX_OUTPUT_CHARS);
        if (code === 0) {
          expect(stderr).toBe('');
          const report = JSON.parse(stdout) as unknown;
          for (const v of numbersIn(report)) expect(Number.isFinite(v)).toBe(true);
          return;
        }
        expect(code, stderr).toBe(2);
        expect(stdout).toBe('');
        const lines = stderr.trimEnd().split('\n');
        // a capped list: 12 problems, then the count of the rest
        expect(lines.length).toBeLessThanOrEqual(13);
        // eslint-disable-next-line no-control-regex -- what must not reach a terminal
        expect(stderr).not.toMatch(/[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/u);
        for (const line of lines) expect(line).toMatch(/^(x\.json|loci analyze): \S/);
      }),
      { seed: 20261203, numRuns: 1000 },
    );
  }, 120_000);
});
