import { describe, expect, it } from 'vitest';
import { closureResidualMm, run, runWithRates, type Plan } from '../../src/core/linkage';
import { createPoseFamily } from '../../src/core/synthesis/poseFamilies';
import { lcg, seededPlan, TRIAD_CASES, triadOf, triadRoots, type TriadCase } from '../support/stephensonTriads';
import { curveAt } from '../support/curveAt';

/**
 * The floating ternary link of a Stephenson II or III (a triad: three joints of one
 * rigid link, each on a circle about a joint placed before it) checked against an
 * independent solution written here: every assembly of the triad at a driver value,
 * found by sampling the angle of its first joint about its centre on both branches of
 * the second joint's circle–circle intersection and bisecting each sign change of the
 * third joint's distance error; the branch followed from the reference pose by fine
 * continuation (the root nearest the last one, eight sub-steps per sample).
 */

const SAMPLES = 180;
const SUB_STEPS = 8;
const GRID = 1500;
const DESIGNS = 14;

interface Design {
  readonly plan: Plan;
  readonly slot: (id: string) => number;
  /** The triad's joints at driver rotation t (from the reference), NaN where the branch has ended. */
  readonly truth: Float64Array[];
  readonly fullTurn: boolean;
  readonly scaleMm: number;
}

/** The seeded design, and its triad's branch from the reference pose at each sample t_k = 2πk / SAMPLES. */
function design(c: TriadCase, random: () => number): Design | null {
  const plan = seededPlan(c, random, 60);
  if (plan === null) return null;
  const { slot, pt, radii, shape, centresAt, scaleMm } = triadOf(c, plan);
  let last: number[] | null = c.joints.flatMap(pt);
  const truth: Float64Array[] = [];
  for (let k = 1; k <= SAMPLES; k++) {
    for (let q = 1; q <= SUB_STEPS && last !== null; q++) {
      const t = (2 * Math.PI * (k - 1 + q / SUB_STEPS)) / SAMPLES;
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
      // A continuous branch moves little in an eighth of a 2° step; a larger gap is another assembly.
      last = nearest !== null && gap < 0.05 * scaleMm ? nearest : null;
    }
    truth.push(last === null ? new Float64Array(6).fill(NaN) : Float64Array.from(last));
  }
  return { plan, slot, truth, fullTurn: last !== null, scaleMm };
}

function designs(c: TriadCase, seed: number): Design[] {
  const random = lcg(seed);
  const out: Design[] = [];
  for (let i = 0; i < DESIGNS; i++) {
    const d = design(c, random);
    if (d !== null) out.push(d);
  }
  return out;
}

describe.each(TRIAD_CASES)('$name triad against direct circle–circle geometry', (c) => {
  const all = designs(c, c.name.length * 7919);

  it('follows the reference branch sample by sample, and assembles over the turn exactly where the branch does', () => {
    let compared = 0;
    let full = 0;
    for (const d of all) {
      const { plan, slot, truth } = d;
      const pose = Float64Array.from(plan.reference);
      let assembledAll = true;
      for (let k = 1; k <= SAMPLES; k++) {
        const ok = run(plan, plan.driverReferenceValue + (2 * Math.PI * k) / SAMPLES, pose);
        if (!ok) {
          assembledAll = false;
          pose.set(plan.reference);
        }
        if (Number.isNaN(truth[k - 1][0])) continue;
        // Until the branch ends, every sample assembles on it.
        expect(ok).toBe(true);
        c.joints.forEach((j, m) => {
          // Source: theorem — the triad's assembly is a root of the closure; the branch is the continuous one.
          expect(Math.hypot(pose[slot(j)] - truth[k - 1][2 * m], pose[slot(j) + 1] - truth[k - 1][2 * m + 1])).toBeLessThan(1e-7 * d.scaleMm);
        });
        // Source: theorem — a solved pose meets every constraint.
        expect(closureResidualMm(plan, pose)).toBeLessThan(1e-9 * d.scaleMm);
        compared++;
      }
      expect(assembledAll).toBe(d.fullTurn);
      if (d.fullTurn) full++;
    }
    expect(compared).toBeGreaterThan(SAMPLES);
    // The seeds hold designs of both kinds, so both directions of the last check are exercised.
    expect(full).toBeGreaterThan(0);
    expect(full).toBeLessThan(all.length);
  });

  it('gives exact rates: the derivative of the branch by the driver', () => {
    let compared = 0;
    for (const d of all.filter((x) => x.fullTurn).slice(0, 3)) {
      const { plan, slot, truth } = d;
      const pose = Float64Array.from(plan.reference);
      const rates = new Float64Array(pose.length);
      const h = (2 * Math.PI) / SAMPLES;
      for (let k = 2; k < SAMPLES; k += 7) {
        // Solve along the branch up to sample k, then take the rates there.
        pose.set(plan.reference);
        for (let j = 1; j <= k; j++) expect(run(plan, plan.driverReferenceValue + j * h, pose)).toBe(true);
        expect(runWithRates(plan, plan.driverReferenceValue + k * h, pose, rates)).toBe(true);
        c.joints.forEach((j, m) => {
          for (const axis of [0, 1]) {
            // Source: theorem — a central difference of the branch over the samples either side, error O(h²).
            const central = (truth[k][2 * m + axis] - truth[k - 2][2 * m + axis]) / (2 * h);
            expect(Math.abs(rates[slot(j) + axis] - central)).toBeLessThan(2e-3 * d.scaleMm);
          }
        });
        compared++;
      }
    }
    expect(compared).toBeGreaterThan(0);
  });

  it('draws the same coupler curve through the family encoding, in any order of driver values', () => {
    const d = all.find((x) => x.fullTurn);
    expect(d).toBeDefined();
    if (d === undefined) return;
    const family = c.name === 'Stephenson II' ? 'stephenson-ii' : 'stephenson-iii';
    const encoding = createPoseFamily(family, {}, { cx: 0, cy: 0, size: 200 });
    encoding.load(Float64Array.from(d.plan.reference), 0, new Float64Array(16));
    const out = new Float64Array(8);
    const p = d.slot('P');
    const ref = d.plan.reference;
    // Forward, back and jumping: the solve's start comes from the poses before.
    const order = [...Array.from({ length: SAMPLES }, (_, k) => k + 1), ...Array.from({ length: 40 }, (_, k) => SAMPLES - 3 * k), 7, 90, 8, 91, 92, 30];
    for (const k of order) {
      expect(curveAt(encoding.curve, (2 * Math.PI * k) / SAMPLES, k % 2 === 0 ? 0 : 1, out)).toBe(1);
      // P rides the link of the triad: place it from the independent X1, X2 by the reference shape.
      const x = d.truth[k - 1];
      const j1 = d.slot(c.joints[0]);
      const j2 = d.slot(c.joints[1]);
      const bx = ref[j2] - ref[j1];
      const by = ref[j2 + 1] - ref[j1 + 1];
      const qx = ref[p] - ref[j1];
      const qy = ref[p + 1] - ref[j1 + 1];
      const cs = ((x[2] - x[0]) * bx + (x[3] - x[1]) * by) / (bx * bx + by * by);
      const sn = ((x[3] - x[1]) * bx - (x[2] - x[0]) * by) / (bx * bx + by * by);
      // Source: theorem — a point of a rigid link follows the link.
      expect(Math.hypot(out[0] - (x[0] + cs * qx - sn * qy), out[1] - (x[1] + sn * qx + cs * qy))).toBeLessThan(1e-7 * d.scaleMm);
    }
  });
});
