/**
 * `fourbar-lengths`: the literature encoding of the four-bar (Cabrera, Simon and Prado,
 * 2002, and the benchmark papers after them), evaluated in closed form.
 *
 * Fixed placement: r1 ground, r2 crank, r3 coupler, r4 rocker, rcx, rcy, θ0, x0, y0
 * (see fourBarClosedForm.ts). Free placement: the similarity fit supplies scale,
 * rotation and translation, so r1 ≡ 1, θ0 = x0 = y0 = 0 and the variables are r2, r3,
 * r4, rcx, rcy in units of the ground link.
 */
import { FOUR_BAR_FIXED_NAMES, FOUR_BAR_FREE_NAMES } from './familyVariables';
import { fourBar } from '../linkage';
import { classifyFourBar } from '../linkage/analysis';
import { COINCIDENT_JOINT_TOL_MM as COINCIDENT_JOINT_TOL_MM_BINDING } from '../linkage/tolerances';
import { crankViolationInto, inputTurnsFully } from './grashofTurn';
import { CURVE_OUT_LENGTH as CURVE_OUT_LENGTH_BINDING, type CurveEvaluator } from './curve';
import {
  V_BRANCH as V_BRANCH_BINDING,
  V_CRANK as V_CRANK_BINDING,
  V_KEEP_OUT as V_KEEP_OUT_BINDING,
  V_LINK_LENGTH as V_LINK_LENGTH_BINDING,
  V_TRANSMISSION as V_TRANSMISSION_BINDING,
  EXTENT_COS as EXTENT_COS_BINDING,
  addPointsToExtent,
  lengthViolation,
  resetExtent,
  transmissionCosLimit,
  type EncodingReport,
  type MechanismEncoding,
  type TargetFrame,
} from './encoding';
import {
  FOUR_BAR_LENGTH_VARIABLES as FOUR_BAR_LENGTH_VARIABLES_BINDING,
  R1 as R1_BINDING,
  R2 as R2_BINDING,
  R3 as R3_BINDING,
  R4 as R4_BINDING,
  RCY as RCY_BINDING,
  THETA0 as THETA0_BINDING,
  X0 as X0_BINDING,
  Y0 as Y0_BINDING,
  OUT_MARGIN as OUT_MARGIN_BINDING,
  OUT_THETA2 as OUT_THETA2_BINDING,
  fourBarCouplerPointInto,
  fourBarCouplerPointIo,
  fourBarJointsInto,
  fourBarJointsIo,
} from './fourBarClosedForm';
import type { Branch, Constraints, Placement } from './problem';

// Imported constants as locals: a module transform (tsx, vitest) may turn each read of an
// imported binding into a getter call, which the hot loops below cannot afford.
const CURVE_OUT_LENGTH = CURVE_OUT_LENGTH_BINDING;
const V_BRANCH = V_BRANCH_BINDING;
const V_CRANK = V_CRANK_BINDING;
const V_KEEP_OUT = V_KEEP_OUT_BINDING;
const V_LINK_LENGTH = V_LINK_LENGTH_BINDING;
const COINCIDENT_JOINT_TOL_MM = COINCIDENT_JOINT_TOL_MM_BINDING;
const V_TRANSMISSION = V_TRANSMISSION_BINDING;
const EXTENT_COS = EXTENT_COS_BINDING;
const FOUR_BAR_LENGTH_VARIABLES = FOUR_BAR_LENGTH_VARIABLES_BINDING;
const R1 = R1_BINDING;
const R2 = R2_BINDING;
const R3 = R3_BINDING;
const R4 = R4_BINDING;
const RCY = RCY_BINDING;
const THETA0 = THETA0_BINDING;
const X0 = X0_BINDING;
const Y0 = Y0_BINDING;
const OUT_MARGIN = OUT_MARGIN_BINDING;
const OUT_THETA2 = OUT_THETA2_BINDING;

const TAU = 2 * Math.PI;

const FIXED_NAMES = FOUR_BAR_FIXED_NAMES;
const FREE_NAMES = FOUR_BAR_FREE_NAMES;

/** Range of cos t over [a, b] into out[0] (min), out[1] (max). */
function cosRangeInto(a: number, b: number, out: Float64Array): void {
  if (!(b - a < TAU)) {
    out[0] = -1;
    out[1] = 1;
    return;
  }
  const ca = Math.cos(a);
  const cb = Math.cos(b);
  out[0] = Math.min(ca, cb);
  out[1] = Math.max(ca, cb);
  // An even multiple of π inside (a, b] reaches cos = 1, an odd one cos = −1 (the ends are counted above).
  if (Math.floor(b / TAU) > Math.floor(a / TAU)) out[1] = 1;
  if (Math.floor((b - Math.PI) / TAU) > Math.floor((a - Math.PI) / TAU)) out[0] = -1;
}

class ClosedFormCurve implements CurveEvaluator {
  readonly secondDerivatives = true;
  readonly p = new Float64Array(FOUR_BAR_LENGTH_VARIABLES);
  sign = 1;
  atIo(order: 0 | 1 | 2, io: Float64Array): void {
    // The coupler point's layout is the curve's (fourBarClosedForm.ts).
    fourBarCouplerPointIo(this.p, 0, this.sign, order, io);
  }
}

export function createFourBarLengths(placement: Placement, constraints: Constraints, frame: TargetFrame): MechanismEncoding {
  const free = placement === 'free';
  const names = free ? FREE_NAMES : FIXED_NAMES;
  const L = frame.size;
  const lower = new Float64Array(names.length);
  const upper = new Float64Array(names.length);
  if (free) {
    // Units of the ground link.
    lower.set([0.05, 0.05, 0.05, -3, -3]);
    upper.set([3, 3, 3, 3, 3]);
  } else {
    lower.set([0.05 * L, 0.05 * L, 0.05 * L, 0.05 * L, -3 * L, -3 * L, 0, frame.cx - 3 * L, frame.cy - 3 * L]);
    upper.set([3 * L, 3 * L, 3 * L, 3 * L, 3 * L, 3 * L, TAU, frame.cx + 3 * L, frame.cy + 3 * L]);
  }
  const branch: Branch = constraints.branch ?? 'open';
  const fullTurn = constraints.fullTurnCrank === true;
  const cosLimit = transmissionCosLimit(constraints.minTransmissionRad);
  const linkLimits = constraints.linkLengthMm;
  const keepOut = constraints.keepOut ?? [];
  const curve = new ClosedFormCurve();
  const p = curve.p;
  const range = new Float64Array(2);
  /** The crank violation before it is added to its slot. */
  const crank = new Float64Array(1);
  const joints = new Float64Array(8);
  /** The joints and the output point of one sample of a sweep (x, y pairs). */
  const extentPoints = new Float64Array(10);
  /** The crank angle into fourBarJointsIo and its margin out. */
  const jointsIo = new Float64Array(2);
  const sample = new Float64Array(CURVE_OUT_LENGTH);

  /** Adds the transmission violation for cos θ2 over [cmin, cmax]. */
  function transmissionOver(cmin: number, cmax: number, parts: Float64Array): void {
    if (cosLimit >= 1) return;
    const r1 = p[R1];
    const r2 = p[R2];
    const r3 = p[R3];
    const r4 = p[R4];
    // cos μ = (r3² + r4² − r1² − r2² + 2 r1 r2 cos θ2) / (2 r3 r4): monotone in cos θ2.
    const k = 2 * r3 * r4;
    const base = r3 * r3 + r4 * r4 - r1 * r1 - r2 * r2;
    const m1 = Math.abs((base + 2 * r1 * r2 * cmin) / k);
    const m2 = Math.abs((base + 2 * r1 * r2 * cmax) / k);
    const worst = Math.max(m1, m2);
    if (!(worst <= cosLimit)) parts[V_TRANSMISSION] += Number.isNaN(worst) ? 1 : worst - cosLimit;
  }

  const encoding: MechanismEncoding = {
    names,
    lower,
    upper,
    driverName: 'theta2',
    branchCount: branch === 'either' ? 2 : 1,
    curve,
    placementTurns: true,
    placeDesignInto(x: Float64Array, placement: Float64Array, lower: Float64Array, upper: Float64Array, into: Float64Array): void {
      // A free placement's variables are the shape alone, which a placement keeps.
      if (free) {
        for (let i = 0; i < names.length; i++) into[i] = x[i];
        return;
      }
      const a = placement[0];
      const b = placement[1];
      const scale = Math.sqrt(a * a + b * b);
      // Lengths and the coupler point (in the coupler's own frame) scale; the ground line turns.
      for (let i = R1; i <= RCY; i++) into[i] = scale * x[i];
      let theta = x[THETA0] + Math.atan2(b, a);
      if (theta > upper[THETA0]) theta -= TAU * Math.ceil((theta - upper[THETA0]) / TAU);
      if (theta < lower[THETA0]) theta += TAU * Math.ceil((lower[THETA0] - theta) / TAU);
      into[THETA0] = theta;
      into[X0] = a * x[X0] - b * x[Y0] + placement[2];
      into[Y0] = b * x[X0] + a * x[Y0] + placement[3];
    },
    load(x: Float64Array, k: number, parts: Float64Array): void {
      if (free) {
        p[R1] = 1;
        for (let i = 0; i < 5; i++) p[R2 + i] = x[i];
        p[THETA0] = 0;
        p[X0] = 0;
        p[Y0] = 0;
      } else {
        for (let i = 0; i < FOUR_BAR_LENGTH_VARIABLES; i++) p[i] = x[i];
      }
      curve.sign = branch === 'crossed' || (branch === 'either' && k === 1) ? -1 : 1;
      // A link of no length is no four-bar (the published boxes start at 0).
      for (let i = R1; i <= R4; i++) if (!(p[i] > 0)) parts[V_LINK_LENGTH] += 1;
      if (fullTurn) {
        // R1 … R4 are ground, crank, coupler, rocker in order, as crankViolationInto reads them.
        crankViolationInto(p, R1, false, crank, 0);
        parts[V_CRANK] += crank[0];
        transmissionOver(-1, 1, parts);
      }
    },
    motion(span: Float64Array, parts: Float64Array): void {
      // With a full turn required, Grashof's criterion (load) stands for the whole turn;
      // otherwise check the travel against the loop's closure condition, exactly.
      if (fullTurn) return;
      const a = span[0];
      const b = span[1];
      // The loop closes when |r3 − r4| ≤ |O4 − A| ≤ r3 + r4, |O4 − A|² = r1² + r2² − 2 r1 r2 cos θ2.
      const r1 = p[R1];
      const r2 = p[R2];
      const r3 = p[R3];
      const r4 = p[R4];
      cosRangeInto(a, b, range);
      const cmin = range[0];
      const cmax = range[1];
      const k = 2 * r1 * r2;
      const cLo = (r1 * r1 + r2 * r2 - (r3 + r4) * (r3 + r4)) / k;
      const cHi = (r1 * r1 + r2 * r2 - (r3 - r4) * (r3 - r4)) / k;
      let v = 0;
      if (cmin < cLo) v += cLo - cmin;
      if (cmax > cHi) v += cmax - cHi;
      if (!(v >= 0)) v = 1;
      parts[V_BRANCH] += v;
      transmissionOver(cmin, cmax, parts);
    },
    placed(placement: Float64Array, parts: Float64Array): void {
      // A link shorter than a linkage file allows once placed (a placement whose scale
      // collapsed to nothing, as where every target point is matched to one driver value):
      // no linkage to export or analyse, as infeasible as one that cannot be built (the
      // pose families' rule, poseFamilies.ts). A link of no length load charged already.
      const shortest = Math.min(p[R1], p[R2], p[R3], p[R4]);
      if (shortest > 0 && !(Math.sqrt(placement[0] * placement[0] + placement[1] * placement[1]) * shortest >= COINCIDENT_JOINT_TOL_MM)) parts[V_LINK_LENGTH] += 1;
      // Nothing else is read unless a limit asks for it: without link-length limits and
      // keep-outs (most problems) this allocates nothing, where Math.hypot allocates its
      // answer in V8, and so may a double in a local of code that is not optimised yet.
      if (linkLimits !== undefined) {
        const scale = Math.hypot(placement[0], placement[1]);
        const lo = linkLimits[0];
        const hi = linkLimits[1];
        for (let i = R1; i <= R4; i++) parts[V_LINK_LENGTH] += lengthViolation(scale * p[i], lo, hi);
      }
      if (keepOut.length > 0) {
        const sa = placement[0];
        const sb = placement[1];
        const tx = placement[2];
        const ty = placement[3];
        fourBarJointsInto(p, 0, 0, curve.sign, joints);
        for (let j = 0; j < 8; j += 6) {
          const x = sa * joints[j] - sb * joints[j + 1] + tx;
          const y = sb * joints[j] + sa * joints[j + 1] + ty;
          for (let q = 0; q < keepOut.length; q++) {
            const c = keepOut[q];
            const d = Math.hypot(x - c.x, y - c.y);
            if (!(d >= c.r)) parts[V_KEEP_OUT] += Number.isNaN(d) ? 1 : (c.r - d) / c.r;
          }
        }
      }
    },
    sweepExtent(from: number, to: number, steps: number, placement: Float64Array, out: Float64Array): number {
      resetExtent(out);
      const r1 = p[R1];
      const r2 = p[R2];
      const r3 = p[R3];
      const r4 = p[R4];
      let failed = 0;
      for (let k = 0; k <= steps; k++) {
        const t = from + ((to - from) * k) / steps;
        // As fourBarJointsInto, with t passed in arrays: this loop allocates nothing
        // whether or not the compiler inlines those wrappers here.
        sample[OUT_THETA2] = t;
        fourBarCouplerPointIo(p, 0, curve.sign, 0, sample);
        if (!(sample[OUT_MARGIN] >= 0)) {
          failed++;
          continue;
        }
        // The four joints, then the output point: into the extent in that order, through an array.
        jointsIo[0] = t;
        fourBarJointsIo(p, 0, curve.sign, jointsIo, extentPoints);
        extentPoints[8] = sample[0];
        extentPoints[9] = sample[1];
        addPointsToExtent(extentPoints, 5, placement, out);
        // cos μ in closed form, as transmissionOver above.
        const c = Math.abs((r3 * r3 + r4 * r4 - r1 * r1 - r2 * r2 + 2 * r1 * r2 * Math.cos(t)) / (2 * r3 * r4));
        if (!(c <= out[EXTENT_COS])) out[EXTENT_COS] = Number.isNaN(c) ? 1 : c;
      }
      return failed;
    },
    verify(): void {
      // Everything above is exact already: Grashof's sum and the loop's closure condition.
    },
    cannotTurn(): boolean {
      // The closure condition of motion over the whole range of cos θ2, as motion reads it:
      // spans that cover a turn reach cos θ2 = −1 and 1 exactly (cosRangeInto).
      const r1 = p[R1];
      const r2 = p[R2];
      const r3 = p[R3];
      const r4 = p[R4];
      const k = 2 * r1 * r2;
      const cLo = (r1 * r1 + r2 * r2 - (r3 + r4) * (r3 + r4)) / k;
      const cHi = (r1 * r1 + r2 * r2 - (r3 - r4) * (r3 - r4)) / k;
      return !(cLo <= -1 && cHi >= 1);
    },
    report(t: number, sa: number, sb: number, tx: number, ty: number): EncodingReport {
      fourBarJointsInto(p, 0, t, curve.sign, joints);
      const point = new Float64Array(CURVE_OUT_LENGTH);
      fourBarCouplerPointInto(p, 0, t, curve.sign, 0, point);
      const place = (x: number, y: number) => ({ x: sa * x - sb * y + tx, y: sb * x + sa * y + ty });
      const linkage = fourBar({
        A0: place(joints[0], joints[1]),
        A: place(joints[2], joints[3]),
        B: place(joints[4], joints[5]),
        B0: place(joints[6], joints[7]),
        P: place(point[0], point[1]),
      });
      const scale = Math.hypot(sa, sb);
      let grashof: EncodingReport['grashof'];
      try {
        grashof = classifyFourBar(scale * p[R1], scale * p[R2], scale * p[R3], scale * p[R4]);
      } catch {
        grashof = undefined;
      }
      return {
        linkage,
        drawnAt: t,
        ...(grashof === undefined ? {} : { grashof }),
        turnsFully: inputTurnsFully(p[R1], p[R2], p[R3], p[R4]),
      };
    },
  };
  return encoding;
}
