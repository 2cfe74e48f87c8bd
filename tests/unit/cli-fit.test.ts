/**
 * `loci check` and `loci fit` through the command table (src/cli/main.ts), in this
 * process with captured output; the search itself runs in real worker threads.
 *
 * The fitted problem is the five-point prescribed-timing four-bar problem of Cabrera,
 * Simon and Prado (2002, Mech. Mach. Theory 37:1165-1177): target points and crank
 * angles 30°, 45°, …, 90° from tests/reference/data/path-synthesis.json ("timed5"),
 * Grashof crank required. Its floor is 2.711e-7 (the 3-decimal rounding of the
 * published points; independent computation noted there).
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseLinkageFile } from '../../src/core/io/linkageFile';
import { loci } from '../support/cli';
import { decodeCheckpoint } from '../../src/engine';

const TIMED5 = {
  format: 'loci-problem',
  version: 1,
  name: 'timed5',
  target: { points: [[3, 3], [2.759, 3.363], [2.372, 3.663], [1.89, 3.862], [1.355, 3.943]], closed: false },
  timing: { mode: 'prescribed', driverValues: [30, 45, 60, 75, 90], unit: 'deg' },
  placement: 'fixed',
  families: ['fourbar-lengths'],
  bounds: { 'fourbar-lengths': { r1: [0.5, 6], r2: [0.5, 6], r3: [0.5, 6], r4: [0.5, 6], rcx: [-5, 5], rcy: [-5, 5], x0: [-5, 5], y0: [-5, 5] } },
  constraints: { fullTurnCrank: true },
};

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-fit-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function write(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}

describe('loci check', () => {
  it('exits 2 on a bad file, naming the file and the field', async () => {
    const unknownFamily = write('family.json', { ...TIMED5, families: ['fourbar-lengths', 'hexapod'] });
    const r = await loci('check', unknownFamily);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/family\.json: families\[1\]: .*"hexapod"/);
    const twoPoints = write('two-points.json', { ...TIMED5, target: { points: [[0, 0], [1, 1]], closed: false }, timing: { mode: 'free', wrap: false } });
    const r2 = await loci('check', twoPoints);
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/two-points\.json: target\.points: .*at least 3/);
    const notJson = write('truncated.json', JSON.stringify(TIMED5).slice(0, 40));
    const r3 = await loci('check', notJson);
    expect(r3.code).toBe(2);
    expect(r3.stderr).toMatch(/truncated\.json: not valid JSON/);
  });

  it('prints each family\'s variables and bounds for a valid file', async () => {
    const r = await loci('check', write('timed5.json', TIMED5));
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/fourbar-lengths: 9 variables/);
    expect(r.stdout).toMatch(/r1\s+0\.5 … 6/);
    const json = await loci('check', '--json', join(dir, 'timed5.json'));
    const summary = JSON.parse(json.stdout) as { families: { family: string; dim: number; variables: { name: string; lower: number; upper: number }[] }[] };
    expect(summary.families[0].dim).toBe(9);
    expect(summary.families[0].variables.find((v) => v.name === 'x0')).toEqual({ name: 'x0', lower: -5, upper: 5 });
  });

  it('names the search map a problem file asks for', async () => {
    const mapped = write('timed5-mapped.json', { ...TIMED5, searchMaps: { 'fourbar-lengths': 'fourbar-boundary' } });
    const r = await loci('check', mapped);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/fourbar-lengths: 9 variables, searched through the "fourbar-boundary" search map/);
    const json = JSON.parse((await loci('check', '--json', mapped)).stdout) as { families: { searchMap: string }[] };
    expect(json.families[0].searchMap).toBe('fourbar-boundary');
  });
});

describe('loci fit', () => {
  const EVALS = 20_000;
  let out = '';
  let checkpoint = '';
  let first: { code: number; stdout: string; stderr: string };
  type Candidate = {
    rank: number;
    family: string;
    parameters: Record<string, number>;
    error: { sumSquares: number; rmsMm: number; maxMm: number; perPointMm: number[] };
    value: number;
    feasible: boolean;
    defects: string[];
    grashof: { grashof: string; name: string } | null;
    transmissionDeg: { min: number; max: number } | null;
    linkage: unknown;
  };
  type FitResult = { format: string; evaluations: number; evaluationsByFamily: Record<string, number>; stopReason: string; candidates: Candidate[] };
  let result: FitResult;

  beforeAll(async () => {
    const problem = write('fit.json', TIMED5);
    out = join(dir, 'fit-out.json');
    checkpoint = join(dir, 'fit-checkpoint.json');
    first = await loci('fit', problem, '--evals', String(EVALS), '--seed', '5', '--workers', '2', '--islands', '2', '--top', '3', '--out', out, '--checkpoint', checkpoint);
    result = JSON.parse(readFileSync(out, 'utf8')) as FitResult;
  });

  it('writes ranked candidates, spending exactly the evaluation budget, with progress on stderr', () => {
    expect(first.code).toBe(0);
    expect(first.stdout).toBe('');
    expect(first.stderr).toMatch(/loci fit: 20,000\/20,000 evaluations, best \S+ mm² \(fourbar-lengths\), [\d,]+ evals\/s, done/);
    expect(result.format).toBe('loci-fit-result');
    expect(result.stopReason).toBe('budget');
    expect(result.evaluations).toBe(EVALS);
    expect(result.evaluationsByFamily).toEqual({ 'fourbar-lengths': EVALS });
    expect(result.candidates.map((c) => c.rank)).toEqual([1, 2, 3]);
    const values = result.candidates.map((c) => c.value);
    expect(values).toEqual([...values].sort((a, b) => a - b));
  });

  it('reports errors that agree with each other: Σ d² = sum of squares, RMS = √(Σ d² / n), max = max d', () => {
    for (const c of result.candidates) {
      const d = c.error.perPointMm;
      const sum = d.reduce((s, v) => s + v * v, 0);
      expect(c.error.sumSquares).toBeCloseTo(sum, 12);
      expect(c.error.rmsMm).toBeCloseTo(Math.sqrt(sum / d.length), 12);
      expect(c.error.maxMm).toBe(Math.max(...d));
      expect(c.value).toBe(c.error.sumSquares);
    }
  });

  it('finds a Grashof crank (s + l ≤ p + q with the crank shortest, Grashof 1883) close to the published points', () => {
    const best = result.candidates[0];
    expect(best.feasible).toBe(true);
    expect(best.defects).toEqual([]);
    const { r1, r2, r3, r4 } = best.parameters;
    const sorted = [r1, r2, r3, r4].sort((a, b) => a - b);
    expect(r2).toBe(sorted[0]);
    expect(sorted[0] + sorted[3]).toBeLessThanOrEqual(sorted[1] + sorted[2]);
    expect(best.grashof?.grashof).toBe('grashof');
    expect(best.transmissionDeg).not.toBeNull();
    // 25 times the floor set by the points' rounding would still be a loose fit; 1e-4 mm²
    // (about 4.5e-3 mm RMS on points 2 mm apart) is what a 20 000-evaluation search must reach.
    expect(best.error.sumSquares).toBeLessThan(1e-4);
  });

  it('gives each candidate a linkage file that reads back', () => {
    for (const c of result.candidates) {
      const read = parseLinkageFile(c.linkage);
      expect(read.ok, JSON.stringify(read.ok ? '' : read.issues)).toBe(true);
    }
  });

  it('saves a checkpoint, resumes from it, and refuses a checkpoint of another search', async () => {
    expect(existsSync(checkpoint)).toBe(true);
    const decoded = decodeCheckpoint(readFileSync(checkpoint, 'utf8'));
    expect(decoded.ok && decoded.payload.evaluations).toBe(EVALS);
    // The one before is kept beside it, and no temporary file of the atomic writes is left.
    expect(decodeCheckpoint(readFileSync(`${checkpoint}.prev`, 'utf8')).ok).toBe(true);
    expect(readdirSync(dir).filter((name) => name.endsWith('.tmp'))).toEqual([]);
    const again = await loci('fit', join(dir, 'fit.json'), '--evals', String(EVALS), '--seed', '5', '--workers', '2', '--islands', '2', '--top', '3', '--checkpoint', checkpoint);
    expect(again.code).toBe(0);
    expect(again.stderr).toMatch(/resuming from .*fit-checkpoint\.json/);
    const resumed = JSON.parse(again.stdout) as FitResult;
    expect(resumed.candidates.map((c) => c.parameters)).toEqual(result.candidates.map((c) => c.parameters));
    const other = await loci('fit', join(dir, 'fit.json'), '--evals', String(EVALS), '--seed', '6', '--islands', '2', '--checkpoint', checkpoint);
    expect(other.code).toBe(2);
    expect(other.stderr).toMatch(/holds a checkpoint of another search/);
  });

  it('refuses --evals with --seconds, and a budget below one evaluation per island', async () => {
    const both = await loci('fit', join(dir, 'fit.json'), '--evals', '1000', '--seconds', '5');
    expect(both.code).toBe(2);
    expect(both.stderr).toMatch(/give --evals or --seconds, not both/);
    const tiny = await loci('fit', join(dir, 'fit.json'), '--evals', '3', '--islands', '4');
    expect(tiny.code).toBe(2);
    expect(tiny.stderr).toMatch(/--evals: 3 is fewer than one evaluation per island/);
  });
});
