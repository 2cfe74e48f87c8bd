/**
 * A design the search can evaluate but the linkage limits refuse (its reach is more than
 * 1e5 times its shortest link, so its pose cannot be checked to the solver's tolerance)
 * is reported, not thrown: infeasible, with the reason in words. Before, describe threw
 * and `loci fit` lost the whole search at its end.
 */
import { describe, expect, it } from 'vitest';
import { MAX_REACH_OVER_SHORTEST_LINK } from '../../../src/core/linkage/model';
import { compile } from '../../../src/core/linkage';
import { createObjective, createProblem } from '../../../src/core/synthesis';

describe('describe of a design past the linkage limits', () => {
  it('reports it infeasible with the reason, and evaluate does not throw', () => {
    const made = createProblem({
      name: 'far',
      target: { points: [[0, 0], [10, 5], [20, 0], [10, -5]], closed: true },
      timing: { mode: 'unprescribed' },
      placement: 'fixed',
      families: ['fourbar'],
      bounds: { fourbar: { 'B0.x': [-1e6, 1e6], 'B.x': [-1e6, 1e6] } },
    });
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'fourbar');
    const at = (name: string) => objective.variableNames.indexOf(name);
    const x = new Float64Array(objective.dim);
    // A0 (0, 0), A (1, 0): a 1 mm crank; B0 and B 5e5 mm away, 1 mm apart: a 1 mm rocker.
    x[at('A.x')] = 1;
    x[at('B0.x')] = 5e5;
    x[at('B.x')] = 5e5;
    x[at('B.y')] = 1;
    x[at('P.x')] = 10;
    x[at('P.y')] = 5;
    // The limit the report refers to (a theorem of double precision, stated with the limit in model.ts).
    expect(5e5 / 1).toBeGreaterThan(MAX_REACH_OVER_SHORTEST_LINK);
    const out = new Float64Array(2);
    expect(() => objective.evaluate(Float64Array.from(x), out)).not.toThrow();
    const report = objective.describe(x);
    expect(report.feasible).toBe(false);
    expect(report.defects.join('\n')).toMatch(/the design cannot be analysed: .*/);
    expect(report.transmissionDeg).toBeUndefined();
    // The exported linkage is refused by the reader's compile for the same reason.
    expect(compile(report.linkage).ok).toBe(false);
  });
});
