/**
 * The four-bar objective allocates nothing per evaluation in steady state (STYLE.md:
 * hot loops allocate nothing; a double passed to or returned from a call V8 does not
 * inline is boxed, 16 bytes a time), measured in bytes, not time; and the array forms
 * that replaced the helpers returning doubles give the same bits as the helpers did.
 */
import { readFileSync } from 'node:fs';
import { allocatedBytes } from '../support/allocatedBytes';
import { describe, expect, it } from 'vitest';
import { parseSynthesisProblemFile } from '../../src/core/io/problem';
import { Prng } from '../../src/core/optimize';
import { FAMILY_IDS, createObjective, isLegProblem, isSuspensionProblem, type FamilyId, type Problem } from '../../src/core/synthesis';
import { crankViolation, crankViolationInto, inputTurnsFully } from '../../src/core/synthesis/grashofTurn';
import { measureValue, measureValueInto } from '../../src/core/synthesis/measures';
import { boxViolationInto } from '../../src/core/synthesis/objective/designSpace';
import { sumViolations, sumViolationsInto } from '../../src/core/synthesis/objective/score';
import { orderViolation, orderViolationInto } from '../../src/core/synthesis/timing';
import { CHANGE_POINT_REL_TOL } from '../../src/core/linkage/analysis/grashof';
import { addPointsToExtent, addToExtent, EXTENT_LENGTH, resetExtent } from '../../src/core/synthesis/encoding';
import { fourBarJointsInto, fourBarJointsIo } from '../../src/core/synthesis/fourBarClosedForm';

/** The published four-bar problems the scaling bench runs (tests/reference/problems). */
const CASES = ['line6-untimed', 'timed5', 'closed18-untimed'] as const;
const WINDOW_EVALUATIONS = 2_000;
/** Windows measured after the warm-up; the JIT compiles in the background, so the first may still run unoptimised code. */
const MAX_WINDOWS = 30;
const WARM_UP_EVALUATIONS = 4_000;
/** Evaluations of each other family on each case before the four-bar's: enough for V8 to compile the shared call sites with their feedback. */
const OTHER_FAMILY_EVALUATIONS = 400;
/**
 * Bytes per evaluation allowed in the quietest window. One boxed double is 16 bytes, so
 * an allocation on every evaluation fails by 8 times; what a window may hold besides (a
 * function compiled or deoptimised once, the heap statistics the measure itself reads,
 * under 4 kB) passes. Bytes are counted exactly, so the machine's speed and load do not
 * enter, only how soon the compiler's background thread finishes, which the windows wait
 * out (by count, not time).
 */
const MAX_BYTES_PER_EVALUATION = 2;

function problemOf(caseId: string): Problem {
  const file: unknown = JSON.parse(readFileSync(new URL(`../reference/problems/${caseId}.json`, import.meta.url), 'utf8'));
  const parsed = parseSynthesisProblemFile(file);
  if (!parsed.ok || isSuspensionProblem(parsed.problem) || isLegProblem(parsed.problem)) throw new Error(`${caseId}: not a path problem`);
  return parsed.problem;
}


/** A run of `count` evaluations of `family`'s objective on the problem, over 512 seeded designs across its box. */
function evaluations(problem: Problem, family: FamilyId): (count: number) => void {
  const objective = createObjective(problem, family);
  // Seeded designs across the box: feasible, infeasible and unassembled ones alike.
  const designs = 512;
  const xs = new Float64Array(designs * objective.dim);
  const prng = Prng.fromSeed(7);
  const u = new Float64Array(objective.dim);
  const x = new Float64Array(objective.dim);
  for (let d = 0; d < designs; d++) {
    for (let j = 0; j < objective.dim; j++) u[j] = prng.float();
    xs.set(objective.fromSearchBoxInto(u, x), d * objective.dim);
  }
  const out = new Float64Array(2);
  const sink = new Float64Array(1);
  return (count: number): void => {
    for (let e = 0; e < count; e++) {
      const d = e % designs;
      for (let j = 0; j < objective.dim; j++) x[j] = xs[d * objective.dim + j];
      objective.evaluate(x, out);
      sink[0] += out[1];
    }
  };
}

describe('the four-bar objective allocates nothing per evaluation', () => {
  // A worker runs jobs of several families one after another, and their curves answer at
  // call sites the four-bar's shares (the path response, the timing solvers): every other
  // family runs first, so those sites have seen every kind of curve before the four-bar is
  // measured, whichever test files ran in this worker before.
  for (const family of FAMILY_IDS) {
    if (family === 'fourbar-lengths') continue;
    for (const caseId of CASES) evaluations(problemOf(caseId), family)(OTHER_FAMILY_EVALUATIONS);
  }
  // The three objectives share the module's code, as islands of several jobs in one worker do.
  const objectives = CASES.map((caseId) => ({ caseId, run: evaluations(problemOf(caseId), 'fourbar-lengths') }));
  for (const { run } of objectives) run(WARM_UP_EVALUATIONS);

  for (const { caseId, run } of objectives) {
    it(`${caseId}: under ${MAX_BYTES_PER_EVALUATION} bytes per evaluation in steady state`, () => {
      let least = Infinity;
      for (let w = 0; w < MAX_WINDOWS && !(least < MAX_BYTES_PER_EVALUATION); w++) {
        least = Math.min(least, allocatedBytes(() => run(WINDOW_EVALUATIONS)) / WINDOW_EVALUATIONS);
      }
      // common practice (V8: a heap number is 16 bytes; an evaluation that boxes one fails)
      expect(least).toBeLessThan(MAX_BYTES_PER_EVALUATION);
    });
  }

  it('the measure can see one boxed double per evaluation (it can fail)', () => {
    // An array of any elements holds each double it is given as a heap number of its own.
    const box: unknown[] = [''];
    const prng = Prng.fromSeed(3);
    const bytes = allocatedBytes(() => {
      for (let e = 0; e < WINDOW_EVALUATIONS; e++) box[0] = prng.float() + 0.5;
    });
    // common practice (V8's heap number: a map word and the double)
    expect(bytes / WINDOW_EVALUATIONS).toBeGreaterThanOrEqual(MAX_BYTES_PER_EVALUATION);
  });
});

// Source: the helpers before this change (git 7e66f07: measures.ts measureValue,
// objective/score.ts sumViolations, objective/designSpace.ts boxViolation, timing.ts
// orderViolation, grashofTurn.ts crankViolation, grashofExcess, changePointBand and
// inputTurnsFully, encoding.ts addToExtent, fourBarClosedForm.ts fourBarJointsInto), copied
// verbatim as the reference the array forms must match to the bit.
const previous = {
  addToExtent(px: number, py: number, placement: Float64Array, out: Float64Array): void {
    const x = placement[0] * px - placement[1] * py + placement[2];
    const y = placement[1] * px + placement[0] * py + placement[3];
    if (!(x >= out[0])) out[0] = Number.isNaN(x) ? -Infinity : x;
    if (!(x <= out[1])) out[1] = Number.isNaN(x) ? Infinity : x;
    if (!(y >= out[2])) out[2] = Number.isNaN(y) ? -Infinity : y;
    if (!(y <= out[3])) out[3] = Number.isNaN(y) ? Infinity : y;
  },
  fourBarJointsInto(p: Float64Array, offset: number, theta2: number, sign: number, out: Float64Array): number {
    const r1 = p[offset + 0];
    const r2 = p[offset + 1];
    const r3 = p[offset + 2];
    const r4 = p[offset + 3];
    const theta0 = p[offset + 6];
    const x0 = p[offset + 7];
    const y0 = p[offset + 8];
    const ax = r2 * Math.cos(theta2);
    const ay = r2 * Math.sin(theta2);
    const dx = r1 - ax;
    const dy = -ay;
    const q = dx * dx + dy * dy;
    const alpha = 0.5 + (0.5 * (r3 * r3 - r4 * r4)) / q;
    const margin = (r3 * r3) / q - alpha * alpha;
    const beta = sign * (margin > 0 ? Math.sqrt(margin) : 0);
    const bx = ax + alpha * dx - beta * dy;
    const by = ay + alpha * dy + beta * dx;
    const ct = Math.cos(theta0);
    const st = Math.sin(theta0);
    out[0] = x0;
    out[1] = y0;
    out[2] = x0 + ct * ax - st * ay;
    out[3] = y0 + st * ax + ct * ay;
    out[4] = x0 + ct * bx - st * by;
    out[5] = y0 + st * bx + ct * by;
    out[6] = x0 + ct * r1;
    out[7] = y0 + st * r1;
    return margin;
  },
  measureValue(measure: 'sum-of-squares' | 'rms' | 'max', d2: Float64Array, n: number, weights: Float64Array | undefined): number {
    let sum = 0;
    let sumW = 0;
    let max = 0;
    for (let i = 0; i < n; i++) {
      const w = weights === undefined ? 1 : weights[i];
      sum += w * d2[i];
      sumW += w;
      if (w > 0 && !(d2[i] <= max)) max = d2[i];
    }
    if (measure === 'sum-of-squares') return sum;
    if (measure === 'rms') return Math.sqrt(sum / sumW);
    return Math.sqrt(max);
  },
  sumViolations(parts: Float64Array, count: number): number {
    let violation = 0;
    for (let s = 0; s < count; s++) violation += parts[s];
    return violation;
  },
  boxViolation(x: Float64Array, lower: Float64Array, upper: Float64Array, dim: number): number {
    let v = 0;
    for (let j = 0; j < dim; j++) {
      const w = upper[j] - lower[j];
      const xj = x[j];
      if (xj < lower[j]) v += (lower[j] - xj) / w;
      else if (xj > upper[j]) v += (xj - upper[j]) / w;
      else if (Number.isNaN(xj)) v += 1;
    }
    return v;
  },
  orderViolation(values: ArrayLike<number>, offset: number, n: number, wrap: boolean, period: number): number {
    let sum = 0;
    if (!wrap) {
      for (let i = 0; i + 1 < n; i++) {
        const d = values[offset + i] - values[offset + i + 1];
        if (d > 0) sum += d;
      }
      return sum / period;
    }
    for (let i = 0; i + 1 < n; i++) {
      let d = values[offset + i + 1] - values[offset + i];
      d -= Math.floor(d / period) * period;
      sum += d;
    }
    const excess = sum - period;
    return excess > 0 ? excess / period : 0;
  },
  changePointBand(a: number, b: number, c: number, d: number): number {
    return CHANGE_POINT_REL_TOL * (a + b + c + d);
  },
  grashofExcess(a: number, b: number, c: number, d: number): number {
    const s = Math.min(a, b, c, d);
    const l = Math.max(a, b, c, d);
    return s + l - (a + b + c + d - s - l);
  },
  inputTurnsFully(ground: number, input: number, coupler: number, output: number): boolean {
    if (!(ground > 0 && input > 0 && coupler > 0 && output > 0)) return false;
    const excess = previous.grashofExcess(ground, input, coupler, output);
    return excess < -previous.changePointBand(ground, input, coupler, output) && Math.min(ground, input) <= Math.min(coupler, output);
  },
  crankViolation(ground: number, input: number, coupler: number, output: number, groundMayBeShortest = false): number {
    const l = Math.max(ground, input, coupler, output);
    const shortestOther = groundMayBeShortest ? Math.min(coupler, output) : Math.min(ground, coupler, output);
    const driven = groundMayBeShortest ? Math.min(ground, input) : input;
    let v = 0;
    if (driven > shortestOther) v += (driven - shortestOther) / l;
    const excess = previous.grashofExcess(ground, input, coupler, output) + previous.changePointBand(ground, input, coupler, output);
    if (!(excess < 0)) v += excess / l + CHANGE_POINT_REL_TOL;
    return v >= 0 ? v : 1;
  },
};

/** Same bits: Object.is tells −0 from 0; NaN equals NaN (its payload is not a result). */
function sameBits(a: number, b: number): boolean {
  return Object.is(a, b);
}

/** Seeded values with the awkward ones mixed in: zeros of both signs, NaN, infinities, ties. */
function awkwardValues(prng: Prng, count: number, scale: number): Float64Array {
  const specials = [0, -0, NaN, Infinity, -Infinity, 1, -1, scale, 1e-300, -1e-300];
  const out = new Float64Array(count);
  for (let i = 0; i < count; i++) out[i] = prng.float() < 0.15 ? specials[Math.floor(prng.float() * specials.length)] : (prng.float() * 2 - 1) * scale;
  return out;
}

describe('the array forms give the previous helpers\' bits', () => {
  const ROUNDS = 4_000;

  it('measureValueInto and measureValue', () => {
    const prng = Prng.fromSeed(21);
    const out = new Float64Array(3);
    let differ = 0;
    for (let r = 0; r < ROUNDS; r++) {
      const n = 1 + Math.floor(prng.float() * 12);
      const d2 = awkwardValues(prng, n, 50).map(Math.abs);
      const weights = prng.float() < 0.5 ? undefined : awkwardValues(prng, n, 3).map(Math.abs);
      for (const measure of ['sum-of-squares', 'rms', 'max'] as const) {
        measureValueInto(measure, d2, n, weights, out, 1);
        if (!sameBits(out[1], previous.measureValue(measure, d2, n, weights))) differ++;
        if (!sameBits(measureValue(measure, d2, n, weights), previous.measureValue(measure, d2, n, weights))) differ++;
      }
    }
    expect(differ).toBe(0);
  });

  it('sumViolationsInto and sumViolations', () => {
    const prng = Prng.fromSeed(22);
    const out = new Float64Array(2);
    let differ = 0;
    for (let r = 0; r < ROUNDS; r++) {
      const parts = awkwardValues(prng, 8, 2).map((v) => (prng.float() < 0.5 ? Math.abs(v) : 0));
      const count = Math.floor(prng.float() * 9);
      sumViolationsInto(parts, count, out, 1);
      if (!sameBits(out[1], previous.sumViolations(parts, count))) differ++;
      if (!sameBits(sumViolations(parts, count), previous.sumViolations(parts, count))) differ++;
    }
    expect(differ).toBe(0);
  });

  it('boxViolationInto', () => {
    const prng = Prng.fromSeed(23);
    const out = new Float64Array(2);
    let differ = 0;
    for (let r = 0; r < ROUNDS; r++) {
      const dim = 1 + Math.floor(prng.float() * 10);
      const lower = awkwardValues(prng, dim, 10).map((v) => (Number.isFinite(v) ? v : -10));
      const upper = lower.map((v) => v + 0.5 + prng.float() * 20);
      const x = awkwardValues(prng, dim, 30);
      boxViolationInto(x, lower, upper, dim, out, 1);
      if (!sameBits(out[1], previous.boxViolation(x, lower, upper, dim))) differ++;
    }
    expect(differ).toBe(0);
  });

  it('orderViolationInto and orderViolation', () => {
    const prng = Prng.fromSeed(24);
    const out = new Float64Array(2);
    const TAU = 2 * Math.PI;
    let differ = 0;
    for (let r = 0; r < ROUNDS; r++) {
      const n = 1 + Math.floor(prng.float() * 10);
      const offset = Math.floor(prng.float() * 3);
      const values = awkwardValues(prng, n + offset, 8);
      for (const wrap of [false, true]) {
        orderViolationInto(values, offset, n, wrap, TAU, out, 1);
        if (!sameBits(out[1], previous.orderViolation(values, offset, n, wrap, TAU))) differ++;
        if (!sameBits(orderViolation(values, offset, n, wrap, TAU), previous.orderViolation(values, offset, n, wrap, TAU))) differ++;
      }
    }
    expect(differ).toBe(0);
  });

  it('crankViolationInto, crankViolation and inputTurnsFully', () => {
    const prng = Prng.fromSeed(25);
    const out = new Float64Array(2);
    let differ = 0;
    for (let r = 0; r < ROUNDS; r++) {
      const lengths = awkwardValues(prng, 6, 10).map((v) => (prng.float() < 0.8 ? Math.abs(v) : v));
      // Grashof boundaries and ties, where the change-point band decides.
      if (r % 5 === 0) lengths[4] = lengths[2] + lengths[3] - lengths[5];
      if (r % 7 === 0) lengths[3] = lengths[2];
      const [a, b, c, d] = [lengths[2], lengths[3], lengths[4], lengths[5]];
      for (const groundMayBeShortest of [false, true]) {
        crankViolationInto(lengths, 2, groundMayBeShortest, out, 1);
        const expected = previous.crankViolation(a, b, c, d, groundMayBeShortest);
        if (!sameBits(out[1], expected)) differ++;
        if (!sameBits(crankViolation(a, b, c, d, groundMayBeShortest), expected)) differ++;
      }
      if (inputTurnsFully(a, b, c, d) !== previous.inputTurnsFully(a, b, c, d)) differ++;
    }
    expect(differ).toBe(0);
  });

  it('addPointsToExtent and addToExtent', () => {
    const prng = Prng.fromSeed(26);
    const placement = new Float64Array(4);
    const expected = new Float64Array(EXTENT_LENGTH);
    const one = new Float64Array(EXTENT_LENGTH);
    const many = new Float64Array(EXTENT_LENGTH);
    let differ = 0;
    for (let r = 0; r < ROUNDS; r++) {
      placement.set(awkwardValues(prng, 4, 3));
      const count = 1 + Math.floor(prng.float() * 6);
      const xy = awkwardValues(prng, 2 * count, 40);
      resetExtent(expected);
      resetExtent(one);
      resetExtent(many);
      for (let k = 0; k < count; k++) {
        previous.addToExtent(xy[2 * k], xy[2 * k + 1], placement, expected);
        addToExtent(xy[2 * k], xy[2 * k + 1], placement, one);
      }
      addPointsToExtent(xy, count, placement, many);
      for (let q = 0; q < EXTENT_LENGTH; q++) if (!sameBits(one[q], expected[q]) || !sameBits(many[q], expected[q])) differ++;
    }
    expect(differ).toBe(0);
  });

  it('fourBarJointsInto and fourBarJointsIo', () => {
    const prng = Prng.fromSeed(27);
    const expected = new Float64Array(8);
    const viaInto = new Float64Array(8);
    const viaIo = new Float64Array(8);
    const io = new Float64Array(2);
    let differ = 0;
    for (let r = 0; r < ROUNDS; r++) {
      const p = awkwardValues(prng, 11, 6);
      const theta2 = (prng.float() * 4 - 2) * Math.PI;
      const sign = prng.float() < 0.5 ? 1 : -1;
      const margin = previous.fourBarJointsInto(p, 2, theta2, sign, expected);
      if (!sameBits(fourBarJointsInto(p, 2, theta2, sign, viaInto), margin)) differ++;
      io[0] = theta2;
      fourBarJointsIo(p, 2, sign, io, viaIo);
      if (!sameBits(io[1], margin)) differ++;
      for (let q = 0; q < 8; q++) if (!sameBits(viaInto[q], expected[q]) || !sameBits(viaIo[q], expected[q])) differ++;
    }
    expect(differ).toBe(0);
  });
});
