/**
 * Sprockets and the chain's upper run. Allocation-free scalar helpers for the metrics loop.
 *
 * The upper run is the external tangent over the tops of the cog (centre at the rear
 * axle) and the chainring (centre at the bottom bracket), both at their pitch circles.
 */

/** ISO 606 pitch circle: radius of a sprocket of `teeth` teeth for chain pitch `pitchMm`, r = p / (2 sin(180°/z)). */
export function pitchRadiusMm(teeth: number, pitchMm: number): number {
  return pitchMm / (2 * Math.sin(Math.PI / teeth));
}

/** Slots of the array written by `upperRunInto`. */
export const RUN_LENGTH_MM = 0;
/** Angle (rad, CCW from +x) of the run's unit normal pointing away from both centres: the tangent points are centre + r·normal. */
export const RUN_NORMAL_RAD = 1;
export const RUN_NX = 2;
export const RUN_NY = 3;
/** The line's offset: the run is {X : n·X = c}. */
export const RUN_OFFSET_MM = 4;
export const RUN_SCRATCH_LENGTH = 5;

/**
 * The upper run from a cog (centre a, pitch radius rCog) forward to the chainring
 * (centre b, radius rRing): its tangent length and unit normal. False (out untouched)
 * when the sprockets overlap, where no chain line exists.
 */
export function upperRunInto(
  ax: number, ay: number, rCog: number,
  bx: number, by: number, rRing: number,
  out: Float64Array,
): boolean {
  const dx = bx - ax;
  const dy = by - ay;
  const d = Math.hypot(dx, dy);
  if (!(d > rCog + rRing)) return false;
  const ux = dx / d;
  const uy = dy / d;
  // n = cos β u⊥ + sin β u with n·(b − a) = rCog − rRing, u⊥ = u turned +90° (up for a forward u).
  const sinB = (rCog - rRing) / d;
  const cosB = Math.sqrt(1 - sinB * sinB);
  const nx = -uy * cosB + ux * sinB;
  const ny = ux * cosB + uy * sinB;
  out[RUN_LENGTH_MM] = d * cosB;
  out[RUN_NORMAL_RAD] = Math.atan2(ny, nx);
  out[RUN_NX] = nx;
  out[RUN_NY] = ny;
  out[RUN_OFFSET_MM] = nx * ax + ny * ay + rCog;
  return true;
}

/**
 * The upper run's path length between a mark on the chainring and a mark on the cog,
 * up to a constant: tangent length plus the wrap term (rRing − rCog)·ψ, ψ the normal's
 * angle. The chain wraps the front of the chainring and the back of the cog, so a turn
 * of the normal by δψ adds rRing·δψ of wrap on the chainring and takes rCog·δψ off
 * the cog.
 */
export function wrappedRunLengthMm(run: Float64Array, rCog: number, rRing: number): number {
  return run[RUN_LENGTH_MM] + (rRing - rCog) * run[RUN_NORMAL_RAD];
}
