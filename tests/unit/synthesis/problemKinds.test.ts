/**
 * The synthesis problem as a union by kind: a path problem carries kind 'path', and
 * createProblem knows every variable name an objective will have, so a problem it
 * accepts always builds an objective (no name is found unknown later).
 */
import { describe, expect, it } from 'vitest';
import { FAMILY_IDS, createObjective, createProblem, isSuspensionProblem, type ProblemInput } from '../../../src/core/synthesis';

const points = [[0, 0], [10, 4], [20, 5], [30, 3], [40, -1]];
const timings: ProblemInput['timing'][] = [
  { mode: 'prescribed', driverValues: [0, 0.5, 1, 1.5, 2] },
  { mode: 'free', wrap: false },
  { mode: 'unprescribed' },
];

describe('createProblem: bound names, by family, timing and placement', () => {
  for (const family of FAMILY_IDS) {
    for (const placement of ['fixed', 'free'] as const) {
      it(`${family}, ${placement}: every name of the objective is accepted, and one it lacks is refused`, () => {
        for (const timing of timings) {
          const base: ProblemInput = { name: 'p', target: { points, closed: false }, timing, placement, families: [family] };
          const made = createProblem(base);
          if (!made.ok) throw new Error(JSON.stringify(made.issues));
          expect(made.problem.kind).toBe('path');
          expect(isSuspensionProblem(made.problem)).toBe(false);
          const objective = createObjective(made.problem, family);
          // Every variable's own box, by its own name: accepted, and the objective takes it.
          const bounds = Object.fromEntries(objective.variableNames.map((name, j) => [name, [objective.lower[j], objective.upper[j] + 1] as const]));
          const withAll = createProblem({ ...base, bounds: { [family]: bounds } });
          expect(withAll.ok, JSON.stringify(!withAll.ok && withAll.issues.slice(0, 2))).toBe(true);
          if (withAll.ok) expect(() => createObjective(withAll.problem, family)).not.toThrow();
          const unknown = createProblem({ ...base, bounds: { [family]: { 'nowhere.x': [0, 1] } } });
          expect(unknown.ok).toBe(false);
          if (!unknown.ok) expect(unknown.issues.map((i) => i.path)).toContain(`bounds.${family}.nowhere.x`);
        }
      });
    }
  }
});
