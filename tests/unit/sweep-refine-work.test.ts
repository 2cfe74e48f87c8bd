/**
 * The work of a sweep's refinements between samples, counted in plan operations run (a
 * count, not a time: it does not depend on the machine). The last hang of the issue
 * "Hostile input and faults": `loci analyze` of a chain of 1,000 dyads refined every
 * sampled minimum of every dyad's signed sine with golden-section probes that each ran
 * the whole plan, work that grew as the square of the chain's length.
 */
import { describe, expect, it } from 'vitest';
import { readLinkageFile } from '../../src/core/io/linkageFile';
import { compile, fourBar, type Plan } from '../../src/core/linkage';
import { MAX_POINTS } from '../../src/core/linkage/model';
import { OP_STRIDE, type PlanInternal } from '../../src/core/linkage/plan';
import { run, runPrefix } from '../../src/core/linkage/run';
import { sweep, type SweepWork } from '../../src/core/linkage/sweep';
import { dyadChain } from './hostileLinkages';

const DEG = Math.PI / 180;

/** Vitest's 5 s is short for a 400-dyad sweep on a busy machine; a hang still fails (a guard, not a timing). */
const HEAVY_TIMEOUT_MS = 60_000;

function newWork(): SweepWork {
  return { trackOps: 0, minima: 0, refined: 0, probeOps: 0, edgeOps: 0 };
}

function chainPlan(dyads: number): PlanInternal {
  const parsed = readLinkageFile(dyadChain(dyads));
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  return parsed.plan as PlanInternal;
}

function bits(values: Float64Array): number[] {
  return Array.from(new Uint8Array(values.buffer, values.byteOffset, values.byteLength));
}

describe('runPrefix: the operations before k, and nothing else', () => {
  // Source: a second method: run over the whole plan (the generated kernel).
  it('gives run’s bits for every slot the prefix writes, leaves the others as they were, and names the same failing operation', () => {
    const plan = chainPlan(100);
    const v0 = plan.driverReferenceValue;
    let failures = 0;
    for (const v of [v0, v0 + 0.2, v0 - 0.3, v0 + 2.5]) {
      const full = Float64Array.from(plan.reference);
      const assembles = run(plan, v, full);
      const failedAt = plan.failedOp;
      if (!assembles) failures++;
      for (const endOp of [0, 1, plan.setCount + 1, 17, 40, 150, plan.opCount]) {
        // The slots of the operations before endOp (a plan without Newton blocks writes one
        // per operation); every other slot starts as a marker that must stay.
        const written = new Set<number>();
        for (let op = 0; op < endOp; op++) written.add(plan.ops[op * OP_STRIDE + 3]);
        const marker = 12345.5;
        const prefix = Float64Array.from(plan.reference);
        for (let i = 0; i < prefix.length; i += 2) if (!written.has(i)) prefix.fill(marker, i, i + 2);
        const failed = runPrefix(plan, v, prefix, endOp);
        const expectedFail = !assembles && failedAt < endOp ? failedAt : -1;
        expect(failed).toBe(expectedFail);
        for (let i = 0; i < prefix.length; i += 2) {
          if (!written.has(i)) {
            expect([prefix[i], prefix[i + 1]]).toEqual([marker, marker]);
          } else if (expectedFail < 0) {
            expect(bits(prefix.subarray(i, i + 2))).toEqual(bits(full.subarray(i, i + 2)));
          }
        }
      }
    }
    // v0 + 2.5 is past the chain's assembly range, so a failing prefix was checked too.
    expect(failures).toBeGreaterThan(0);
  });

  it('refuses an end outside the plan (a programmer error)', () => {
    const plan = chainPlan(3);
    const pose = Float64Array.from(plan.reference);
    expect(() => runPrefix(plan, 0, pose, plan.opCount + 1)).toThrow(RangeError);
    expect(() => runPrefix(plan, 0, pose, -1)).toThrow(RangeError);
  });
});

describe('a refinement runs only the prefix of the plan up to its dyad', () => {
  // The narrow lock window of tests/unit/sweep-assembly-limits.test.ts: non-Grashof
  // (s + l = 140 > p + q = 139.9998), the crank locks only where |A − B0| exceeds b + c,
  // coupler and rocker in line (theorem: triangle inequality), i.e. for θ in
  // (θ*, 2π − θ*) with cos θ* = (a² + d² − (b + c)²) / (2ad): a window of 0.43°, which
  // no sample falls in, so only the refinement of the dyad at B finds it.
  const a = 40;
  const b = 70;
  const c = 69.9998;
  const d = 100;
  const edge = Math.acos((a * a + d * d - (b + c) ** 2) / (2 * a * d));
  const reference = 60.25 * DEG;

  /** The four-bar, with `points` more points on its coupler: operations after the dyad at B that the window does not depend on. */
  function windowPlan(points: number): Plan {
    const A = { x: a * Math.cos(reference), y: a * Math.sin(reference) };
    const dx = d - A.x;
    const dy = -A.y;
    const dist = Math.hypot(dx, dy);
    const along = (b * b - c * c + dist * dist) / (2 * dist);
    const h = Math.sqrt(b * b - along * along);
    const B = { x: A.x + (along * dx - h * dy) / dist, y: A.y + (along * dy + h * dx) / dist };
    const linkage = fourBar({ A0: { x: 0, y: 0 }, B0: { x: d, y: 0 }, A, B, P: { x: A.x, y: A.y + 10 } });
    const extra = Array.from({ length: points }, (_, i) => ({ id: `Q${i}`, body: 'coupler', x: A.x + (i % 50), y: A.y + 20 + Math.floor(i / 50) }));
    const compiled = compile({ ...linkage, points: [...(linkage.points ?? []), ...extra] });
    if (!compiled.ok) throw new Error(JSON.stringify(compiled.issues));
    return compiled.plan;
  }

  it('999 more points after the dyad leave its probes’ work unchanged; the window is found at the theorem’s edges either way', () => {
    const small = newWork();
    const large = newWork();
    const plainPlan = windowPlan(0);
    const widePlan = windowPlan(MAX_POINTS - 1);
    expect((widePlan as PlanInternal).opCount).toBe((plainPlan as PlanInternal).opCount + MAX_POINTS - 1);
    const plain = sweep(plainPlan, { from: reference, to: reference + 2 * Math.PI, steps: 361 }, small);
    const wide = sweep(widePlan, { from: reference, to: reference + 2 * Math.PI, steps: 361 }, large);
    for (const s of [plain, wide]) {
      expect(s.locks).toHaveLength(1);
      // theorem (above)
      expect(Math.abs(s.locks[0].from - edge)).toBeLessThan(1e-9);
      expect(Math.abs(s.locks[0].to - (2 * Math.PI - edge))).toBeLessThan(1e-9);
    }
    expect(wide.locks).toEqual(plain.locks);
    expect(small.refined).toBeGreaterThan(0);
    expect(large.refined).toBe(small.refined);
    expect(small.probeOps).toBeGreaterThan(0);
    expect(large.probeOps).toBe(small.probeOps);
    // The edges of the window are bisected on the whole plan: that work does grow.
    expect(large.edgeOps).toBeGreaterThan(small.edgeOps);
  });
});

describe('the chain of dyads: work grows about linearly with its length', () => {
  // Source: common practice: work measured by counting operations, not by timing it.
  // Linear work doubles with the length; work per dyad that grows with the length (a
  // probe of the whole plan for every dyad's minima) makes it four times as much.
  it('a sweep of the assembly search (0.5° over a turn) of 400 dyads does less than 3 × the work of 200', () => {
    const work = [200, 400].map((n) => {
      const plan = chainPlan(n);
      const w = newWork();
      const v0 = plan.driverReferenceValue;
      const s = sweep(plan, { from: v0, to: v0 + 2 * Math.PI, steps: 721 }, w);
      // The chain locks where its last dyad reaches its toggle: the sweep has met every dyad's minima.
      expect(s.locks).toHaveLength(1);
      expect(s.deadCentres[0]).toMatchObject({ joint: `C${n}`, kind: 'limit' });
      expect(w.minima).toBeGreaterThan(n);
      return w;
    });
    const total = (w: SweepWork) => w.trackOps + w.probeOps + w.edgeOps;
    expect(total(work[1]) / total(work[0])).toBeLessThan(3);
    expect(total(work[1]) / total(work[0])).toBeGreaterThan(1.5);
  }, HEAVY_TIMEOUT_MS);
});
