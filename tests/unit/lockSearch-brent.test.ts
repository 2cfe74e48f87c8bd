import { describe, expect, it } from 'vitest';
import { compile, stephensonIII, wattI, STEPHENSON_III_DEFAULT, WATT_I_DEFAULT, type Linkage } from '../../src/core/linkage';
import { V_SLOTS } from '../../src/core/synthesis/encoding';
import { DEAD_CENTRE_MARGIN, LOCK_BRACKET_TOL_RAD, LockSearch, type MarginCurve } from '../../src/core/synthesis/lockSearch';
import { createPoseFamily, type PoseFamilyId } from '../../src/core/synthesis/poseFamilies';

/**
 * The lock search's refinement (Brent's minimisation, lockSearch.ts) against the search it
 * replaced, copied here as it was (golden-section steps only, Kiefer 1953), and against
 * margins whose locks are known in closed form: both count the same locks, on seeded
 * six-bar motions and on made-up margins, and Brent's takes fewer probes.
 */

const GOLDEN_MAX_STEPS = 80;
const STEP_RAD = (2 * Math.PI) / 72;

// The previous search, as it was in src/core/synthesis/lockSearch.ts before Brent's method
// (its probes started from a sample's pose as the curve's contract now has it: startFrom).
class GoldenLockSearch {
  private readonly stride: number;
  private readonly maxSteps: number;
  private readonly margins: Float64Array;
  private readonly poses: Float64Array;
  private readonly start: Float64Array;
  private readonly at: Float64Array;
  private startT = NaN;

  constructor(stride: number, maxSteps: number) {
    this.stride = stride;
    this.maxSteps = maxSteps;
    this.margins = new Float64Array(maxSteps + 1);
    this.at = new Float64Array(maxSteps + 1);
    this.poses = new Float64Array((maxSteps + 1) * stride);
    this.start = new Float64Array(stride);
  }

  /**
   * The number of locks met driving from `a` to `b` ≥ a, sampled at most `stepRad` apart
   * (capped at maxSteps samples): runs of samples that fail, plus refined minima of the
   * margin that fail or fall below DEAD_CENTRE_MARGIN. `cyclic`: b = a + 2π and the
   * samples close up. The curve starts from the pose it holds and is left to start from the
   * pose of the last sample.
   */
  count(curve: MarginCurve, a: number, b: number, stepRad: number, cyclic: boolean): number {
    if (!(b > a)) return 0;
    const steps = Math.min(this.maxSteps, Math.max(2, Math.ceil((b - a) / stepRad)));
    const h = (b - a) / steps;
    // Cyclic: samples 0 … steps − 1, the last neighbouring the first; else 0 … steps.
    const last = cyclic ? steps - 1 : steps;
    const m = this.margins;
    const stride = this.stride;
    for (let k = 0; k <= last; k++) {
      this.at[k] = a + k * h;
      const v = curve.marginAt(this.at[k]);
      m[k] = v >= 0 ? v : -1;
      this.poses.set(curve.pose, k * stride);
    }
    let locks = 0;
    for (let k = 0; k <= last; k++) {
      const here = m[k];
      const before = k > 0 ? m[k - 1] : cyclic ? m[last] : Infinity;
      const after = k < last ? m[k + 1] : cyclic ? m[0] : Infinity;
      if (here < 0) {
        // A run of failed samples counts once, at its start.
        if (!(before < 0)) locks++;
        continue;
      }
      if (!(here < before && here <= after)) continue;
      const lo = k > 0 || cyclic ? a + (k - 1) * h : a;
      const hi = k < last || cyclic ? a + (k + 1) * h : b;
      if (this.refine(curve, k, lo, hi)) locks++;
    }
    // Every sample failed in a cyclic range: one lock, not a run without a start.
    if (cyclic && locks === 0 && m[0] < 0) locks = 1;
    this.copyPose(last, this.start);
    curve.startFrom(this.start, this.at[last]);
    return locks;
  }

  /** Golden-section search for the least margin on [lo, hi] from the pose of sample k; true when it finds a lock. */
  private refine(curve: MarginCurve, k: number, lo: number, hi: number): boolean {
    this.copyPose(k, this.start);
    this.startT = this.at[k];
    const invPhi = (Math.sqrt(5) - 1) / 2;
    let a = lo;
    let b = hi;
    let x1 = b - invPhi * (b - a);
    let x2 = a + invPhi * (b - a);
    let f1 = this.probe(curve, x1);
    let f2 = this.probe(curve, x2);
    for (let i = 0; i < GOLDEN_MAX_STEPS && b - a > LOCK_BRACKET_TOL_RAD; i++) {
      if (!(f1 >= 0) || !(f2 >= 0)) return true;
      if (f1 <= f2) {
        b = x2;
        x2 = x1;
        f2 = f1;
        x1 = b - invPhi * (b - a);
        f1 = this.probe(curve, x1);
      } else {
        a = x1;
        x1 = x2;
        f1 = f2;
        x2 = a + invPhi * (b - a);
        f2 = this.probe(curve, x2);
      }
    }
    return !(f1 >= DEAD_CENTRE_MARGIN) || !(f2 >= DEAD_CENTRE_MARGIN);
  }

  /** Copies the pose of sample k into `out` (a loop: a subarray would allocate). */
  private copyPose(k: number, out: Float64Array): void {
    const o = k * this.stride;
    for (let i = 0; i < this.stride; i++) out[i] = this.poses[o + i];
  }

  private probe(curve: MarginCurve, t: number): number {
    curve.startFrom(this.start, this.startT);
    return curve.marginAt(t);
  }
}

/** A made-up margin: features (centre, half-width, kind) on a smooth background; probes counted. */
class MadeUpMargin implements MarginCurve {
  readonly pose = new Float64Array(2);
  probes = 0;
  /** Every driver value asked, in order. */
  readonly asked: number[] = [];
  constructor(private readonly features: readonly { at: number; half: number; touch: boolean }[], private readonly phase: number) {}
  // The margin does not depend on a start.
  startFrom(): void {}
  marginAt(t: number): number {
    this.probes++;
    this.asked.push(t);
    let m = 0.55 + 0.35 * Math.sin(3 * t + this.phase);
    for (const f of this.features) {
      const d = Math.abs(t - f.at);
      // A failed stretch of half-width `half`, or a dead centre touched at `at` (margin 0 there).
      if (!f.touch && d <= f.half) return -1;
      m = Math.min(m, 0.4 * (f.touch ? d : d - f.half));
    }
    return m;
  }
}

function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return s / 2147483648;
  };
}

/** `count` features well apart, each a dead centre or a failed stretch narrower than `stepRad`, between samples. */
function madeUpFeatures(random: () => number, count: number, stepRad: number): { at: number; half: number; touch: boolean }[] {
  return Array.from({ length: count }, (_, j) => {
    const at = 0.3 + j * 2 + random() * 1.2;
    const half = random() < 0.5 ? 0 : (0.02 + 0.3 * random()) * stepRad;
    return { at, half, touch: half === 0 };
  });
}

describe('lock search refinement', () => {
  it('counts the locks of made-up margins that are known in closed form, as the golden-section search did, in fewer probes', () => {
    const random = lcg(20261203);
    let brentProbes = 0;
    let goldenProbes = 0;
    let locks = 0;
    for (let i = 0; i < 200; i++) {
      const count = Math.floor(random() * 3);
      const features = madeUpFeatures(random, count, STEP_RAD);
      const phase = random() * 2 * Math.PI;
      const brent = new MadeUpMargin(features, phase);
      const golden = new MadeUpMargin(features, phase);
      const b = 6.2;
      const got = new LockSearch(2, 720).count(brent, 0, b, STEP_RAD, false);
      const was = new GoldenLockSearch(2, 720).count(golden, 0, b, STEP_RAD, false);
      // Source: theorem — each feature is one lock (a failed stretch, or a margin of 0 at a dead centre), the background none.
      expect(got).toBe(count);
      expect(was).toBe(count);
      locks += count;
      brentProbes += brent.probes;
      goldenProbes += golden.probes;
    }
    expect(locks).toBeGreaterThan(100);
    expect(brentProbes).toBeLessThan(goldenProbes);
  });

  it('on a grid, samples the range at its ends and at the multiples of the grid between them, and counts the same known locks', () => {
    const random = lcg(20261205);
    const gridRad = (2 * Math.PI) / 180;
    let locks = 0;
    for (let i = 0; i < 200; i++) {
      const count = Math.floor(random() * 3);
      const features = madeUpFeatures(random, count, gridRad);
      const margin = new MadeUpMargin(features, random() * 2 * Math.PI);
      const a = 0.1 * random();
      const b = 6.1 + 0.1 * random();
      const got = new LockSearch(2, 720).count(margin, a, b, STEP_RAD, false, gridRad);
      // Source: theorem — each feature is one lock (a failed stretch, or a margin of 0 at a dead centre), the background none.
      expect(got).toBe(count);
      locks += count;
      const first = Math.floor(a / gridRad) + 1;
      const inside = Math.ceil(b / gridRad) - first;
      const grid = [a, ...Array.from({ length: inside }, (_, k) => (first + k) * gridRad), b];
      expect(margin.asked.slice(0, grid.length)).toEqual(grid);
    }
    expect(locks).toBeGreaterThan(100);
  });

  const cases: { family: PoseFamilyId; build: (at: never) => Linkage; defaults: Record<string, { x: number; y: number }> }[] = [
    { family: 'watt-i', build: wattI as never, defaults: { ...WATT_I_DEFAULT } },
    { family: 'stephenson-iii', build: stephensonIII as never, defaults: { ...STEPHENSON_III_DEFAULT } },
  ];
  it.each(cases)('counts the same locks as the golden-section search on seeded $family motions', (c) => {
    const random = lcg(c.family.length * 977);
    let compared = 0;
    let locked = 0;
    for (let i = 0; i < 16; i++) {
      const at: Record<string, { x: number; y: number }> = {};
      for (const [id, q] of Object.entries(c.defaults)) at[id] = { x: q.x + (random() - 0.5) * 50, y: q.y + (random() - 0.5) * 50 };
      const compiled = compile(c.build(at as never));
      if (!compiled.ok) continue;
      const encoding = createPoseFamily(c.family, {}, { cx: 0, cy: 0, size: 200 });
      const curve = encoding.curve as unknown as MarginCurve;
      const x = Float64Array.from(compiled.plan.reference);
      const a = (random() - 0.5) * Math.PI;
      const b = a + Math.PI / 2 + random() * 1.5 * Math.PI;
      encoding.load(x, 0, new Float64Array(V_SLOTS));
      const got = new LockSearch(curve.pose.length, 720).count(curve, a, b, STEP_RAD, false);
      encoding.load(x, 0, new Float64Array(V_SLOTS));
      const was = new GoldenLockSearch(curve.pose.length, 720).count(curve, a, b, STEP_RAD, false);
      // Source: the previous method (copied above) on the same motion.
      expect(got).toBe(was);
      compared++;
      if (got > 0) locked++;
    }
    expect(compared).toBeGreaterThan(8);
    expect(locked).toBeGreaterThan(0);
    expect(locked).toBeLessThan(compared);
  });
});
