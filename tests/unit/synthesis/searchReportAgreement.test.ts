/**
 * The search and the report judge a six-bar's motion alike. The search's curve solves a
 * Newton block's poses from nearby poses it kept; the report (`loci analyze`'s motion
 * analysis of the exported linkage, sweep.ts) follows the motion from the drawn pose by
 * predictor–corrector continuation and refuses a solve across a fold (det J of the block
 * changes sign). Two methods written apart: a design the search ranks as feasible must be
 * feasible in its report, or the table would rank a motion the linkage cannot make.
 * Stephenson II and III are the families with Newton blocks; the others place every
 * joint by dyads, the branch fixed by the reference pose's side. The report draws the
 * linkage at target point 1, so the figures are taken over the fitted motion. The lengths
 * four-bar is checked too, for what its placement makes of its links.
 */
import { describe, expect, it } from 'vitest';
import { Prng } from '../../../src/core/optimize/prng';
import type { FamilyId } from '../../../src/core/synthesis';
import { demoPathObjective } from '../../support/demoObjective';

/**
 * Random designs per family and path: before the curve kept to the reference pose's
 * assembly, 6 (Stephenson II) and 4 (III) of these disagreed on the closed path; on the
 * open one, before a gap's ends were the values reached, a collapsed placement counted
 * and the report drew the curve's own pose, 7 and 9. On 3,000 designs of each family,
 * path and seed (7 and 8), none of about 13,850 feasible ones disagree (22 before a sweep
 * step after a refused one went on from the pose it reached and a motion that does not
 * come back after a turn was charged outside its first turn: sweepRestart.test.ts,
 * opensAfterATurn.test.ts; 4, all on the open path, before the mends of
 * drawnOnTheMotion.test.ts; README, accuracy table).
 */
const DESIGNS = 400;

/**
 * Family, closed path, random designs. The lengths four-bar places its links by the
 * similarity fit's scale: where the fit collapses (every target point matched to one
 * driver value) its exported links have no length and the report cannot analyse it; 600
 * designs take in design 575, feasible in the search before its placement was checked as
 * the pose families' is.
 */
const CASES: readonly (readonly [FamilyId, boolean, number])[] = [
  ['stephenson-ii', true, DESIGNS],
  ['stephenson-iii', true, DESIGNS],
  ['stephenson-ii', false, DESIGNS],
  ['stephenson-iii', false, DESIGNS],
  ['fourbar-lengths', false, 600],
];

describe('search and report agree on a design', () => {
  for (const [family, closed, designs] of CASES) {
    it(`${family}, ${closed ? 'closed' : 'open'} path: every random design the search calls feasible is feasible in its report`, () => {
      const objective = demoPathObjective(family, closed);
      const prng = Prng.fromSeed(7);
      const u = new Float64Array(objective.dim);
      const x = new Float64Array(objective.dim);
      const out = new Float64Array(2);
      const disagree: string[] = [];
      let feasible = 0;
      for (let k = 0; k < designs; k++) {
        prng.fillFloats(u, objective.dim);
        objective.fromSearchBoxInto(u, x);
        objective.evaluate(Float64Array.from(x), out);
        if (out[1] !== 0) continue;
        feasible++;
        const report = objective.describe(Float64Array.from(x));
        if (!report.feasible) disagree.push(`design ${k}: ${report.defects.join('; ')}`);
        // The exported linkage is drawn where the search fitted target point 1 (reached
        // the other way round where a lock bars the way forward), not in its reference pose.
        else if (report.referencePose !== 'target point 1') disagree.push(`design ${k}: drawn in its ${report.referencePose}`);
      }
      // Enough feasible designs for the check to mean something (about one in ten).
      expect(feasible).toBeGreaterThan(designs / 20);
      expect(disagree).toEqual([]);
    });
  }
});
