/**
 * "fullTurnCrank" is honoured by every family: a design whose driver cannot turn fully
 * breaks the constraint even when its lock is narrower than the search's samples, and a
 * seeded search on a closed target ranks no such design feasible.
 *
 * The designs are of our own invention, built round one non-Grashof four-bar: ground
 * A0 = (0, 0) to B0 = (100, 0), crank 30, coupler 80, rocker 49.99 mm, so
 * s + l − p − q = 30 + 100 − 80 − 49.99 = +0.01 mm. It cannot assemble while the crank
 * pin is farther than 80 + 49.99 from B0: |A − B0|² = 100² + 30² + 6000 cos θ (θ the
 * crank's angle from +x) exceeds 129.99² for |θ − π| < 1.69°, a window of 3.4°, narrower
 * than the 5° steps a search samples, and placed between them (crank at 2.5° in the
 * reference pose, samples at 2.5° + 5° k).
 */
import { describe, expect, it } from 'vitest';
import { compile, fourBar, run, sliderCrank, wattI, type Linkage } from '../../../src/core/linkage';
import { createOptimizer } from '../../../src/core/optimize';
import { createObjective, createProblem, type FamilyId } from '../../../src/core/synthesis';

const DEG = Math.PI / 180;
const CRANK_AT = 2.5 * DEG;
const A0 = { x: 0, y: 0 };
const B0 = { x: 100, y: 0 };
const A = { x: 30 * Math.cos(CRANK_AT), y: 30 * Math.sin(CRANK_AT) };

/** The point at distance ra from a and rb from b, to the left of a → b. */
function dyad(a: { x: number; y: number }, b: { x: number; y: number }, ra: number, rb: number) {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const d = Math.hypot(dx, dy);
  const along = (d * d + ra * ra - rb * rb) / (2 * d);
  const h = Math.sqrt(ra * ra - along * along);
  return { x: a.x + (along * dx - h * dy) / d, y: a.y + (along * dy + h * dx) / d };
}

const B = dyad(A, B0, 80, 49.99);

/** The non-Grashof four-bar of the header, coupler point above the coupler. */
function lockedFourBar(): Linkage {
  return fourBar({ A0, A, B, B0, P: { x: (A.x + B.x) / 2 - 10, y: (A.y + B.y) / 2 + 30 } });
}

/**
 * A slider-crank of our own that cannot turn fully: crank 30 about the origin, slide on
 * y = 10 (slider pin B), rod 39.99. The rod reaches the slide only while the crank pin is
 * within 39.99 of y = 10; it is 40 away at θ = 270°, so the crank cannot pass
 * 270° ± 1.48° (30 (1 − cos φ) = 0.01): a 3° window between the 5° samples.
 */
function lockedSliderCrank(): Linkage {
  const bx = A.x + Math.sqrt(39.99 ** 2 - (10 - A.y) ** 2);
  return sliderCrank({ A0, A, B: { x: bx, y: 10 }, P: { x: (A.x + bx) / 2, y: 20 }, slideAngleRad: 0 });
}

/** A Watt I six-bar whose four-bar loop A0-A-B-B0 is the non-Grashof one above. */
function lockedWattI(): Linkage {
  return wattI({ A0, B0, A, B, C: { x: 10, y: 30 }, D: { x: 60, y: 90 }, E: { x: 0, y: 160 }, P: { x: 10, y: 170 } });
}

/** Output points at rotations `turns` from the reference pose, by the kinematics core. */
function pathOf(linkage: Linkage, turns: readonly number[]): number[][] {
  const compiled = compile(linkage);
  if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
  const plan = compiled.plan;
  const pose = Float64Array.from(plan.reference);
  const p = 2 * (plan.slotIndex.get('P') ?? -1);
  return turns.map((t) => {
    expect(run(plan, plan.driverReferenceValue + t, pose)).toBe(true);
    return [pose[p], pose[p + 1]];
  });
}

/** Independent of the code under test: a fine sweep (0.05°) of a full turn from the reference pose finds a pose that does not assemble. */
function fineSweepLocks(linkage: Linkage): boolean {
  const compiled = compile(linkage);
  if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
  const plan = compiled.plan;
  const pose = Float64Array.from(plan.reference);
  for (let k = 1; k <= 7200; k++) if (!run(plan, plan.driverReferenceValue + (k * 2 * Math.PI) / 7200, pose)) return true;
  return false;
}

/** Reference-pose positions of the joints and points, in the family's variable order. */
function designOf(linkage: Linkage, names: readonly string[]): Float64Array {
  const all = [...linkage.joints, ...(linkage.points ?? [])];
  return Float64Array.from(names, (name) => {
    const [id, axis] = name.split('.');
    const found = all.find((j) => j.id === id);
    if (found === undefined) throw new Error(`no ${id}`);
    return axis === 'x' ? found.x : found.y;
  });
}

// Samples on both sides of the window (0.3 … 2.9 rad and 3.3 … 6.0 rad from the reference).
const TURNS = [0.3, 1.1, 2.0, 2.9, 3.3, 4.1, 5.0, 6.0];

const CASES: [FamilyId, () => Linkage][] = [
  ['fourbar', lockedFourBar],
  ['slider-crank', lockedSliderCrank],
  ['watt-i', lockedWattI],
];

describe('a driver that cannot turn fully breaks fullTurnCrank in every family', () => {
  for (const [family, build] of CASES) {
    it(`${family}: a lock 3° wide between the samples is found`, () => {
      const linkage = build();
      // theorem: Grashof's criterion (Chang, Lin and Wu, "A note on Grashof's theorem",
      // J. Marine Sci. Technol. 13(4), 2005) for the four-bars, and a fine sweep, an
      // independent method, for all three.
      expect(fineSweepLocks(linkage)).toBe(true);
      const made = createProblem({
        name: family,
        target: { points: pathOf(linkage, TURNS), closed: true },
        timing: { mode: 'unprescribed' },
        placement: 'fixed',
        families: [family],
        constraints: { fullTurnCrank: true },
        bounds: { [family]: Object.fromEntries([...linkage.joints, ...(linkage.points ?? [])].flatMap((j) => [[`${j.id}.x`, [-400, 400]], [`${j.id}.y`, [-400, 400]]])) },
      });
      if (!made.ok) throw new Error(JSON.stringify(made.issues));
      const objective = createObjective(made.problem, family);
      const x = designOf(linkage, objective.variableNames);
      const out = new Float64Array(2);
      objective.evaluate(x, out);
      expect(out[1]).toBeGreaterThan(0);
      const report = objective.describe(x);
      expect(report.feasible).toBe(false);
      expect(report.defects.join()).toMatch(/crank cannot turn fully/);
      expect(report.motion.fullTurn).toBe(false);
    });
  }

  for (const [family, build] of CASES) {
    it(`${family}: without fullTurnCrank, target points on both sides of the lock are a branch defect`, () => {
      const linkage = build();
      // Rotations from the reference pose; the lock (see the header) lies at 3.07 … 3.13 rad
      // for the four-bar loops, passed from 2.9 to 3.3, and at 4.64 … 4.69 rad for the
      // slider-crank, passed from 4.4 to 5.1: in both, between the 5° samples.
      const turns = family === 'slider-crank' ? [4.2, 4.4, 5.1, 5.3] : [2.7, 2.9, 3.3, 3.5];
      const made = createProblem({
        name: family,
        target: { points: pathOf(linkage, turns), closed: false },
        timing: { mode: 'prescribed', driverValues: turns },
        placement: 'fixed',
        families: [family],
        bounds: { [family]: Object.fromEntries([...linkage.joints, ...(linkage.points ?? [])].flatMap((j) => [[`${j.id}.x`, [-400, 400]], [`${j.id}.y`, [-400, 400]]])) },
      });
      if (!made.ok) throw new Error(JSON.stringify(made.issues));
      const objective = createObjective(made.problem, family);
      const x = designOf(linkage, objective.variableNames);
      const out = new Float64Array(2);
      objective.evaluate(x, out);
      // Every target point is met exactly: only the motion between them is wrong.
      expect(out[0]).toBeLessThan(1e-12);
      expect(out[1]).toBeGreaterThan(0);
      expect(objective.describe(x).defects.join()).toMatch(/branch defect/);
    });
  }

  it('fourbar: a Grashof crank-rocker a hair inside the boundary still turns fully', () => {
    // Rocker 50.01: s + l − p − q = −0.01 mm, Grashof with the crank shortest (theorem).
    const linkage = fourBar({ A0, A, B: dyad(A, B0, 80, 50.01), B0, P: { x: 50, y: 60 } });
    expect(fineSweepLocks(linkage)).toBe(false);
    const made = createProblem({
      name: 'grashof',
      target: { points: pathOf(linkage, TURNS), closed: true },
      timing: { mode: 'unprescribed' },
      placement: 'fixed',
      families: ['fourbar'],
      constraints: { fullTurnCrank: true },
      bounds: { fourbar: Object.fromEntries(['A0', 'B0', 'A', 'B', 'P'].flatMap((id) => [[`${id}.x`, [-400, 400]], [`${id}.y`, [-400, 400]]])) },
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'fourbar');
    const report = objective.describe(designOf(linkage, objective.variableNames));
    expect(report.feasible).toBe(true);
    expect(report.motion.fullTurn).toBe(true);
    expect(report.error.maxMm).toBeLessThan(1e-6);
  });

  it('fourbar-lengths: a change point within the tolerance is not a full turn', () => {
    // r1 5, r2 1.5, r3 4, r4 2.5: s + l = p + q exactly (theorem: a change point).
    const design = Float64Array.from([5, 1.5, 4, 2.5, 2, 1.2, 0.3, 1, -0.5]);
    const made = createProblem({
      name: 'change point',
      target: { points: [[0, 0], [1, 1], [2, 0], [1, -1]], closed: true },
      timing: { mode: 'prescribed', driverValues: [0.5, 1.5, 2.5, 3.5] },
      placement: 'fixed',
      families: ['fourbar-lengths'],
      constraints: { fullTurnCrank: true },
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'fourbar-lengths');
    const report = objective.describe(design);
    expect(report.grashof?.grashof).toBe('change-point');
    expect(report.defects.join()).toMatch(/crank cannot turn fully/);
    expect(report.motion.fullTurn).toBe(false);
  });
});

describe('a seeded search on a closed target with fullTurnCrank', () => {
  it('fourbar: no design it evaluates as feasible is one whose crank cannot turn fully', () => {
    const linkage = lockedFourBar();
    const made = createProblem({
      name: 'near a change point',
      target: { points: pathOf(linkage, TURNS), closed: true },
      timing: { mode: 'unprescribed' },
      placement: 'fixed',
      families: ['fourbar'],
      constraints: { fullTurnCrank: true },
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'fourbar');
    const names = objective.variableNames;
    const at = (x: Float64Array, id: string) => ({ x: x[names.indexOf(`${id}.x`)], y: x[names.indexOf(`${id}.y`)] });
    const length = (p: { x: number; y: number }, q: { x: number; y: number }) => Math.hypot(q.x - p.x, q.y - p.y);
    /** theorem (Grashof; Chang, Lin and Wu 2005): the input turns fully iff s + l < p + q and the input or the ground is shortest. */
    const turnsFully = (x: Float64Array) => {
      const g = length(at(x, 'A0'), at(x, 'B0'));
      const a = length(at(x, 'A0'), at(x, 'A'));
      const b = length(at(x, 'A'), at(x, 'B'));
      const c = length(at(x, 'B0'), at(x, 'B'));
      const s = Math.min(g, a, b, c);
      const l = Math.max(g, a, b, c);
      return s + l < g + a + b + c - s - l && Math.min(g, a) <= Math.min(b, c);
    };
    const made2 = createOptimizer({ kind: 'hybrid', dim: objective.dim, maxEvaluations: 6000, seed: 1 });
    if (!made2.ok) throw new Error(made2.reason);
    const optimizer = made2.optimizer;
    const x = new Float64Array(objective.dim);
    // The target is the locked design's own path: the search is drawn to the Grashof boundary.
    const out = new Float64Array(2);
    let feasible = 0;
    const wrong: number[] = [];
    for (let round = 0; round < 10_000 && !optimizer.done(); round++) {
      const batch = optimizer.ask();
      const values = new Float64Array(batch.length);
      const violations = new Float64Array(batch.length);
      for (let k = 0; k < batch.length; k++) {
        objective.fromSearchBoxInto(batch[k], x);
        objective.evaluate(x, out);
        values[k] = out[0];
        violations[k] = out[1];
        if (out[1] <= 0) {
          feasible++;
          if (!turnsFully(x)) wrong.push(out[0]);
        }
      }
      optimizer.tell(batch, values, violations);
    }
    expect(feasible).toBeGreaterThan(0);
    expect(wrong).toEqual([]);
    const best = new Float64Array(objective.dim);
    objective.fromSearchBoxInto(optimizer.best().x, best);
    const report = objective.describe(best);
    if (report.feasible) expect(turnsFully(best)).toBe(true);
  });
});
