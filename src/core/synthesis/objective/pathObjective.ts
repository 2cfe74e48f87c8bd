/**
 * The objective of a path problem: design space → path response → score (the problem's
 * measure, violations feasibility first) → report. With both assembly branches asked
 * for, both are evaluated and the better kept, all within one evaluation.
 *
 * With a fixed placement or free timing it also offers a search `fitBetter`: the design
 * it has just evaluated, moved onto the placement and given the driver values that fit
 * its output curve to the target (as an unprescribed free placement's evaluation fits
 * them: the target matched in order on the curve and refined with the placement; with
 * prescribed timing, the least-squares similarity alone), kept where it lies in the box
 * and ranks better. The placement is taken by the design's own variables
 * (placeDesignInto); a free placement's is fitted in every evaluation already. A search
 * that calls it finds the shape of a mechanism and need not also hit its placement and
 * its timing by sampling (the reach set's fixed-placement and free-timing cases,
 * bench/README.md).
 */
import { SIM_A, SIM_B, SIM_LENGTH } from '../../geometry/similarity';
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
  const freeTiming = problem.timing.mode === 'free';
  const wrap = problem.timing.mode === 'free' && problem.timing.wrap;
  /** The placement fitted to the evaluated design, the design so moved (and timed) and its evaluation. */
  const fitted = new Float64Array(SIM_LENGTH);
  const moved = new Float64Array(dim);
  const movedOut = new Float64Array(2);
  /** The moved design's value and violation, then the design's. */
  const ranked = new Float64Array(2);
  const rankedViolation = new Float64Array(2);

  /** Evaluates x as it is; returns the better branch. */
  function evaluateAsIs(x: Float64Array, out: Float64Array): number {
    const best = response.evaluateAll(x);
    if (refineFree) for (let i = 0; i < n; i++) x[m + i] = times[best * n + i];
    out[0] = evaluation[2 * best];
    out[1] = evaluation[2 * best + 1];
    return best;
  }

  /** The better branch of the design evaluate saw last. */
  let lastBest = 0;

  function evaluate(x: Float64Array, out: Float64Array): void {
    lastBest = evaluateAsIs(x, out);
  }

  /** See the header; called right after evaluate(x, out), with the same x and out. */
  function fitBetter(x: Float64Array, out: Float64Array): boolean {
    if (!response.fitDesign(x, lastBest, encoding.placementTurns, fitted)) return false;
    if (fixed) {
      // A scale of 0 is no mechanism.
      const a = fitted[SIM_A];
      const b = fitted[SIM_B];
      if (!(a * a + b * b > 0)) return false;
      encoding.placeDesignInto(x, fitted, lower, upper, moved);
    } else {
      for (let j = 0; j < m; j++) moved[j] = x[j];
    }
    for (let i = 0; i < n; i++) {
      // fitDesign's driver values: cyclic ones taken to the turn [0, 2π) the variables span.
      const t = freeTiming ? times[lastBest * n + i] : x[m + i];
      moved[m + i] = freeTiming && wrap ? t - Math.floor(t / TAU) * TAU : t;
    }
    let same = true;
    for (let j = 0; j < dim; j++) {
      if (!(moved[j] >= lower[j] && moved[j] <= upper[j])) return false;
      same = same && moved[j] === x[j];
    }
    if (same) return false;
    evaluateAsIs(moved, movedOut);
    // Compared in arrays: a double passed to a call the compiler does not inline is boxed.
    ranked[0] = movedOut[0];
    rankedViolation[0] = movedOut[1];
    ranked[1] = out[0];
    rankedViolation[1] = out[1];
    if (!precedesRawAt(ranked, rankedViolation, 0, 1)) return false;
    x.set(moved);
    out[0] = movedOut[0];
    out[1] = movedOut[1];
    return true;
  }

  return {
    family,
    ...objectiveSpace(space),
    evaluate,
    ...(fixed || freeTiming ? { fitBetter } : {}),
    describe: (x: Float64Array): CandidateReport => describePathDesign(problem, family, space, response, x),
  };
}
