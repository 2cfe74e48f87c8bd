/**
 * Test support for src/core/optimize: published test functions with their domains and
 * known minima, a driver loop that checks the ask/tell contract on every batch, and a
 * bit-exact trace of a run for the determinism and resume tests.
 */
import { createOptimizer, fromUnitBoxInto, restoreOptimizer } from '../../src/core/optimize';
import type { Optimizer, OptimizerConfig, OptimizerState } from '../../src/core/optimize';

export interface TestFunction {
  readonly name: string;
  readonly dim: number;
  readonly lower: number;
  readonly upper: number;
  /** Known global minimum value and minimiser (real units). */
  readonly minimum: number;
  readonly minimiser: readonly number[];
  value(x: Float64Array): number;
}

/**
 * Sphere Σ (x_i − o_i)², minimum 0 at o. Definition: Jamil and Yang (2013), "A literature
 * survey of benchmark functions for global optimisation problems", Sphere; search range
 * [−100, 100]^D and a shift o of our own, as for the shifted sphere of CEC 2005 (F1).
 */
export function shiftedSphere(shift: readonly number[]): TestFunction {
  return {
    name: 'sphere',
    dim: shift.length,
    lower: -100,
    upper: 100,
    minimum: 0,
    minimiser: shift,
    value(x) {
      let sum = 0;
      for (let i = 0; i < x.length; i++) {
        const t = x[i] - shift[i];
        sum += t * t;
      }
      return sum;
    },
  };
}

/**
 * Rosenbrock Σ 100 (x_{i+1} − x_i²)² + (x_i − 1)², −30 ≤ x_i ≤ 30, minimum 0 at (1, …, 1):
 * Jamil and Yang (2013), Rosenbrock. The minimiser is off the centre of the box already.
 */
export function rosenbrock(dim: number, lower = -30, upper = 30): TestFunction {
  return {
    name: 'rosenbrock',
    dim,
    lower,
    upper,
    minimum: 0,
    minimiser: new Array<number>(dim).fill(1),
    value(x) {
      let sum = 0;
      for (let i = 0; i + 1 < x.length; i++) {
        const a = x[i + 1] - x[i] * x[i];
        const b = x[i] - 1;
        sum += 100 * a * a + b * b;
      }
      return sum;
    },
  };
}

/**
 * Rastrigin 10 D + Σ (z_i² − 10 cos 2π z_i), z = x − o, −5.12 ≤ x_i ≤ 5.12, minimum 0 at o:
 * Jamil and Yang (2013), Rastrigin, with a shift of our own (as CEC 2014 F8 shifts it).
 */
export function shiftedRastrigin(shift: readonly number[]): TestFunction {
  return {
    name: 'rastrigin',
    dim: shift.length,
    lower: -5.12,
    upper: 5.12,
    minimum: 0,
    minimiser: shift,
    value(x) {
      let sum = 10 * x.length;
      for (let i = 0; i < x.length; i++) {
        const z = x[i] - shift[i];
        sum += z * z - 10 * Math.cos(2 * Math.PI * z);
      }
      return sum;
    },
  };
}

/**
 * Ackley −20 exp(−0.2 √(Σ z_i² / D)) − exp(Σ cos(2π z_i) / D) + 20 + e, z = x − o, on
 * [−35, 35]^D (Jamil and Yang, 2013, Ackley 1), minimum 0 at o; the coefficient 0.2 is
 * Ackley's (1987), as in the CEC 2014 definitions (Liang, Qu and Suganthan, 2013).
 */
export function shiftedAckley(shift: readonly number[]): TestFunction {
  return {
    name: 'ackley',
    dim: shift.length,
    lower: -35,
    upper: 35,
    minimum: 0,
    minimiser: shift,
    value(x) {
      const n = x.length;
      let squares = 0;
      let cosines = 0;
      for (let i = 0; i < n; i++) {
        const z = x[i] - shift[i];
        squares += z * z;
        cosines += Math.cos(2 * Math.PI * z);
      }
      return -20 * Math.exp(-0.2 * Math.sqrt(squares / n)) - Math.exp(cosines / n) + 20 + Math.E;
    },
  };
}

/** Shift vectors of our own, well inside the ranges above. */
export const SHIFT_10 = [-43.1, 12.7, 77.3, -5.9, 31.4, -68.2, 3.3, 55.5, -21.8, 9.6];
export const SHIFT_RASTRIGIN_5 = [1.23, -2.71, 0.42, 3.14, -0.87];
export const SHIFT_ACKLEY_10 = [-12.5, 7.25, 20.1, -3.3, 0.9, 14.7, -25.2, 5.05, -8.8, 17.6];

export function make(config: OptimizerConfig): Optimizer {
  const result = createOptimizer(config);
  if (!result.ok) throw new Error(result.reason);
  return result.optimizer;
}

/** JSON round trip of an exported state, then restore. */
export function roundTrip(state: OptimizerState): Optimizer {
  const result = restoreOptimizer(JSON.parse(JSON.stringify(state)));
  if (!result.ok) throw new Error(result.reason);
  return result.optimizer;
}

/** FNV-1a over the bits of every point asked and value told: equal traces mean bit-identical runs. */
export class Trace {
  hash = 0x811c9dc5;
  batches = 0;
  points = 0;
  private readonly cell = new Float64Array(1);
  private readonly words = new Uint32Array(this.cell.buffer);

  add(x: number): void {
    this.cell[0] = x;
    for (const w of this.words) {
      this.hash = Math.imul(this.hash ^ w, 0x01000193) >>> 0;
    }
  }
}

export interface Problem {
  readonly dim: number;
  readonly lower: number;
  readonly upper: number;
  value(x: Float64Array): number;
  /** Constraint violation (≤ 0 feasible), in real units; absent: unconstrained. */
  violation?(x: Float64Array): number;
}

export interface DriveOptions {
  /** Stop after this many evaluations (at a batch boundary, never inside a batch). */
  readonly until?: number;
  readonly trace?: Trace;
}

/**
 * Runs `opt` on `problem` until done (or `until`), checking on every batch that the
 * points are in the unit box, that asking twice gives the same batch, and that the
 * budget is never exceeded. Returns the optimizer's best in real units.
 */
export function drive(opt: Optimizer, problem: Problem, options: DriveOptions = {}) {
  const d = problem.dim;
  const lower = new Float64Array(d).fill(problem.lower);
  const upper = new Float64Array(d).fill(problem.upper);
  const x = new Float64Array(d);
  const until = options.until ?? Infinity;
  const trace = options.trace;
  const budget = opt.exportState().config.maxEvaluations;
  let batches = 0;
  while (!opt.done() && opt.evaluations() < until) {
    if (++batches > 10_000_000) throw new Error('drive: no end in sight');
    const points = opt.ask();
    if (points.length === 0) throw new Error('ask() gave no points while not done');
    if (opt.ask() !== points) throw new Error('a second ask() before tell() gave another batch');
    const values = new Float64Array(points.length);
    const violations = problem.violation === undefined ? undefined : new Float64Array(points.length);
    for (let k = 0; k < points.length; k++) {
      const p = points[k];
      for (let j = 0; j < d; j++) {
        if (!(p[j] >= 0 && p[j] <= 1)) throw new Error(`point ${k} coordinate ${j} is ${p[j]}, outside [0, 1]`);
        trace?.add(p[j]);
      }
      fromUnitBoxInto(p, lower, upper, x);
      values[k] = problem.value(x);
      if (violations !== undefined && problem.violation !== undefined) violations[k] = problem.violation(x);
      trace?.add(values[k]);
    }
    if (trace !== undefined) {
      trace.batches++;
      trace.points += points.length;
    }
    opt.tell(points, values, violations);
    if (opt.evaluations() > budget) throw new Error(`${opt.evaluations()} evaluations exceed the budget of ${budget}`);
  }
  const best = opt.best();
  return {
    value: best.value,
    violation: best.violation,
    unit: best.x,
    x: Array.from(fromUnitBoxInto(best.x, lower, upper, new Float64Array(d))),
    evaluations: opt.evaluations(),
    stopReason: opt.stopReason(),
  };
}

/** Largest |a_i − b_i|. */
export function maxAbsDiff(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

/**
 * Runs `config` on `problem` without a break, then again stopping at each of `cuts`
 * evaluations, exporting the state through JSON and resuming from it. Every resumed
 * run must ask for the same points bit for bit and end in the same state.
 */
export function expectExactResume(config: OptimizerConfig, problem: Problem, cuts: readonly number[]): void {
  const whole = new Trace();
  const straight = make(config);
  drive(straight, problem, { trace: whole });
  const finalState = JSON.stringify(straight.exportState());
  for (const cut of cuts) {
    const trace = new Trace();
    let opt = make(config);
    drive(opt, problem, { until: cut, trace });
    opt.ask(); // a pending batch is part of the state too
    opt = roundTrip(opt.exportState());
    drive(opt, problem, { trace });
    if (trace.hash !== whole.hash || trace.points !== whole.points) {
      throw new Error(`resumed at ${cut}: trace ${trace.hash}/${trace.points} differs from ${whole.hash}/${whole.points}`);
    }
    if (JSON.stringify(opt.exportState()) !== finalState) throw new Error(`resumed at ${cut}: final state differs`);
  }
}

/** Runs and returns the trace hash and best point. */
export function traced(config: OptimizerConfig, problem: Problem) {
  const trace = new Trace();
  const result = drive(make(config), problem, { trace });
  return { ...result, hash: trace.hash, points: trace.points };
}
