/**
 * The error a six-bar candidate carries is the error of its motion. With a free placement
 * the search takes the target's points from its last fit of driver values and placement
 * (the curve evaluated there last) rather than solving them again. Second method: a plain
 * continuation with the linkage solver alone (tests/support/designFixture.ts) from the
 * design's reference pose to each fitted driver value (turning backward where a lock bars
 * the way forward, as the motion goes), the output point placed by the
 * fitted similarity; the RMS of its distances to the targets must be the search's value.
 */
import { describe, expect, it } from 'vitest';
import { Prng } from '../../../src/core/optimize/prng';
import { demoTargetPoints } from '../../../src/app/demo/transferDemo';
import { demoPathObjective } from '../../support/demoObjective';
import { continueTo, designPlan } from '../../support/designFixture';

/** Feasible random designs checked per family and path. */
const DESIGNS = 12;
const SEED = 5;

describe("a six-bar candidate's error is its motion's", () => {
  for (const family of ['stephenson-ii', 'stephenson-iii'] as const) {
    for (const closed of [true, false]) {
      it(`${family}, ${closed ? 'closed' : 'open'} path: the search's RMS is the continued motion's at the fitted driver values`, () => {
        const objective = demoPathObjective(family, closed);
        const targets = demoTargetPoints();
        const prng = Prng.fromSeed(SEED);
        const u = new Float64Array(objective.dim);
        const x = new Float64Array(objective.dim);
        const out = new Float64Array(2);
        let checked = 0;
        for (let draw = 0; draw < 20_000 && checked < DESIGNS; draw++) {
          prng.fillFloats(u, objective.dim);
          objective.fromSearchBoxInto(u, x);
          objective.evaluate(Float64Array.from(x), out);
          if (out[1] !== 0) continue;
          const report = objective.describe(Float64Array.from(x));
          const placement = report.placement;
          expect(placement).toBeDefined();
          if (placement === undefined) return;
          const variables = Object.fromEntries(objective.variableNames.map((name, i) => [name, x[i]]));
          const plan = designPlan(family, { variables });
          const p = 2 * (plan.slotIndex.get('P') ?? -1);
          const c = placement.scale * Math.cos(placement.rotationRad);
          const s = placement.scale * Math.sin(placement.rotationRad);
          let sum = 0;
          report.driverValues.forEach((t, i) => {
            // A value past a lock turning forward is reached turning backward (a turn less).
            const pose = continueTo(plan, t).pose ?? continueTo(plan, t - 2 * Math.PI).pose;
            expect(pose).not.toBeNull();
            if (pose === null) return;
            const px = c * pose[p] - s * pose[p + 1] + placement.tx;
            const py = s * pose[p] + c * pose[p + 1] + placement.ty;
            sum += (px - targets[i].x) ** 2 + (py - targets[i].y) ** 2;
          });
          const rms = Math.sqrt(sum / targets.length);
          // The continuation's solves converge to 1e-13 of the linkage's size; the two
          // motions' points agree far below a micrometre.
          expect(Math.abs(out[0] - rms)).toBeLessThan(1e-6 * Math.max(1, rms));
          checked++;
        }
        expect(checked).toBe(DESIGNS);
      });
    }
  }
});
