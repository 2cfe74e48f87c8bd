/**
 * Grashof's criterion and Barker's complete classification of the planar four-bar
 * (Barker, "A complete classification of planar four-bar linkages", Mech. Mach.
 * Theory 20(6), 1985).
 *
 * With s the shortest link, l the longest and p, q the others (Grashof 1883; as
 * stated by Chang, Lin and Wu, "A note on Grashof's theorem", J. Marine Sci.
 * Technol. 13(4), 2005):
 *   s + l < p + q  Grashof: the shortest link turns fully relative to every other link;
 *   s + l > p + q  non-Grashof: no link turns fully relative to another;
 *   s + l = p + q  change point: the linkage can pass through a flat (all-collinear) pose.
 *
 * Barker's fourteen types, over (ground g, input a, coupler b, output c). The numbering
 * and the codes are from memory (Barker 1985, as tabulated in Norton, Design of
 * Machinery). The sign columns are of the characteristic sums T1 = g + c − a − b,
 * T2 = g + b − a − c, T3 = b + c − a − g as defined here; texts define the T's
 * differently, so their sign rows differ, but the link each row names does not. In a
 * Grashof linkage every pairing that holds the shortest link is the smaller sum, so the
 * signs of (T1, T2, T3) say which link is shortest; in a non-Grashof linkage every
 * pairing that holds the longest link is the larger, so the signs say which link is
 * longest. The non-Grashof types are numbered by the longest link in Barker's order
 * (ground, input, coupler, output):
 *
 *   type code  T1 T2 T3  condition      which link              usual name
 *    1   GCCC   −  −  +  Grashof        shortest: ground        double crank (drag link)
 *    2   GCRR   +  +  +  Grashof        shortest: input         crank-rocker
 *    3   GRCR   +  −  −  Grashof        shortest: coupler       double rocker, coupler turns fully
 *    4   GRRC   −  +  −  Grashof        shortest: output        rocker-crank
 *    5   RRR1   +  +  −  non-Grashof    longest: ground         triple rocker
 *    6   RRR2   −  −  −  non-Grashof    longest: input          triple rocker
 *    7   RRR3   −  +  +  non-Grashof    longest: coupler        triple rocker
 *    8   RRR4   +  −  +  non-Grashof    longest: output         triple rocker
 *    9   SCCC   one is 0 change point   shortest: ground        change-point double crank
 *   10   SCRR   one is 0 change point   shortest: input         change-point crank-rocker
 *   11   SRCR   one is 0 change point   shortest: coupler       change-point double rocker
 *   12   SRRC   one is 0 change point   shortest: output        change-point rocker-crank
 *   13   S2X    two are 0               two pairs of equal links  double change point
 *   14   S3X    all are 0               all links equal           triple change point
 *
 * The three letters after G (or S) are the motion of input, coupler and output relative
 * to ground (C turns fully, R rocks). Some texts print the change-point codes without the
 * leading S (CCC, CRR, RCR, RRC); that too is from memory.
 */

export type GrashofCondition = 'grashof' | 'non-grashof' | 'change-point';

export type BarkerType = 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9 | 10 | 11 | 12 | 13 | 14;

export interface FourBarClass {
  readonly grashof: GrashofCondition;
  readonly barkerType: BarkerType;
  /** Barker's code, such as `GCRR` (from memory). */
  readonly code: string;
  /** The usual name, such as `crank-rocker`. */
  readonly name: string;
  /** s + l − p − q, mm: negative for Grashof, positive for non-Grashof. */
  readonly slMinusPq: number;
}

/**
 * Relative tolerance (dimensionless, a share of s + l + p + q) within which two sums of
 * link lengths count as equal: the change-point boundary s + l = p + q and the equal
 * links of the double and triple change points. Optimised designs tend to sit on the
 * Grashof boundary, where rounding alone must not decide the class; 1e-9 of the total
 * length is far above double-precision rounding of lengths computed from positions
 * (about 1e-15) and far below any manufacturing tolerance.
 */
export const CHANGE_POINT_REL_TOL = 1e-9;

/** Link positions in Barker's order. */
const GROUND = 0;
const INPUT = 1;
const COUPLER = 2;
const OUTPUT = 3;

interface TypeRow {
  readonly barkerType: BarkerType;
  readonly code: string;
  readonly name: string;
}

/** Grashof types indexed by the shortest link. */
const GRASHOF_BY_SHORTEST: readonly TypeRow[] = [
  { barkerType: 1, code: 'GCCC', name: 'double crank (drag link)' },
  { barkerType: 2, code: 'GCRR', name: 'crank-rocker' },
  { barkerType: 3, code: 'GRCR', name: 'double rocker (coupler turns fully)' },
  { barkerType: 4, code: 'GRRC', name: 'rocker-crank' },
];

/** Non-Grashof types indexed by the longest link. */
const NON_GRASHOF_BY_LONGEST: readonly TypeRow[] = [
  { barkerType: 5, code: 'RRR1', name: 'triple rocker (ground longest)' },
  { barkerType: 6, code: 'RRR2', name: 'triple rocker (input longest)' },
  { barkerType: 7, code: 'RRR3', name: 'triple rocker (coupler longest)' },
  { barkerType: 8, code: 'RRR4', name: 'triple rocker (output longest)' },
];

/** Single change-point types indexed by the shortest link. */
const CHANGE_POINT_BY_SHORTEST: readonly TypeRow[] = [
  { barkerType: 9, code: 'SCCC', name: 'change-point double crank' },
  { barkerType: 10, code: 'SCRR', name: 'change-point crank-rocker' },
  { barkerType: 11, code: 'SRCR', name: 'change-point double rocker' },
  { barkerType: 12, code: 'SRRC', name: 'change-point rocker-crank' },
];

/**
 * Barker's class of a four-bar from its link lengths (mm, or any one unit): ground
 * (the frame, between the two ground pivots), input (the driven link), coupler, output.
 * Throws a RangeError when a length is not a finite number > 0 or `relTol` is not in
 * [0, 0.1): the lengths of a compiled plan always are.
 */
export function classifyFourBar(
  ground: number,
  input: number,
  coupler: number,
  output: number,
  relTol: number = CHANGE_POINT_REL_TOL,
): FourBarClass {
  const lengths = [ground, input, coupler, output];
  const names = ['ground', 'input', 'coupler', 'output'];
  for (let i = 0; i < 4; i++) {
    const v = lengths[i];
    if (!(Number.isFinite(v) && v > 0)) {
      throw new RangeError(`classifyFourBar: ${names[i]} length is ${v}; expected a finite length > 0`);
    }
  }
  if (!(relTol >= 0 && relTol < 0.1)) {
    throw new RangeError(`classifyFourBar: relTol is ${relTol}; expected a relative tolerance in [0, 0.1)`);
  }
  return classifyLengths(ground, input, coupler, output, relTol);
}

/**
 * The classification without argument checks, for lengths already known to be finite
 * and non-negative (the loops of a plan).
 */
export function classifyLengths(
  ground: number,
  input: number,
  coupler: number,
  output: number,
  relTol: number,
): FourBarClass {
  const lengths = [ground, input, coupler, output];
  let shortest = GROUND;
  let longest = GROUND;
  for (let i = 1; i < 4; i++) {
    if (lengths[i] < lengths[shortest]) shortest = i;
    if (lengths[i] > lengths[longest]) longest = i;
  }
  const s = lengths[shortest];
  const l = lengths[longest];
  const total = ground + input + coupler + output;
  const pq = total - s - l;
  const slMinusPq = s + l - pq;
  const tolMm = relTol * total;

  if (slMinusPq < -tolMm) {
    return { grashof: 'grashof', slMinusPq, ...GRASHOF_BY_SHORTEST[shortest] };
  }
  if (slMinusPq > tolMm) {
    return { grashof: 'non-grashof', slMinusPq, ...NON_GRASHOF_BY_LONGEST[longest] };
  }
  if (l - s <= tolMm) {
    return {
      grashof: 'change-point', slMinusPq, barkerType: 14, code: 'S3X',
      name: 'triple change point (all links equal: rhombus or square)',
    };
  }
  // On the boundary, s = p forces l = q: the double change point. Either equality
  // within tolerance decides it, so that a single change point has a clear shortest link.
  const p = secondSmallest(lengths, shortest);
  const q = pq - p;
  if (p - s <= tolMm || l - q <= tolMm) {
    return {
      grashof: 'change-point', slMinusPq, barkerType: 13, code: 'S2X',
      name: doubleChangePointName(lengths, tolMm),
    };
  }
  return { grashof: 'change-point', slMinusPq, ...CHANGE_POINT_BY_SHORTEST[shortest] };
}

function secondSmallest(lengths: readonly number[], shortest: number): number {
  let best = Infinity;
  for (let i = 0; i < 4; i++) {
    if (i !== shortest && lengths[i] < best) best = lengths[i];
  }
  return best;
}

/**
 * Equal opposite links make a parallelogram or, in the crossed assembly, an
 * antiparallelogram (lengths alone cannot tell which); equal adjacent links a deltoid.
 */
function doubleChangePointName(lengths: readonly number[], tolMm: number): string {
  const oppositeEqual =
    Math.abs(lengths[GROUND] - lengths[COUPLER]) <= 2 * tolMm &&
    Math.abs(lengths[INPUT] - lengths[OUTPUT]) <= 2 * tolMm;
  return oppositeEqual
    ? 'double change point (parallelogram or antiparallelogram)'
    : 'double change point (deltoid)';
}
