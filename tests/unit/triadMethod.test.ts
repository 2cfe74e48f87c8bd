import { describe, expect, it } from 'vitest';
import {
  compile,
  run,
  stephensonII,
  stephensonIII,
  STEPHENSON_II_DEFAULT,
  STEPHENSON_III_DEFAULT,
  type Linkage,
} from '../../src/core/linkage';
import { circleCircleIntersectInto } from '../../src/core/geometry/intersect';
import { OP_NEWTON, OP_STRIDE, type PlanInternal } from '../../src/core/linkage/plan';
import { runPrefix } from '../../src/core/linkage/run';
import { NEWTON_MAX_ITERATIONS, NEWTON_ROUNDING_FLOOR_FACTOR } from '../../src/core/linkage/tolerances';
import { triadLayout } from '../../src/core/linkage/triad';

/**
 * The triad solver (triad.ts) turns X_i's direction in the tangent chart, with no
 * trigonometric call per step. Here it is compared with the solver it replaced, copied
 * below as it was (X_i's angle φ itself, placed by Math.cos and Math.sin, started from
 * Math.atan2): on seeded Stephenson II and III designs, stepped round a full turn at
 * several step sizes from the solved pose before, both must assemble at the same samples,
 * on the same assembly (joints within a rounding-sized distance), and so turn fully or
 * not alike. Source: common practice (differential testing against the previous method).
 */

// ---- The previous method, as it was in triad.ts (layout fields and scratch offsets the same). ----
const F_CENTRE = 3;
const F_RADIUS = 6;
const F_SPAN = 9;
const F_RIGID = 10;
const PAIR_I = [0, 0, 1, 1, 2, 2];
const PAIR_J = [1, 2, 0, 2, 0, 1];
const OLD_MAX_STEP_RAD = 0.5;
const OLD_CONTRACTION = 0.5;
const OLD_MAX_SLOW_STEPS = 2;
const OLD_MAX_HALVINGS = 3;
const NOW = 0;
const TRIAL = 6;
const KI = 12;
const RI = 14;
const KJ = 15;
const RJ = 17;
const DIJ = 18;
const SIDE = 19;
const Z = 20;
const KK = 22;
const RK = 24;
const PHI = 25;
const SCORE = 26;
const OLD_SOLVED = 1;
const OLD_NO_ROOT = 0;
const OLD_NO_START = -1;

function oldPlace(s: Float64Array, phi: number, at: number): number {
  const xi = s[KI] + s[RI] * Math.cos(phi);
  const yi = s[KI + 1] + s[RI] * Math.sin(phi);
  if (!circleCircleIntersectInto(xi, yi, s[DIJ], s[KJ], s[KJ + 1], s[RJ], s[SIDE], s, at + 2)) return NaN;
  s[at] = xi;
  s[at + 1] = yi;
  const wx = s[at + 2] - xi;
  const wy = s[at + 3] - yi;
  const xk = xi + s[Z] * wx - s[Z + 1] * wy;
  const yk = yi + s[Z] * wy + s[Z + 1] * wx;
  s[at + 4] = xk;
  s[at + 5] = yk;
  const dx = xk - s[KK];
  const dy = yk - s[KK + 1];
  const rk = s[RK];
  return (dx * dx + dy * dy - rk * rk) / (2 * rk);
}

function oldSlope(s: Float64Array): number {
  const xi = s[NOW];
  const yi = s[NOW + 1];
  const dxi = -(yi - s[KI + 1]);
  const dyi = xi - s[KI];
  const ax = s[NOW + 2] - xi;
  const ay = s[NOW + 3] - yi;
  const cx = s[NOW + 2] - s[KJ];
  const cy = s[NOW + 3] - s[KJ + 1];
  const along = (ax * dxi + ay * dyi) / (ax * cy - ay * cx);
  const wx = along * cy - dxi;
  const wy = -along * cx - dyi;
  const dxk = dxi + s[Z] * wx - s[Z + 1] * wy;
  const dyk = dyi + s[Z] * wy + s[Z + 1] * wx;
  return ((s[NOW + 4] - s[KK]) * dxk + (s[NOW + 5] - s[KK + 1]) * dyk) / s[RK];
}

function oldSetUp(s: Float64Array, prm: Float64Array, t: Int32Array, pose: Float64Array, pair: number): number {
  const i = PAIR_I[pair];
  const j = PAIR_J[pair];
  const k = 3 - i - j;
  const u = prm[t[F_RIGID]];
  const v = prm[t[F_RIGID] + 1];
  const bix = i === 2 ? u : i === 1 ? 1 : 0;
  const biy = i === 2 ? v : 0;
  const bjx = (j === 2 ? u : j === 1 ? 1 : 0) - bix;
  const bjy = (j === 2 ? v : 0) - biy;
  const bkx = (k === 2 ? u : k === 1 ? 1 : 0) - bix;
  const bky = (k === 2 ? v : 0) - biy;
  const bj2 = bjx * bjx + bjy * bjy;
  s[Z] = (bkx * bjx + bky * bjy) / bj2;
  s[Z + 1] = (bky * bjx - bkx * bjy) / bj2;
  s[DIJ] = prm[t[F_SPAN]] * Math.sqrt(bj2);
  const xi = t[i];
  const xj = t[j];
  const ki = t[F_CENTRE + i];
  const kj = t[F_CENTRE + j];
  const kk = t[F_CENTRE + k];
  s[KI] = pose[ki];
  s[KI + 1] = pose[ki + 1];
  s[RI] = prm[t[F_RADIUS + i]];
  s[KJ] = pose[kj];
  s[KJ + 1] = pose[kj + 1];
  s[RJ] = prm[t[F_RADIUS + j]];
  s[KK] = pose[kk];
  s[KK + 1] = pose[kk + 1];
  s[RK] = prm[t[F_RADIUS + k]];
  const side = (s[KJ] - pose[xi]) * (pose[xj + 1] - pose[xi + 1]) - (s[KJ + 1] - pose[xi + 1]) * (pose[xj] - pose[xi]);
  s[SIDE] = side < 0 ? -1 : 1;
  s[PHI] = Math.atan2(pose[xi + 1] - s[KI + 1], pose[xi] - s[KI]);
  return oldPlace(s, s[PHI], NOW);
}

function oldPairScore(t: Int32Array, pose: Float64Array, c: number): number {
  const xi = t[PAIR_I[c]];
  const xj = t[PAIR_J[c]];
  const kj = t[F_CENTRE + PAIR_J[c]];
  const ax = pose[xj] - pose[xi];
  const ay = pose[xj + 1] - pose[xi + 1];
  const cx = pose[xj] - pose[kj];
  const cy = pose[xj + 1] - pose[kj + 1];
  const cross = ax * cy - ay * cx;
  return (cross * cross) / ((ax * ax + ay * ay) * (cx * cx + cy * cy));
}

function oldSolveTriad(s: Float64Array, prm: Float64Array, t: Int32Array, pose: Float64Array, tolMm: number): number {
  for (let c = 0; c < 6; c++) {
    const score = oldPairScore(t, pose, c);
    s[SCORE + c] = score >= 0 ? score : -1;
  }
  let pair = -1;
  let g = NaN;
  for (let attempt = 0; attempt < 6 && Number.isNaN(g); attempt++) {
    pair = -1;
    let best = -Infinity;
    for (let c = 0; c < 6; c++) {
      if (s[SCORE + c] > best) {
        best = s[SCORE + c];
        pair = c;
      }
    }
    if (pair < 0) return OLD_NO_START;
    s[SCORE + pair] = -Infinity;
    g = oldSetUp(s, prm, t, pose, pair);
  }
  if (Number.isNaN(g)) return OLD_NO_START;
  const i = PAIR_I[pair];
  const j = PAIR_J[pair];
  const xi = t[i];
  const xj = t[j];
  const xk = t[3 - i - j];
  let phi = s[PHI];
  let norm = Math.abs(g);
  let slow = 0;
  let solved = false;
  for (let iteration = 0; iteration < NEWTON_MAX_ITERATIONS; iteration++) {
    if (norm <= tolMm) {
      solved = true;
      break;
    }
    let step = -g / oldSlope(s);
    if (!(Math.abs(step) < Infinity)) break;
    const bounded = !(Math.abs(step) <= OLD_MAX_STEP_RAD);
    if (bounded) step = step > 0 ? OLD_MAX_STEP_RAD : -OLD_MAX_STEP_RAD;
    let lambda = 1;
    let next = NaN;
    for (let halving = 0; halving <= OLD_MAX_HALVINGS; halving++) {
      next = oldPlace(s, phi + lambda * step, TRIAL);
      if (Math.abs(next) < norm) break;
      lambda *= 0.5;
    }
    if (!(Math.abs(next) < norm)) {
      solved = norm <= NEWTON_ROUNDING_FLOOR_FACTOR * tolMm;
      break;
    }
    phi += lambda * step;
    for (let q = 0; q < 6; q++) s[NOW + q] = s[TRIAL + q];
    slow = !bounded && Math.abs(next) > OLD_CONTRACTION * norm ? slow + 1 : 0;
    g = next;
    norm = Math.abs(next);
    if (slow >= OLD_MAX_SLOW_STEPS) break;
  }
  if (!solved && !(norm <= tolMm)) return OLD_NO_ROOT;
  pose[xi] = s[NOW];
  pose[xi + 1] = s[NOW + 1];
  pose[xj] = s[NOW + 2];
  pose[xj + 1] = s[NOW + 3];
  pose[xk] = s[NOW + 4];
  pose[xk + 1] = s[NOW + 5];
  return OLD_SOLVED;
}
// ---- End of the previous method. ----

/** A seeded linear congruential generator (test data only). */
function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648;
  };
}

const CASES = [
  { name: 'Stephenson II', build: stephensonII as (at: never) => Linkage, defaults: { ...STEPHENSON_II_DEFAULT } as Record<string, { x: number; y: number }> },
  { name: 'Stephenson III', build: stephensonIII as (at: never) => Linkage, defaults: { ...STEPHENSON_III_DEFAULT } as Record<string, { x: number; y: number }> },
];
const DESIGNS = 30;
/** Samples per turn: 2° and 5° steps (a curve sample, a motion check). */
const STEPS_PER_TURN = [180, 72];

describe.each(CASES)('$name: the triad solver against the method it replaced', (c) => {
  it('assembles at the same samples, on the same assembly, round full turns at several step sizes', () => {
    const random = lcg(c.name.length * 104729);
    let compared = 0;
    let failedAlike = 0;
    let fullTurns = 0;
    let partTurns = 0;
    for (let d = 0; d < DESIGNS; d++) {
      const at: Record<string, { x: number; y: number }> = {};
      for (const [id, q] of Object.entries(c.defaults)) at[id] = { x: q.x + (random() - 0.5) * 60, y: q.y + (random() - 0.5) * 60 };
      const compiled = compile(c.build(at as never));
      if (!compiled.ok) continue;
      const p = compiled.plan as PlanInternal;
      expect(p.blockCount).toBe(1);
      const layout = triadLayout(p, 0);
      expect(layout).not.toBeNull();
      if (layout === null) continue;
      let blockOp = -1;
      for (let o = 0; o < p.opCount; o++) if (p.ops[o * OP_STRIDE] === OP_NEWTON) blockOp = o;
      const joints = [layout[0], layout[1], layout[2]];
      const scratch = new Float64Array(40);
      for (const steps of STEPS_PER_TURN) {
        const now = Float64Array.from(p.reference);
        const before = Float64Array.from(p.reference);
        let whole = true;
        for (let k = 1; k <= steps; k++) {
          const v = p.driverReferenceValue + (2 * Math.PI * k) / steps;
          // Both start from the same pose: the one solved at the sample before.
          before.set(now);
          expect(runPrefix(p, v, before, blockOp)).toBe(-1);
          const old = oldSolveTriad(scratch, p.params, layout, before, p.newtonTolMm);
          const ok = run(p, v, now);
          // Where the old method could not start it handed the block to damped Newton, as the new one does.
          if (old === OLD_NO_START) continue;
          expect([k, steps, ok]).toEqual([k, steps, old === OLD_SOLVED]);
          if (ok) {
            // Source: common practice — the same root to within rounding of the tolerance.
            for (const s of joints) expect(Math.hypot(now[s] - before[s], now[s + 1] - before[s + 1])).toBeLessThan(1e3 * p.newtonTolMm);
            compared++;
          } else {
            whole = false;
            failedAlike++;
            now.set(p.reference);
          }
        }
        if (whole) fullTurns++;
        else partTurns++;
      }
    }
    expect(compared).toBeGreaterThan(1000);
    // Both outcomes are exercised: samples that do not assemble, turns that complete and turns that do not.
    expect(failedAlike).toBeGreaterThan(0);
    expect(fullTurns).toBeGreaterThan(0);
    expect(partTurns).toBeGreaterThan(0);
  });
});
