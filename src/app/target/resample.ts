/**
 * Resampling a target path to N points evenly spaced along its length (open: from the
 * first point to the last; closed: round the loop, the closing segment included). A
 * prescribed crank angle per point is carried along by linear interpolation over arc
 * length, with each step between neighbours taken the short way round (within ±180°);
 * weights, when the points have them, are interpolated the same way.
 */
import type { TargetPoint } from '../state/project';

export const MIN_RESAMPLE_POINTS = 3;
export const MAX_RESAMPLE_POINTS = 2000;
/** A path shorter than this (mm) has no length to spread points over. */
export const MIN_PATH_LENGTH_MM = 1e-6;

export type ResampleResult = { readonly ok: true; readonly points: TargetPoint[] } | { readonly ok: false; readonly reason: string };

/** Differences of consecutive angles brought into (−180°, 180°], accumulated: an unwrapped sequence. */
function unwrapDeg(values: readonly number[]): number[] {
  const out = [values[0]];
  for (let i = 1; i < values.length; i++) {
    let step = (values[i] - values[i - 1]) % 360;
    if (step > 180) step -= 360;
    if (step <= -180) step += 360;
    out.push(out[i - 1] + step);
  }
  return out;
}

export function resamplePath(points: readonly TargetPoint[], closed: boolean, count: number): ResampleResult {
  if (!(Number.isInteger(count) && count >= MIN_RESAMPLE_POINTS && count <= MAX_RESAMPLE_POINTS)) {
    return { ok: false, reason: `the number of points is ${count}; expected a whole number from ${MIN_RESAMPLE_POINTS} to ${MAX_RESAMPLE_POINTS}` };
  }
  if (points.length < 2) return { ok: false, reason: `the path has ${points.length} point${points.length === 1 ? '' : 's'}; resampling needs at least 2` };

  const vertices = closed ? [...points, points[0]] : [...points];
  const withAngles = points.every((p) => p.driverDeg !== null);
  let angles: number[] | null = null;
  if (withAngles) {
    const unwrapped = unwrapDeg(points.map((p) => p.driverDeg as number));
    if (closed) {
      // Closing the loop brings the crank back to the first angle plus a whole turn in the direction it was going.
      const direction = unwrapped[unwrapped.length - 1] >= unwrapped[0] ? 1 : -1;
      unwrapped.push(unwrapped[0] + 360 * direction);
    }
    angles = unwrapped;
  }
  // Weights are carried like the angles: linear in arc length, the closing vertex taking the first point's.
  const weighted = points.every((p) => p.weight !== undefined);
  const weights = weighted ? vertices.map((p) => p.weight as number) : null;
  const cumulative = [0];
  for (let i = 1; i < vertices.length; i++) {
    cumulative.push(cumulative[i - 1] + Math.hypot(vertices[i].x - vertices[i - 1].x, vertices[i].y - vertices[i - 1].y));
  }
  const total = cumulative[cumulative.length - 1];
  if (!(total > MIN_PATH_LENGTH_MM)) return { ok: false, reason: 'the path has no length: all its points are in one place' };

  // Closed: N points split the loop into N equal arcs; open: N points include both ends.
  const spacing = closed ? total / count : total / (count - 1);
  const out: TargetPoint[] = [];
  let segment = 0;
  for (let k = 0; k < count; k++) {
    const s = Math.min(k * spacing, total);
    while (segment < vertices.length - 2 && cumulative[segment + 1] < s) segment++;
    const length = cumulative[segment + 1] - cumulative[segment];
    const t = length > 0 ? (s - cumulative[segment]) / length : 0;
    const a = vertices[segment];
    const b = vertices[segment + 1];
    const driverDeg = angles === null ? null : angles[segment] + t * (angles[segment + 1] - angles[segment]);
    const at = { x: a.x + t * (b.x - a.x), y: a.y + t * (b.y - a.y), driverDeg };
    out.push(weights === null ? at : { ...at, weight: weights[segment] + t * (weights[segment + 1] - weights[segment]) });
  }
  return { ok: true, points: out };
}
