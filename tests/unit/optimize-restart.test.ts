import { describe, expect, it } from 'vitest';
import { Restart, type Optimizer, type RestartState } from '../../src/core/optimize';
import { drive, expectExactResume, make, rosenbrock, roundTrip, shiftedRastrigin, SHIFT_RASTRIGIN_5 } from '../support/optimize';

const rastrigin = shiftedRastrigin(SHIFT_RASTRIGIN_5);

function restarts(opt: Optimizer): number {
  if (!(opt instanceof Restart)) throw new Error('not a restart scheme');
  return opt.restarts();
}

describe('restart scheme (IPOP-style, Auger and Hansen 2005)', () => {
  // DE/rand/1/bin stops 'converged' when its population collapses, wherever that is: on
  // Rastrigin (Jamil and Yang, 2013; a local minimum near every integer point) often not
  // at the global one. A budget 20 times what one such search needs must all be spent.
  const de = { kind: 'de-rand-1-bin', population: 20, xTolerance: 1e-6 } as const;
  const single = drive(make({ ...de, dim: 5, maxEvaluations: 1_000_000, seed: 11 }), rastrigin);

  it('a single search stops converged, well inside its budget', () => {
    expect(single.stopReason).toBe('converged');
    expect(single.evaluations).toBeLessThan(1_000_000 / 20);
  });

  const budget = 20 * single.evaluations;
  const config = { kind: 'restart', inner: de, dim: 5, maxEvaluations: budget, seed: 11 } as const;

  it('with 20 times that budget it restarts, spends the whole budget, and ends on it', () => {
    const opt = make(config);
    const result = drive(opt, rastrigin);
    expect(restarts(opt)).toBeGreaterThan(0);
    expect(result.evaluations).toBe(budget);
    expect(result.stopReason).toBe('budget');
    // Its first run is that single search, bit for bit, so it can only do as well or better.
    expect(result.value).toBeLessThanOrEqual(single.value);
  });

  it('its first run is exactly the search alone: the same best after the same evaluations', () => {
    const opt = make(config);
    const first = drive(opt, rastrigin, { until: single.evaluations });
    expect(restarts(opt)).toBe(1);
    expect(first.value).toBe(single.value);
    expect(Array.from(first.unit)).toEqual(Array.from(single.unit));
  });

  it('grows the population of each run by populationGrowth (IPOP) and records each run’s best as a basin', () => {
    const opt = make({ ...config, populationGrowth: 2 });
    drive(opt, rastrigin, { until: Math.floor(budget / 2) });
    const state = opt.exportState() as RestartState;
    expect(state.restarts).toBeGreaterThanOrEqual(2);
    const run = state.inner;
    if (run.kind === 'hybrid' || run.kind === 'nelder-mead' || run.config.kind !== 'de-rand-1-bin') throw new Error(`inner is ${run.kind}`);
    expect(run.config.population).toBe(Math.min(20 * 2 ** state.restarts, 10000));
    expect(state.basins.length).toBe(Math.min(state.restarts, 64) * 5);
  });

  it('an exported state, through JSON, resumes exactly, before and after restarts', () => {
    const cuts = [single.evaluations - 20, single.evaluations + 20, Math.floor(budget * 0.6)];
    expect(() => expectExactResume(config, rastrigin, cuts)).not.toThrow();
  });

  it('restarts a run that stagnates before it converges (L-SHADE sized for the whole budget)', () => {
    // L-SHADE's population shrinks over its whole budget (Tanabe and Fukunaga, 2014), so
    // it converges only near the end of it; stagnation ends the run sooner.
    const opt = make({ kind: 'restart', inner: { kind: 'lshade' }, dim: 2, maxEvaluations: 200_000, seed: 3, stallShare: 0.05 });
    const result = drive(opt, rosenbrock(2));
    expect(restarts(opt)).toBeGreaterThan(0);
    expect(result.evaluations).toBe(200_000);
    expect(result.value).toBeLessThan(1e-8); // Rosenbrock's minimum is 0 at (1, 1): Jamil and Yang (2013)
  });

  it('stops on the target, not restarting past it', () => {
    // Rosenbrock's minimum is 0 (Jamil and Yang, 2013), so a target of 1e-6 is reachable.
    const opt = make({ kind: 'restart', inner: { kind: 'lshade' }, dim: 2, maxEvaluations: 1_000_000, seed: 3, runEvaluations: 20_000, targetValue: 1e-6 });
    const result = drive(opt, rosenbrock(2));
    expect(result.stopReason).toBe('target');
    expect(result.value).toBeLessThanOrEqual(1e-6);
    expect(result.evaluations).toBeLessThan(1_000_000);
  });

  it('starts Nelder–Mead runs afresh too, and resumes them exactly', () => {
    const nm = { kind: 'restart', inner: { kind: 'nelder-mead' }, dim: 3, maxEvaluations: 20_000, seed: 5 } as const;
    const opt = make(nm);
    const result = drive(opt, rastrigin.dim === 3 ? rastrigin : shiftedRastrigin([0.5, -1.5, 2.2]));
    expect(restarts(opt)).toBeGreaterThan(0);
    expect(result.evaluations).toBe(20_000);
    expect(() => expectExactResume(nm, shiftedRastrigin([0.5, -1.5, 2.2]), [3000, 12_000])).not.toThrow();
  });

  it('refuses a restart scheme inside a restart scheme, and a bad option, naming the field', () => {
    const nested = { kind: 'restart', inner: { kind: 'restart' }, dim: 2, maxEvaluations: 100, seed: 1 };
    const r1 = make as unknown as (c: unknown) => Optimizer;
    expect(() => r1(nested)).toThrow(/config\.inner\.kind/);
    expect(() => make({ ...config, populationGrowth: 0.5 })).toThrow(/config\.populationGrowth is 0\.5/);
  });

  it('gives each run at most runEvaluations, restarting when a run spends it', () => {
    const opt = make({ kind: 'restart', inner: { kind: 'lshade' }, dim: 2, maxEvaluations: 10_000, seed: 3, runEvaluations: 3000 });
    const result = drive(opt, rosenbrock(2));
    expect(result.evaluations).toBe(10_000);
    expect(restarts(opt)).toBeGreaterThanOrEqual(3);
    const state = opt.exportState() as RestartState;
    expect(state.inner.config.maxEvaluations).toBeLessThanOrEqual(3000);
  });

  it('with penaliseBasins, each run keeps out of the basins found before it, and resumes exactly', () => {
    const keepOut = { ...config, penaliseBasins: true, avoidDistance: 0.05 } as const;
    const opt = make(keepOut);
    const result = drive(opt, rastrigin);
    expect(result.evaluations).toBe(budget);
    const state = opt.exportState() as RestartState;
    expect(state.config.penaliseBasins).toBe(true);
    const d = 5;
    const count = state.basins.length / d;
    expect(count).toBeGreaterThanOrEqual(3);
    // Each run's best is feasible only outside the earlier basins' radius, and any point
    // outside ranks before every point inside (Deb, 2000, feasibility first): so every
    // basin is at least avoidDistance (RMS, box units) from each earlier one. Theorem.
    for (let b = 1; b < count; b++) {
      for (let a = 0; a < b; a++) {
        let sum = 0;
        for (let j = 0; j < d; j++) sum += (state.basins[b * d + j] - state.basins[a * d + j]) ** 2;
        expect(Math.sqrt(sum / d), `basins ${a} and ${b}`).toBeGreaterThanOrEqual(0.05);
      }
    }
    // The reported best is a true evaluation, never a penalised one.
    expect(result.violation).toBe(0);
    expect(rastrigin.value(Float64Array.from(result.x))).toBe(result.value);
    expect(() => expectExactResume(keepOut, rastrigin, [single.evaluations + 20, Math.floor(budget * 0.7)])).not.toThrow();
  });

  it('by default penalises basins and splits a budget into runs of at least 10 000 × dim; null and false switch both off', () => {
    const state = make(config).exportState() as RestartState;
    expect(state.config.penaliseBasins).toBe(true);
    expect(state.config.runEvaluationsPerVariable).toBe(10_000);
    const off = make({ ...config, penaliseBasins: false, runEvaluationsPerVariable: null }).exportState() as RestartState;
    expect(off.config.penaliseBasins).toBe(false);
    expect(off.config.runEvaluationsPerVariable).toBeNull();
    expect(off.inner.config.maxEvaluations).toBe(budget);
    expect(() => make({ ...config, penaliseBasins: 'yes' } as unknown as typeof config)).toThrow(/config\.penaliseBasins/);
  });

  it('splits the budget evenly into whole runs of at least runEvaluationsPerVariable × dim, and at most runEvaluations', () => {
    // 10 000 evaluations, runs of at least 1500 × 2 = 3000: three runs of 3334 fit.
    const split = make({ kind: 'restart', inner: { kind: 'lshade' }, dim: 2, maxEvaluations: 10_000, seed: 3, runEvaluationsPerVariable: 1500 });
    expect((split.exportState() as RestartState).inner.config.maxEvaluations).toBe(3334);
    expect(drive(split, rosenbrock(2)).evaluations).toBe(10_000);
    expect(restarts(split)).toBeGreaterThanOrEqual(2);
    // Fewer than two runs fit: one run of the whole budget, as without the option.
    const whole = make({ kind: 'restart', inner: { kind: 'lshade' }, dim: 2, maxEvaluations: 10_000, seed: 3, runEvaluationsPerVariable: 2600 });
    expect((whole.exportState() as RestartState).inner.config.maxEvaluations).toBe(10_000);
    // More than runEvaluations left (a time-only island): runs of runEvaluations, then the rest split.
    const both = make({ kind: 'restart', inner: { kind: 'lshade' }, dim: 2, maxEvaluations: 10_000, seed: 3, runEvaluations: 4000, runEvaluationsPerVariable: 1000 });
    const sizes: number[] = [];
    for (let guard = 0; guard < 100 && !both.done(); guard++) {
      const state = both.exportState() as RestartState;
      if (sizes.length === state.restarts) sizes.push(state.inner.config.maxEvaluations);
      const points = both.ask();
      both.tell(points, Float64Array.from(points, () => 1));
    }
    // A constant objective stagnates each run at stallShare of its budget, so the runs are
    // short; the first is still sized by runEvaluations, and the last split ones by the rest.
    expect(sizes[0]).toBe(4000);
    expect(sizes.every((n) => n <= 4000)).toBe(true);
  });

  it('with growRuns, gives each run runEvaluations times its population growth, the last what is left', () => {
    /** Each run's budget and the evaluations before it, read from the scheme's state as the run starts, on a constant objective (every run stagnates). */
    const runs = (opt: Optimizer): { size: number; past: number }[] => {
      const seen: { size: number; past: number }[] = [];
      for (let guard = 0; guard < 100_000 && !opt.done() && seen.length < 12; guard++) {
        const state = opt.exportState() as RestartState;
        if (seen.length === state.restarts) seen.push({ size: state.inner.config.maxEvaluations, past: state.pastEvaluations });
        const points = opt.ask();
        opt.tell(points, Float64Array.from(points, () => 1));
      }
      return seen;
    };
    const runSizes = (opt: Optimizer): number[] => runs(opt).map((run) => run.size);
    // No end in sight (a time-only island's budget): IPOP doubles the population (Auger and
    // Hansen, 2005), and each run gets as many evaluations per member as the first, so 1000 ×
    // 2^r until the population reaches its limit (10,000 members in 2-D: 20 × 2^9 is past it).
    const open = make({ kind: 'restart', inner: de, dim: 2, maxEvaluations: Number.MAX_SAFE_INTEGER, seed: 3, runEvaluations: 1000, growRuns: true });
    expect(runSizes(open)).toEqual([1000, 2000, 4000, 8000, 16_000, 32_000, 64_000, 128_000, 256_000, 500_000, 500_000, 500_000]);
    // A budget: a run takes all that is left when less than itself would remain after it
    // (each constant run stagnates after about a quarter of its size, stallShare).
    const budgeted = runs(make({ kind: 'restart', inner: de, dim: 2, maxEvaluations: 40_000, seed: 3, runEvaluations: 1000, growRuns: true }));
    const expected = budgeted.map(({ past }, r) => (40_000 - past >= 2 * 1000 * 2 ** r ? 1000 * 2 ** r : 40_000 - past));
    expect(budgeted.map((run) => run.size)).toEqual(expected);
    expect(budgeted.length).toBeGreaterThanOrEqual(4);
    expect(budgeted.at(-1)?.size).toBe(40_000 - (budgeted.at(-1)?.past ?? 0));
    // Nelder–Mead has no population: its runs stay runEvaluations long.
    const simplex = make({ kind: 'restart', inner: { kind: 'nelder-mead' }, dim: 2, maxEvaluations: Number.MAX_SAFE_INTEGER, seed: 3, runEvaluations: 1000, growRuns: true });
    expect(new Set(runSizes(simplex).slice(0, 4))).toEqual(new Set([1000]));
  });

  it('a restored state keeps its restart count', () => {
    const opt = make(config);
    drive(opt, rastrigin, { until: Math.floor(budget / 3) });
    const back = roundTrip(opt.exportState());
    expect(restarts(back)).toBe(restarts(opt));
    expect(back.evaluations()).toBe(opt.evaluations());
  });
});
