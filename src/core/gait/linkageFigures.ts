/** Figures over the whole linkage: poor transmission within stance, and the leg's size. */
import type { SweepResult } from '../linkage';
import { transmissionAngleRad, type FourBarLoop } from '../linkage/analysis';
import { TRANSMISSION_GUIDELINE_DEG } from '../linkage/report';
import { DEG_PER_RAD, TWO_PI, type Probe } from './probe';
import { GAIT_ANGLE_TOL_RAD, signChange } from './solve';
import type { GaitFigures, LoopTransmission, TurnRange } from './types';

/** Crank ranges within the stance intervals where the loop's transmission angle is outside the guideline. */
export function loopTransmission(probe: Probe, loop: FourBarLoop, intervals: readonly TurnRange[], steps: number): LoopTransmission {
  const minRad = TRANSMISSION_GUIDELINE_DEG.min / DEG_PER_RAD;
  const maxRad = TRANSMISSION_GUIDELINE_DEG.max / DEG_PER_RAD;
  const mu = (t: number): number => (probe.at(t) ? transmissionAngleRad(loop, probe.pose) : Number.NaN);
  const outsideOf = (m: number) => !(m >= minRad && m <= maxRad);
  const dt = TWO_PI / steps;
  const outside: TurnRange[] = [];
  let worst = Infinity;
  for (const r of intervals) {
    const ts = [r.fromRad];
    for (let k = Math.floor(r.fromRad / dt) + 1; k * dt < r.toRad - GAIT_ANGLE_TOL_RAD; k++) ts.push(k * dt);
    ts.push(r.toRad);
    let prevT = ts[0];
    let prevMu = mu(prevT);
    let openAt = outsideOf(prevMu) ? prevT : Number.NaN;
    worst = Math.min(worst, Math.min(prevMu, Math.PI - prevMu));
    for (let i = 1; i < ts.length; i++) {
      const t = ts[i];
      const m = mu(t);
      worst = Math.min(worst, Math.min(m, Math.PI - m));
      if (outsideOf(m) !== outsideOf(prevMu)) {
        // The bound crossed is the one the outside end is beyond.
        const bad = outsideOf(m) ? m : prevMu;
        const bound = bad < minRad ? minRad : maxRad;
        const edge = signChange((s) => mu(s) - bound, prevT, t, prevMu - bound);
        if (outsideOf(m)) openAt = edge;
        else {
          outside.push({ fromRad: openAt, toRad: edge });
          openAt = Number.NaN;
        }
      }
      prevT = t;
      prevMu = m;
    }
    if (!Number.isNaN(openAt)) outside.push({ fromRad: openAt, toRad: r.toRad });
  }
  return {
    jointIds: loop.jointIds,
    bodyIds: loop.bodyIds,
    outside,
    worstInStanceDeg: intervals.length > 0 && Number.isFinite(worst) ? worst * DEG_PER_RAD : null,
  };
}

/**
 * The box holding every joint and point over the turn: the samples, and each extreme of
 * a coordinate between them, located where its exact rate changes sign.
 */
export function legSize(probe: Probe, sw: SweepResult, slotCount: number, steps: number): GaitFigures['size'] {
  const lo = [Infinity, Infinity];
  const hi = [-Infinity, -Infinity];
  const stride = 2 * slotCount;
  const dt = TWO_PI / steps;
  for (let i = 0; i < stride; i++) {
    const axis = i & 1;
    for (let k = 0; k <= steps; k++) {
      const v = sw.poses[k * stride + i];
      if (v < lo[axis]) lo[axis] = v;
      if (v > hi[axis]) hi[axis] = v;
      if (k === steps) break;
      const r0 = sw.rates[k * stride + i];
      if (!(r0 * sw.rates[(k + 1) * stride + i] < 0)) continue;
      const rate = (t: number): number => (probe.at(t) ? probe.rates[i] : Number.NaN);
      // Rates here are per unit of driver angle; the sign change is the same in turn angle.
      probe.at(signChange(rate, k * dt, (k + 1) * dt, r0));
      const e = probe.pose[i];
      if (e < lo[axis]) lo[axis] = e;
      if (e > hi[axis]) hi[axis] = e;
    }
  }
  return { minXMm: lo[0], maxXMm: hi[0], minYMm: lo[1], maxYMm: hi[1], widthMm: hi[0] - lo[0], heightMm: hi[1] - lo[1] };
}
