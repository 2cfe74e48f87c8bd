/**
 * Whether the input link of a four-bar turns fully relative to ground, exactly, from
 * Grashof's criterion (Grashof, 1883; as stated by Chang, Lin and Wu, "A note on
 * Grashof's theorem", J. Marine Sci. Technol. 13(4), 2005): with s the shortest link, l
 * the longest and p, q the others, the shortest link turns fully relative to every other
 * link when s + l < p + q. On the boundary s + l = p + q (a change point) the linkage
 * reaches a flat pose where its motion may change branch: that is not a full turn.
 */
import { CHANGE_POINT_REL_TOL as CHANGE_POINT_REL_TOL_BINDING } from '../linkage/analysis/grashof';

const CHANGE_POINT_REL_TOL = CHANGE_POINT_REL_TOL_BINDING;

/**
 * The change-point band of four lengths, in their unit (mm): |s + l − p − q| within it is
 * a change point. The analysis classifier's own band (CHANGE_POINT_REL_TOL of the sum of
 * the lengths), so a design the search calls Grashof, `loci analyze` calls Grashof too.
 */
export function changePointBand(a: number, b: number, c: number, d: number): number {
  return CHANGE_POINT_REL_TOL * (a + b + c + d);
}

/** s + l − p − q of four lengths (negative: Grashof). */
export function grashofExcess(a: number, b: number, c: number, d: number): number {
  const s = Math.min(a, b, c, d);
  const l = Math.max(a, b, c, d);
  return s + l - (a + b + c + d - s - l);
}

/** The input turns fully relative to ground: Grashof beyond the change-point band, with the input or the ground shortest. */
export function inputTurnsFully(ground: number, input: number, coupler: number, output: number): boolean {
  if (!(ground > 0 && input > 0 && coupler > 0 && output > 0)) return false;
  const excess = grashofExcess(ground, input, coupler, output);
  return excess < -changePointBand(ground, input, coupler, output) && Math.min(ground, input) <= Math.min(coupler, output);
}

/**
 * How far a four-bar is from a full turn of its input, normalised by the longest link
 * (0: it turns fully). `groundMayBeShortest`: a double crank (ground shortest) counts as
 * turning; without it the input must be the shortest link (the benchmark papers'
 * "Grashof with the crank shortest"). A design inside the change-point band is a change
 * point and counts against a full turn, however little.
 */
export function crankViolation(
  ground: number,
  input: number,
  coupler: number,
  output: number,
  groundMayBeShortest = false,
): number {
  const l = Math.max(ground, input, coupler, output);
  const shortestOther = groundMayBeShortest ? Math.min(coupler, output) : Math.min(ground, coupler, output);
  const driven = groundMayBeShortest ? Math.min(ground, input) : input;
  let v = 0;
  if (driven > shortestOther) v += (driven - shortestOther) / l;
  const excess = grashofExcess(ground, input, coupler, output) + changePointBand(ground, input, coupler, output);
  // On the band's edge itself the design is a change point: count it, however little.
  if (!(excess < 0)) v += excess / l + CHANGE_POINT_REL_TOL;
  return v >= 0 ? v : 1;
}
