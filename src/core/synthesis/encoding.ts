/**
 * What a family encoding gives the objective: its variables and default box, the
 * output curve of the design it holds, and its share of the constraint violations.
 * Violations are added into slots of one Float64Array so a report can say which
 * constraint a design breaks; each is already normalised (dimensionless, ~1 = badly
 * broken), and their sum is the objective's `violation`.
 */
import type { FourBarClass } from '../linkage/analysis';
import type { Linkage } from '../linkage';
import type { CurveEvaluator } from './curve';

export const V_BOUNDS = 0;
/** A full turn is required and the driver cannot make it (a lock or a change point on the way round). */
export const V_CRANK = 1;
/** The mechanism cannot assemble at a target point's driver value. */
export const V_ASSEMBLY = 2;
/** The motion between target points passes a lock or dead centre (would flip branch). */
export const V_BRANCH = 3;
/** The driver values do not increase. */
export const V_ORDER = 4;
export const V_TRANSMISSION = 5;
export const V_LINK_LENGTH = 6;
export const V_KEEP_OUT = 7;
export const V_SLOTS = 8;

export const DEFECT_NAMES: readonly string[] = [
  'variable outside its bounds',
  'crank cannot turn fully (a lock or change point on the way round)',
  'cannot assemble at a target point',
  'motion passes a dead centre or lock (branch defect)',
  'driver values out of order (order defect)',
  'transmission angle below the minimum',
  'link length outside the limits',
  'ground pivot inside a keep-out circle',
];

/**
 * Layout of what `sweepExtent` writes: the placed bounding box of every joint and point
 * (mm) and the largest |cos μ| over the four-bar loops (0 where no sample assembles).
 */
export const EXTENT_MIN_X = 0;
export const EXTENT_MAX_X = 1;
export const EXTENT_MIN_Y = 2;
export const EXTENT_MAX_Y = 3;
export const EXTENT_COS = 4;
export const EXTENT_LENGTH = 5;

/** Empties an extent before a sweep adds its samples. */
export function resetExtent(out: Float64Array): void {
  out[EXTENT_MIN_X] = Infinity;
  out[EXTENT_MAX_X] = -Infinity;
  out[EXTENT_MIN_Y] = Infinity;
  out[EXTENT_MAX_Y] = -Infinity;
  out[EXTENT_COS] = 0;
}

/**
 * Adds the points xy[0 … 2·count) (x, y pairs), placed by [a, b, tx, ty], to an extent, in
 * order; a non-finite point fills it to ±Infinity. The points come in an array: a double
 * passed to a call that is not inlined is boxed (an allocation).
 */
export function addPointsToExtent(xy: Float64Array, count: number, placement: Float64Array, out: Float64Array): void {
  for (let k = 0; k < count; k++) {
    const px = xy[2 * k];
    const py = xy[2 * k + 1];
    const x = placement[0] * px - placement[1] * py + placement[2];
    const y = placement[1] * px + placement[0] * py + placement[3];
    if (!(x >= out[EXTENT_MIN_X])) out[EXTENT_MIN_X] = Number.isNaN(x) ? -Infinity : x;
    if (!(x <= out[EXTENT_MAX_X])) out[EXTENT_MAX_X] = Number.isNaN(x) ? Infinity : x;
    if (!(y >= out[EXTENT_MIN_Y])) out[EXTENT_MIN_Y] = Number.isNaN(y) ? -Infinity : y;
    if (!(y <= out[EXTENT_MAX_Y])) out[EXTENT_MAX_Y] = Number.isNaN(y) ? Infinity : y;
  }
}

/** addToExtent's point on its way to addPointsToExtent. */
const extentPoint = new Float64Array(2);

/** Adds a point, placed by [a, b, tx, ty], to an extent; a non-finite point fills it to ±Infinity. */
export function addToExtent(px: number, py: number, placement: Float64Array, out: Float64Array): void {
  extentPoint[0] = px;
  extentPoint[1] = py;
  addPointsToExtent(extentPoint, 1, placement, out);
}

export interface EncodingReport {
  readonly linkage: Linkage;
  /** The driver value, in the encoding's frame, at which `linkage` is drawn (its reference pose). */
  readonly drawnAt: number;
  readonly grashof?: FourBarClass;
  /**
   * The driver turns fully, found exactly: Grashof's sum for a four-bar, the assembly
   * margin's minima located by golden section for the other families. A change point
   * within the classifier's tolerance does not turn fully.
   */
  readonly turnsFully: boolean;
}

// No `family` here: problem.ts imports targetFrame from this module, so this one imports nothing from it.
export interface MechanismEncoding {
  /** The mechanism's variables (the per-point driver variables come after them). */
  readonly names: readonly string[];
  /** Default box of each mechanism variable. */
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  /** Prefix of the per-point driver variables: `theta2` or `driver`. */
  readonly driverName: string;
  /** Designs one x stands for (2 when both assembly branches are tried). */
  readonly branchCount: number;
  /** The output curve of the loaded design. */
  readonly curve: CurveEvaluator;
  /** Loads design x (its first names.length entries) on branch k; adds the design's own violations. */
  load(x: Float64Array, branch: number, parts: Float64Array): void;
  /** Adds the violations of moving the driver from span[0] to span[1] ≥ span[0] (an array: doubles passed to calls are boxed). */
  motion(span: Float64Array, parts: Float64Array): void;
  /** Adds the violations that depend on placement: p ↦ (a −b; b a) p + (tx, ty), `placement` = [a, b, tx, ty]. */
  placed(placement: Float64Array, parts: Float64Array): void;
  /**
   * False where the family cannot take a turn of the plane (its slide's direction is
   * not a variable): placeDesignInto then takes only placements with b = 0.
   */
  readonly placementTurns: boolean;
  /**
   * The mechanism variables of design x moved by `placement` = [a, b, tx, ty], into
   * `into`: the design whose output point at every driver value is x's there, so placed
   * (driver values are measured from the design's own ground line or reference pose, so
   * they do not move). An angle variable is taken to its turn in [lower, upper] where
   * one is. Allocates nothing.
   */
  placeDesignInto(x: Float64Array, placement: Float64Array, lower: Float64Array, upper: Float64Array, into: Float64Array): void;
  /**
   * The exact lock search behind `load` (a full turn) and `motion` (the spans
   * spans[2i] … spans[2i + 1], i < count), where those only sampled: locks narrower than
   * the sample spacing. Adds to the same slots. Costly, so the objective calls it only
   * for a design that is otherwise feasible; allocates nothing.
   */
  verify(spans: Float64Array, count: number, parts: Float64Array): void;
  /**
   * The loaded design certainly cannot turn its driver through a whole turn (false where
   * that is not known): then any motion over a whole turn, as a closed path's is, makes
   * the design infeasible, whatever its timing and placement. Cheap; allocates nothing.
   */
  cannotTurn(): boolean;
  /**
   * Runs the loaded design from driver value `from` to `to` in `steps` equal steps (both
   * ends taken), placed by `placement` ([a, b, tx, ty]), and writes into `out` (EXTENT_*)
   * the bounding box of every joint and point and the largest |cos μ| of its four-bar
   * loops over the samples that assemble; returns how many samples do not. For the size
   * limit and the size and transmission terms; allocates nothing.
   */
  sweepExtent(from: number, to: number, steps: number, placement: Float64Array, out: Float64Array): number;
  /**
   * The loaded design as a linkage drawn at driver value `t` (its pose there becomes the
   * linkage's reference pose), placed; allocates.
   */
  report(t: number, sa: number, sb: number, tx: number, ty: number): EncodingReport;
}

/** Where the target sits and how big it is: the scale of default boxes. */
export interface TargetFrame {
  readonly cx: number;
  readonly cy: number;
  /** Larger side of the target's bounding box, mm (> 0). */
  readonly size: number;
}

export function targetFrame(points: Float64Array): TargetFrame {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (let i = 0; i < points.length; i += 2) {
    minX = Math.min(minX, points[i]);
    maxX = Math.max(maxX, points[i]);
    minY = Math.min(minY, points[i + 1]);
    maxY = Math.max(maxY, points[i + 1]);
  }
  return { cx: (minX + maxX) / 2, cy: (minY + maxY) / 2, size: Math.max(maxX - minX, maxY - minY) };
}

/** Largest |cos μ| allowed by a minimum transmission angle μmin: μ ∈ [μmin, π − μmin]. */
export function transmissionCosLimit(minTransmissionRad: number | undefined): number {
  return minTransmissionRad === undefined ? 1 : Math.cos(minTransmissionRad);
}

/** Normalised excess of a length over [lo, hi]. */
export function lengthViolation(length: number, lo: number, hi: number): number {
  if (Number.isNaN(length)) return 1;
  if (length < lo) return (lo - length) / lo;
  if (length > hi) return (length - hi) / hi;
  return 0;
}
