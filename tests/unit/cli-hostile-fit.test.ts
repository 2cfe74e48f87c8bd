/**
 * `loci fit` on targets that once crashed it after the whole search (exit 1, the search
 * lost) or that `check` accepted and `fit` refused: each is now refused at the start,
 * exit 2 naming the field, as `check` refuses it. Targets just inside each limit run a
 * small search (a few hundred evaluations, 1 worker) to exit 0 with finite output, so
 * the limits are where the computations can still work.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../support/cli';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-hostile-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function problem(name: string, overrides: Record<string, unknown>): string {
  const path = join(dir, `${name}.json`);
  const file = {
    format: 'loci-problem',
    version: 1,
    name,
    target: { points: [[0, 0], [10, 2], [20, 0], [30, -3]], closed: false },
    timing: { mode: 'free', wrap: false },
    placement: 'fixed',
    families: ['fourbar-lengths', 'fourbar'],
    ...overrides,
  };
  writeFileSync(path, JSON.stringify(file));
  return path;
}

const SMALL_FIT = ['--evals', '400', '--workers', '1', '--islands', '1', '--seed', '3'];
const arc = (cx: number, cy: number, span: number, n = 6) =>
  Array.from({ length: n }, (_, i) => [cx + (span * i) / (n - 1), cy + span * 0.3 * Math.sin((Math.PI * i) / (n - 1))]);

function numbersIn(value: unknown, into: number[] = []): number[] {
  if (typeof value === 'number') into.push(value);
  else if (Array.isArray(value)) for (const v of value) numbersIn(v, into);
  else if (typeof value === 'object' && value !== null) for (const v of Object.values(value)) numbersIn(v, into);
  return into;
}

// Each of these crashed `fit` (exit 1 after the search) or was accepted by `check` and refused by `fit`.
const REFUSED: { name: string; overrides: Record<string, unknown>; field: RegExp }[] = [
  // 4e-9 mm: "describe: the reported linkage does not compile … a link of zero length".
  { name: 'tiny', overrides: { target: { points: [[0, 0], [2e-9, 0], [4e-9, 0]], closed: false } }, field: /tiny\.json: target\.points: span 4e-9 mm/ },
  // Near 1e15 mm, where doubles are 0.125 mm apart (IEEE 754 binary64): joints "0 mm apart".
  { name: 'far', overrides: { target: { points: [[1e15, 1e15], [1e15 + 1, 1e15], [1e15 + 2, 1e15 + 1]], closed: false } }, field: /far\.json: target\.points\[0\]: .*within ±20000 mm/ },
  // 992 points and free timing: 1,001 variables against the optimizers' limit of 1,000 (src/core/optimize/config.ts).
  {
    name: 'points992',
    overrides: { target: { points: Array.from({ length: 992 }, (_, i) => [i, 10 * Math.sin(i / 50)]), closed: false }, families: ['fourbar-lengths'] },
    field: /points992\.json: target\.points: has 992 points; .*at most 991 points/,
  },
  // fit named only a job: 'jobs[1].id is "fourbar"'.
  { name: 'twice', overrides: { families: ['fourbar', 'fourbar'] }, field: /twice\.json: families\[1\]: "fourbar" is listed twice/ },
  // Exit 0 with an empty candidate list, or null errors.
  { name: 'huge', overrides: { target: { points: [[-1e308, 0], [1e308, 0], [0, 1e308]], closed: false } }, field: /huge\.json: target\.points\[0\]/ },
  { name: 'bounds', overrides: { bounds: { 'fourbar-lengths': { r1: [-1e308, 1e308] } } }, field: /bounds\.json: bounds\.fourbar-lengths\.r1: .*at most 1000000/ },
  { name: 'weights', overrides: { target: { points: [[0, 0], [10, 2], [20, 0], [30, -3]], closed: false, weights: [1e308, 1e308, 1, 1] } }, field: /weights\.json: target\.weights\[0\]/ },
];

describe('loci fit refuses at the start what loci check refuses', () => {
  for (const { name, overrides, field } of REFUSED) {
    it(`${name}: exit 2 from both, naming the field`, async () => {
      const path = problem(name, overrides);
      const checked = await loci('check', path);
      expect(checked.code).toBe(2);
      expect(checked.stderr).toMatch(field);
      const fitted = await loci('fit', path, ...SMALL_FIT);
      expect(fitted.code).toBe(2);
      expect(fitted.stdout).toBe('');
      expect(fitted.stderr).toMatch(field);
      expect(fitted.stderr).not.toMatch(/evaluations/); // refused before any search
    });
  }
});

describe('loci check and fit on files too large or too deep', () => {
  it('a file over 4,000 kB is refused by both, naming the limit', async () => {
    const path = join(dir, 'large.json');
    writeFileSync(path, JSON.stringify({ format: 'loci-problem', version: 1, name: 'x'.repeat(4_000_001) }));
    for (const command of ['check', 'fit']) {
      const r = await loci(command, path);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/large\.json: the file is 4,000 kB; a problem file may be at most 4,000 kB/);
    }
  });

  it('nesting 100,000 deep is refused with exit 2, not a stack overflow', async () => {
    const path = join(dir, 'deep.json');
    writeFileSync(path, `{"format":"loci-problem","version":1,"name":"deep","target":${'['.repeat(100_000)}${']'.repeat(100_000)}}`);
    const r = await loci('check', path);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^deep\.json|\/deep\.json/);
  });
});

// Just inside each limit: the search runs and every number it writes is finite.
const ACCEPTED: { name: string; overrides: Record<string, unknown> }[] = [
  { name: 'span-floor', overrides: { target: { points: arc(0, 0, 1e-3), closed: false } } },
  { name: 'far-floor', overrides: { target: { points: arc(2e4 - 20, 2e4 - 20, 20), closed: false } } },
  { name: 'far-free', overrides: { target: { points: arc(-2e4 + 20, 2e4 - 20, 20, 12), closed: true }, timing: { mode: 'unprescribed' }, placement: 'free' } },
  { name: 'wide', overrides: { target: { points: arc(-2e4, -2e4 + 1, 4e4), closed: false } } },
  { name: 'points991', overrides: { target: { points: Array.from({ length: 991 }, (_, i) => [i, 10 * Math.sin(i / 50)]), closed: false }, families: ['fourbar-lengths'] } },
  { name: 'weights-edge', overrides: { target: { points: [[0, 0], [10, 2], [20, 0], [30, -3]], closed: false, weights: [1e6, 0, 1e6, 1e-300] } } },
  { name: 'bounds-edge', overrides: { bounds: { 'fourbar-lengths': { r1: [1, 1e6], x0: [-1e6, 1e6] }, fourbar: { 'A0.x': [-1e6, 1e6] } } } },
  { name: 'driver-edge', overrides: { timing: { mode: 'prescribed', driverValues: [-5729, 0, 2000, 5729], unit: 'deg' } } },
];

describe('loci fit just inside the limits', () => {
  for (const { name, overrides } of ACCEPTED) {
    it(`${name}: check exits 0, and fit exits 0 with finite candidates`, async () => {
      const path = problem(name, overrides);
      expect((await loci('check', path)).code).toBe(0);
      const fitted = await loci('fit', path, ...SMALL_FIT);
      expect(fitted.code, fitted.stderr.slice(-600)).toBe(0);
      const result = JSON.parse(fitted.stdout) as { candidates: { error: unknown; value: unknown; x: unknown }[] };
      expect(result.candidates.length).toBeGreaterThan(0);
      for (const v of numbersIn(result)) expect(Number.isFinite(v)).toBe(true);
      for (const c of result.candidates) {
        expect(typeof c.value).toBe('number');
        expect(numbersIn(c.error).length).toBeGreaterThan(0);
        expect(JSON.stringify(c.error)).not.toMatch(/null/);
      }
    }, 60_000);
  }
});
