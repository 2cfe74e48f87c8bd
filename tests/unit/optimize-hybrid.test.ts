import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { canonicalValue, canonicalViolation, DistinctElite, precedes, restoreOptimizer, rmsDistance } from '../../src/core/optimize';
import type { HybridState, OptimizerConfig } from '../../src/core/optimize';
import { DEFAULT_GLOBAL_SHARE } from '../../src/core/optimize/config';
import {
  drive,
  expectExactResume,
  make,
  rosenbrock,
  SHIFT_ACKLEY_10,
  SHIFT_RASTRIGIN_5,
  shiftedAckley,
  shiftedRastrigin,
  shiftedSphere,
  Trace,
  traced,
  type Problem,
} from '../support/optimize';

describe('hybrid schedule on published test functions', () => {
  // Functions as in Jamil and Yang (2013); budget 10000 · D (CEC 2014), error 1e-8.
  const cases: [string, Problem][] = [
    ['Rastrigin, 5-d, shifted', shiftedRastrigin(SHIFT_RASTRIGIN_5)],
    ['Ackley, 10-d, shifted', shiftedAckley(SHIFT_ACKLEY_10)],
    ['Rosenbrock, 10-d', rosenbrock(10)],
  ];
  for (const [name, problem] of cases) {
    it(`reaches error 1e-8 on ${name} within 10000 · D evaluations`, () => {
      for (const seed of [1, 2]) {
        const r = drive(make({ kind: 'hybrid', dim: problem.dim, maxEvaluations: 10_000 * problem.dim, seed, targetValue: 1e-8 }), problem);
        expect(r.stopReason).toBe('target');
      }
    });
  }

  it('its global phase is L-SHADE on stream 0 with globalShare of the budget, and the polish only improves on it', () => {
    const problem = rosenbrock(10);
    const budget = 20_000;
    for (const seed of [1, 2]) {
      const global = new Trace();
      const alone = drive(make({ kind: 'lshade', dim: 10, maxEvaluations: DEFAULT_GLOBAL_SHARE * budget, seed, stream: 0 }), problem, { trace: global });
      const head = new Trace();
      const hybrid = make({ kind: 'hybrid', dim: 10, maxEvaluations: budget, seed });
      drive(hybrid, problem, { until: DEFAULT_GLOBAL_SHARE * budget, trace: head });
      expect(head.hash).toBe(global.hash);
      expect((hybrid.exportState() as HybridState).phase).toBe('polish');
      const r = drive(hybrid, problem);
      expect(r.value).toBeLessThanOrEqual(alone.value);
      // On this valley the polish wins where the global search alone, with the whole budget, does not.
      const whole = drive(make({ kind: 'lshade', dim: 10, maxEvaluations: budget, seed }), problem);
      expect(r.value).toBeLessThan(1e-10);
      expect(whole.value).toBeGreaterThan(1e-10);
    }
  });
});

describe('distinct candidates (DistinctElite)', () => {
  it('keeps the best first and lets a point in only when nothing near it is as good', () => {
    const elite = new DistinctElite(2, 3, 0.05);
    expect(elite.offer([0.5, 0.5], 1, 0)).toBe(true);
    expect(elite.offer([0.52, 0.5], 2, 0)).toBe(false); // near a better one
    expect(elite.offer([0.9, 0.1], 3, 0)).toBe(true);
    expect(elite.offer([0.1, 0.9], 4, 0)).toBe(true);
    expect(elite.offer([0.3, 0.3], 5, 0)).toBe(false); // full, and worse than the worst
    expect(elite.offer([0.3, 0.3], Infinity, Infinity)).toBe(false); // a failed evaluation never enters
    expect(elite.offer([0.91, 0.1], 0.5, 0)).toBe(true); // replaces the worse one near it
    expect(Array.from(elite.values.subarray(0, elite.count))).toEqual([0.5, 1, 4]);
    expect(Array.from(elite.point(0))).toEqual([0.91, 0.1]);
    expect(elite.offer([0.2, 0.2], 2, 0)).toBe(true); // the worst (4) falls off
    expect(Array.from(elite.values.subarray(0, elite.count))).toEqual([0.5, 1, 2]);
    // RMS distance: √(((0.52 − 0.5)² + 0) / 2).
    expect(rmsDistance([0.5, 0.5], [0.52, 0.5])).toBeCloseTo(0.02 / Math.SQRT2, 15);
  });

  it('stays pairwise distinct, ranked, bounded, and holds the best point offered (property)', () => {
    const arbPoint = fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 3, maxLength: 3 });
    const arbValue = fc.oneof(fc.double({ min: -5, max: 5, noNaN: true }), fc.constant(Infinity));
    fc.assert(
      fc.property(
        fc.array(fc.tuple(arbPoint, arbValue, fc.constantFrom(0, 0, 0, 0.5, 2)), { minLength: 1, maxLength: 60 }),
        fc.integer({ min: 1, max: 6 }),
        fc.double({ min: 0, max: 0.4, noNaN: true }),
        (offers, capacity, radius) => {
          const elite = new DistinctElite(3, capacity, radius);
          let best: [number, number] | null = null;
          for (const [x, rawValue, rawViolation] of offers) {
            const v = canonicalValue(rawValue);
            const c = canonicalViolation(rawViolation, v);
            elite.offer(x, v, c);
            if (c < Infinity && (best === null || precedes(v, c, best[0], best[1]))) best = [v, c];
          }
          expect(elite.count).toBeLessThanOrEqual(capacity);
          for (let a = 0; a < elite.count; a++) {
            if (a > 0) expect(precedes(elite.values[a], elite.violations[a], elite.values[a - 1], elite.violations[a - 1])).toBe(false);
            for (let b = a + 1; b < elite.count; b++) expect(rmsDistance(elite.point(a), elite.point(b))).toBeGreaterThan(radius);
          }
          if (best === null) expect(elite.count).toBe(0);
          else expect([elite.values[0], elite.violations[0]]).toEqual(best);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('a run on Rastrigin polishes polishCount distinct candidates, the best of the global phase first', () => {
    const problem = shiftedRastrigin(SHIFT_RASTRIGIN_5);
    const opt = make({ kind: 'hybrid', dim: 5, maxEvaluations: 5000, seed: 3, polishCount: 4, distinctDistance: 0.02 });
    const globalEnd = Math.floor(DEFAULT_GLOBAL_SHARE * 5000);
    drive(opt, problem, { until: globalEnd });
    const bestOfGlobal = opt.best();
    drive(opt, problem, { until: globalEnd + 1 });
    const s = opt.exportState() as HybridState;
    expect(s.phase).toBe('polish');
    expect(s.candidates.length).toBe(4);
    expect(s.candidates[0].value).toBe(bestOfGlobal.value);
    expect(s.candidates[0].x).toEqual(Array.from(bestOfGlobal.x));
    for (let a = 0; a < 4; a++) {
      for (let b = a + 1; b < 4; b++) expect(rmsDistance(s.candidates[a].x, s.candidates[b].x)).toBeGreaterThan(0.02);
    }
  });
});

describe('hybrid determinism, resume, budget and failures', () => {
  const problem = shiftedRastrigin(SHIFT_RASTRIGIN_5);
  const config: OptimizerConfig = { kind: 'hybrid', dim: 5, maxEvaluations: 3000, seed: 17, polish: { maxStaleRestarts: 1000 } };

  it('the same seed gives a bit-identical run; another seed differs', () => {
    const a = traced(config, problem);
    expect(traced(config, problem).hash).toBe(a.hash);
    expect(traced({ ...config, seed: 18 }, problem).hash).not.toBe(a.hash);
  });

  it('an exported state, through JSON, resumes exactly in the global phase, at the hand-over and in each polish', () => {
    // Find where each polish starts, to cut right there and just after.
    const starts: number[] = [];
    const scout = make(config);
    let last = '';
    while (!scout.done()) {
      const s = scout.exportState() as HybridState;
      const key = `${s.phase}:${s.polishIndex}`;
      if (key !== last) starts.push(scout.evaluations());
      last = key;
      drive(scout, problem, { until: scout.evaluations() + 1 });
    }
    expect(starts.length).toBe(1 + 3); // the global phase and three polishes
    const cuts = starts.flatMap((e) => [e, e + 1, e + 7]).filter((e) => e < 3000);
    expectExactResume(config, problem, [0, 500, ...cuts, 2999]);
    // The same with DE/rand/1/bin as the global search.
    expectExactResume({ ...config, global: { kind: 'de-rand-1-bin' } }, problem, [0, 333, 2399, 2400, 2401, 2750]);
  });

  it('asks for exactly maxEvaluations points, then none', () => {
    for (const budget of [1, 2, 50, 911, 2345]) {
      const opt = make({ ...config, maxEvaluations: budget });
      const r = drive(opt, problem);
      expect(r.evaluations).toBe(budget);
      expect(r.stopReason).toBe('budget');
      expect(opt.ask()).toEqual([]);
    }
  });

  // Regression: a hybrid stopped on its budget exported a state it then refused to restore.
  it('a state exported after the search stopped restores, still stopped, with the same best point', () => {
    for (const budget of [300, 2345]) {
      const opt = make({ ...config, maxEvaluations: budget });
      drive(opt, problem);
      const restored = restoreOptimizer(JSON.parse(JSON.stringify(opt.exportState())));
      if (!restored.ok) throw new Error(restored.reason);
      expect(restored.optimizer.done()).toBe(true);
      expect(restored.optimizer.stopReason()).toBe('budget');
      expect(restored.optimizer.best()).toEqual(opt.best());
      expect(restored.optimizer.ask()).toEqual([]);
    }
  });

  it('stops as converged after the global phase when there is nothing to polish', () => {
    const r = drive(make({ ...config, polishCount: 0 }), problem);
    expect(r.stopReason).toBe('converged');
    expect(r.evaluations).toBe(Math.floor(DEFAULT_GLOBAL_SHARE * 3000));
  });

  it('ranks NaN and Infinity worst', () => {
    const sphere = shiftedSphere([10, -20, 30]);
    const holed: Problem = { ...sphere, value: (x) => (x[0] > 40 ? Number.NaN : x[1] > 50 ? Infinity : sphere.value(x)) };
    const r = drive(make({ kind: 'hybrid', dim: 3, maxEvaluations: 6000, seed: 2 }), holed);
    expect(r.value).toBeLessThan(1e-10);
  });
});
