import { compile, STEPHENSON_II_DEFAULT, STEPHENSON_III_DEFAULT, stephensonII, stephensonIII, type Linkage, type Plan } from '../../src/core/linkage';

/**
 * The six-bar tests' independent triad solution: every assembly of a floating ternary
 * link (three joints of one rigid link, each on a circle about a centre) at one pose of
 * its centres, found by sampling the angle of its first joint about its centre on both
 * branches of the second joint's circle–circle intersection and bisecting each sign
 * change of the third joint's distance error. Written apart from the kernel's triad
 * (src/core/linkage/triad.ts), which solves the link as one unknown angle by Newton.
 */

export type Pt = readonly [number, number];

/** A seeded linear congruential generator (test data only). */
export function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648;
  };
}

/** Every assembly (X1, X2, X3 as six numbers) of the triad with centres K, radii r and link shape, sampled on `grid` angles per branch. */
export function triadRoots(K: readonly Pt[], r: readonly number[], shape: readonly Pt[], grid: number): number[][] {
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
    for (let m = 1; m <= grid; m++) {
      const a = (2 * Math.PI * m) / grid;
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

/** A Stephenson six-bar whose floating ternary link is a triad: which joints, about which centres. */
export interface TriadCase {
  readonly name: string;
  readonly family: 'stephenson-ii' | 'stephenson-iii';
  readonly build: (at: never) => Linkage;
  readonly defaults: Record<string, { x: number; y: number }>;
  /** The triad's joints, and the joint each turns about. */
  readonly joints: readonly string[];
  readonly centres: readonly string[];
  readonly pivot: string;
  /** Centres that turn with the driver about the pivot. */
  readonly driven: readonly string[];
}

export const TRIAD_CASES: readonly TriadCase[] = [
  {
    name: 'Stephenson II', family: 'stephenson-ii', build: stephensonII as TriadCase['build'], defaults: { ...STEPHENSON_II_DEFAULT },
    joints: ['C', 'D', 'E'], centres: ['A', 'B', 'G0'], pivot: 'A0', driven: ['A', 'B'],
  },
  {
    name: 'Stephenson III', family: 'stephenson-iii', build: stephensonIII as TriadCase['build'], defaults: { ...STEPHENSON_III_DEFAULT },
    joints: ['A', 'B', 'C'], centres: ['A0', 'B0', 'D'], pivot: 'C0', driven: ['D'],
  },
];

/** The case's family with each default joint moved by up to ± spreadMm / 2 in x and y (two draws each, in the defaults' order), compiled; null where it does not compile. */
export function seededPlan(c: TriadCase, random: () => number, spreadMm: number): Plan | null {
  const at: Record<string, { x: number; y: number }> = {};
  for (const [id, q] of Object.entries(c.defaults)) at[id] = { x: q.x + (random() - 0.5) * spreadMm, y: q.y + (random() - 0.5) * spreadMm };
  const compiled = compile(c.build(at as never));
  return compiled.ok ? compiled.plan : null;
}

/** The triad of a compiled design, read from its reference pose. */
export interface Triad {
  /** A joint's x offset in a pose. */
  readonly slot: (id: string) => number;
  /** A joint's reference position. */
  readonly pt: (id: string) => Pt;
  readonly radii: readonly number[];
  readonly shape: readonly Pt[];
  /** The triad's centres with the driver turned by t from its reference pose. */
  readonly centresAt: (t: number) => Pt[];
  /** The largest coordinate of the reference pose, mm: the design's size for tolerances. */
  readonly scaleMm: number;
}

export function triadOf(c: TriadCase, plan: Plan): Triad {
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
  return { slot, pt, radii, shape, centresAt, scaleMm };
}
