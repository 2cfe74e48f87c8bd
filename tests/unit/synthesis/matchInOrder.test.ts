import { describe, expect, it } from 'vitest';
import { createMatchScratch, matchInOrder } from '../../../src/core/synthesis';
import { CYCLIC_START_CANDIDATES } from '../../../src/core/synthesis/timing';
import { Prng } from '../../../src/core/optimize/prng';
import { cost, cyclicStarts, plainDp, randomCase, type Case } from '../../support/matchReference';

/**
 * matchInOrder against two references written here: an exhaustive search over every
 * admissible index sequence (an independent method; small cases), and the plain
 * dynamic programme the matcher replaced (one pass per start, costs recomputed in every
 * cell, no abandoning), which must give the same indices, ties included.
 */

/**
 * Exhaustive: every non-decreasing u₀ ≤ u₁ ≤ … ≤ uₙ₋₁ in 0..m−1 with u₀ ≤ firstSpan,
 * sample (first + u) mod m (with `barriers`, no sample that does not assemble strictly
 * between two consecutive ones: the driver cannot turn through it); the least total
 * (Infinity when none is finite).
 */
function exhaustive(c: Case, n: number, m: number, first: number, firstSpan: number, barriers: boolean): number {
  let best = Infinity;
  const u = new Array<number>(n).fill(0);
  const visit = (i: number, from: number, sum: number): void => {
    if (i === n) {
      if (sum < best) best = sum;
      return;
    }
    const to = i === 0 ? Math.min(firstSpan, m - 1) : m - 1;
    for (let v = from; v <= to; v++) {
      if (barriers && i > 0 && v - 1 > from && c.valid[(first + v - 1) % m] === 0) break;
      u[i] = v;
      visit(i + 1, v, sum + cost(c, i, (first + v) % m));
    }
  };
  visit(0, 0, 0);
  return best;
}

/** The cost of an index sequence as matchInOrder reports it (unrolled indices). */
function costOf(c: Case, index: Int32Array, m: number): number {
  let sum = 0;
  for (let i = 0; i < index.length; i++) sum += cost(c, i, ((index[i] % m) + m) % m);
  return sum;
}

function relClose(a: number, b: number): boolean {
  if (a === b) return true;
  return Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b));
}

describe('matchInOrder against references', () => {
  it('finds the least in-order cost an exhaustive search finds (open and cyclic, weights, unassembled samples)', () => {
    // Source: theorem (a dynamic programme over a monotone assignment is exact; Bellman, 1957), checked by enumeration.
    const prng = Prng.fromSeed(7);
    let checked = 0;
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + Math.floor(prng.float() * 4);
      const m = 5 + Math.floor(prng.float() * 14);
      const c = randomCase(prng, n, m, { weights: trial % 2 === 0, invalid: trial % 3 === 0, ties: trial % 7 === 0 });
      for (const [cyclic, barriers] of [[false, false], [true, false], [false, true], [true, true]]) {
        const index = new Int32Array(n);
        const got = matchInOrder(c.samples, c.valid, c.targets, c.weights, cyclic, barriers, createMatchScratch(n, m), index);
        let want: number;
        if (!cyclic) {
          want = exhaustive(c, n, m, 0, m - 1, barriers);
        } else {
          const minima = cyclicStarts(c, m).sort((a, b) => a.c - b.c);
          const starts = minima.length > 0 ? minima.slice(0, CYCLIC_START_CANDIDATES) : [{ j: 0, c: 0 }];
          const half = Math.max(1, Math.floor(m / 16));
          want = Math.min(...starts.map((s) => exhaustive(c, n, m, (s.j - half + m) % m, 2 * half, barriers)));
        }
        expect(relClose(got, want), `trial ${trial} cyclic ${cyclic} barriers ${barriers}: ${got} vs ${want}`).toBe(true);
        if (got < Infinity) {
          for (let i = 1; i < n; i++) expect(index[i]).toBeGreaterThanOrEqual(index[i - 1]);
          if (cyclic) expect(index[n - 1] - index[0]).toBeLessThan(m);
          expect(relClose(costOf(c, index, m), got)).toBe(true);
        }
        checked++;
      }
    }
    expect(checked).toBe(1200);
  });

  it('gives the plain dynamic programme its exact indices and cost, ties included, at the sizes the objective uses', () => {
    // Source: the replaced algorithm, transcribed above (a second, independent implementation).
    const prng = Prng.fromSeed(11);
    const scratch = createMatchScratch(24, 180);
    for (let trial = 0; trial < 200; trial++) {
      const c = randomCase(prng, 24, 180, { weights: trial % 2 === 1, invalid: trial % 4 === 0, ties: trial % 5 === 0 });
      for (const [cyclic, barriers] of [[false, false], [true, false], [false, true], [true, true]]) {
        const index = new Int32Array(24);
        const want = new Int32Array(24);
        // The same scratch every time: nothing may leak from one call to the next.
        const got = matchInOrder(c.samples, c.valid, c.targets, c.weights, cyclic, barriers, scratch, index);
        const ref = plainDp(c, 24, 180, cyclic, want, barriers);
        expect(relClose(got, ref), `trial ${trial} cyclic ${cyclic} barriers ${barriers}`).toBe(true);
        expect(Array.from(index)).toEqual(Array.from(want));
      }
    }
  });

  it('answers Infinity, and the first sample for every point, when nothing assembles', () => {
    // Source: common practice (no admissible sample, no finite cost).
    const m = 12;
    const c = randomCase(Prng.fromSeed(3), 4, m, { weights: false, invalid: false, ties: false });
    const none = new Uint8Array(m);
    for (const cyclic of [false, true]) {
      const index = new Int32Array(4).fill(99);
      const want = new Int32Array(4);
      expect(matchInOrder(c.samples, none, c.targets, undefined, cyclic, true, createMatchScratch(4, m), index)).toBe(Infinity);
      plainDp({ ...c, valid: none }, 4, m, cyclic, want);
      expect(Array.from(index)).toEqual(Array.from(want));
    }
  });

  it('settles a tie between two cyclic starts as the plain programme does', () => {
    // Source: theorem (an ellipse is symmetric under a half turn: both ends of its minor axis are equally near its centre).
    const m = 36;
    const samples = new Float64Array(2 * m);
    for (let j = 0; j < m; j++) {
      samples[2 * j] = 2 * Math.cos((2 * Math.PI * j) / m);
      samples[2 * j + 1] = Math.sin((2 * Math.PI * j) / m);
    }
    const c: Case = { samples, valid: new Uint8Array(m).fill(1), targets: new Float64Array(6), weights: undefined };
    const index = new Int32Array(3);
    const want = new Int32Array(3);
    const got = matchInOrder(c.samples, c.valid, c.targets, undefined, true, false, createMatchScratch(3, m), index);
    expect(got).toBe(plainDp(c, 3, m, true, want));
    expect(Array.from(index)).toEqual(Array.from(want));
    expect(((index[0] % m) + m) % m).toBe(9);
  });
});
