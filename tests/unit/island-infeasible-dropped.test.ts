/**
 * An island stops the evaluations its search and archive drop if infeasible (early
 * abandoning, Optimizer.infeasibleDroppedInto), and its search is the one it would run
 * evaluating every design in full: the same island with an objective that evaluates in
 * full whatever it is told (the independent method) exports the same state after every
 * step, optimizer and archive. The closed demo target (our own), the default search.
 */
import { describe, expect, it } from 'vitest';
import type { FamilyId } from '../../src/core/synthesis';
import { DEFAULT_ARCHIVE } from '../../src/engine/runSpec';
import { Island } from '../../workers/island';
import { buildObjective } from '../../workers/objective';
import type { SearchObjective } from '../../workers/searchObjective';
import { demoProblemFile } from '../../bench/demoProblem';

const BUDGET = 3000;
const SLICE = { evaluations: 250 } as const;
const noClock = (): number => 0;

/** The island's objective, evaluating in full (`full`) or as told, counting the evaluations it stopped. */
function island(family: FamilyId, full: boolean, counter: { stopped: number }): Island {
  const made = Island.create(
    {
      islandId: 'dropped',
      objective: { kind: 'synthesis', problem: demoProblemFile(family, 180), family },
      seed: 4,
      stream: 0,
      optimizer: { kind: 'hybrid' },
      maxEvaluations: BUDGET,
      archiveCapacity: DEFAULT_ARCHIVE.capacity,
      archiveDistance: DEFAULT_ARCHIVE.distance,
    },
    (spec) => {
      const built = buildObjective(spec);
      if (!built.ok) return built;
      const o: SearchObjective = built.objective;
      const evaluate = (x: Float64Array, out: Float64Array, droppedIfInfeasible?: boolean): void => {
        o.evaluate(x, out, full ? false : droppedIfInfeasible);
        if (out[0] === Infinity && out[1] === Infinity) counter.stopped++;
      };
      return { ...built, objective: { ...o, evaluate } };
    },
  );
  if (!made.ok) throw new Error(made.reason);
  return made.island;
}

describe('an island that stops the evaluations its search drops', () => {
  for (const family of ['fourbar', 'stephenson-ii'] as const) {
    it(`${family}: runs the search it would run in full, step by step, and stops some evaluations`, () => {
      const fullCount = { stopped: 0 };
      const stoppedCount = { stopped: 0 };
      const full = island(family, true, fullCount);
      const early = island(family, false, stoppedCount);
      while (full.stopReason() === null) {
        const a = full.step(SLICE, noClock);
        const b = early.step(SLICE, noClock);
        expect(b).toEqual(a);
        expect(JSON.stringify(early.exportState())).toBe(JSON.stringify(full.exportState()));
      }
      expect(early.stopReason()).toBe(full.stopReason());
      expect(fullCount.stopped).toBe(0);
      expect(stoppedCount.stopped).toBeGreaterThan(100);
    });
  }
});
