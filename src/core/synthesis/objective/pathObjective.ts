/**
 * The objective of a path problem: design space → path response → score (the problem's
 * measure, violations feasibility first) → report. With both assembly branches asked
 * for, both are evaluated and the better kept, all within one evaluation.
 *
 * With a fixed placement, or refined free timing, it also offers a search `fitBetter`:
 * the design it has just evaluated, moved onto the placement that fits its output points
 * to the target best (the similarity a free placement fits, taken by the design's own
 * variables: placeDesignInto) and, with refined free timing where the target matched in
 * order on its curve takes a point to another stretch of it, given the driver values so
 * refitted (pathResponse.ts, refitTiming); kept where it lies in the box and ranks
 * better. A search that calls it finds the shape of a mechanism and need not also hit its
 * placement, nor each point's stretch of the curve, by sampling: four more variables, and
 * one per point (the reach set's fixed-placement and free-timing cases, bench/README.md).
 */
import { SIM_A, SIM_B, SIM_LENGTH, SIM_TX, SIM_TY } from '../../geometry/similarity';
import { precedesRawAt } from '../../optimize';
import type { FamilyId, Problem } from '../problem';
import { createPathDesignSpace, objectiveSpace } from './designSpace';
import { describePathDesign } from './pathReport';
import { createPathResponse } from './pathResponse';
import type { CandidateReport, Objective } from './types';

const TAU = 2 * Math.PI;

export function createPathObjective(problem: Problem, family: FamilyId): Objective {
  const space = createPathDesignSpace(problem, family);
  const response = createPathResponse(problem, space);
  const { n, times, evaluation, refineFree } = response;
  const { encoding, lower, upper, dim } = space;
  const m = space.mechanismDim;
  const fixed = problem.placement === 'fixed';
  /** A cyclic free timing's refitted values are taken to the turn [0, 2π) its variables span. */
  const wraps = problem.timing.mode === 'free' && problem.timing.wrap;
  /** The placement fitted to the evaluated design, the design so moved (and timed) and its evaluation. */
  const fitted = new Float64Array(SIM_LENGTH);
  const moved = new Float64Array(dim);
  const movedOut = new Float64Array(2);
  /** The moved design's value and violation, then the design's, as the objective gives them. */
  const compared = new Float64Array(2);
  const comparedViolation = new Float64Array(2);

  /** Evaluates x as it is (see evaluate); returns the better branch. */
  function evaluateAsIs(x: Float64Array, out: Float64Array, droppedIfInfeasible: boolean): number {
    const best = response.evaluateAll(x, droppedIfInfeasible);
    if (refineFree && !response.stoppedEarly()) for (let i = 0; i < n; i++) x[m + i] = times[best * n + i];
    out[0] = evaluation[2 * best];
    out[1] = evaluation[2 * best + 1];
    return best;
  }

  /** The better branch of the design evaluate saw last. */
  let lastBest = 0;

  function evaluate(x: Float64Array, out: Float64Array, droppedIfInfeasible = false): void {
    lastBest = evaluateAsIs(x, out, droppedIfInfeasible);
  }

  /**
   * See the header; called right after evaluate(x, out), with the same x and out. Not
   * where that evaluation stopped early: the design cannot turn, nor can any placement of
   * it, and the search drops both.
   */
  function fitBetter(x: Float64Array, out: Float64Array): boolean {
    if (response.stoppedEarly()) return false;
    if (!response.fitDesign(x, lastBest, encoding.placementTurns, fitted)) return false;
    const retimed = response.timingRefitted();
    if (fixed) {
      const a = fitted[SIM_A];
      const b = fitted[SIM_B];
      // A scale of 0 is no mechanism; the identity moves nothing (but retimed, the design is new).
      if (!(a * a + b * b > 0) || (!retimed && a === 1 && b === 0 && fitted[SIM_TX] === 0 && fitted[SIM_TY] === 0)) return false;
      encoding.placeDesignInto(x, fitted, lower, upper, moved);
    } else {
      for (let j = 0; j < m; j++) moved[j] = x[j];
    }
    for (let j = 0; j < m; j++) if (!(moved[j] >= lower[j] && moved[j] <= upper[j])) return false;
    for (let j = m; j < dim; j++) moved[j] = x[j];
    if (retimed) {
      for (let i = 0; i < n; i++) {
        const t = times[lastBest * n + i];
        const v = wraps ? t - Math.floor(t / TAU) * TAU : t;
        if (!(v >= lower[m + i] && v <= upper[m + i])) return false;
        moved[m + i] = v;
      }
    }
    evaluateAsIs(moved, movedOut, false);
    // Compared in arrays, ranked where they are compared: a double passed to or returned
    // from a call the compiler does not inline is boxed (canonicalInto's calls were not
    // always inlined here, three boxed numbers per evaluation).
    compared[0] = movedOut[0];
    comparedViolation[0] = movedOut[1];
    compared[1] = out[0];
    comparedViolation[1] = out[1];
    if (!precedesRawAt(compared, comparedViolation, 0, 1)) return false;
    x.set(moved);
    out[0] = movedOut[0];
    out[1] = movedOut[1];
    return true;
  }

  return {
    family,
    ...objectiveSpace(space),
    evaluate,
    ...(fixed || refineFree ? { fitBetter } : {}),
    describe: (x: Float64Array): CandidateReport => describePathDesign(problem, family, space, response, x),
  };
}
