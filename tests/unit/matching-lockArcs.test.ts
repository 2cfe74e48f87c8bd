/**
 * The four-bar's crank limit angles in closed form (lockSearch.ts fourBarLockArcs,
 * fourBarLockCount) against an independent method: the kinematics kernel run densely
 * along each span, counting the runs of driver values where the linkage does not
 * assemble. Four-bars and spans are seeded, of our own invention.
 */
import { describe, expect, it } from 'vitest';
import { compile, fourBar, run } from '../../src/core/linkage';
import { LOCK_ARC_LENGTH, fourBarLockArcs, fourBarLockCount } from '../../src/core/synthesis/lockSearch';

/** Mulberry32 (Ettinger, 2017): a small seeded generator for the test's own cases. */
function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Dense steps of the kernel sampling, rad: far finer than any arc or gap the cases keep. */
const DENSE_STEP_RAD = 2e-4;
/** Cases keep arcs, gaps and span ends at least this far (rad) from a lock's edge, so the samples cannot miss one. */
const CLEARANCE_RAD = 0.01;

interface Case {
  readonly linkage: ReturnType<typeof fourBar>;
  readonly lo: number;
  readonly hi: number;
}

function randomCase(next: () => number): Case | null {
  const A0 = { x: 200 * next() - 100, y: 200 * next() - 100 };
  const groundAt = 2 * Math.PI * next();
  const g = 40 + 100 * next();
  const B0 = { x: A0.x + g * Math.cos(groundAt), y: A0.y + g * Math.sin(groundAt) };
  const crankAt = 2 * Math.PI * next();
  const r = 10 + 80 * next();
  const A = { x: A0.x + r * Math.cos(crankAt), y: A0.y + r * Math.sin(crankAt) };
  const b = 20 + 150 * next();
  const c = 20 + 150 * next();
  // B at b from A and c from B0, on either side.
  const dx = B0.x - A.x;
  const dy = B0.y - A.y;
  const d = Math.hypot(dx, dy);
  const along = (d * d + b * b - c * c) / (2 * d);
  const h2 = b * b - along * along;
  if (!(h2 > 1)) return null;
  const side = next() < 0.5 ? 1 : -1;
  const h = side * Math.sqrt(h2);
  const B = { x: A.x + (along * dx - h * dy) / d, y: A.y + (along * dy + h * dx) / d };
  const P = { x: (A.x + B.x) / 2 + 30 * next(), y: (A.y + B.y) / 2 + 30 * next() };
  const lo = -Math.PI + 2 * Math.PI * next();
  const hi = lo + 7 * next();
  return { linkage: fourBar({ A0, A, B, B0, P }), lo, hi };
}

/** The failing runs of the kernel met driving from lo to hi (a run the span starts or ends in counts). */
function denseLocks(plan: Parameters<typeof run>[0], lo: number, hi: number): { locks: number; edges: number[] } {
  const pose = Float64Array.from(plan.reference);
  const steps = Math.ceil((hi - lo) / DENSE_STEP_RAD);
  let locks = 0;
  let before = true;
  const edges: number[] = [];
  for (let k = 0; k <= steps; k++) {
    const t = lo + ((hi - lo) * k) / steps;
    const ok = run(plan, plan.driverReferenceValue + t, pose);
    if (!ok && before) locks++;
    if (k > 0 && ok !== before) edges.push(t);
    before = ok;
  }
  return { locks, edges };
}

describe('four-bar crank limit angles in closed form', () => {
  it('count the same locks as the kernel sampled densely, over seeded four-bars and spans', () => {
    const next = mulberry32(20261203);
    const arcs = new Float64Array(LOCK_ARC_LENGTH);
    const spans = new Float64Array(2);
    let compared = 0;
    let withLocks = 0;
    for (let attempt = 0; attempt < 400 && compared < 120; attempt++) {
      const made = randomCase(next);
      if (made === null) continue;
      const compiled = compile(made.linkage);
      if (!compiled.ok) continue;
      const plan = compiled.plan;
      const slot = (id: string) => 2 * (plan.slotIndex.get(id) ?? -1);
      fourBarLockArcs(plan.reference, slot('A0'), slot('A'), slot('B'), slot('B0'), arcs);
      const dense = denseLocks(plan, made.lo, made.hi);
      // A lock edge within the clearance of a span end, or a run or gap narrower than it:
      // the samples may see it either way, so the case decides nothing.
      const ends = [made.lo, ...dense.edges, made.hi];
      let clear = true;
      for (let i = 1; i < ends.length; i++) if (ends[i] - ends[i - 1] < CLEARANCE_RAD) clear = false;
      if (!clear) continue;
      spans[0] = made.lo;
      spans[1] = made.hi;
      // theorem: law of cosines, the dyad closes only while |b − c| ≤ |A − B0| ≤ b + c.
      expect(fourBarLockCount(arcs, spans, 1)).toBe(dense.locks);
      compared++;
      if (dense.locks > 0) withLocks++;
    }
    expect(compared).toBeGreaterThanOrEqual(100);
    // The cases must include locks, or the comparison could not fail.
    expect(withLocks).toBeGreaterThanOrEqual(30);
  });

  it('sums over spans, and a Grashof crank-rocker has none', () => {
    // Ground 100, crank 30, coupler 80, rocker 70: s + l = 130 ≤ p + q = 150, crank shortest.
    const A0 = { x: 0, y: 0 };
    const B0 = { x: 100, y: 0 };
    const A = { x: 0, y: 30 };
    const d = Math.hypot(100, 30);
    const along = (d * d + 80 * 80 - 70 * 70) / (2 * d);
    const h = Math.sqrt(80 * 80 - along * along);
    const B = { x: A.x + (along * 100 + h * 30) / d, y: A.y + (along * -30 + h * 100) / d };
    const compiled = compile(fourBar({ A0, A, B, B0, P: { x: 50, y: 60 } }));
    if (!compiled.ok) throw new Error('crank-rocker does not compile');
    const plan = compiled.plan;
    const slot = (id: string) => 2 * (plan.slotIndex.get(id) ?? -1);
    const arcs = new Float64Array(LOCK_ARC_LENGTH);
    fourBarLockArcs(plan.reference, slot('A0'), slot('A'), slot('B'), slot('B0'), arcs);
    // theorem: Grashof, 1883 — the shortest link, a crank, turns fully.
    expect(fourBarLockCount(arcs, Float64Array.of(-20, 20, 0, 3), 2)).toBe(0);
    // The non-Grashof four-bar of fullTurn.test.ts (crank 30, coupler 80, rocker 49.99):
    // one stretched lock a turn, at ψ = π; three turns meet it three times.
    const A2 = { x: 30 * Math.cos(0.04), y: 30 * Math.sin(0.04) };
    const d2 = Math.hypot(100 - A2.x, A2.y);
    const along2 = (d2 * d2 + 80 * 80 - 49.99 * 49.99) / (2 * d2);
    const h2 = Math.sqrt(80 * 80 - along2 * along2);
    const ux = (100 - A2.x) / d2;
    const uy = -A2.y / d2;
    const B2 = { x: A2.x + along2 * ux - h2 * uy, y: A2.y + along2 * uy + h2 * ux };
    const locked = compile(fourBar({ A0, A: A2, B: B2, B0, P: { x: 50, y: 60 } }));
    if (!locked.ok) throw new Error('locked four-bar does not compile');
    const p2 = locked.plan;
    fourBarLockArcs(p2.reference, 2 * (p2.slotIndex.get('A0') ?? -1), 2 * (p2.slotIndex.get('A') ?? -1), 2 * (p2.slotIndex.get('B') ?? -1), 2 * (p2.slotIndex.get('B0') ?? -1), arcs);
    // theorem: |A − B0|² = 100² + 30² − 6000 cos ψ exceeds 129.99² only near ψ = π.
    expect(fourBarLockCount(arcs, Float64Array.of(0, 6 * Math.PI), 1)).toBe(3);
    expect(fourBarLockCount(arcs, Float64Array.of(0, 2, 2, 4, 4, 6), 3)).toBe(1);
    expect(denseLocks(p2, 0, 6 * Math.PI).locks).toBe(3);
  });

  it('finds the 2.2° lock of a search design the sampled margin search missed', () => {
    // A four-bar a seeded search met (demo target, free placement): its crank cannot pass
    // 0.106 … 0.145 rad from its reference pose, and a closed path's last span crossed
    // the next turn's copy of that window between two samples of the margin search.
    const compiled = compile(
      fourBar({
        A0: { x: 238.95852498665914, y: 227.80291757043392 },
        B0: { x: 248.18809185633432, y: 326.07393501108925 },
        A: { x: 141.13202073670567, y: -211.90890572974286 },
        B: { x: 224.0679368723272, y: 141.62769538169442 },
        P: { x: -281.96624676476114, y: -36.51199914962865 },
      }),
    );
    if (!compiled.ok) throw new Error('search design does not compile');
    const plan = compiled.plan;
    const slot = (id: string) => 2 * (plan.slotIndex.get(id) ?? -1);
    const arcs = new Float64Array(LOCK_ARC_LENGTH);
    fourBarLockArcs(plan.reference, slot('A0'), slot('A'), slot('B'), slot('B0'), arcs);
    const dense = denseLocks(plan, 2.78, 6.44);
    // theorem: law of cosines, as above; the kernel sampled densely agrees.
    expect(dense.locks).toBe(1);
    expect(fourBarLockCount(arcs, Float64Array.of(2.78, 6.44), 1)).toBe(1);
    expect(fourBarLockCount(arcs, Float64Array.of(0.2, 6.3), 1)).toBe(0);
  });
});
