/**
 * What an island evaluates, built from the plain `ObjectiveSpec` that crosses the
 * worker boundary: a synthesis problem (the problem file's JSON and a family) or a
 * published test function.
 */
import { parseProblemFile } from '../src/core/io/problem';
import { createObjective, FAMILY_IDS, type FamilyId } from '../src/core/synthesis';
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

/** The synthesis objective of one family on the problem a problem file (as JSON) describes. */
function synthesisObjective(problemFile: unknown, family: unknown): ObjectiveResult {
  if (!(FAMILY_IDS as readonly unknown[]).includes(family)) {
    return { ok: false, reason: `family is ${JSON.stringify(family)}; expected one of ${FAMILY_IDS.join(', ')}` };
  }
  const parsed = parseProblemFile(problemFile);
  if (!parsed.ok) {
    const issues = parsed.issues.map((issue) => (issue.path === '' ? issue.message : `${issue.path}: ${issue.message}`));
    return { ok: false, reason: `problem: ${issues.join('; ')}` };
  }
  let objective: ReturnType<typeof createObjective>;
  try {
    objective = createObjective(parsed.problem, family as FamilyId);
  } catch (error) {
    if (error instanceof RangeError) return { ok: false, reason: error.message };
    throw error;
  }
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
      describe: (x) => ({ kind: 'synthesis', candidate: objective.describe(x) }),
    },
  };
}
