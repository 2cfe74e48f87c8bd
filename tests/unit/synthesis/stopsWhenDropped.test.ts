/**
 * An evaluation the search will drop if it is infeasible (evaluate's `droppedIfInfeasible`)
 * stops before its fit on a closed path when the design cannot turn its driver through a
 * whole turn, the motion every closed path asks for. Checked against two independent
 * methods: the same design evaluated in full (infeasible, and otherwise the same to the
 * bit), and the analysis of its exported linkage (`loci analyze`: sweep.ts), which must
 * find that the driver does not turn fully. Designs drawn uniformly from each family's box
 * with a fixed seed; the demo target, our own.
 */
import { describe, expect, it } from 'vitest';
import { compile } from '../../../src/core/linkage';
import { analyzeLinkage } from '../../../src/core/linkage/report';
import { Prng } from '../../../src/core/optimize/prng';
import { FAMILY_IDS } from '../../../src/core/synthesis';
import { reachCases } from '../../../bench/reachCases';
import { createObjective, createProblem } from '../../../src/core/synthesis';
import { demoPathObjective } from '../../support/demoObjective';

const DESIGNS = 160;
/** Designs per family whose exported linkage is analysed (each allocates a report). */
const ANALYSED = 12;

type Objective = ReturnType<typeof demoPathObjective>;

function draw(objective: Objective, prng: Prng): Float64Array {
  const u = new Float64Array(objective.dim);
  for (let j = 0; j < u.length; j++) u[j] = prng.float();
  return objective.fromSearchBoxInto(u, new Float64Array(objective.dim));
}

/** Evaluates `designs` with and without the mark; returns the designs the marked evaluation stopped on. */
function compare(objective: Objective, designs: readonly Float64Array[]): Float64Array[] {
  const stopped: Float64Array[] = [];
  const full = new Float64Array(2);
  const marked = new Float64Array(2);
  for (const x of designs) {
    objective.evaluate(Float64Array.from(x), full);
    objective.evaluate(Float64Array.from(x), marked, true);
    if (marked[0] === Infinity && marked[1] === Infinity) {
      expect(full[1]).toBeGreaterThan(0);
      stopped.push(x);
    } else {
      expect(Array.from(marked)).toEqual(Array.from(full));
    }
  }
  return stopped;
}

/**
 * The analysis of the exported linkages of `designs`, up to ANALYSED of those that compile
 * (an infeasible design's fitted placement may collapse its joints onto one point, which
 * no linkage file takes): each must find no full turn of the driver.
 */
function expectNoFullTurn(objective: Objective, designs: readonly Float64Array[]): void {
  let analysedCount = 0;
  for (const x of designs) {
    if (analysedCount === ANALYSED) break;
    const compiled = compile(objective.describe(x).linkage);
    if (!compiled.ok) continue;
    const analysed = analyzeLinkage(compiled.plan);
    if (!analysed.ok) throw new Error(JSON.stringify(analysed.issues));
    expect(analysed.report.driver.fullTurn).toBe(false);
    analysedCount++;
  }
  expect(analysedCount).toBe(ANALYSED);
}

describe('a design dropped if infeasible, on a closed path', () => {
  for (const family of FAMILY_IDS.filter((f) => f !== 'fourbar-lengths')) {
    it(`${family}: stops only where the full evaluation is infeasible and the analysis finds no full turn`, () => {
      const objective = demoPathObjective(family, true);
      const prng = Prng.fromSeed(5);
      const designs = Array.from({ length: DESIGNS }, () => draw(objective, prng));
      const stopped = compare(objective, designs);
      expect(stopped.length).toBeGreaterThan(DESIGNS / 4);
      expectNoFullTurn(objective, stopped);
    });
  }

  it('the literature four-bar (both assembly branches, a fixed placement): likewise, and no placement is tried for it', () => {
    const c = reachCases(['lengths-u-closed-fixed'])[0];
    const made = createProblem(c.problem);
    if (!made.ok) throw new Error(JSON.stringify(made.issues));
    const objective = createObjective(made.problem, 'fourbar-lengths');
    const prng = Prng.fromSeed(6);
    const designs = Array.from({ length: DESIGNS }, () => draw(objective, prng));
    const stopped = compare(objective, designs);
    expect(stopped.length).toBeGreaterThan(DESIGNS / 4);
    const out = new Float64Array(2);
    for (const x of stopped.slice(0, ANALYSED)) {
      const design = Float64Array.from(x);
      objective.evaluate(design, out, true);
      expect(objective.fitBetter?.(design, out)).toBe(false);
      expect(Array.from(design)).toEqual(Array.from(x));
    }
    expectNoFullTurn(objective, stopped);
  });
});

describe('a design dropped if infeasible, on an open path', () => {
  it('is evaluated in full: an open path need not turn', () => {
    for (const family of ['fourbar', 'stephenson-ii'] as const) {
      const objective = demoPathObjective(family, false);
      const prng = Prng.fromSeed(5);
      const designs = Array.from({ length: 60 }, () => draw(objective, prng));
      expect(compare(objective, designs)).toEqual([]);
    }
  });
});
