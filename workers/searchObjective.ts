/** What an island evaluates, whatever the kind of objective behind it. */
import type { CandidateDetail } from './api';

/** The island's view of an objective; the synthesis `Objective` has this shape. */
export interface SearchObjective {
  readonly dim: number;
  /** Real bounds of each variable. */
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly variableNames: readonly string[];
  /** The design a point u of the optimizer's box [0, 1]^dim stands for (affine unless the objective maps otherwise); no allocation. */
  fromSearchBoxInto(u: ArrayLike<number>, x: Float64Array): Float64Array;
  /** A box point standing for design x: how immigrants re-enter the search. */
  toSearchBoxInto(x: ArrayLike<number>, u: Float64Array): Float64Array;
  /**
   * out[0] = value, out[1] = violation (0 feasible). May write a repaired x back. No
   * allocation. `droppedIfInfeasible`: the search drops x if it is infeasible, so the
   * objective may stop once it knows that (Infinity for both).
   */
  evaluate(x: Float64Array, out: Float64Array, droppedIfInfeasible?: boolean): void;
  /** Right after evaluate(x, out): x moved onto a better placement (and timing), where the objective has one (the synthesis Objective's fitBetter). */
  readonly fitBetter?: (x: Float64Array, out: Float64Array) => boolean;
  /** A full report of one design (allocates). */
  describe(x: Float64Array): CandidateDetail;
}
