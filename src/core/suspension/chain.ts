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

/** Slots of the array written by `upperRunInto` and `upperRunAlongInto`. The tangent length: */
export const RUN_LENGTH_MM = 0;
/** The run's unit normal n pointing away from both centres: the tangent points are centre + r·n. */
export const RUN_NX = 1;
export const RUN_NY = 2;
/** The line's offset: the run is {X : n·X = c}. */
export const RUN_OFFSET_MM = 3;
/** sin and cos of the normal's tilt β from u⊥ (u the unit vector from the cog to the chainring): sin β = (rCog − rRing) / d. */
export const RUN_SIN_TILT = 4;
export const RUN_COS_TILT = 5;
export const RUN_SCRATCH_LENGTH = 6;

/**
 * asin(z) for |z| below this by its Maclaurin series to z¹¹: the next term,
 * 231/13312 · z¹³, is below 1e-19 of z there.
 */
const ASIN_SERIES_MAX = 0.03;

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
  upperRunAlongInto(ax, ay, dx / d, dy / d, d, rCog, rRing, out);
  return true;
}

/**
 * upperRunInto with the centre line given, u = (b − a) / d and d = |b − a| > rCog + rRing
 * (the caller checks): what the cogs on one axle share is found once.
 */
export function upperRunAlongInto(ax: number, ay: number, ux: number, uy: number, d: number, rCog: number, rRing: number, out: Float64Array): void {
  // n = cos β u⊥ + sin β u with n·(b − a) = rCog − rRing, u⊥ = u turned +90° (up for a forward u).
  const sinB = (rCog - rRing) / d;
  const cosB = Math.sqrt(1 - sinB * sinB);
  const nx = -uy * cosB + ux * sinB;
  const ny = ux * cosB + uy * sinB;
  out[RUN_LENGTH_MM] = d * cosB;
  out[RUN_NX] = nx;
  out[RUN_NY] = ny;
  out[RUN_OFFSET_MM] = nx * ax + ny * ay + rCog;
  out[RUN_SIN_TILT] = sinB;
  out[RUN_COS_TILT] = cosB;
}

/**
 * The change of the upper run's path length between a mark on the chainring and a mark
 * on the cog, from a reference run (its tangent length, sin and cos of its tilt, and its
 * normal's angle in (−π, π]) to `run`, both from upperRunAlongInto, when the centre line
 * has turned by dThetaRad between them. The path is the tangent length plus the wrap
 * term (rRing − rCog)·ψ, ψ the normal's angle in (−π, π]: the chain wraps the front of
 * the chainring and the back of the cog, so a turn of the normal by δψ adds rRing·δψ of
 * wrap on the chainring and takes rCog·δψ off the cog. ψ is found without an angle per
 * cog: ψ = θ + π/2 − β, so ψ ≡ ψ0 + Δθ − Δβ (mod 2π), and for tilts of one sign
 * asin(s) − asin(s0) = asin(s·cos β0 − s0·cos β).
 */
export function wrappedRunGrowthMm(
  run: Float64Array, len0Mm: number, sinTilt0: number, cosTilt0: number, normal0Rad: number, dThetaRad: number, rCog: number, rRing: number,
): number {
  const z = run[RUN_SIN_TILT] * cosTilt0 - sinTilt0 * run[RUN_COS_TILT];
  let psi = normal0Rad + dThetaRad - asinSmall(z);
  // Into (−π, π], as atan2 gives the angle: ψ0 and Δθ lie there and |Δβ| < π/2, so one turn at most.
  if (psi > Math.PI) psi -= 2 * Math.PI;
  else if (psi <= -Math.PI) psi += 2 * Math.PI;
  return run[RUN_LENGTH_MM] - len0Mm + (rRing - rCog) * (psi - normal0Rad);
}

/** asin, by its series where |z| is small (the tilt changes little over the travel), else Math.asin. */
function asinSmall(z: number): number {
  if (!(Math.abs(z) < ASIN_SERIES_MAX)) return Math.asin(z);
  const z2 = z * z;
  return z * (1 + z2 * (1 / 6 + z2 * (3 / 40 + z2 * (5 / 112 + z2 * (35 / 1152 + z2 * (63 / 2816))))));
}
