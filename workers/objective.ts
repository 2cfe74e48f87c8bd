/**
 * What an island evaluates, built from the plain `ObjectiveSpec` that crosses the
 * worker boundary: a synthesis problem (the problem file's JSON, of any kind, and a
 * family or layout) or a published test function.
 */
import { parseSynthesisProblemFile } from '../src/core/io/problem';
import { LAYOUT_KINDS, type LayoutKind } from '../src/core/suspension';
import { createObjective, FAMILY_IDS, isLegProblem, isSuspensionProblem, type FamilyId } from '../src/core/synthesis';
import type { ObjectiveSpec } from './api';
import type { SearchObjective } from './searchObjective';
import { testFunctionObjective } from './testFunctions';

export type ObjectiveResult = { readonly ok: true; readonly objective: SearchObjective } | { readonly ok: false; readonly reason: string };

export function buildObjective(spec: ObjectiveSpec): ObjectiveResult {
  if (typeof spec !== 'object' || spec === null) return { ok: false, reason: `objective is ${JSON.stringify(spec)}; expected an object` };
  switch (spec.kind) {
    case 'test-function':
      return testFunctionObjective(spec.name, spec.dim);
    case 'synthesis':
      return synthesisObjective(spec.problem, spec.family);
    default:
      return { ok: false, reason: `objective.kind is ${JSON.stringify((spec as { kind?: unknown }).kind)}; expected "synthesis" or "test-function"` };
  }
}

/** The synthesis objective of one family (path) or layout (suspension) on the problem a problem file (as JSON) describes. */
function synthesisObjective(problemFile: unknown, family: unknown): ObjectiveResult {
  const parsed = parseSynthesisProblemFile(problemFile);
  if (!parsed.ok) {
    const issues = parsed.issues.map((issue) => (issue.path === '' ? issue.message : `${issue.path}: ${issue.message}`));
    return { ok: false, reason: `problem: ${issues.join('; ')}` };
  }
  const problem = parsed.problem;
  if (isSuspensionProblem(problem)) {
    if (!(problem.layouts as readonly unknown[]).includes(family)) {
      return { ok: false, reason: `family is ${JSON.stringify(family)}; expected one of the problem's layouts, ${problem.layouts.join(', ')} (of ${LAYOUT_KINDS.join(', ')})` };
    }
    const objective = createObjective(problem, family as LayoutKind);
    return searchObjective(objective, (x) => ({ kind: 'suspension', candidate: objective.describe(x) }));
  }
  if (isLegProblem(problem)) {
    if (!(problem.families as readonly unknown[]).includes(family)) {
      return { ok: false, reason: `family is ${JSON.stringify(family)}; expected one of the leg problem's families, ${problem.families.join(', ')}` };
    }
    const objective = createObjective(problem, problem.families[problem.families.indexOf(family as never)]);
    return searchObjective(objective, (x) => ({ kind: 'leg', candidate: objective.describe(x) }));
  }
  if (!(FAMILY_IDS as readonly unknown[]).includes(family)) {
    return { ok: false, reason: `family is ${JSON.stringify(family)}; expected one of ${FAMILY_IDS.join(', ')}` };
  }
  let objective: ReturnType<typeof createObjective>;
  try {
    objective = createObjective(problem, family as FamilyId);
  } catch (error) {
    if (error instanceof RangeError) return { ok: false, reason: error.message };
    throw error;
  }
  return searchObjective(objective, (x) => ({ kind: 'synthesis', candidate: objective.describe(x) }));
}

/** The island's view of a synthesis objective, with its reports tagged by kind. */
function searchObjective(
  objective: Omit<SearchObjective, 'describe'>,
  describe: SearchObjective['describe'],
): ObjectiveResult {
  return {
    ok: true,
    objective: {
      dim: objective.dim,
      lower: objective.lower,
      upper: objective.upper,
      variableNames: objective.variableNames,
      fromSearchBoxInto: objective.fromSearchBoxInto,
      toSearchBoxInto: objective.toSearchBoxInto,
      evaluate: objective.evaluate,
      ...(objective.fitBetter === undefined ? {} : { fitBetter: objective.fitBetter }),
      describe,
    },
  };
}
