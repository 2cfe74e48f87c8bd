/**
 * The objective of a path problem: design space → path response → score (the problem's
 * measure, violations feasibility first) → report. With both assembly branches asked
 * for, both are evaluated and the better kept, all within one evaluation.
 */
import type { FamilyId, Problem } from '../problem';
import { createPathDesignSpace, objectiveSpace } from './designSpace';
import { describePathDesign } from './pathReport';
import { createPathResponse } from './pathResponse';
import type { CandidateReport, Objective } from './types';

export function createPathObjective(problem: Problem, family: FamilyId): Objective {
  const space = createPathDesignSpace(problem, family);
  const response = createPathResponse(problem, space);
  const { n, times, evaluation, refineFree } = response;
  const m = space.mechanismDim;

  function evaluate(x: Float64Array, out: Float64Array): void {
    const best = response.evaluateAll(x);
    if (refineFree) for (let i = 0; i < n; i++) x[m + i] = times[best * n + i];
    out[0] = evaluation[2 * best];
    out[1] = evaluation[2 * best + 1];
  }

  return {
    family,
    ...objectiveSpace(space),
    evaluate,
    describe: (x: Float64Array): CandidateReport => describePathDesign(problem, family, space, response, x),
  };
}
