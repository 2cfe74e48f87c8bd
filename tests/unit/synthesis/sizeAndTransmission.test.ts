/**
 * Size and force transmission in a path problem: the size limit (constraints.maxSizeMm)
 * holds along the motion `loci analyze` analyses of each exported candidate, and the
 * transmission term (terms.transmissionWeight) moves the ranking towards the design
 * whose transmission angle stays within the guideline.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loci } from '../../support/cli';
import { FOUR_BAR_OUT_LENGTH, createObjective, createProblem, fourBarCouplerPointInto } from '../../../src/core/synthesis';
import { parseProblemFile } from '../../../src/core/io/problem';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'loci-size-'));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

// A foot path of our own: a D shape 60 mm long and 20 mm high, traced clockwise.
const FOOT: number[][] = [
  [0, 0], [15, 0], [30, 0], [45, 0], [60, 0], [55, 10], [45, 17], [30, 20], [15, 17], [5, 10],
];
const SPAN_MM = 60;
/** The limit asked for: three spans, well below what the default boxes allow (13 spans). */
const LIMIT_MM = 3 * SPAN_MM;

const FOOT_PROBLEM = {
  format: 'loci-problem',
  version: 1,
  name: 'foot, size limit',
  target: { points: FOOT, closed: true },
  timing: { mode: 'unprescribed' },
  placement: 'fixed',
  families: ['fourbar'],
  constraints: { fullTurnCrank: true, maxSizeMm: LIMIT_MM },
};

type FitCandidate = {
  feasible: boolean;
  defects: string[];
  motion: { fromDeg: number; toDeg: number; steps: number; fullTurn: boolean };
  sizeMm: { widthMm: number; heightMm: number } | null;
  linkage: unknown;
};

/** The bounding box of every joint and point path in `loci analyze`'s report, read here (not through the code under test). */
function analysedSizeMm(report: { joints: { path: ([number, number] | null)[] }[]; points: { path: ([number, number] | null)[] }[] }): number {
  const xy = [...report.joints, ...report.points].flatMap((j) => j.path.filter((q): q is [number, number] => q !== null));
  const xs = xy.map((q) => q[0]);
  const ys = xy.map((q) => q[1]);
  return Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys));
}

describe('the size limit', () => {
  it('is read from a problem file and checked there', () => {
    const read = parseProblemFile(FOOT_PROBLEM);
    expect(read.ok).toBe(true);
    if (read.ok) expect(read.problem.constraints.maxSizeMm).toBe(LIMIT_MM);
    const bad = parseProblemFile({ ...FOOT_PROBLEM, constraints: { maxSizeMm: -5 } });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.issues[0]).toMatchObject({ path: 'constraints.maxSizeMm' });
    const badTerm = parseProblemFile({ ...FOOT_PROBLEM, terms: { transmissionGuidelineRad: 2 } });
    expect(badTerm.ok).toBe(false);
    if (!badTerm.ok) expect(badTerm.issues[0]).toMatchObject({ path: 'terms.transmissionGuidelineRad' });
  });

  it('`loci check` names the limit and the terms', async () => {
    const file = join(dir, 'foot-check.json');
    writeFileSync(file, JSON.stringify({ ...FOOT_PROBLEM, terms: { transmissionWeight: 1 } }));
    const checked = await loci('check', file);
    expect(checked.code).toBe(0);
    expect(checked.stdout).toMatch(/motion at most 180 mm wide and high/);
    // common practice: the 40°–140° guideline is the default.
    expect(checked.stdout).toMatch(/transmission outside 40\.0°–140\.0° weighted 1/);
  });

  it('a seeded `loci fit` returns feasible designs whose analysed motion fits, by `loci analyze` of each exported file', async () => {
    const problem = join(dir, 'foot.json');
    writeFileSync(problem, JSON.stringify(FOOT_PROBLEM));
    const out = join(dir, 'foot-out.json');
    const fit = await loci('fit', problem, '--evals', '12000', '--seed', '3', '--workers', '2', '--islands', '2', '--top', '5', '--out', out);
    expect(fit.code).toBe(0);
    const candidates = (JSON.parse(readFileSync(out, 'utf8')) as { candidates: FitCandidate[] }).candidates;
    const feasible = candidates.filter((c) => c.feasible);
    expect(feasible.length).toBeGreaterThan(0);
    for (const [i, c] of candidates.entries()) {
      const file = join(dir, `candidate-${i}.json`);
      writeFileSync(file, JSON.stringify(c.linkage));
      const analysed = await loci('analyze', file, '--from', String(c.motion.fromDeg), '--to', String(c.motion.toDeg), '--steps', String(c.motion.steps));
      expect(analysed.code).toBe(0);
      const size = analysedSizeMm(JSON.parse(analysed.stdout) as Parameters<typeof analysedSizeMm>[0]);
      // Independent route: `loci analyze` of the exported file over the candidate's motion.
      if (c.feasible) expect(size).toBeLessThanOrEqual(LIMIT_MM);
      // A design over the limit says so in words.
      if (size > LIMIT_MM) expect(c.defects).toContain('motion larger than the size limit');
    }
    // The control: the same seeded search without the limit returns designs larger than it.
    const free = join(dir, 'foot-free.json');
    writeFileSync(free, JSON.stringify({ ...FOOT_PROBLEM, constraints: { fullTurnCrank: true } }));
    const freeOut = join(dir, 'foot-free-out.json');
    expect((await loci('fit', free, '--evals', '12000', '--seed', '3', '--workers', '2', '--islands', '2', '--top', '5', '--out', freeOut)).code).toBe(0);
    const unlimited = (JSON.parse(readFileSync(freeOut, 'utf8')) as { candidates: FitCandidate[] }).candidates;
    expect(unlimited.some((c) => c.sizeMm !== null && Math.max(c.sizeMm.widthMm, c.sizeMm.heightMm) > LIMIT_MM)).toBe(true);
  }, 180_000);
});

// Two Grashof crank-rockers of our own, mm: ground 100, coupler 80, rocker 70, coupler
// point (40, 24), ground angle 0.3 rad, crank pivot (20, −10); crank 45 (A) or 40 (B).
const A = [100, 45, 80, 70, 40, 24, 0.3, 20, -10];
const B = [100, 40, 80, 70, 40, 24, 0.3, 20, -10];
const TURNS = [1.0, 1.3, 1.6, 1.9, 2.2];
const GUIDELINE_DEG = 40; // common practice: transmission angles from 40° to 140°

/** Worst transmission angle, deg, min(μ, 180° − μ) over a full turn. */
function worstMuDeg(d: number[]): number {
  const [r1, r2, r3, r4] = d;
  // theorem (law of cosines in the loop): cos μ = (r3² + r4² − r1² − r2² + 2 r1 r2 cos θ2) / (2 r3 r4),
  // monotone in cos θ2, so over a full turn μ runs between its values at θ2 = 0 and π.
  const mu = (c: number) => (Math.acos((r3 * r3 + r4 * r4 - r1 * r1 - r2 * r2 + 2 * r1 * r2 * c) / (2 * r3 * r4)) * 180) / Math.PI;
  return Math.min(mu(1), 180 - mu(1), mu(-1), 180 - mu(-1));
}

describe('the transmission and size terms', () => {
  // The target: 45 % of the way from A's coupler points to B's, so A fits a little better.
  const out = new Float64Array(FOUR_BAR_OUT_LENGTH);
  const at = (d: number[], t: number) => {
    fourBarCouplerPointInto(Float64Array.from(d), 0, t, 1, 0, out);
    return [out[0], out[1]];
  };
  const target = TURNS.map((t) => {
    const [ax, ay] = at(A, t);
    const [bx, by] = at(B, t);
    return [ax + 0.45 * (bx - ax), ay + 0.45 * (by - ay)];
  });
  const xs = target.map((p) => p[0]);
  const ys = target.map((p) => p[1]);
  const spanMm = Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys));

  function reports(terms?: { transmissionWeight?: number; sizeWeight?: number }) {
    const made = createProblem({
      name: 'two crank-rockers',
      target: { points: target, closed: false },
      timing: { mode: 'prescribed', driverValues: TURNS },
      placement: 'fixed',
      families: ['fourbar-lengths'],
      measure: 'rms',
      ...(terms === undefined ? {} : { terms }),
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'fourbar-lengths');
    return [objective.describe(Float64Array.from(A)), objective.describe(Float64Array.from(B))];
  }

  it('ranks B (within 40°–140°) above A (outside) once weighted, though A fits better', () => {
    // The premise, by the law of cosines: A leaves the guideline, B stays within it.
    expect(worstMuDeg(A)).toBeLessThan(GUIDELINE_DEG);
    expect(worstMuDeg(B)).toBeGreaterThan(GUIDELINE_DEG);
    const [plainA, plainB] = reports();
    expect(plainA.feasible && plainB.feasible).toBe(true);
    expect(plainA.value).toBeLessThan(plainB.value);
    expect(plainA.termsValue).toBeUndefined();

    const [a, b] = reports({ transmissionWeight: 1 });
    expect(b.value).toBeLessThan(a.value);
    // B costs nothing more; A costs weight × 5 % of the span × its shortfall as a share of the guideline.
    expect(b.value).toBe(plainB.value);
    const expected = 0.05 * spanMm * ((GUIDELINE_DEG - worstMuDeg(A)) / GUIDELINE_DEG);
    // The search samples the turn 5° apart; μ is flat at its extremes, so within 2 %.
    expect(Math.abs((a.termsValue ?? NaN) - expected)).toBeLessThan(0.02 * expected);
    expect(a.value).toBeCloseTo(plainA.value + (a.termsValue ?? NaN), 12);
  });

  it('ranks the smaller motion first once size is weighted', () => {
    const [plainA, plainB] = reports();
    const [a, b] = reports({ sizeWeight: 2 });
    const side = (r: typeof a) => Math.max(r.sizeMm?.widthMm ?? NaN, r.sizeMm?.heightMm ?? NaN);
    // The premise, from the analysis `loci analyze` runs (candidateFigures.test.ts): A's motion is the larger.
    expect(side(a)).toBeGreaterThan(side(b));
    expect(plainA.value).toBeLessThan(plainB.value);
    expect(b.value).toBeLessThan(a.value);
    // Each costs weight × 5 % of the span × (its larger side over the span − 1); the search samples 5° apart, the analysis 1°.
    for (const r of [a, b]) {
      const expected = 2 * 0.05 * spanMm * (side(r) / spanMm - 1);
      expect(Math.abs((r.termsValue ?? NaN) - expected)).toBeLessThan(0.01 * expected);
    }
  });
});
