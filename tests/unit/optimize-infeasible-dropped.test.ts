/**
 * Early abandoning (Optimizer.infeasibleDroppedInto): a point the search marks is dropped
 * if it is infeasible, whatever value and violation it is told with. Checked against the
 * same search told every point's true result: two copies of one search, the second told
 * Infinity for each marked point that is infeasible, must export the same state after every
 * batch (the independent method is the search itself, unabridged). Each check also counts
 * the points it abridged, so it cannot pass by marking none.
 */
import { describe, expect, it } from 'vitest';
import { createOptimizer, type Optimizer, type OptimizerConfig } from '../../src/core/optimize';
import { DistinctElite } from '../../src/core/optimize/elite';

/**
 * A constrained sphere in the unit box (our own test problem): value Σ (u_j − 0.3)², and
 * infeasible outside the ball of radius 0.35 about (0.6, …), violation the distance past
 * it. The optimum of the feasible set lies on the ball, so a search keeps meeting points
 * on both sides of it.
 */
function constrainedSphere(u: Float64Array, out: Float64Array): void {
  let value = 0;
  let away = 0;
  for (let j = 0; j < u.length; j++) {
    value += (u[j] - 0.3) * (u[j] - 0.3);
    away += (u[j] - 0.6) * (u[j] - 0.6);
  }
  out[0] = value;
  out[1] = Math.max(0, Math.sqrt(away) - 0.35);
}

function make(config: OptimizerConfig): Optimizer {
  const built = createOptimizer(config);
  if (!built.ok) throw new Error(built.reason);
  return built.optimizer;
}

/** Runs both copies to the end; returns how many points the abridged copy was told Infinity for, how many were marked, and the last state. */
function runBoth(config: OptimizerConfig): { abridged: number; marked: number; state: object } {
  const full = make(config);
  const abridged = make(config);
  const out = new Float64Array(2);
  let told = 0;
  let marked = 0;
  for (let batch = 0; batch < 100_000 && !full.done(); batch++) {
    const points = full.ask();
    const same = abridged.ask();
    expect(same.map((p) => Array.from(p))).toEqual(points.map((p) => Array.from(p)));
    const n = points.length;
    const dropped = new Uint8Array(n);
    abridged.infeasibleDroppedInto(dropped);
    const values = new Float64Array(n);
    const violations = new Float64Array(n);
    const abridgedValues = new Float64Array(n);
    const abridgedViolations = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      constrainedSphere(points[k], out);
      values[k] = out[0];
      violations[k] = out[1];
      marked += dropped[k];
      const drop = dropped[k] === 1 && out[1] > 0;
      if (drop) told++;
      abridgedValues[k] = drop ? Infinity : out[0];
      abridgedViolations[k] = drop ? Infinity : out[1];
    }
    full.tell(points, values, violations);
    abridged.tell(same, abridgedValues, abridgedViolations);
    expect(JSON.stringify(abridged.exportState())).toBe(JSON.stringify(full.exportState()));
  }
  expect(abridged.done()).toBe(true);
  return { abridged: told, marked, state: full.exportState() };
}

const COMMON = { dim: 4, maxEvaluations: 6000, seed: 17 } as const;

describe('points marked as dropped if infeasible: told anything infeasible, the search goes on the same', () => {
  it('L-SHADE marks a trial whose parent is feasible', () => {
    const { abridged } = runBoth({ kind: 'lshade', ...COMMON });
    expect(abridged).toBeGreaterThan(100);
  });

  it('DE/rand/1/bin likewise', () => {
    const { abridged } = runBoth({ kind: 'de-rand-1-bin', ...COMMON });
    expect(abridged).toBeGreaterThan(100);
  });

  it('the hybrid marks in its global phase once its candidates to polish refuse infeasible points', () => {
    const { abridged } = runBoth({ kind: 'hybrid', ...COMMON });
    expect(abridged).toBeGreaterThan(20);
  });

  it('the restart scheme marks as its current run does, basins and all', () => {
    const { abridged, state } = runBoth({ kind: 'restart', inner: { kind: 'hybrid' }, ...COMMON, maxEvaluations: 8000, runEvaluations: 2000 });
    expect(abridged).toBeGreaterThan(20);
    expect((state as { restarts: number }).restarts).toBeGreaterThan(1);
  });

  it('Nelder–Mead marks none: it compares every point it asks for by its value', () => {
    const { marked } = runBoth({ kind: 'nelder-mead', ...COMMON });
    expect(marked).toBe(0);
  });

  it('the initial population is kept whatever it holds, so none of it is marked', () => {
    const opt = make({ kind: 'lshade', ...COMMON });
    const dropped = new Uint8Array(opt.ask().length).fill(7);
    opt.infeasibleDroppedInto(dropped);
    expect(Array.from(new Set(dropped))).toEqual([0]);
  });
});

describe('a list of distinct points takes an infeasible point while it has room or holds one', () => {
  it('not once it is full of feasible points, nor with no room at all', () => {
    const elite = new DistinctElite(1, 2, 0.01);
    expect(elite.takesInfeasible()).toBe(true);
    elite.offer([0.1], 1, 0);
    expect(elite.takesInfeasible()).toBe(true);
    elite.offer([0.9], 5, 0.1);
    expect(elite.takesInfeasible()).toBe(true);
    expect(elite.offer([0.7], 9, 0)).toBe(true);
    expect(elite.takesInfeasible()).toBe(false);
    expect(elite.offer([0.5], 0, 1e-9)).toBe(false);
    expect(new DistinctElite(3, 0, 0.01).takesInfeasible()).toBe(false);
  });
});

describe("the hybrid's candidates to polish, full of feasible points when a batch is asked", () => {
  it('take none of its infeasible points, though an offer of the batch frees a place', () => {
    // Two candidates 0.08 apart (radius 0.05 in one variable), then a batch whose first
    // point, better than both and near both, takes both places; the second is infeasible.
    const hybrid = make({ kind: 'hybrid', dim: 1, maxEvaluations: 400, seed: 2, polishCount: 2, distinctDistance: 0.05, global: { kind: 'de-rand-1-bin', population: 4 } });
    const candidates = (hybrid as unknown as { candidates: DistinctElite }).candidates;
    candidates.offer([0.4], 2, 0);
    candidates.offer([0.48], 3, 0);
    const points = hybrid.ask();
    const n = points.length;
    const values = new Float64Array(n).fill(50);
    const violations = new Float64Array(n);
    // Told in the batch's order: a point at 0.44 (near both) ranks first; infeasible ones after it.
    // (The batch's points are rewritten in place, which a caller must not do, to set the scene.)
    points[0][0] = 0.44;
    values[0] = 1;
    points[1][0] = 0.9;
    violations[1] = 0.3;
    for (let k = 2; k < n; k++) {
      points[k][0] = 0.1 + 0.01 * k;
      violations[k] = 0.5;
    }
    hybrid.tell(points, values, violations);
    expect(Array.from(candidates.x.subarray(0, candidates.count))).toEqual([0.44]);
  });
});
