/**
 * What every objective gives a search, whatever the kind of problem: a design space (the
 * variables, their boxes and the map from the optimizers' unit box), an allocation-free
 * evaluate, and a full report of one design.
 */
import type { FourBarClass } from '../../linkage/analysis';
import type { Linkage } from '../../linkage';
import type { CandidateMotionRange } from '../candidateFigures';
import type { ErrorSummary } from '../measures';
import type { FamilyId } from '../problem';
import type { SearchMapKind } from '../searchMap';

export interface CandidateReport {
  readonly family: FamilyId;
  /** The design vector (with refined driver values where evaluate writes them back). */
  readonly x: number[];
  readonly variables: Record<string, number>;
  readonly error: ErrorSummary;
  /** The value of the problem's measure, plus its objective terms (`termsValue`) where it has any. */
  readonly value: number;
  /** The share of `value` the problem's size and transmission terms add (problem.ts ObjectiveTerms); absent when 0. */
  readonly termsValue?: number;
  readonly violation: number;
  readonly feasible: boolean;
  /** The constraints the design breaks, in words. */
  readonly defects: string[];
  /**
   * The design as a linkage, placed, ready for the linkage file. Its reference pose is the
   * pose at target point 1 (`referencePose`), so its output point sits on the fitted path.
   */
  readonly linkage: Linkage;
  /**
   * Where `linkage` is drawn: 'target point 1' (the pose at the first target point's
   * driver value), or 'design reference' when the design does not assemble there.
   */
  readonly referencePose: 'target point 1' | 'design reference';
  /** The driver value at each target point, in the problem's frame (its timing's variables). */
  readonly driverValues: number[];
  /**
   * The same values in the linkage's own driver frame (absolute angle of pivot → tip,
   * rad; or length, mm): running `linkage` at `linkageDriverValues[i]` places the output
   * point at `points[i]`.
   */
  readonly linkageDriverValues: number[];
  /**
   * The motion the figures below are taken over, in the linkage's driver frame: the
   * range, step count and full-turn finding to give `loci analyze` (analyzeLinkage) to
   * get the same figures.
   */
  readonly motion: CandidateMotionRange;
  /** The output point at each target point, placed (x0, y0, x1, y1, …). */
  readonly points: number[];
  /** The fitted similarity of a free placement: p ↦ s R(θ) p + t. */
  readonly placement?: { readonly scale: number; readonly rotationRad: number; readonly tx: number; readonly ty: number };
  /** Class of the four-bar loop that holds the driven link (by the motion analysis). */
  readonly grashof?: FourBarClass;
  /** Least and greatest transmission angle of every four-bar loop over `motion`, deg. */
  readonly transmissionDeg?: { readonly min: number; readonly max: number };
  /** Bounding box of every joint and point over `motion`, mm. */
  readonly sizeMm?: { readonly widthMm: number; readonly heightMm: number };
}

/** The design space, evaluation and report of one family (or layout) on one problem. */
export interface SearchObjectiveOf<Family extends string, Report> {
  readonly family: Family;
  readonly dim: number;
  /** Real bounds of each variable. */
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly variableNames: readonly string[];
  /**
   * One evaluation: out[0] = value of the problem's measure, out[1] = constraint
   * violation (0 feasible, > 0 otherwise). No allocation. With free timing and
   * `refine`, the refined driver values are written back into x (Lamarckian), so the
   * value is that of the x the caller then holds. `droppedIfInfeasible`: the search drops
   * this design if it is infeasible, whatever its value (Optimizer.infeasibleDroppedInto);
   * the objective may then stop as soon as it knows the design infeasible and write
   * Infinity for both.
   */
  evaluate(x: Float64Array, out: Float64Array, droppedIfInfeasible?: boolean): void;
  /**
   * A path problem with a fixed placement or refined free timing: right after evaluate(x,
   * out), tries the design moved onto the placement that fits it to the target best, and
   * with refined free timing given the driver values the target's match on its curve
   * refits (pathObjective.ts); where that design lies in the box and ranks better, writes
   * it into x and its evaluation into out and returns true. A search calls it on the
   * designs it evaluates.
   */
  readonly fitBetter?: (x: Float64Array, out: Float64Array) => boolean;
  /** Which map takes the search box to designs: the problem's for this family (searchMap.ts). */
  readonly searchMap: SearchMapKind;
  /**
   * The design x that a point u of the search box [0, 1]^dim stands for, inside
   * [lower, upper]; allocates nothing. With the default 'affine' map this is
   * `fromUnitBoxInto(u, lower, upper, x)`.
   */
  fromSearchBoxInto(u: ArrayLike<number>, x: Float64Array): Float64Array;
  /** A search-box point standing for design x (the inverse of fromSearchBoxInto where it is one to one). */
  toSearchBoxInto(x: ArrayLike<number>, u: Float64Array): Float64Array;
  /** Full report of one design (allocates; for the archive and the top candidates). */
  describe(x: Float64Array): Report;
}

/** A path problem's objective: one family, reports as CandidateReport. */
export type Objective = SearchObjectiveOf<FamilyId, CandidateReport>;
