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

/** Scratch of the scalar entries below: four lengths, then what grashofInto writes. */
const scratch = new Float64Array(6);
/** Where grashofInto writes: s + l − p − q, then the change-point band. */
const EXCESS = 4;
const BAND = 5;
/** What crankViolationInto's grashofInto writes (slots EXCESS, BAND). */
const figures = new Float64Array(6);

/**
 * For the four lengths at lengths[offset …], in their unit (mm): s + l − p − q
 * (negative: Grashof) into out[EXCESS], and the change-point band into out[BAND]:
 * |s + l − p − q| within it is a change point. The band is the analysis classifier's own
 * (CHANGE_POINT_REL_TOL of the sum of the lengths), so a design the search calls
 * Grashof, `loci analyze` calls Grashof too. Lengths in and figures out through arrays:
 * a double passed to or returned from a call that is not inlined is boxed (an allocation).
 */
function grashofInto(lengths: Float64Array, offset: number, out: Float64Array): void {
  const a = lengths[offset];
  const b = lengths[offset + 1];
  const c = lengths[offset + 2];
  const d = lengths[offset + 3];
  const s = Math.min(a, b, c, d);
  const l = Math.max(a, b, c, d);
  out[EXCESS] = s + l - (a + b + c + d - s - l);
  out[BAND] = CHANGE_POINT_REL_TOL * (a + b + c + d);
}

/** The input turns fully relative to ground: Grashof beyond the change-point band, with the input or the ground shortest. */
export function inputTurnsFully(ground: number, input: number, coupler: number, output: number): boolean {
  if (!(ground > 0 && input > 0 && coupler > 0 && output > 0)) return false;
  scratch[0] = ground;
  scratch[1] = input;
  scratch[2] = coupler;
  scratch[3] = output;
  grashofInto(scratch, 0, scratch);
  return scratch[EXCESS] < -scratch[BAND] && Math.min(ground, input) <= Math.min(coupler, output);
}

/**
 * How far a four-bar is from a full turn of its input, normalised by the longest link
 * (0: it turns fully), for the lengths ground, input, coupler, output at
 * lengths[offset …], into out[index]. `groundMayBeShortest`: a double crank (ground
 * shortest) counts as turning; without it the input must be the shortest link (the
 * benchmark papers' "Grashof with the crank shortest"). A design inside the change-point
 * band is a change point and counts against a full turn, however little.
 */
export function crankViolationInto(lengths: Float64Array, offset: number, groundMayBeShortest: boolean, out: Float64Array, index: number): void {
  const ground = lengths[offset];
  const input = lengths[offset + 1];
  const coupler = lengths[offset + 2];
  const output = lengths[offset + 3];
  const l = Math.max(ground, input, coupler, output);
  const shortestOther = groundMayBeShortest ? Math.min(coupler, output) : Math.min(ground, coupler, output);
  const driven = groundMayBeShortest ? Math.min(ground, input) : input;
  let v = 0;
  if (driven > shortestOther) v += (driven - shortestOther) / l;
  grashofInto(lengths, offset, figures);
  const excess = figures[EXCESS] + figures[BAND];
  // On the band's edge itself the design is a change point: count it, however little.
  if (!(excess < 0)) v += excess / l + CHANGE_POINT_REL_TOL;
  out[index] = v >= 0 ? v : 1;
}

/**
 * crankViolationInto of four lengths given one by one, returned. Where a double must not
 * cross an uninlined call (an evaluation's loop), pass the lengths in an array instead.
 */
export function crankViolation(ground: number, input: number, coupler: number, output: number, groundMayBeShortest = false): number {
  scratch[0] = ground;
  scratch[1] = input;
  scratch[2] = coupler;
  scratch[3] = output;
  crankViolationInto(scratch, 0, groundMayBeShortest, scratch, EXCESS);
  return scratch[EXCESS];
}
