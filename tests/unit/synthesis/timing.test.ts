import { describe, expect, it } from 'vitest';
import {
  CandidateArchive,
  compareCandidates,
  createMatchScratch,
  matchInOrder,
  orderViolation,
  refineDriverValue,
  type CurveEvaluator,
} from '../../../src/core/synthesis';

const TAU = 2 * Math.PI;

/** A circle of radius r about the origin, parameterised by angle: a curve with known closest points. */
function circle(r: number): CurveEvaluator {
  return {
    secondDerivatives: true,
    atIo(_order, out) {
      const t = out[6];
      out[0] = r * Math.cos(t);
      out[1] = r * Math.sin(t);
      out[2] = -r * Math.sin(t);
      out[3] = r * Math.cos(t);
      out[4] = -r * Math.cos(t);
      out[5] = -r * Math.sin(t);
      out[7] = 1;
    },
  };
}

function sampled(r: number, m: number): Float64Array {
  const s = new Float64Array(2 * m);
  for (let j = 0; j < m; j++) {
    s[2 * j] = r * Math.cos((j * TAU) / m);
    s[2 * j + 1] = r * Math.sin((j * TAU) / m);
  }
  return s;
}

describe('matchInOrder', () => {
  it('matches points on a loop in order, through the end of the samples when cyclic', () => {
    const m = 72;
    const angles = [5.5, 6.0, 0.3, 1.0];
    const targets = Float64Array.from(angles.flatMap((a) => [1.1 * Math.cos(a), 1.1 * Math.sin(a)]));
    const valid = new Uint8Array(m).fill(1);
    const index = new Int32Array(4);
    matchInOrder(sampled(1, m), valid, targets, undefined, true, false, createMatchScratch(4, m), index);
    for (let i = 1; i < 4; i++) expect(index[i]).toBeGreaterThanOrEqual(index[i - 1]);
    index.forEach((u, i) => {
      const t = (u * TAU) / m;
      const d = Math.abs(((t - angles[i] + 3 * Math.PI) % TAU) - Math.PI);
      expect(d).toBeLessThanOrEqual(TAU / m / 2 + 1e-12);
    });
  });

  it('keeps the order without wrap even when the nearest samples are out of order', () => {
    const m = 36;
    // Point 2 lies nearest sample 0 but must come after point 1 (near sample 18).
    const targets = Float64Array.from([Math.cos(1), Math.sin(1), -1, 0, 1, 0.01]);
    const index = new Int32Array(3);
    matchInOrder(sampled(1, m), new Uint8Array(m).fill(1), targets, undefined, false, false, createMatchScratch(3, m), index);
    expect(index[0]).toBeLessThanOrEqual(index[1]);
    expect(index[1]).toBeLessThanOrEqual(index[2]);
    expect(index[1]).toBe(18);
  });

  it('never matches a sample where the mechanism does not assemble', () => {
    const m = 36;
    const valid = new Uint8Array(m).fill(1);
    valid[9] = 0;
    const targets = Float64Array.from([1, 0, 0, 1, -1, 0]);
    const index = new Int32Array(3);
    matchInOrder(sampled(1, m), valid, targets, undefined, false, false, createMatchScratch(3, m), index);
    expect(index[1]).not.toBe(9);
  });
});

describe('refineDriverValue', () => {
  it('converges to the closest point of a circle within its bounds', () => {
    // The closest point of a circle to an outside point lies on the ray to it (theorem).
    const io = Float64Array.from([0.5, 3 * Math.cos(0.9), 3 * Math.sin(0.9), 0, TAU, 0.5]);
    refineDriverValue(circle(2), io, 20, new Float64Array(8));
    expect(io[0]).toBeCloseTo(0.9, 12);
    // A bound it must not cross.
    const bounded = Float64Array.from([0.5, 3 * Math.cos(0.9), 3 * Math.sin(0.9), 0, 0.7, 0.5]);
    refineDriverValue(circle(2), bounded, 20, new Float64Array(8));
    expect(bounded[0]).toBeCloseTo(0.7, 12);
  });

  it('stops on a curve that returns NaN', () => {
    const broken: CurveEvaluator = {
      secondDerivatives: false,
      atIo(_o, out) {
        out.fill(NaN);
      },
    };
    const io = Float64Array.from([1, 0, 0, 0, TAU, 0.5]);
    refineDriverValue(broken, io, 1000, new Float64Array(8));
    expect(io[0]).toBe(1);
  });
});

describe('orderViolation', () => {
  it('is zero for increasing values and grows with a decrease', () => {
    expect(orderViolation([0.1, 0.5, 2], 0, 3, false, TAU)).toBe(0);
    expect(orderViolation([0.1, 0.5, 0.2], 0, 3, false, TAU)).toBeCloseTo(0.3 / TAU, 15);
  });

  it('with wrap accepts one pass through 2π and rejects more than a turn', () => {
    expect(orderViolation([5, 6, 0.5, 1], 0, 4, true, TAU)).toBe(0);
    expect(orderViolation([5, 6, 0.5, 1], 0, 4, false, TAU)).toBeGreaterThan(0);
    // 5 → 1 → 4.9 goes round more than once.
    expect(orderViolation([5, 1, 4.9, 5.2], 0, 4, true, TAU)).toBeGreaterThan(0);
  });
});

describe('ranking and archive', () => {
  it('ranks feasible first, then by value; infeasible by violation (Deb, 2000)', () => {
    const list = [
      { value: 1, violation: 0.5 },
      { value: 5, violation: 0 },
      { value: NaN, violation: 0 },
      { value: 2, violation: 0 },
      { value: 0.1, violation: 0.7 },
    ];
    list.sort(compareCandidates);
    expect(list.map((c) => [c.value, c.violation])).toEqual([[2, 0], [5, 0], [1, 0.5], [0.1, 0.7], [NaN, 0]]);
  });

  it('keeps the best K distinct candidates', () => {
    const archive = new CandidateArchive(2, 0.05, [0, 0], [10, 10]);
    expect(archive.offer([1, 1], 3, 0)).toBe(true);
    // Within 5 % of the box of the first, and better: replaces it.
    expect(archive.offer([1.2, 1.1], 2, 0)).toBe(true);
    expect(archive.size).toBe(1);
    expect(archive.offer([8, 8], 5, 0)).toBe(true);
    expect(archive.offer([5, 1], 9, 0)).toBe(false);
    expect(archive.offer([5, 1], 1, 0)).toBe(true);
    expect(archive.entries().map((e) => e.value)).toEqual([1, 2]);
    expect(Array.from(archive.entries()[1].x)).toEqual([1.2, 1.1]);
  });
});
