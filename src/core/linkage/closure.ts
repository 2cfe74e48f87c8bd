/**
 * The verifier: how far a pose is from meeting every constraint of the linkage (body
 * distances and body-local positions, frame positions, slider lines), in mm. A driver
 * value is not a constraint of the pose alone, so the driver is not checked here.
 */
import { EQ_DIST, EQ_FIXED, EQ_RIGID, EQ_SLIDER_BODY, EQ_SLIDER_GROUND, EQ_STRIDE, type Plan, type PlanInternal } from './plan';

/** Largest constraint violation (mm) of pose; Infinity when a number is not finite. */
export function closureResidualMm(plan: Plan, pose: Float64Array): number {
  const p = plan as PlanInternal;
  if (pose.length !== 2 * p.slotCount) {
    throw new RangeError(`closureResidualMm: pose has ${pose.length} numbers; expected ${2 * p.slotCount} (2 × ${p.slotCount} slots)`);
  }
  const eqs = p.checks;
  const params = p.params;
  let worst = 0;
  for (let e = 0, end = p.checkCount * EQ_STRIDE; e < end; e += EQ_STRIDE) {
    const s0 = eqs[e + 1];
    const s1 = eqs[e + 2];
    const s2 = eqs[e + 3];
    const q = eqs[e + 4];
    let violation = 0;
    switch (eqs[e]) {
      case EQ_DIST:
        violation = Math.abs(Math.hypot(pose[s1] - pose[s0], pose[s1 + 1] - pose[s0 + 1]) - params[q]);
        break;
      case EQ_RIGID: {
        const u = params[q];
        const v = params[q + 1];
        const wx = pose[s1] - pose[s0];
        const wy = pose[s1 + 1] - pose[s0 + 1];
        violation = Math.hypot(pose[s2] - (pose[s0] + u * wx - v * wy), pose[s2 + 1] - (pose[s0 + 1] + u * wy + v * wx));
        break;
      }
      case EQ_SLIDER_GROUND:
        violation = Math.abs(params[q + 2] * (pose[s0 + 1] - params[q + 1]) - params[q + 3] * (pose[s0] - params[q]));
        break;
      case EQ_SLIDER_BODY: {
        const wx = pose[s2] - pose[s1];
        const wy = pose[s2 + 1] - pose[s1 + 1];
        const u = params[q];
        const v = params[q + 1];
        const dx = params[q + 2] * wx - params[q + 3] * wy;
        const dy = params[q + 2] * wy + params[q + 3] * wx;
        const rx = pose[s0] - (pose[s1] + u * wx - v * wy);
        const ry = pose[s0 + 1] - (pose[s1 + 1] + u * wy + v * wx);
        violation = Math.abs(dx * ry - dy * rx) / Math.hypot(dx, dy);
        break;
      }
      case EQ_FIXED:
        violation = Math.hypot(pose[s0] - params[q], pose[s0 + 1] - params[q + 1]);
        break;
    }
    if (!Number.isFinite(violation)) return Infinity;
    if (violation > worst) worst = violation;
  }
  return worst;
}
