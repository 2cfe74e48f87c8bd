/**
 * The transmission angle of a four-bar loop: the angle μ at the coupler–output joint
 * between the coupler and the output link (Balli and Chand, "Transmission angle in
 * mechanisms", Mech. Mach. Theory 37, 2002). Force passes best at 90°; the common
 * guideline keeps 40° ≤ μ ≤ 140° (common practice).
 */
import type { FourBarLoop } from './loops';
import type { SweepResult } from '../sweep';

/**
 * μ in [0, π] at `pose`: the angle at `loop.joints[2]` between the coupler (towards
 * `joints[1]`) and the output link (towards `joints[3]`). NaN when those joints are not
 * solved in the pose or a link has no length there.
 */
export function transmissionAngleRad(loop: Pick<FourBarLoop, 'joints'>, pose: Float64Array): number {
  return angleAtRad(loop.joints, pose, 0);
}

/** μ for the pose stored from `offset` in `poses` (a sweep's poses, without a subarray per step). */
function angleAtRad(joints: FourBarLoop['joints'], poses: Float64Array, offset: number): number {
  const tipIn = offset + 2 * joints[1];
  const tipOut = offset + 2 * joints[2];
  const pivotOut = offset + 2 * joints[3];
  const cx = poses[tipIn] - poses[tipOut];
  const cy = poses[tipIn + 1] - poses[tipOut + 1];
  const ox = poses[pivotOut] - poses[tipOut];
  const oy = poses[pivotOut + 1] - poses[tipOut + 1];
  const cross = cx * oy - cy * ox;
  const dot = cx * ox + cy * oy;
  // atan2 of |cross| and dot keeps full precision near 0 and π, where acos does not.
  if (!(Math.abs(cross) + Math.abs(dot) > 0)) return Number.NaN;
  return Math.atan2(Math.abs(cross), dot);
}

export type TransmissionRange =
  | {
      readonly ok: true;
      readonly minRad: number;
      readonly maxRad: number;
      /** Driver values where μ is least and greatest. */
      readonly minAt: number;
      readonly maxAt: number;
      /** The least of min(μ, π − μ) over the sweep: the figure the 40° guideline bounds. */
      readonly worstRad: number;
      readonly worstAt: number;
      /** Poses that assembled and were measured. */
      readonly samples: number;
    }
  | { readonly ok: false; readonly reason: string };

/** The range of μ over the assembled poses of a sweep. */
export function transmissionAngleRange(
  loop: Pick<FourBarLoop, 'joints'>,
  sweep: Pick<SweepResult, 'values' | 'poses' | 'assembled'>,
): TransmissionRange {
  const steps = sweep.values.length;
  const stride = steps > 0 ? sweep.poses.length / steps : 0;
  if (!(steps > 0 && Number.isInteger(stride) && stride > 0 && sweep.assembled.length === steps)) {
    throw new RangeError(
      `transmissionAngleRange: sweep has ${steps} values, ${sweep.poses.length} pose numbers and ` +
        `${sweep.assembled.length} assembly flags; expected one pose of equal length and one flag per value`,
    );
  }
  let minRad = Infinity;
  let maxRad = -Infinity;
  let worstRad = Infinity;
  let minAt = Number.NaN;
  let maxAt = Number.NaN;
  let worstAt = Number.NaN;
  let samples = 0;
  for (let k = 0; k < steps; k++) {
    if (sweep.assembled[k] !== 1) continue;
    const mu = angleAtRad(loop.joints, sweep.poses, k * stride);
    if (!(mu >= 0)) continue;
    samples++;
    const value = sweep.values[k];
    if (mu < minRad) { minRad = mu; minAt = value; }
    if (mu > maxRad) { maxRad = mu; maxAt = value; }
    const worst = Math.min(mu, Math.PI - mu);
    if (worst < worstRad) { worstRad = worst; worstAt = value; }
  }
  if (samples === 0) return { ok: false, reason: 'no pose of the sweep assembled, so there is no transmission angle to measure' };
  return { ok: true, minRad, maxRad, minAt, maxAt, worstRad, worstAt, samples };
}
