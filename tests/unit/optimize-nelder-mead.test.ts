import { describe, expect, it } from 'vitest';
import { gaoHanCoefficients } from '../../src/core/optimize';
import type { NelderMeadState, OptimizerConfig } from '../../src/core/optimize';
import { fmin } from '../support/fmin';
import { drive, expectExactResume, make, maxAbsDiff, rosenbrock, shiftedSphere, traced, type Problem } from '../support/optimize';

/** A start point given in real units, in box units for a box [lower, upper]^d. */
function toBox(x: readonly number[], lower: number, upper: number): number[] {
  return x.map((v) => (v - lower) / (upper - lower));
}

describe('Gao and Han (2012) adaptive coefficients', () => {
  it('are 1, 1 + 2/n, 0.75 − 1/(2n), 1 − 1/n, and the standard 1, 2, 1/2, 1/2 for n = 2', () => {
    // Gao and Han note that for n = 2 their parameters are the standard ones.
    expect(gaoHanCoefficients(2)).toEqual({ reflection: 1, expansion: 2, contraction: 0.5, shrink: 0.5 });
    const c10 = gaoHanCoefficients(10);
    expect(c10.reflection).toBe(1);
    expect(c10.expansion).toBeCloseTo(1.2, 15);
    expect(c10.contraction).toBeCloseTo(0.7, 15);
    expect(c10.shrink).toBeCloseTo(0.9, 15);
    expect(gaoHanCoefficients(1)).toEqual(gaoHanCoefficients(2));
  });
});

describe('Nelder–Mead on published test functions', () => {
  it('solves Rosenbrock 2-d from the classical start (−1.2, 1)', () => {
    // Rosenbrock (1960); start and minimum 0 at (1, 1) as in Moré, Garbow and Hillstrom
    // (1981), "Testing unconstrained optimization software", problem 1. Box [−5, 5]^2.
    const problem = rosenbrock(2, -5, 5);
    for (const seed of [1, 2, 3]) {
      const r = drive(make({ kind: 'nelder-mead', dim: 2, maxEvaluations: 2000, seed, x0: toBox([-1.2, 1], -5, 5) }), problem);
      expect(r.value).toBeLessThan(1e-14);
      expect(maxAbsDiff(r.x, [1, 1])).toBeLessThan(1e-6);
      expect(r.stopReason).toBe('converged');
    }
  });

  it('reaches 1e-8 on a shifted sphere in 10, 20 and 30 dimensions (adaptive coefficients)', () => {
    // Sphere as in Jamil and Yang (2013); Gao and Han (2012) show the standard
    // coefficients failing on such quadratics as n grows. The budgets are ours.
    for (const [d, budget] of [[10, 3000], [20, 8000], [30, 15000]]) {
      const shift = Array.from({ length: d }, (_, i) => ((i * 37) % 17) - 8);
      const r = drive(make({ kind: 'nelder-mead', dim: d, maxEvaluations: budget, seed: 1, targetValue: 1e-8 }), shiftedSphere(shift));
      expect(r.stopReason).toBe('target');
    }
  });

  it("finds the minimum −1/4 at (0, −1/2) of McKinnon's function (τ = 2, θ = 6, φ = 60)", () => {
    // McKinnon (1998), "Convergence of the Nelder–Mead simplex method to a nonstationary
    // point": f = θ φ |x|^τ + y + y² for x ≤ 0, θ x^τ + y + y² for x > 0.
    const mckinnon: Problem = { dim: 2, lower: -1, upper: 1, value: (x) => (x[0] <= 0 ? 360 * x[0] * x[0] : 6 * x[0] * x[0]) + x[1] + x[1] * x[1] };
    for (const seed of [1, 2, 3]) {
      const r = drive(make({ kind: 'nelder-mead', dim: 2, maxEvaluations: 3000, seed }), mckinnon);
      expect(r.value - -0.25).toBeLessThan(1e-12);
      expect(maxAbsDiff(r.x, [0, -0.5])).toBeLessThan(1e-5);
    }
  });

  it('clamps to the box: a minimiser outside it is found on the boundary', () => {
    // The nearest point of [0, 1]^3 to (1.5, −0.25, 0.5) is (1, 0, 0.5), distance² 0.3125.
    const outside: Problem = { dim: 3, lower: 0, upper: 1, value: (x) => (x[0] - 1.5) ** 2 + (x[1] + 0.25) ** 2 + (x[2] - 0.5) ** 2 };
    const r = drive(make({ kind: 'nelder-mead', dim: 3, maxEvaluations: 3000, seed: 1 }), outside);
    expect(r.value - 0.3125).toBeLessThan(1e-12);
    expect(maxAbsDiff(r.x, [1, 0, 0.5])).toBeLessThan(1e-5);
  });

  it('restarts on stagnation, and stops as converged after maxStaleRestarts restarts without progress', () => {
    const opt = make({ kind: 'nelder-mead', dim: 4, maxEvaluations: 100_000, seed: 1, maxStaleRestarts: 4 });
    const r = drive(opt, shiftedSphere([1, 2, 3, 4]));
    const s = opt.exportState() as NelderMeadState;
    expect(r.stopReason).toBe('converged');
    expect(s.restarts).toBeGreaterThanOrEqual(4);
    expect(s.staleRestarts).toBe(4);
    expect(r.evaluations).toBeLessThan(100_000);
  });

  it('moves from an infeasible start into the feasible region (Deb, 2000)', () => {
    // Minimise (x − 0.8)² + (y − 0.8)² subject to x + y ≤ 1, from (0.95, 0.95).
    const constrained: Problem = {
      dim: 2,
      lower: 0,
      upper: 1,
      value: (x) => (x[0] - 0.8) ** 2 + (x[1] - 0.8) ** 2,
      violation: (x) => x[0] + x[1] - 1,
    };
    const r = drive(make({ kind: 'nelder-mead', dim: 2, maxEvaluations: 3000, seed: 1, x0: [0.95, 0.95] }), constrained);
    expect(r.violation).toBe(0);
    expect(r.x[0] + r.x[1]).toBeLessThanOrEqual(1);
  });
});

describe('Nelder–Mead against the Nelder–Mead of the fmin package', () => {
  /** fmin's nelderMead, restarted from its own result until it stops improving. */
  function referenceMinimum(f: (x: number[]) => number, x0: number[]): { x: number[]; fx: number } {
    let x = x0.slice();
    let fx = f(x);
    for (let round = 0; round < 20; round++) {
      let r: { x: number[]; fx: number };
      try {
        r = fmin.nelderMead(f, x.slice(), { maxIterations: 20_000, minErrorDelta: 1e-14 });
      } catch (error) {
        // fmin 0.0.4 assigns an undeclared loop variable in its shrink step, which throws
        // in strict mode; sigma = 1 makes it stop there instead, and the next round goes on.
        if (!(error instanceof ReferenceError)) throw error;
        r = fmin.nelderMead(f, x.slice(), { maxIterations: 20_000, minErrorDelta: 1e-14, sigma: 1 });
      }
      if (!(r.fx < fx)) break;
      x = Array.from(r.x);
      fx = r.fx;
    }
    return { x, fx };
  }

  function ours(f: (x: number[]) => number, x0: number[], lower: number, upper: number): { x: number[]; fx: number } {
    const d = x0.length;
    const problem: Problem = { dim: d, lower, upper, value: (x) => f(Array.from(x)) };
    const r = drive(make({ kind: 'nelder-mead', dim: d, maxEvaluations: 20_000, seed: 1, x0: toBox(x0, lower, upper) }), problem);
    return { x: r.x, fx: r.value };
  }

  const cases: { name: string; f: (x: number[]) => number; x0: number[]; minimiser: number[] }[] = [
    {
      // Moré, Garbow and Hillstrom (1981), problem 1.
      name: 'Rosenbrock 2-d from (−1.2, 1)',
      f: (x) => 100 * (x[1] - x[0] ** 2) ** 2 + (1 - x[0]) ** 2,
      x0: [-1.2, 1],
      minimiser: [1, 1],
    },
    {
      // (x − c)ᵀ A (x − c) with A = [[4, 1], [1, 3]] positive definite: minimum 0 at c.
      name: 'a 2-d quadratic with cross term',
      f: (x) => {
        const a = x[0] - 0.7;
        const b = x[1] + 1.3;
        return 4 * a * a + 2 * a * b + 3 * b * b;
      },
      x0: [2, 2],
      minimiser: [0.7, -1.3],
    },
    {
      name: 'a 3-d ill-scaled quadratic, diag(1, 10, 100)',
      f: (x) => (x[0] - 1) ** 2 + 10 * (x[1] - 2) ** 2 + 100 * (x[2] - 3) ** 2,
      x0: [0, 0, 0],
      minimiser: [1, 2, 3],
    },
    {
      // Tridiagonal A with 4 on the diagonal and 1 beside it: diagonally dominant, so positive definite.
      name: 'a 4-d quadratic with a tridiagonal Hessian',
      f: (x) => {
        const c = [0.3, -0.6, 1.1, 0.05];
        const z = x.map((v, i) => v - c[i]);
        let s = 0;
        for (let i = 0; i < 4; i++) s += 4 * z[i] * z[i] + (i < 3 ? 2 * z[i] * z[i + 1] : 0);
        return s;
      },
      x0: [1, 1, -1, 2],
      minimiser: [0.3, -0.6, 1.1, 0.05],
    },
  ];

  for (const c of cases) {
    it(`both reach the same minimum on ${c.name}`, () => {
      const reference = referenceMinimum(c.f, c.x0);
      const mine = ours(c.f, c.x0, -5, 5);
      expect(maxAbsDiff(reference.x, c.minimiser)).toBeLessThan(1e-6);
      expect(maxAbsDiff(mine.x, c.minimiser)).toBeLessThan(1e-6);
      expect(maxAbsDiff(mine.x, reference.x)).toBeLessThan(1e-6);
      expect(Math.abs(mine.fx - reference.fx)).toBeLessThan(1e-12);
    });
  }
});

describe('Nelder–Mead determinism, resume, budget and failures', () => {
  const problem = rosenbrock(3, -2, 2);
  const config: OptimizerConfig = { kind: 'nelder-mead', dim: 3, maxEvaluations: 3000, seed: 21, maxStaleRestarts: 1000 };

  it('the same seed gives a bit-identical run; another seed (another start) differs', () => {
    const a = traced(config, problem);
    expect(traced(config, problem).hash).toBe(a.hash);
    const b = traced({ ...config, seed: 22 }, problem);
    expect(b.hash).not.toBe(a.hash);
  });

  it('an exported state, through JSON, resumes exactly, in every phase', () => {
    // A staircase (a floored sphere) has plateaus, so contractions fail and shrinks occur.
    const staircase: Problem = {
      dim: 3,
      lower: -2,
      upper: 2,
      value: (x) => Math.floor(20 * ((x[0] - 0.3) ** 2 + (x[1] + 0.2) ** 2 + x[2] ** 2)),
    };
    const stairs: OptimizerConfig = { ...config, maxEvaluations: 2000 };
    // Cut where each kind of step is pending: the first three times of each.
    const cutsByPhase = new Map<string, number[]>();
    const scout = make(stairs);
    while (!scout.done()) {
      const phase = (scout.exportState() as NelderMeadState).phase;
      const list = cutsByPhase.get(phase) ?? [];
      if (list.length < 3) list.push(scout.evaluations());
      cutsByPhase.set(phase, list);
      drive(scout, staircase, { until: scout.evaluations() + 1 });
    }
    expect([...cutsByPhase.keys()].sort()).toEqual(['contract-inside', 'contract-outside', 'expand', 'reflect', 'shrink', 'simplex']);
    expectExactResume(stairs, staircase, [...[...cutsByPhase.values()].flat(), 1999]);
    expectExactResume(config, problem, [0, 1, 4, 500, 2999]);
  });

  it('asks for exactly maxEvaluations points, then none', () => {
    for (const budget of [1, 2, 3, 4, 5, 17, 1234]) {
      const opt = make({ ...config, maxEvaluations: budget });
      const r = drive(opt, problem);
      expect(r.evaluations).toBe(budget);
      expect(r.stopReason).toBe('budget');
      expect(opt.ask()).toEqual([]);
    }
  });

  it('ranks NaN and Infinity worst and goes around them', () => {
    const sphere = shiftedSphere([0.2, -0.3]);
    const holed: Problem = { ...sphere, value: (x) => (x[0] > 0.5 ? Number.NaN : x[1] < -0.8 ? Infinity : sphere.value(x)), lower: -1, upper: 1 };
    // Start at (0.4, 0): the first simplex has vertices on both sides of x = 0.5.
    const r = drive(make({ kind: 'nelder-mead', dim: 2, maxEvaluations: 3000, seed: 4, x0: [0.7, 0.5] }), holed);
    expect(r.value).toBeLessThan(1e-12);
    // Where every evaluation fails there is nothing to follow: it stops, it does not spin.
    const failing: Problem = { dim: 2, lower: 0, upper: 1, value: () => Number.NaN };
    const f = drive(make({ kind: 'nelder-mead', dim: 2, maxEvaluations: 500, seed: 1 }), failing);
    expect(f.value).toBe(Infinity);
    expect(f.stopReason).toBe('converged');
    expect(f.evaluations).toBeLessThan(500);
  });
});
