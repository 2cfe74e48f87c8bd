/**
 * A fixed placement's fitBetter (pathObjective.ts): a design moved off its target by a
 * known similarity is moved back onto it. The reference is outside the search: each
 * reach case's target is sampled from a known generating linkage (bench/reachCases.ts),
 * so the generating design scores zero; this test moves that design by a similarity
 * written out here, independently of the encodings' placeDesignInto, and expects
 * fitBetter to return the generating design, scoring zero again, with describe
 * reporting the figures evaluate gave. Refined free timing's refit, the other thing
 * fitBetter does: tests/unit/synthesis/freeTimingRefine.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { reachCases, type ReachCase } from '../../../bench/reachCases';
import { createObjective, createProblem, type Objective } from '../../../src/core/synthesis';
import { expectFitBetterRecovers } from '../../support/reachRecovery';


function objectiveOf(c: ReachCase): Objective {
  const made = createProblem(c.problem);
  if (!made.ok) throw new Error(`${c.id}: ${JSON.stringify(made.issues)}`);
  return createObjective(made.problem, c.family);
}

/** p ↦ scale · R(turn) p + (tx, ty). */
interface Move {
  readonly scale: number;
  readonly turn: number;
  readonly tx: number;
  readonly ty: number;
}

/**
 * The generating design of `c` moved by `move`, written from the variables' meaning: the
 * literature four-bar's lengths and coupler point scale, its ground line turns and its
 * pivot moves; a pose family's every joint and point moves. Driver values stay.
 */
function movedDesign(c: ReachCase, move: Move): Float64Array {
  const x = Float64Array.from(c.design);
  const a = move.scale * Math.cos(move.turn);
  const b = move.scale * Math.sin(move.turn);
  const at = (name: string) => c.designNames.indexOf(name);
  if (c.family === 'fourbar-lengths') {
    for (const name of ['r1', 'r2', 'r3', 'r4', 'rcx', 'rcy']) x[at(name)] *= move.scale;
    x[at('theta0')] = (((x[at('theta0')] + move.turn) % (2 * Math.PI)) + 2 * Math.PI) % (2 * Math.PI);
    const [px, py] = [x[at('x0')], x[at('y0')]];
    x[at('x0')] = a * px - b * py + move.tx;
    x[at('y0')] = b * px + a * py + move.ty;
    return x;
  }
  for (let k = 0; k < c.designNames.length; k++) {
    if (!c.designNames[k].endsWith('.x')) continue;
    const [px, py] = [x[k], x[k + 1]];
    x[k] = a * px - b * py + move.tx;
    x[k + 1] = b * px + a * py + move.ty;
  }
  return x;
}

const BY_ID = new Map(reachCases().map((c) => [c.id, c]));
function reachCase(id: string): ReachCase {
  const c = BY_ID.get(id);
  if (c === undefined) throw new Error(`no reach case ${id}`);
  return c;
}

const TURNING = { scale: 1.07, turn: 0.12, tx: 3.5, ty: -2.25 };
/** The slider-crank's slide keeps its direction: a move without a turn. */
const STRAIGHT = { scale: 0.94, turn: 0, tx: -4, ty: 1.5 };

describe('fitBetter moves a fixed-placement design back onto its target', () => {
  it.each([
    ['lengths-p-open-fixed', TURNING],
    ['lengths-u-closed-fixed', TURNING],
    ['watt1-p-open-fixed', TURNING],
    ['steph1-u-closed-fixed', TURNING],
    ['slider-p-open-fixed', STRAIGHT],
  ] as const)('%s: the generating design, moved, comes back and scores zero', (id, move) => {
    const c = reachCase(id);
    const objective = objectiveOf(c);
    const x = movedDesign(c, move);
    const out = new Float64Array(2);
    objective.evaluate(x, out);
    // Moved off its target, the design misses it by far more than rounding.
    expect(out[0] / c.sizeMm).toBeGreaterThan(1e-3);
    expectFitBetterRecovers(objective, c, x, out, (j) => Math.abs(x[j] - c.design[j]) / c.sizeMm);
  });

  it('leaves a design whose fitted placement lies outside the box where it is', () => {
    const c = reachCase('lengths-p-open-fixed');
    const made = createProblem(c.problem);
    if (!made.ok) throw new Error('the case does not parse');
    // r1's box ends below the generating 100 mm, so the design 10 % smaller cannot be scaled back.
    const narrowed = createProblem({ ...c.problem, bounds: { 'fourbar-lengths': { r1: [50, 95] } } });
    if (!narrowed.ok) throw new Error(JSON.stringify(narrowed.issues));
    const objective = createObjective(narrowed.problem, c.family);
    const x = movedDesign(c, { scale: 0.9, turn: 0, tx: 0, ty: 0 });
    const before = Float64Array.from(x);
    const out = new Float64Array(2);
    objective.evaluate(x, out);
    const evaluated = Float64Array.from(out);
    expect(objective.fitBetter?.(x, out)).toBe(false);
    expect(Array.from(x)).toEqual(Array.from(before));
    expect(Array.from(out)).toEqual(Array.from(evaluated));
  });

  it('is offered for a fixed placement, and with a free one only to refined free timing', () => {
    const free = reachCase('lengths-p-open-free');
    expect(objectiveOf(free).fitBetter).toBeUndefined();
    expect(objectiveOf(reachCase('lengths-p-open-fixed')).fitBetter).toBeTypeOf('function');
  });
});
