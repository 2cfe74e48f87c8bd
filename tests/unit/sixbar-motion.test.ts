import { describe, expect, it } from 'vitest';
import {
  compile,
  stephensonII,
  stephensonIII,
  STEPHENSON_II_DEFAULT,
  STEPHENSON_III_DEFAULT,
  type Linkage,
  type Plan,
} from '../../src/core/linkage';
import { V_BRANCH, V_SLOTS } from '../../src/core/synthesis/encoding';
import { createPoseFamily } from '../../src/core/synthesis/poseFamilies';

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

type Pt = readonly [number, number];

interface Case {
  readonly name: string;
  readonly family: 'stephenson-ii' | 'stephenson-iii';
  readonly build: (at: never) => Linkage;
  readonly defaults: Record<string, { x: number; y: number }>;
  readonly joints: readonly string[];
  readonly centres: readonly string[];
  readonly pivot: string;
  readonly driven: readonly string[];
}

const CASES: readonly Case[] = [
  {
    name: 'Stephenson II', family: 'stephenson-ii', build: stephensonII as Case['build'], defaults: { ...STEPHENSON_II_DEFAULT },
    joints: ['C', 'D', 'E'], centres: ['A', 'B', 'G0'], pivot: 'A0', driven: ['A', 'B'],
  },
  {
    name: 'Stephenson III', family: 'stephenson-iii', build: stephensonIII as Case['build'], defaults: { ...STEPHENSON_III_DEFAULT },
    joints: ['A', 'B', 'C'], centres: ['A0', 'B0', 'D'], pivot: 'C0', driven: ['D'],
  },
];

/** Angles at which the independent answer counts assemblies: every 0.5°. */
const TRUTH_STEPS = 720;
const GRID = 1200;
const CURVE_SAMPLES = 180;
const TRIES = 90;
/** Spreads of the joints about the family's default (mm): small ones turn all round, large ones lock. */
const SPREADS_MM = [20, 60, 120, 200];
/** The curve samples every 2°: each edge of a dead arc can be misplaced by one sample. */
const EDGE_SHARE = 1 / CURVE_SAMPLES;

function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648;
  };
}

/** Every assembly (X1, X2, X3 as six numbers) of the triad with these centres, radii and link shape. */
function triadRoots(K: readonly Pt[], r: readonly number[], shape: readonly Pt[]): number[][] {
  const d12 = Math.hypot(shape[1][0] - shape[0][0], shape[1][1] - shape[0][1]);
  const bx = shape[1][0] - shape[0][0];
  const by = shape[1][1] - shape[0][1];
  const qx = shape[2][0] - shape[0][0];
  const qy = shape[2][1] - shape[0][1];
  const place = (a: number, side: number): number[] | null => {
    const x1 = K[0][0] + r[0] * Math.cos(a);
    const y1 = K[0][1] + r[0] * Math.sin(a);
    const dx = K[1][0] - x1;
    const dy = K[1][1] - y1;
    const d = Math.hypot(dx, dy);
    const along = (d12 * d12 - r[1] * r[1] + d * d) / (2 * d);
    const h2 = d12 * d12 - along * along;
    if (!(h2 >= 0)) return null;
    const h = side * Math.sqrt(h2);
    const x2 = x1 + (along * dx - h * dy) / d;
    const y2 = y1 + (along * dy + h * dx) / d;
    // The link's rotation and scale from its frame: (X2 − X1) / (b2 − b1) as complex numbers.
    const c = ((x2 - x1) * bx + (y2 - y1) * by) / (bx * bx + by * by);
    const s = ((y2 - y1) * bx - (x2 - x1) * by) / (bx * bx + by * by);
    const x3 = x1 + c * qx - s * qy;
    const y3 = y1 + s * qx + c * qy;
    return [x1, y1, x2, y2, x3, y3, Math.hypot(x3 - K[2][0], y3 - K[2][1]) - r[2]];
  };
  const roots: number[][] = [];
  for (const side of [1, -1]) {
    let before = place(0, side);
    let aBefore = 0;
    for (let m = 1; m <= GRID; m++) {
      const a = (2 * Math.PI * m) / GRID;
      const now = place(a, side);
      if (before !== null && now !== null && Math.sign(before[6]) !== Math.sign(now[6])) {
        let lo = aBefore;
        let hi = a;
        let fLo = before[6];
        for (let it = 0; it < 200 && hi - lo > 1e-15; it++) {
          const mid = 0.5 * (lo + hi);
          const f = place(mid, side);
          if (f === null) break;
          if (Math.sign(f[6]) === Math.sign(fLo)) {
            lo = mid;
            fLo = f[6];
          } else {
            hi = mid;
          }
        }
        const f = place(0.5 * (lo + hi), side);
        if (f !== null && Math.abs(f[6]) < 1e-7) roots.push(f.slice(0, 6));
      }
      before = now;
      aBefore = a;
    }
  }
  return roots;
}

interface Design {
  readonly plan: Plan;
  /** Share of a turn where the triad has no assembly. */
  readonly deadShare: number;
  /** The triad's branch from the reference pose, followed root to nearest root, goes all round and comes back to it. */
  readonly closesInOneTurn: boolean;
}

/** A seeded design, with the share of a turn where its triad has no assembly, and whether its branch turns all round. */
function design(c: Case, random: () => number, spreadMm: number): Design | null {
  const at: Record<string, { x: number; y: number }> = {};
  for (const [id, q] of Object.entries(c.defaults)) at[id] = { x: q.x + (random() - 0.5) * spreadMm, y: q.y + (random() - 0.5) * spreadMm };
  const compiled = compile(c.build(at as never));
  if (!compiled.ok) return null;
  const plan = compiled.plan;
  const slot = (id: string) => 2 * (plan.slotIndex.get(id) ?? -1);
  const ref = plan.reference;
  const pt = (id: string): Pt => [ref[slot(id)], ref[slot(id) + 1]];
  const radii = c.joints.map((j, m) => Math.hypot(pt(j)[0] - pt(c.centres[m])[0], pt(j)[1] - pt(c.centres[m])[1]));
  const shape = c.joints.map(pt);
  const o = pt(c.pivot);
  const centresAt = (t: number): Pt[] => c.centres.map((id) => {
    const q = pt(id);
    if (!c.driven.includes(id)) return q;
    const x = q[0] - o[0];
    const y = q[1] - o[1];
    return [o[0] + Math.cos(t) * x - Math.sin(t) * y, o[1] + Math.sin(t) * x + Math.cos(t) * y];
  });
  let scaleMm = 0;
  for (const v of ref) scaleMm = Math.max(scaleMm, Math.abs(v));
  let dead = 0;
  const first = c.joints.flatMap(pt);
  let last: number[] | null = first;
  for (let m = 1; m <= TRUTH_STEPS; m++) {
    const roots = triadRoots(centresAt((2 * Math.PI * m) / TRUTH_STEPS), radii, shape);
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
function motionShare(c: Case, d: Design, a: number, b: number): number {
  const encoding = createPoseFamily(c.family, {}, { cx: 0, cy: 0, size: 200 });
  const parts = new Float64Array(V_SLOTS);
  encoding.load(Float64Array.from(d.plan.reference), 0, parts);
  const out = new Float64Array(8);
  for (let k = 0; k < CURVE_SAMPLES; k++) encoding.curve.at((2 * Math.PI * k) / CURVE_SAMPLES, 0, out);
  encoding.curve.at(a, 0, out);
  encoding.motion(Float64Array.of(a, b), parts);
  return parts[V_BRANCH];
}

describe.each(CASES)('$name motion check against the triad\'s assemblies counted directly', (c) => {
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
