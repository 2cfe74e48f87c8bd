import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/linkage';
import { createPoseFamily } from '../../src/core/synthesis/poseFamilies';
import { lcg, seededPlan, TRIAD_CASES, triadOf, triadRoots, type TriadCase } from '../support/stephensonTriads';
import { curveAt } from '../support/curveAt';

/**
 * A Stephenson II or III family's curve starts each Newton solve from the poses it has
 * solved for the design (poseFamilies.ts, SOLVED_BINS), in the order a path response asks
 * for them: the curve's samples forward, then jumps between target points back and
 * forth, the same values again, and a motion past the first turn. Every answer is
 * checked against an independent solution written here: every assembly of the triad
 * found by sampling the angle of its first joint about its centre on both branches of
 * the second joint's circle–circle intersection and bisecting each sign change of the
 * third joint's distance error (as in sixbarTriad.test.ts), and the branch followed
 * from the reference pose by fine continuation over two turns (the root nearest the
 * last one, SUB_STEPS sub-steps per TRUTH_PER_TURN step).
 */

/** Truth every quarter of a degree, over two turns; the curve samples every 2° (8 truth steps). */
const TRUTH_PER_TURN = 1440;
const SUB_STEPS = 2;
const GRID = 1200;
const CURVE_SAMPLES = 180;
const TRIES = 12;
const DESIGNS = 2;

interface Design {
  readonly plan: Plan;
  readonly slot: (id: string) => number;
  /** P at truth step m (driver rotation 2πm / TRUTH_PER_TURN), m = 0 … 2 TRUTH_PER_TURN. */
  readonly p: Float64Array;
  readonly scaleMm: number;
}

/** A seeded design whose triad's branch from the reference pose lasts two turns, or null. */
function design(c: TriadCase, random: () => number): Design | null {
  const plan = seededPlan(c, random, 60);
  if (plan === null) return null;
  const { slot, pt, radii, shape, centresAt, scaleMm } = triadOf(c, plan);
  const ref = plan.reference;
  // P rides the triad's link: placed from X1, X2 by the reference shape.
  const j1 = slot(c.joints[0]);
  const j2 = slot(c.joints[1]);
  const ps = slot('P');
  const bx = ref[j2] - ref[j1];
  const by = ref[j2 + 1] - ref[j1 + 1];
  const qx = ref[ps] - ref[j1];
  const qy = ref[ps + 1] - ref[j1 + 1];
  const p = new Float64Array(2 * (2 * TRUTH_PER_TURN + 1));
  let last: number[] = c.joints.flatMap(pt);
  const store = (m: number, x: readonly number[]) => {
    const cs = ((x[2] - x[0]) * bx + (x[3] - x[1]) * by) / (bx * bx + by * by);
    const sn = ((x[3] - x[1]) * bx - (x[2] - x[0]) * by) / (bx * bx + by * by);
    p[2 * m] = x[0] + cs * qx - sn * qy;
    p[2 * m + 1] = x[1] + sn * qx + cs * qy;
  };
  store(0, last);
  for (let m = 1; m <= 2 * TRUTH_PER_TURN; m++) {
    for (let q = 1; q <= SUB_STEPS; q++) {
      const t = (2 * Math.PI * (m - 1 + q / SUB_STEPS)) / TRUTH_PER_TURN;
      let nearest: number[] | null = null;
      let gap = Infinity;
      for (const root of triadRoots(centresAt(t), radii, shape, GRID)) {
        let d = 0;
        for (let i = 0; i < 6; i += 2) d = Math.max(d, Math.hypot(root[i] - last[i], root[i + 1] - last[i + 1]));
        if (d < gap) {
          gap = d;
          nearest = root;
        }
      }
      // A continuous branch moves little in a sub-step; a larger gap is another assembly.
      if (nearest === null || !(gap < 0.02 * scaleMm)) return null;
      last = nearest;
    }
    store(m, last);
  }
  return { plan, slot, p, scaleMm };
}

describe.each(TRIAD_CASES)('$name curve started from the poses it solved, against direct circle–circle geometry', (c) => {
  const random = lcg(c.name.length * 104729);
  const all: Design[] = [];
  for (let i = 0; i < TRIES && all.length < DESIGNS; i++) {
    const d = design(c, random);
    if (d !== null) all.push(d);
  }

  it('stays on the branch from the reference pose in a path response\'s order of driver values, past the first turn too', () => {
    expect(all.length).toBeGreaterThan(0);
    const step = TRUTH_PER_TURN / CURVE_SAMPLES;
    // The curve's samples; jumps between target points (between the samples) back and
    // forth with rates, twice; the same values without; a motion over the end of the turn.
    const order: [number, 0 | 1][] = [];
    for (let k = 0; k < CURVE_SAMPLES; k++) order.push([k * step, 0]);
    const targets = Array.from({ length: 24 }, (_, i) => (i * TRUTH_PER_TURN) / 24 + 3 + (i % 5));
    for (const shift of [0, 1, -2]) for (const m of targets) order.push([m + shift, 1]);
    for (const m of [...targets].reverse()) order.push([m + 1, 1]);
    for (const m of targets) order.push([m - 2, 0]);
    for (let m = TRUTH_PER_TURN - 60; m <= TRUTH_PER_TURN + 400; m += 20) order.push([m, 0]);
    order.push([TRUTH_PER_TURN + 401, 1], [300, 1], [2 * TRUTH_PER_TURN - 7, 1]);
    let compared = 0;
    for (const d of all) {
      const encoding = createPoseFamily(c.family, {}, { cx: 0, cy: 0, size: 200 });
      encoding.load(Float64Array.from(d.plan.reference), 0, new Float64Array(16));
      const out = new Float64Array(8);
      for (const [m, order0] of order) {
        expect(curveAt(encoding.curve, (2 * Math.PI * m) / TRUTH_PER_TURN, order0, out)).toBe(1);
        // Source: theorem — the motion from the reference pose is the continuous branch of the triad's closure.
        expect(Math.hypot(out[0] - d.p[2 * m], out[1] - d.p[2 * m + 1])).toBeLessThan(1e-7 * d.scaleMm);
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(order.length - 1);
  });
});
