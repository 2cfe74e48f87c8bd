import { describe, expect, it } from 'vitest';
import { createOptimizer, restoreOptimizer } from '../../src/core/optimize';
import type { DeState, OptimizerConfig } from '../../src/core/optimize';
import {
  drive,
  expectExactResume,
  make,
  maxAbsDiff,
  rosenbrock,
  roundTrip,
  SHIFT_10,
  SHIFT_ACKLEY_10,
  SHIFT_RASTRIGIN_5,
  shiftedAckley,
  shiftedRastrigin,
  shiftedSphere,
  traced,
  type Problem,
} from '../support/optimize';

const SEEDS = [1, 2, 3];

describe('L-SHADE (Tanabe and Fukunaga, 2014) on published test functions', () => {
  // Budget 10000 · D evaluations, the maximum of the CEC 2014 benchmark (Liang, Qu and
  // Suganthan, 2013); error 1e-8, the level below which CEC 2014 counts an error as zero.
  const cases: [string, Problem][] = [
    ['sphere, 10-d, shifted', shiftedSphere(SHIFT_10)],
    ['Rosenbrock, 10-d', rosenbrock(10)],
    ['Rastrigin, 5-d, shifted', shiftedRastrigin(SHIFT_RASTRIGIN_5)],
    ['Ackley, 10-d, shifted', shiftedAckley(SHIFT_ACKLEY_10)],
  ];
  for (const [name, problem] of cases) {
    it(`reaches error 1e-8 on ${name} within 10000 · D evaluations`, () => {
      for (const seed of SEEDS) {
        const r = drive(make({ kind: 'lshade', dim: problem.dim, maxEvaluations: 10_000 * problem.dim, seed, targetValue: 1e-8 }), problem);
        expect(r.stopReason).toBe('target');
        expect(r.value).toBeLessThanOrEqual(1e-8);
        expect(r.evaluations).toBeLessThanOrEqual(10_000 * problem.dim);
      }
    });
  }

  it('finds the minimiser, not only the value: Rosenbrock 10-d to (1, …, 1) within 1e-4', () => {
    const r = drive(make({ kind: 'lshade', dim: 10, maxEvaluations: 100_000, seed: 4, targetValue: 1e-10 }), rosenbrock(10));
    expect(maxAbsDiff(r.x, new Array(10).fill(1))).toBeLessThan(1e-4);
  });

  it('shrinks the population linearly: N = max(N_min, round(N_init + (N_min − N_init) · nfe / budget))', () => {
    const problem = shiftedRastrigin(SHIFT_RASTRIGIN_5);
    const budget = 20_000;
    const opt = make({ kind: 'lshade', dim: 5, maxEvaluations: budget, seed: 1 });
    const initial = 18 * 5;
    let checked = 0;
    while (!opt.done()) {
      drive(opt, problem, { until: opt.evaluations() + 1 }); // one generation
      const s = opt.exportState() as DeState;
      const planned = Math.max(4, Math.round(initial + ((4 - initial) * s.evaluations) / budget));
      expect(s.populationSize).toBe(planned);
      expect(s.archive.length / 5).toBeLessThanOrEqual(Math.round(2.6 * s.populationSize));
      for (const m of s.memoryF) expect(m > 0 && m <= 1).toBe(true);
      for (const m of s.memoryCR) expect(m === -1 || (m >= 0 && m <= 1)).toBe(true);
      checked++;
    }
    expect(checked).toBeGreaterThan(100);
    expect((opt.exportState() as DeState).populationSize).toBe(4);
  });
});

describe('DE/rand/1/bin (Storn and Price, 1997) on De Jong test functions', () => {
  // De Jong's first and second functions (sphere on [−5.12, 5.12]^3, Rosenbrock on
  // [−2.048, 2.048]^2), minimum 0, as in Storn and Price's test suite; value to reach
  // 1e-6 (from memory); the budget of 5000 evaluations is ours.
  const sphere3: Problem = { dim: 3, lower: -5.12, upper: 5.12, value: (x) => x[0] * x[0] + x[1] * x[1] + x[2] * x[2] };
  const cases: [string, Problem][] = [
    ['first (sphere, 3-d)', sphere3],
    ['second (Rosenbrock, 2-d)', rosenbrock(2, -2.048, 2.048)],
  ];
  for (const [name, problem] of cases) {
    it(`reaches 1e-6 on the ${name} within 5000 evaluations`, () => {
      for (const seed of [1, 2, 3, 4, 5]) {
        const r = drive(make({ kind: 'de-rand-1-bin', dim: problem.dim, maxEvaluations: 5000, seed, targetValue: 1e-6 }), problem);
        expect(r.stopReason).toBe('target');
      }
    });
  }
});

describe('feasibility-first ranking with violations (Deb, 2000)', () => {
  // Problem g06 of the CEC 2006 constrained benchmark (Liang et al., 2006, "Problem
  // definitions and evaluation criteria for the CEC 2006 special session on constrained
  // real-parameter optimization"): minimise (x1 − 10)^3 + (x2 − 20)^3 subject to
  // (x1 − 5)² + (x2 − 5)² ≥ 100 and (x1 − 6)² + (x2 − 5)² ≤ 82.81, 13 ≤ x1 ≤ 100,
  // 0 ≤ x2 ≤ 100; best known value −6961.81387558015 (from memory).
  const g06: Problem = {
    dim: 2,
    lower: 0,
    upper: 100,
    value: (x) => (x[0] - 10) ** 3 + (x[1] - 20) ** 3,
    violation: (x) =>
      Math.max(0, 13 - x[0]) +
      Math.max(0, 100 - (x[0] - 5) ** 2 - (x[1] - 5) ** 2) +
      Math.max(0, (x[0] - 6) ** 2 + (x[1] - 5) ** 2 - 82.81),
  };
  it('L-SHADE ends feasible within 1e-6 of the best known value of g06', () => {
    for (const seed of SEEDS) {
      const r = drive(make({ kind: 'lshade', dim: 2, maxEvaluations: 20_000, seed }), g06);
      expect(r.violation).toBe(0);
      expect(Math.abs(r.value - -6961.81387558015)).toBeLessThan(1e-6 * 6961.8);
    }
  });

  it('telling all-zero violations changes nothing', () => {
    const sphere = shiftedSphere(SHIFT_10.slice(0, 4));
    const zeros: Problem = { ...sphere, violation: () => 0 };
    const config: OptimizerConfig = { kind: 'lshade', dim: 4, maxEvaluations: 3000, seed: 8 };
    expect(traced(config, zeros).hash).toBe(traced(config, sphere).hash);
  });
});

describe('DE determinism, resume and budget', () => {
  const problem = shiftedRastrigin(SHIFT_RASTRIGIN_5);
  for (const kind of ['lshade', 'de-rand-1-bin'] as const) {
    it(`${kind}: the same seed gives a bit-identical run, other seeds and streams differ`, () => {
      const config: OptimizerConfig = { kind, dim: 5, maxEvaluations: 4000, seed: 11 };
      const a = traced(config, problem);
      const b = traced(config, problem);
      expect(b.hash).toBe(a.hash);
      expect(Array.from(b.unit)).toEqual(Array.from(a.unit));
      const other = traced({ ...config, seed: 12 }, problem);
      expect(other.hash).not.toBe(a.hash);
      expect(Array.from(other.unit)).not.toEqual(Array.from(a.unit));
      expect(traced({ ...config, stream: 0 }, problem).hash).not.toBe(a.hash);
      expect(traced({ ...config, stream: 3 }, problem).hash).toBe(traced({ ...config, stream: 3 }, problem).hash);
    });

    it(`${kind}: an exported state, through JSON, resumes exactly`, () => {
      expectExactResume({ kind, dim: 5, maxEvaluations: 3001, seed: 5 }, problem, [0, 1, 90, 777, 2500, 2999]);
    });

    it(`${kind}: asks for exactly maxEvaluations points, then none`, () => {
      for (const budget of [1, 7, 89, 1001, 2477]) {
        const opt = make({ kind, dim: 5, maxEvaluations: budget, seed: 3 });
        const r = drive(opt, problem);
        expect(r.evaluations).toBe(budget);
        expect(r.stopReason).toBe('budget');
        expect(opt.ask()).toEqual([]);
        opt.tell([], new Float64Array(0));
        expect(opt.evaluations()).toBe(budget);
      }
    });
  }

  it('stops as converged when the population has collapsed', () => {
    const r = drive(make({ kind: 'lshade', dim: 2, maxEvaluations: 200_000, seed: 1, xTolerance: 1e-9 }), shiftedSphere([3, -4]));
    expect(r.stopReason).toBe('converged');
    expect(r.evaluations).toBeLessThan(200_000);
  });
});

describe('DE with failed evaluations', () => {
  it('ranks NaN and Infinity worst and still finds the minimum among the rest', () => {
    const sphere = shiftedSphere([10, -20, 30, 5]);
    // NaN on a slab and +Infinity on another, both away from the minimiser (10, −20, 30, 5).
    const holed: Problem = {
      ...sphere,
      value: (x) => (x[0] > 50 ? Number.NaN : x[1] > 40 ? Infinity : x[2] < -60 ? -Infinity : sphere.value(x)),
    };
    for (const kind of ['lshade', 'de-rand-1-bin'] as const) {
      const r = drive(make({ kind, dim: 4, maxEvaluations: 20_000, seed: 2 }), holed);
      expect(r.value).toBeLessThan(1e-8);
      expect(r.violation).toBe(0);
    }
  });

  it('survives an objective that always fails', () => {
    const failing: Problem = { dim: 3, lower: 0, upper: 1, value: () => Number.NaN };
    const r = drive(make({ kind: 'lshade', dim: 3, maxEvaluations: 1500, seed: 1 }), failing);
    expect(r.evaluations).toBe(1500);
    expect(r.value).toBe(Infinity);
    expect(r.violation).toBe(Infinity);
    const s = JSON.parse(JSON.stringify(make({ kind: 'lshade', dim: 3, maxEvaluations: 10, seed: 1 }).exportState()));
    expect(restoreOptimizer(s).ok).toBe(true);
  });
});

describe('DE input checks', () => {
  it('rejects invalid configurations with a reason', () => {
    const bad: [OptimizerConfig, RegExp][] = [
      [{ kind: 'lshade', dim: 0, maxEvaluations: 10, seed: 1 }, /config\.dim is 0; expected an integer in \[1, 1000\]/],
      [{ kind: 'lshade', dim: 2, maxEvaluations: 0, seed: 1 }, /maxEvaluations is 0/],
      [{ kind: 'lshade', dim: 2, maxEvaluations: 10, seed: -3 }, /seed is -3/],
      [{ kind: 'lshade', dim: 2, maxEvaluations: 10, seed: 1, pBest: 0 }, /pBest is 0; expected a number in \(0, 1\]/],
      [{ kind: 'lshade', dim: 2, maxEvaluations: 10, seed: 1, initialPopulation: 3 }, /initialPopulation is 3/],
      [{ kind: 'de-rand-1-bin', dim: 2, maxEvaluations: 10, seed: 1, crossoverRate: 1.5 }, /crossoverRate is 1.5/],
      [{ kind: 'lshade', dim: 2, maxEvaluations: 10, seed: 1, targetValue: Number.NaN }, /targetValue is NaN/],
    ];
    for (const [config, reason] of bad) {
      const r = createOptimizer(config);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toMatch(reason);
    }
    const unknown = createOptimizer({ kind: 'simplex' } as unknown as OptimizerConfig);
    expect(unknown.ok === false && unknown.reason).toMatch(/config\.kind is "simplex"/);
  });

  it('rejects a corrupt state with a reason instead of crashing later', () => {
    const opt = make({ kind: 'lshade', dim: 3, maxEvaluations: 1000, seed: 1 });
    drive(opt, shiftedSphere([1, 2, 3]), { until: 200 });
    const good = JSON.parse(JSON.stringify(opt.exportState())) as Record<string, unknown>;
    const spoil = (change: (s: Record<string, unknown>) => void) => {
      const s = structuredClone(good);
      change(s);
      return restoreOptimizer(s);
    };
    expect(restoreOptimizer(good).ok).toBe(true);
    const cases: [(s: Record<string, unknown>) => void, RegExp][] = [
      [(s) => (s.version = 2), /state\.version is 2/],
      [(s) => (s.population = (s.population as number[]).slice(1)), /state\.population is an array of/],
      [(s) => ((s.population as number[])[4] = 7), /state\.population\[4\] is 7/],
      [(s) => ((s.values as unknown[])[0] = 'x'), /state\.values\[0\]/],
      [(s) => ((s.rng as { words: number[] }).words = [0, 0, 0, 0]), /state\.rng/],
      [(s) => (s.evaluations = 5000), /state\.evaluations is 5000/],
      [(s) => (s.trials = []), /state\.trials/],
      [(s) => ((s.config as Record<string, unknown>).dim = 4), /state\.population|state\.best/],
    ];
    for (const [change, reason] of cases) {
      const r = spoil(change);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toMatch(reason);
    }
    expect(restoreOptimizer('nonsense').ok).toBe(false);
  });

  it('throws when tell() is not given the batch of the last ask()', () => {
    const opt = make({ kind: 'de-rand-1-bin', dim: 2, maxEvaluations: 1000, seed: 1 });
    const first = opt.ask();
    const n = first.length;
    expect(() => opt.tell(first.slice(1), new Float64Array(n - 1))).toThrow(/got \d+ points/);
    expect(() => opt.tell(first, new Float64Array(n + 1))).toThrow(/values for/);
    const copies = first.map((p) => Float64Array.from(p));
    opt.tell(copies, new Float64Array(n).fill(1)); // copies with the same coordinates are fine
    expect(() => opt.tell(first, new Float64Array(n).fill(1))).toThrow(/not the point/); // stale batch
    const next = opt.ask();
    const moved = next.map((p) => Float64Array.from(p));
    moved[3][1] += 1e-9;
    expect(() => opt.tell(moved, new Float64Array(n))).toThrow(/point 3/);
  });

  it('a resumed optimizer is independent of the state object it came from', () => {
    const opt = make({ kind: 'lshade', dim: 2, maxEvaluations: 500, seed: 1 });
    const state = opt.exportState() as DeState;
    const again = roundTrip(state);
    state.population.fill(0);
    (state.config as { maxEvaluations: number }).maxEvaluations = 1;
    expect(Array.from(again.ask()[0])).toEqual(Array.from(opt.ask()[0]));
    expect(again.exportState().config.maxEvaluations).toBe(500);
  });
});
