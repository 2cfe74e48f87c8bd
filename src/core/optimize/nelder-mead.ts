/**
 * Nelder–Mead simplex search in the box [0, 1]^dim, in ask/tell form.
 *
 * Moves and acceptance rules as stated by Lagarias, Reeds, Wright and Wright (1998),
 * with the dimension-adaptive coefficients of Gao and Han (2012, "Implementing the
 * Nelder-Mead simplex algorithm with adaptive parameters"): reflection 1, expansion
 * 1 + 2/n, contraction 0.75 − 1/(2n), shrink 1 − 1/n. Comparisons are feasibility first
 * (ranking.ts).
 *
 * Bounds by clamping: every point asked is projected onto the box, coordinate by
 * coordinate. A simplex that flattens against a face then stagnates, and the restart
 * cures it.
 *
 * Restarts: when the simplex is smaller than `simplexTolerance` or its values spread
 * less than `valueTolerance` (relative), a new simplex is built around the best point
 * so far, its edge the previous restart's edge times `restartStepFactor` (back to
 * `initialStep` below `minRestartStep`), each edge along one axis with a random sign.
 * After `maxStaleRestarts` restarts in a row without a better point the search stops
 * as converged.
 *
 * The search is sequential: a batch is one point, except a new simplex (n or n + 1
 * points) and a shrink (n points).
 */
import { BatchOptimizerBase } from './base';
import { PointBatch } from './batch';
import {
  encodeNumbers,
  encodeReal,
  encodeReals,
  fail,
  readInteger,
  readIntegers,
  readLength,
  readLiteral,
  readNumber,
  readNumbers,
  readReal,
  readReals,
  readViolations,
} from './codec';
import { checkImmigrants, IMMIGRATION_NEVER } from './immigration';
import type { Prng } from './prng';
import { BestTracker, canonicalInto, canonicalValue, canonicalViolation, precedes, precedesAt, rankInto } from './ranking';
import { readHeader, targetOrBudget, writeHeader } from './state';
import type { Immigrant, Immigration, NelderMeadPhase, NelderMeadState, Optimizer, ResolvedNelderMead, StopReason } from './types';

export interface NelderMeadCoefficients {
  readonly reflection: number;
  readonly expansion: number;
  readonly contraction: number;
  readonly shrink: number;
}

/**
 * Gao and Han (2012) coefficients for dimension n. Their formulas give a zero shrink
 * for n = 1, so n = 1 takes the n = 2 values, which are the standard 1, 2, 1/2, 1/2.
 */
export function gaoHanCoefficients(n: number): NelderMeadCoefficients {
  const m = Math.max(2, n);
  return { reflection: 1, expansion: 1 + 2 / m, contraction: 0.75 - 1 / (2 * m), shrink: 1 - 1 / m };
}

const PHASES: readonly NelderMeadPhase[] = ['simplex', 'reflect', 'expand', 'contract-outside', 'contract-inside', 'shrink'];

function clampUnit(x: number): number {
  return x < 0 ? 0 : x > 1 ? 1 : x;
}

/** A point already evaluated that a new search may start from without asking for it again. */
export interface EvaluatedStart {
  readonly x: Float64Array;
  readonly value: number;
  readonly violation: number;
}

export class NelderMead extends BatchOptimizerBase implements Optimizer {
  readonly dim: number;
  private readonly config: ResolvedNelderMead;
  private readonly rng: Prng;
  private readonly coefficients: NelderMeadCoefficients;
  /** (n + 1) × n vertex coordinates, slot-indexed; `order` ranks the slots. */
  private readonly vertices: Float64Array;
  private readonly values: Float64Array;
  private readonly violations: Float64Array;
  private readonly order: Int32Array;
  private readonly orderScratch: Int32Array;
  private readonly centroid: Float64Array;
  private readonly reflected: Float64Array;
  /** The uniforms that pick each axis's sign when a simplex is built. */
  private readonly signDraws: Float64Array;
  private reflectedValue = Infinity;
  private reflectedViolation = Infinity;
  /** Value and violation of the told point (entry 0) and of the reflected one (entry 1), for `offerAt` and `accept`. */
  private readonly scores = new Float64Array(2);
  private readonly scoreViolations = new Float64Array(2);
  /** For 'simplex' and 'shrink': the vertex slot each pending row refills. */
  private readonly pendingSlots: Int32Array;
  private phase: NelderMeadPhase = 'simplex';
  private restarts = 0;
  private staleRestarts = 0;
  private restartStep: number;
  private restartBaseValue = Infinity;
  private restartBaseViolation = Infinity;

  private constructor(config: ResolvedNelderMead, rng: Prng, evaluations: number, stop: StopReason | null, best: BestTracker) {
    // At most a new simplex (n + 1 points) at once.
    super(evaluations, stop, best, new PointBatch(config.dim, config.dim + 1));
    const n = config.dim;
    this.dim = n;
    this.config = config;
    this.rng = rng;
    this.coefficients = gaoHanCoefficients(n);
    this.vertices = new Float64Array((n + 1) * n);
    this.values = new Float64Array(n + 1).fill(Infinity);
    this.violations = new Float64Array(n + 1).fill(Infinity);
    this.order = Int32Array.from({ length: n + 1 }, (_, i) => i);
    this.orderScratch = new Int32Array(n + 1);
    this.centroid = new Float64Array(n);
    this.reflected = new Float64Array(n);
    this.signDraws = new Float64Array(n);
    this.pendingSlots = new Int32Array(n + 1);
    const firstRestartStep = config.initialStep * config.restartStepFactor;
    this.restartStep = firstRestartStep < config.minRestartStep ? config.initialStep : firstRestartStep;
  }

  /**
   * A new search from `config.x0` (or a uniform random point). With `start`, the search
   * begins at that evaluated point instead and does not ask for it again.
   */
  static create(config: ResolvedNelderMead, rng: Prng, start?: EvaluatedStart): NelderMead {
    const n = config.dim;
    const nm = new NelderMead(config, rng, 0, null, new BestTracker(n));
    const x0 = new Float64Array(n);
    if (start !== undefined) x0.set(start.x);
    else if (config.x0 !== null) x0.set(config.x0);
    else for (let j = 0; j < n; j++) x0[j] = rng.float();
    if (start !== undefined) {
      const value = canonicalValue(start.value);
      nm.bestPoint.offer(x0, 0, value, canonicalViolation(start.violation, value));
    }
    nm.buildSimplex(x0, config.initialStep, start !== undefined);
    nm.restartBaseValue = nm.bestPoint.value;
    nm.restartBaseViolation = nm.bestPoint.violation;
    return nm;
  }

  /** Restores an exported state; throws InvalidInput with what is wrong. */
  static fromState(o: Record<string, unknown>, where: string): NelderMead {
    const h = readHeader(o, where, ['nelder-mead'] as const);
    const config = h.config;
    const n = config.dim;
    const nm = new NelderMead(config, h.rng, h.evaluations, h.stopReason, h.best);
    nm.phase = readLiteral(o.phase, `${where}.phase`, PHASES);
    readNumbers(o.vertices, `${where}.vertices`, (n + 1) * n, 0, 1, nm.vertices);
    readReals(o.values, `${where}.values`, n + 1, nm.values);
    readViolations(o.violations, `${where}.violations`, n + 1, nm.violations);
    readIntegers(o.order, `${where}.order`, n + 1, 0, n, nm.order);
    const seen = new Set(nm.order);
    if (seen.size !== n + 1) fail(`${where}.order`, o.order, `a permutation of 0..${n}`);
    readNumbers(o.centroid, `${where}.centroid`, n, 0, 1, nm.centroid);
    readNumbers(o.reflected, `${where}.reflected`, n, 0, 1, nm.reflected);
    nm.reflectedValue = readReal(o.reflectedValue, `${where}.reflectedValue`);
    nm.reflectedViolation = readReal(o.reflectedViolation, `${where}.reflectedViolation`);
    const pendingEntries = readLength(o.pending, `${where}.pending`, (n + 1) * n);
    if (pendingEntries % n !== 0) fail(`${where}.pending`, o.pending, `a multiple of dim = ${n} entries`);
    const pending = pendingEntries / n;
    if (pending + h.evaluations > config.maxEvaluations) fail(`${where}.pending`, o.pending, 'no more points than the budget leaves');
    if ((pending === 0) !== (h.stopReason !== null)) fail(`${where}.pending`, o.pending, 'a pending batch exactly while the search runs');
    const single = nm.phase !== 'simplex' && nm.phase !== 'shrink';
    if (single && pending > 1) fail(`${where}.pending`, o.pending, `one point in phase ${nm.phase}`);
    readNumbers(o.pending, `${where}.pending`, pendingEntries, 0, 1, nm.batch.begin());
    nm.batch.commit(pending);
    const slotCount = single ? 0 : pending;
    readIntegers(o.pendingSlots, `${where}.pendingSlots`, slotCount, 0, n, nm.pendingSlots);
    nm.restarts = readInteger(o.restarts, `${where}.restarts`, 0, Number.MAX_SAFE_INTEGER);
    nm.staleRestarts = readInteger(o.staleRestarts, `${where}.staleRestarts`, 0, config.maxStaleRestarts);
    nm.restartStep = readNumber(o.restartStep, `${where}.restartStep`, 0, config.initialStep, true);
    nm.restartBaseValue = readReal(o.restartBaseValue, `${where}.restartBaseValue`);
    nm.restartBaseViolation = readReal(o.restartBaseViolation, `${where}.restartBaseViolation`);
    return nm;
  }

  tell(points: readonly Float64Array[], values: Float64Array, violations?: Float64Array): void {
    const count = this.received(points, values, violations);
    if (count === 0) return;
    const batch = this.batch;
    const n = this.dim;
    const rows = batch.data;
    this.evaluationsTold += count;
    if (this.phase === 'simplex' || this.phase === 'shrink') {
      for (let k = 0; k < count; k++) {
        const slot = this.pendingSlots[k];
        for (let j = 0; j < n; j++) this.vertices[slot * n + j] = rows[k * n + j];
        canonicalInto(values, violations, k, this.values, this.violations, slot);
        this.bestPoint.offerAt(rows, k * n, this.values, this.violations, slot);
      }
      rankInto(this.order, this.orderScratch, n + 1, this.values, this.violations);
      this.endIteration();
      return;
    }
    const scores = this.scores;
    const scoreViolations = this.scoreViolations;
    canonicalInto(values, violations, 0, scores, scoreViolations, 0);
    const v = scores[0];
    const c = scoreViolations[0];
    this.bestPoint.offerAt(rows, 0, scores, scoreViolations, 0);
    if (this.stopped()) return;
    const order = this.order;
    const worst = order[n];
    switch (this.phase) {
      case 'reflect': {
        this.reflectedValue = v;
        this.reflectedViolation = c;
        const first = order[0];
        const secondWorst = order[n - 1];
        if (precedesAt(scores, scoreViolations, 0, this.values, this.violations, first)) {
          this.askAlong(this.reflected, 0, 'expand');
        } else if (precedesAt(scores, scoreViolations, 0, this.values, this.violations, secondWorst)) {
          this.accept(this.reflected, scores, scoreViolations, 0);
          this.endIteration();
        } else if (precedesAt(scores, scoreViolations, 0, this.values, this.violations, worst)) {
          this.askAlong(this.reflected, 0, 'contract-outside');
        } else {
          this.askAlong(this.vertices, worst * n, 'contract-inside');
        }
        return;
      }
      case 'expand':
        scores[1] = this.reflectedValue;
        scoreViolations[1] = this.reflectedViolation;
        if (precedesAt(scores, scoreViolations, 0, scores, scoreViolations, 1)) this.accept(rows, scores, scoreViolations, 0);
        else this.accept(this.reflected, scores, scoreViolations, 1);
        this.endIteration();
        return;
      case 'contract-outside':
        scores[1] = this.reflectedValue;
        scoreViolations[1] = this.reflectedViolation;
        if (precedesAt(scores, scoreViolations, 1, scores, scoreViolations, 0)) {
          this.askShrink();
        } else {
          this.accept(rows, scores, scoreViolations, 0);
          this.endIteration();
        }
        return;
      case 'contract-inside':
        if (precedesAt(scores, scoreViolations, 0, this.values, this.violations, worst)) {
          this.accept(rows, scores, scoreViolations, 0);
          this.endIteration();
        } else {
          this.askShrink();
        }
        return;
    }
  }

  /** Every point asked is compared by its value: none is dropped whatever its value. */
  infeasibleDroppedInto(out: Uint8Array): void {
    out.fill(0, 0, this.batch.count);
  }

  /** Never: an outside point would break the simplex's geometry. */
  takeImmigrants(immigrants: readonly Immigrant[]): Immigration {
    checkImmigrants(immigrants, this.dim);
    return IMMIGRATION_NEVER;
  }

  exportState(): NelderMeadState {
    const n = this.dim;
    const pending = this.batch.count;
    const single = this.phase !== 'simplex' && this.phase !== 'shrink';
    return {
      ...writeHeader(this.config, this.rng, this.evaluationsTold, this.stop, this.bestPoint),
      kind: 'nelder-mead',
      phase: this.phase,
      vertices: encodeNumbers(this.vertices, (n + 1) * n),
      values: encodeReals(this.values, n + 1),
      violations: encodeReals(this.violations, n + 1),
      order: encodeNumbers(this.order, n + 1),
      centroid: encodeNumbers(this.centroid, n),
      reflected: encodeNumbers(this.reflected, n),
      reflectedValue: encodeReal(this.reflectedValue),
      reflectedViolation: encodeReal(this.reflectedViolation),
      pending: encodeNumbers(this.batch.data, pending * n),
      pendingSlots: single ? [] : encodeNumbers(this.pendingSlots, pending),
      restarts: this.restarts,
      staleRestarts: this.staleRestarts,
      restartStep: this.restartStep,
      restartBaseValue: encodeReal(this.restartBaseValue),
      restartBaseViolation: encodeReal(this.restartBaseViolation),
    };
  }

  /** Target or budget reached: stop, nothing pending. */
  private stopped(): boolean {
    const reason = targetOrBudget(this.bestPoint, this.config.targetValue, this.evaluationsTold, this.config.maxEvaluations);
    if (reason === null) return false;
    this.stop = reason;
    this.batch.clear();
    return true;
  }

  /** After a vertex was accepted or the simplex rebuilt: stop, restart, or reflect. */
  private endIteration(): void {
    if (this.stopped()) return;
    if (this.stagnated()) this.restart();
    else this.askReflection();
  }

  private stagnated(): boolean {
    const n = this.dim;
    const best = this.order[0];
    const worst = this.order[n];
    const fBest = this.values[best];
    const fWorst = this.values[worst];
    const bothFeasible = this.violations[best] <= 0 && this.violations[worst] <= 0;
    if (bothFeasible && fWorst - fBest <= this.config.valueTolerance * Math.max(Math.abs(fBest), Math.abs(fWorst))) return true;
    const x = this.vertices;
    const tolerance = this.config.simplexTolerance;
    for (let s = 0; s <= n; s++) {
      if (s === best) continue;
      for (let j = 0; j < n; j++) {
        if (!(Math.abs(x[s * n + j] - x[best * n + j]) < tolerance)) return false;
      }
    }
    return true;
  }

  private restart(): void {
    const best = this.bestPoint;
    const improved = precedes(best.value, best.violation, this.restartBaseValue, this.restartBaseViolation);
    this.staleRestarts = improved ? 0 : this.staleRestarts + 1;
    if (this.staleRestarts >= this.config.maxStaleRestarts) {
      this.stop = 'converged';
      this.batch.clear();
      return;
    }
    this.restarts++;
    this.restartBaseValue = best.value;
    this.restartBaseViolation = best.violation;
    const step = this.restartStep;
    const next = step * this.config.restartStepFactor;
    this.restartStep = next < this.config.minRestartStep ? this.config.initialStep : next;
    this.buildSimplex(best.x, step, true);
  }

  /**
   * A new simplex: slot 0 at `center`, slot i at `center ± step` along axis i − 1 (sign
   * random, flipped if it would leave the box). `centerKnown`: slot 0 takes the best
   * point's value and is not asked for.
   */
  private buildSimplex(center: Float64Array, step: number, centerKnown: boolean): void {
    const n = this.dim;
    const rows = this.batch.begin();
    const x = this.vertices;
    let k = 0;
    for (let j = 0; j < n; j++) x[j] = center[j];
    if (centerKnown) {
      this.values[0] = this.bestPoint.value;
      this.violations[0] = this.bestPoint.violation;
    } else {
      rows.set(center.subarray(0, n), 0);
      this.pendingSlots[k++] = 0;
      this.values[0] = Infinity;
      this.violations[0] = Infinity;
    }
    // One uniform per axis, drawn as a block: the numbers n calls of float() give, none boxed.
    const draws = this.signDraws;
    this.rng.fillFloats(draws, n);
    for (let i = 1; i <= n; i++) {
      const axis = i - 1;
      const sign = draws[axis] < 0.5 ? -1 : 1;
      let moved = center[axis] + sign * step;
      if (moved < 0 || moved > 1) moved = clampUnit(center[axis] - sign * step);
      const row = k * n;
      for (let j = 0; j < n; j++) rows[row + j] = center[j];
      rows[row + axis] = moved;
      this.pendingSlots[k++] = i;
      this.values[i] = Infinity;
      this.violations[i] = Infinity;
    }
    this.phase = 'simplex';
    this.batch.commit(Math.min(k, this.config.maxEvaluations - this.evaluationsTold));
  }

  /** Centroid of all vertices but the worst, and the reflection of the worst through it. */
  private askReflection(): void {
    const n = this.dim;
    const x = this.vertices;
    const c = this.centroid;
    const order = this.order;
    c.fill(0);
    for (let r = 0; r < n; r++) {
      const at = order[r] * n;
      for (let j = 0; j < n; j++) c[j] += x[at + j];
    }
    const worst = order[n] * n;
    const alpha = this.coefficients.reflection;
    const rows = this.batch.begin();
    for (let j = 0; j < n; j++) {
      c[j] /= n;
      const xr = clampUnit(c[j] + alpha * (c[j] - x[worst + j]));
      this.reflected[j] = xr;
      rows[j] = xr;
    }
    this.phase = 'reflect';
    this.batch.commit(1);
  }

  /** Asks for c + t · (p − c), clamped, c the centroid, p at `source[offset..]`, t the phase's coefficient: expansion or a contraction. */
  private askAlong(source: Float64Array, offset: number, phase: 'expand' | 'contract-outside' | 'contract-inside'): void {
    // The coefficient is looked up here, not passed: a double passed to a call not inlined is boxed.
    const t = phase === 'expand' ? this.coefficients.expansion : this.coefficients.contraction;
    const n = this.dim;
    const c = this.centroid;
    const rows = this.batch.begin();
    for (let j = 0; j < n; j++) rows[j] = clampUnit(c[j] + t * (source[offset + j] - c[j]));
    this.phase = phase;
    this.batch.commit(1);
  }

  /** Shrink towards the best vertex: x_i = x_best + δ (x_i − x_best), n points. */
  private askShrink(): void {
    const n = this.dim;
    const x = this.vertices;
    const delta = this.coefficients.shrink;
    const best = this.order[0] * n;
    const rows = this.batch.begin();
    for (let r = 1; r <= n; r++) {
      const slot = this.order[r];
      const row = (r - 1) * n;
      for (let j = 0; j < n; j++) rows[row + j] = x[best + j] + delta * (x[slot * n + j] - x[best + j]);
      this.pendingSlots[r - 1] = slot;
    }
    this.phase = 'shrink';
    this.batch.commit(Math.min(n, this.config.maxEvaluations - this.evaluationsTold));
  }

  /** Replaces the worst vertex by the point at `source[0..n)`, ranked `values[k]`, `violations[k]`, and re-ranks it (after equals). */
  private accept(source: Float64Array, values: Float64Array, violations: Float64Array, k: number): void {
    const value = values[k];
    const violation = violations[k];
    const n = this.dim;
    const order = this.order;
    const slot = order[n];
    for (let j = 0; j < n; j++) this.vertices[slot * n + j] = source[j];
    this.values[slot] = value;
    this.violations[slot] = violation;
    let p = n;
    while (p > 0 && precedesAt(values, violations, k, this.values, this.violations, order[p - 1])) {
      order[p] = order[p - 1];
      p--;
    }
    order[p] = slot;
  }
}
