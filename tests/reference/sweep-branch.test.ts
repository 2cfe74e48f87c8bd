/**
 * The sweep stays on the reference pose's assembly branch: checked against a second,
 * independent method written here, continuation of the whole linkage at very fine
 * steps. It solves every body's joint-to-joint distances (not the plan's dyads or Newton
 * blocks) by its own Newton iteration, from the reference pose, a 1/50 of a sample step
 * at a time; a continuous motion moves the joints a little each step, so where its next
 * step cannot converge or jumps, the branch ends (a fold of the assembly: the
 * linkage locks there).
 */
import { describe, expect, it } from 'vitest';
import { analyzeLinkage } from '../../src/core/linkage/report';
import {
  STEPHENSON_III_DEFAULT,
  compile,
  stephensonI,
  stephensonII,
  stephensonIII,
  sweep,
  wattI,
  wattII,
  type Linkage,
  type Plan,
  type SweepResult,
} from '../../src/core/linkage';

function compiled(linkage: Linkage): Plan {
  const result = compile(linkage);
  if (!result.ok) throw new Error(`compile failed: ${JSON.stringify(result.issues)}`);
  return result.plan;
}

/** Fine continuation of a rotation-driven linkage of pins only, from its reference pose. */
class Continuation {
  readonly ids: string[];
  readonly pos: Float64Array;
  private readonly unknown: number[] = [];
  private readonly eqs: [number, number, number][] = [];
  private readonly pivot: number;
  private readonly tip: number;
  private readonly tipLength: number;
  readonly sizeMm: number;

  constructor(linkage: Linkage) {
    this.ids = linkage.joints.map((j) => j.id);
    this.pos = new Float64Array(2 * this.ids.length);
    linkage.joints.forEach((j, i) => {
      this.pos[2 * i] = j.x;
      this.pos[2 * i + 1] = j.y;
    });
    if (linkage.driver.kind !== 'rotation') throw new Error('rotation drivers only');
    this.pivot = this.ids.indexOf(linkage.driver.pivot);
    this.tip = this.ids.indexOf(linkage.driver.tip);
    this.tipLength = this.dist(this.pivot, this.tip);
    const known = new Set<number>([this.tip]);
    linkage.joints.forEach((j, i) => {
      if (j.ground === true) known.add(i);
    });
    for (let i = 0; i < this.ids.length; i++) if (!known.has(i)) this.unknown.push(i);
    let size = 0;
    for (const body of linkage.bodies) {
      const idx = body.joints.map((id) => this.ids.indexOf(id));
      for (let a = 0; a < idx.length; a++) {
        for (let b = a + 1; b < idx.length; b++) {
          const L = this.dist(idx[a], idx[b]);
          size = Math.max(size, L);
          if (!(known.has(idx[a]) && known.has(idx[b]))) this.eqs.push([idx[a], idx[b], L]);
        }
      }
    }
    this.sizeMm = size;
    if (this.eqs.length !== 2 * this.unknown.length) throw new Error(`${this.eqs.length} equations for ${2 * this.unknown.length} unknowns`);
  }

  private dist(i: number, j: number): number {
    return Math.hypot(this.pos[2 * i] - this.pos[2 * j], this.pos[2 * i + 1] - this.pos[2 * j + 1]);
  }

  get driverValue(): number {
    return Math.atan2(this.pos[2 * this.tip + 1] - this.pos[2 * this.pivot + 1], this.pos[2 * this.tip] - this.pos[2 * this.pivot]);
  }

  /** Newton on the distance equations at driver value v from the current pose; false when it does not converge. */
  solveAt(v: number): boolean {
    const p = this.pos;
    p[2 * this.tip] = p[2 * this.pivot] + this.tipLength * Math.cos(v);
    p[2 * this.tip + 1] = p[2 * this.pivot + 1] + this.tipLength * Math.sin(v);
    const n = 2 * this.unknown.length;
    const column = new Map(this.unknown.map((j, k) => [j, 2 * k]));
    for (let iteration = 0; iteration < 25; iteration++) {
      const jac = new Float64Array(n * n);
      const res = new Float64Array(n);
      let worst = 0;
      this.eqs.forEach(([i, j, L], row) => {
        const dx = p[2 * i] - p[2 * j];
        const dy = p[2 * i + 1] - p[2 * j + 1];
        res[row] = (dx * dx + dy * dy - L * L) / (2 * L);
        worst = Math.max(worst, Math.abs(res[row]));
        const ci = column.get(i);
        const cj = column.get(j);
        if (ci !== undefined) {
          jac[row * n + ci] += dx / L;
          jac[row * n + ci + 1] += dy / L;
        }
        if (cj !== undefined) {
          jac[row * n + cj] -= dx / L;
          jac[row * n + cj + 1] -= dy / L;
        }
      });
      if (worst < 1e-12 * this.sizeMm) return true;
      const step = gaussSolve(jac, res.map((r) => -r), n);
      if (step === null) return false;
      this.unknown.forEach((j, k) => {
        p[2 * j] += step[2 * k];
        p[2 * j + 1] += step[2 * k + 1];
      });
    }
    return false;
  }

  /** Position of a joint. */
  at(id: string): [number, number] {
    const i = this.ids.indexOf(id);
    return [this.pos[2 * i], this.pos[2 * i + 1]];
  }
}

function gaussSolve(a: Float64Array, b: Float64Array, n: number): Float64Array | null {
  for (let k = 0; k < n; k++) {
    let q = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(a[i * n + k]) > Math.abs(a[q * n + k])) q = i;
    if (!(Math.abs(a[q * n + k]) > 1e-14)) return null;
    for (let j = 0; j < n; j++) [a[k * n + j], a[q * n + j]] = [a[q * n + j], a[k * n + j]];
    [b[k], b[q]] = [b[q], b[k]];
    for (let i = k + 1; i < n; i++) {
      const f = a[i * n + k] / a[k * n + k];
      for (let j = k; j < n; j++) a[i * n + j] -= f * a[k * n + j];
      b[i] -= f * b[k];
    }
  }
  const x = new Float64Array(n);
  for (let k = n - 1; k >= 0; k--) {
    let s = b[k];
    for (let j = k + 1; j < n; j++) s -= a[k * n + j] * x[j];
    x[k] = s / a[k * n + k];
  }
  return x;
}

/** Sub-steps of the continuation per sample step. */
const FINE = 50;

/**
 * Compares a sweep from the reference driver value with the fine continuation over the
 * same samples: every sample the continuation reaches matches to 1e-6 of the linkage's
 * size; where it ends, the sweep reports a lock beginning within one fine step, with a
 * dead centre there, and no sample past it on the branch.
 */
function compareWithContinuation(
  linkage: Linkage, direction: 1 | -1, steps = 361,
): { reached: number; endsAt: number | null; locks: SweepResult['locks']; assembled: Uint8Array } {
  const plan = compiled(linkage);
  const v0 = plan.driverReferenceValue;
  const s: SweepResult = sweep(plan, { from: v0, to: v0 + direction * 2 * Math.PI, steps });
  const fine = new Continuation(linkage);
  expect(fine.driverValue).toBeCloseTo(v0, 12);
  const h = (direction * 2 * Math.PI) / ((steps - 1) * FINE);
  const stride = 2 * plan.slotCount;
  let lastMove = 0;
  let reached = 0;
  let endsAt: number | null = null;
  let lastGood = v0;
  const previous = new Float64Array(fine.pos.length);
  outer: for (let k = 0; k < steps; k++) {
    for (let sub = k === 0 ? FINE : 1; sub <= FINE; sub++) {
      const v = v0 + ((k - 1) * FINE + sub) * h;
      previous.set(fine.pos);
      const converged = fine.solveAt(v);
      let move = 0;
      for (let i = 0; i < previous.length; i += 2) move = Math.max(move, Math.hypot(fine.pos[i] - previous[i], fine.pos[i + 1] - previous[i + 1]));
      // A continuous motion moves a bounded amount per fine step; a jump or no solution ends the branch.
      if (!converged || (lastMove > 0 && move > 4 * lastMove + 1e-9 * fine.sizeMm)) {
        endsAt = lastGood;
        break outer;
      }
      // The solve at the reference itself moves nothing: it sets no scale for the next step.
      if (k > 0) lastMove = move;
      lastGood = v;
    }
    reached = k + 1;
    // Source: independent method, the fine continuation above.
    expect(s.assembled[k]).toBe(1);
    for (const id of fine.ids) {
      const slot = plan.slotIndex.get(id) ?? -1;
      const [x, y] = fine.at(id);
      const err = Math.hypot(s.poses[k * stride + 2 * slot] - x, s.poses[k * stride + 2 * slot + 1] - y);
      expect(err, `${id} at sample ${k}`).toBeLessThan(1e-6 * fine.sizeMm);
    }
  }
  // Source: independent method, the fine continuation above: where it ends, the branch ends.
  if (endsAt === null) {
    expect(s.fullTurn).toBe(true);
    expect(s.locks).toEqual([]);
  } else {
    expect(s.fullTurn).toBe(false);
    expect(s.locks.length).toBeGreaterThan(0);
    const lock = s.locks[0];
    expect(Math.abs(lock.from - endsAt)).toBeLessThanOrEqual(Math.abs(h) * 1.001);
    expect(s.deadCentres.some((d) => d.kind === 'limit' && d.value === lock.from)).toBe(true);
    // The sample past the end is off the branch, or the lock ends before it.
    if (s.assembled[reached] === 1) expect((lock.to - lock.from) * direction).toBeLessThan((s.values[reached] - lock.from) * direction);
  }
  return { reached, endsAt, locks: s.locks, assembled: s.assembled };
}

/**
 * Stephenson III six-bars whose input crank drives the coupler through a connector.
 * The first is the issue's case, a fixture kept for the bug it caught: sampled at 1°
 * the Newton solve used to land on the other assembly branch (opposite sign of det J)
 * for a run of steps, a joint jumping over 100 mm between steps, with no lock reported.
 */
const STEPHENSON_III_BRANCH_JUMP = stephensonIII({
  A0: { x: 0, y: 0 }, B0: { x: 82.6, y: -33.4 }, C0: { x: 125.9, y: 120.7 },
  A: { x: -14.2, y: 54.1 }, B: { x: 97.2, y: 20.3 }, C: { x: 77.8, y: 136.5 }, D: { x: 187.2, y: 105.5 },
  P: { x: 51.1, y: 99.6 },
});

const STEPHENSON_III_DESIGNS: [string, Linkage][] = [
  ['issue fixture: branch jump at 1° steps', STEPHENSON_III_BRANCH_JUMP],
  ['second jump fixture', stephensonIII({
    A0: { x: 0, y: 0 }, B0: { x: 69.0, y: 26.9 }, C0: { x: 170.8, y: 95.3 },
    A: { x: 21.2, y: 64.3 }, B: { x: 77.3, y: 93.3 }, C: { x: 3.5, y: 67.7 }, D: { x: 155.9, y: 139.4 },
    P: { x: 11.1, y: 136.0 },
  })],
  ['third jump fixture', stephensonIII({
    A0: { x: 0, y: 0 }, B0: { x: 115.3, y: -29.7 }, C0: { x: 123.6, y: 99.5 },
    A: { x: -48.4, y: 70.1 }, B: { x: 93.5, y: 53.4 }, C: { x: 59.7, y: 137.3 }, D: { x: 176.1, y: 152.0 },
    P: { x: 29.7, y: 105.3 },
  })],
  ['the default (a full turn)', stephensonIII()],
];

describe('sweep stays on the reference branch (independent method: fine continuation of the body distances)', () => {
  it.each(STEPHENSON_III_DESIGNS)('Stephenson III, %s, both ways from the reference', (_name, linkage) => {
    compareWithContinuation(linkage, 1);
    compareWithContinuation(linkage, -1);
  });

  it.each<[string, Linkage]>([
    ['Stephenson II (Newton block)', stephensonII()],
    ['Stephenson I', stephensonI()],
    ['Watt I', wattI()],
    ['Watt II', wattII()],
  ])('%s, both ways from the reference', (_name, linkage) => {
    compareWithContinuation(linkage, 1);
    compareWithContinuation(linkage, -1);
  });
});

describe('a lock of a Newton block narrower than a step (independent method: fine continuation both ways round)', () => {
  it('is listed, between two assembled samples, from the fold where the branch ends to the fold where it comes back', () => {
    // The default Stephenson III with its input tip D moved 30.9736 mm along +x: just past
    // the design where the connector's reach first falls short, so the lock is narrow.
    const linkage = stephensonIII({ ...STEPHENSON_III_DEFAULT, D: { x: 200.9736, y: 115 } });
    const up = compareWithContinuation(linkage, 1);
    const down = compareWithContinuation(linkage, -1);
    if (up.endsAt === null || down.endsAt === null) throw new Error('expected the branch to end both ways');
    // Source: independent method, the fine continuation, run up from the reference to the
    // near fold and down (the other way round) to the far one.
    const far = down.endsAt + 2 * Math.PI;
    const h = (2 * Math.PI) / (360 * FINE);
    // Narrower than the 1° sample step, and no sample in it.
    expect(far - up.endsAt).toBeLessThan(Math.PI / 180);
    expect(Array.from(up.assembled).every((f) => f === 1)).toBe(true);
    expect(up.locks).toHaveLength(1);
    expect(Math.abs(up.locks[0].to - far)).toBeLessThanOrEqual(h * 1.001);
  });
});

describe('loci analyze of the issue fixture reports the reference branch (independent method: fine continuation)', () => {
  it('its default range ends where the branch ends, both ends listed as dead centres, and every pose is the branch’s', () => {
    const plan = compiled(STEPHENSON_III_BRANCH_JUMP);
    const forward = compareWithContinuation(STEPHENSON_III_BRANCH_JUMP, 1);
    const backward = compareWithContinuation(STEPHENSON_III_BRANCH_JUMP, -1);
    expect(forward.endsAt).not.toBeNull();
    expect(backward.endsAt).not.toBeNull();
    const result = analyzeLinkage(plan);
    if (!result.ok) throw new Error(JSON.stringify(result.issues));
    const { driver, defects, joints, values } = result.report;
    const deg = 180 / Math.PI;
    const fineStepDeg = 360 / (360 * FINE);
    // Source: independent method, the fine continuation above, both ways.
    expect(driver.rangeRule).toBe('assembly range');
    expect(Math.abs(driver.from - (backward.endsAt ?? NaN) * deg)).toBeLessThan(fineStepDeg);
    expect(Math.abs(driver.to - (forward.endsAt ?? NaN) * deg)).toBeLessThan(fineStepDeg);
    expect(defects.deadCentres.map((dc) => dc.kind)).toEqual(['limit', 'limit']);
    expect(defects.locks).toEqual([]);
    // Every reported pose on the branch: continue from the reference to each value in fine steps.
    const fine = new Continuation(STEPHENSON_III_BRANCH_JUMP);
    // Down from the reference, then up from it again.
    const indices = values.map((_, k) => k);
    const below = indices.filter((k) => values[k] / deg < plan.driverReferenceValue).reverse();
    const above = indices.filter((k) => values[k] / deg >= plan.driverReferenceValue);
    const start = Float64Array.from(fine.pos);
    for (const part of [below, above]) {
      fine.pos.set(start);
      let v = plan.driverReferenceValue;
      for (const k of part) {
        const target = values[k] / deg;
        const n = Math.max(1, Math.ceil(Math.abs(target - v) / (fineStepDeg / deg)));
        for (let i = 1; i <= n; i++) expect(fine.solveAt(v + ((target - v) * i) / n)).toBe(true);
        v = target;
        for (const joint of joints) {
          const [x, y] = fine.at(joint.id);
          const xy = joint.path[k];
          expect(xy).not.toBeNull();
          if (xy !== null) expect(Math.hypot(xy[0] - x, xy[1] - y)).toBeLessThan(1e-6 * fine.sizeMm);
        }
      }
    }
  });
});
