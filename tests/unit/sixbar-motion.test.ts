import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/linkage';
import { V_BRANCH, V_SLOTS } from '../../src/core/synthesis/encoding';
import { createPoseFamily } from '../../src/core/synthesis/poseFamilies';
import { lcg, seededPlan, TRIAD_CASES, triadOf, triadRoots, type TriadCase } from '../support/stephensonTriads';
import { curveAt } from '../support/curveAt';

/**
 * The motion check of a Stephenson II or III family (poseFamilies.ts: the share of a
 * turn where the linkage does not assemble, sampled on the curve's own 2° bins and read
 * from the poses and failures the curve's samples left, a turn on where the motion
 * closes in one turn) against an independent answer written here: every assembly of the
 * triad at a driver angle, found by sampling the angle of its first joint about its
 * centre on both branches of the second joint's circle–circle intersection and
 * bisecting each sign change of the third joint's distance error (as in
 * sixbarTriad.test.ts). Where the triad has no assembly at all the linkage cannot
 * assemble, whatever the start; where the branch from the reference pose, followed
 * from root to nearest root every half degree, goes all round and comes back to the
 * reference pose, the motion never fails, on the first turn or on any later one.
 */

/** Angles at which the independent answer counts assemblies: every 0.5°. */
const TRUTH_STEPS = 720;
const GRID = 1200;
const CURVE_SAMPLES = 180;
const TRIES = 90;
/** Spreads of the joints about the family's default (mm): small ones turn all round, large ones lock. */
const SPREADS_MM = [20, 60, 120, 200];
/** The curve samples every 2°: each edge of a dead arc can be misplaced by one sample. */
const EDGE_SHARE = 1 / CURVE_SAMPLES;

interface Design {
  readonly plan: Plan;
  /** Share of a turn where the triad has no assembly. */
  readonly deadShare: number;
  /** The triad's branch from the reference pose, followed root to nearest root, goes all round and comes back to it. */
  readonly closesInOneTurn: boolean;
}

/** A seeded design, with the share of a turn where its triad has no assembly, and whether its branch turns all round. */
function design(c: TriadCase, random: () => number, spreadMm: number): Design | null {
  const plan = seededPlan(c, random, spreadMm);
  if (plan === null) return null;
  const { pt, radii, shape, centresAt, scaleMm } = triadOf(c, plan);
  let dead = 0;
  const first = c.joints.flatMap(pt);
  let last: number[] | null = first;
  for (let m = 1; m <= TRUTH_STEPS; m++) {
    const roots = triadRoots(centresAt((2 * Math.PI * m) / TRUTH_STEPS), radii, shape, GRID);
    if (roots.length === 0) dead++;
    if (last === null) continue;
    let nearest: number[] | null = null;
    let gap = Infinity;
    for (const root of roots) {
      let g = 0;
      for (let i = 0; i < 6; i += 2) g = Math.max(g, Math.hypot(root[i] - last[i], root[i + 1] - last[i + 1]));
      if (g < gap) {
        gap = g;
        nearest = root;
      }
    }
    // A continuous branch moves little in half a degree; a larger gap is another assembly.
    last = nearest !== null && gap < 0.05 * scaleMm ? nearest : null;
  }
  let back = last === null ? Infinity : 0;
  for (let i = 0; last !== null && i < 6; i++) back = Math.max(back, Math.abs(last[i] - first[i]));
  return { plan, deadShare: dead / TRUTH_STEPS, closesInOneTurn: back < 1e-6 * scaleMm };
}

/** The motion check over [a, b] after the curve's samples, as a path response calls it. */
function motionShare(c: TriadCase, d: Design, a: number, b: number): number {
  const encoding = createPoseFamily(c.family, {}, { cx: 0, cy: 0, size: 200 });
  const parts = new Float64Array(V_SLOTS);
  encoding.load(Float64Array.from(d.plan.reference), 0, parts);
  const out = new Float64Array(8);
  for (let k = 0; k < CURVE_SAMPLES; k++) curveAt(encoding.curve, (2 * Math.PI * k) / CURVE_SAMPLES, 0, out);
  curveAt(encoding.curve, a, 0, out);
  encoding.motion(Float64Array.of(a, b), parts);
  return parts[V_BRANCH];
}

describe.each(TRIAD_CASES)('$name motion check against the triad\'s assemblies counted directly', (c) => {
  const random = lcg(c.name.length * 7919);
  const locking: Design[] = [];
  const turning: Design[] = [];
  for (let i = 0; i < TRIES && (locking.length < 2 || turning.length < 2); i++) {
    const d = design(c, random, SPREADS_MM[i % SPREADS_MM.length]);
    if (d === null) continue;
    if (d.deadShare > 4 * EDGE_SHARE && d.deadShare < 0.75 && locking.length < 2) locking.push(d);
    if (d.closesInOneTurn && turning.length < 2) turning.push(d);
  }

  it('counts at least the share of the turn where the triad has no assembly, over one turn and over a turn that runs past 2π', () => {
    expect(locking.length).toBeGreaterThan(0);
    for (const d of locking) {
      // Source: theorem — a linkage assembles only where its closure equations have a root.
      for (const [a, b] of [[0, 2 * Math.PI], [2.5, 2.5 + 2 * Math.PI]]) {
        const share = motionShare(c, d, a, b);
        expect(share).toBeGreaterThanOrEqual(d.deadShare - 2 * EDGE_SHARE - 1 / TRUTH_STEPS);
        expect(share).toBeLessThanOrEqual(1);
      }
    }
  });

  it('finds no failure where the branch from the reference pose goes all round, on the first turn and past it', () => {
    expect(turning.length).toBeGreaterThan(0);
    for (const d of turning) {
      expect(d.deadShare).toBe(0);
      // Source: theorem — the motion from the reference pose is the continuous branch of the triad's closure.
      expect(motionShare(c, d, 0, 2 * Math.PI)).toBe(0);
      expect(motionShare(c, d, 4, 4 + 2 * Math.PI)).toBe(0);
      expect(motionShare(c, d, 1, 9)).toBe(0);
    }
  });
});
