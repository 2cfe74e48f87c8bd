/**
 * The objective the six-bar trust tests judge designs by: the demo target (closed or
 * open), unprescribed timing on 180 curve samples, free placement, RMS.
 */
import { demoTargetPoints } from '../../src/app/demo/transferDemo';
import { createObjective, createProblem, type Constraints, type FamilyId } from '../../src/core/synthesis';

export function demoPathObjective(family: FamilyId, closed: boolean, constraints?: Constraints): ReturnType<typeof createObjective> {
  const made = createProblem({
    name: `demo ${closed ? 'closed' : 'open'} path`,
    target: { points: demoTargetPoints().map((p) => [p.x, p.y]), closed },
    timing: { mode: 'unprescribed', samples: 180 },
    placement: 'free',
    families: [family],
    measure: 'rms',
    ...(constraints === undefined ? {} : { constraints }),
  });
  if (!made.ok) throw new Error(JSON.stringify(made.issues));
  return createObjective(made.problem, family);
}
