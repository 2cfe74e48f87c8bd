/**
 * A prepared suspension evaluator reuses its arrays from one evaluation to the next: each
 * evaluation must give the figures of a fresh one-shot analysis, whatever came before.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_LAYOUTS, DEMO_TRAIL_BIKE, shortLinkFourBar, singlePivot, stephensonSixBar, suspensionCurves, type SuspensionOptions } from '../../../src/core/suspension';
import { prepareSuspension, type SuspensionResult } from '../../../src/core/suspension/metrics';

/** The report with its typed arrays copied out, so that a later evaluation cannot change it. */
function snapshot(result: SuspensionResult): unknown {
  return JSON.parse(JSON.stringify(result, (_key, value: unknown) => (ArrayBuffer.isView(value) ? Array.from(value as Float64Array) : value)));
}

describe('a prepared suspension evaluator', () => {
  const cases: [string, ReturnType<typeof singlePivot>, SuspensionOptions][] = [
    ['single pivot', singlePivot(DEMO_LAYOUTS.singlePivot), { steps: 60 }],
    ['short-link four-bar, part of the travel', shortLinkFourBar(DEMO_LAYOUTS.shortLinkFourBar), { steps: 33, travelMm: 100 }],
    ['Stephenson six-bar, floating brake', stephensonSixBar(DEMO_LAYOUTS.stephensonSixBar), { steps: 25, floatingBrakeBody: 'rocker' }],
  ];
  for (const [name, linkage, options] of cases) {
    it(`${name}: every evaluation gives the one-shot figures, bit for bit (common practice)`, () => {
      const prepared = prepareSuspension(linkage, DEMO_TRAIL_BIKE, options);
      expect(prepared.ok).toBe(true);
      if (!prepared.ok) return;
      const once = snapshot(suspensionCurves(linkage, DEMO_TRAIL_BIKE, options));
      expect(once).toMatchObject({ ok: true });
      for (let i = 0; i < 3; i++) expect(snapshot(prepared.evaluator.evaluate())).toEqual(once);
    });
  }
});
