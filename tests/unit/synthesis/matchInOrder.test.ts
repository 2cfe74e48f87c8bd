import { describe, expect, it } from 'vitest';
import { createMatchScratch, matchInOrder } from '../../../src/core/synthesis';
import { Prng } from '../../../src/core/optimize/prng';

/**
 * matchInOrder against two references written here: an exhaustive search over every
 * admissible index sequence (an independent method; small cases), and the plain
 * dynamic programme the matcher replaced (one pass per start, costs recomputed in every
 * cell, no abandoning), which must give the same indices, ties included.
 */

interface Case {
  readonly samples: Float64Array;
  readonly valid: Uint8Array;
  readonly targets: Float64Array;
  readonly weights: Float64Array | undefined;
}

function cost(c: Case, i: number, j: number): number {
  if (c.valid[j] === 0) return Infinity;
  const dx = c.samples[2 * j] - c.targets[2 * i];
  const dy = c.samples[2 * j + 1] - c.targets[2 * i + 1];
  return (c.weights === undefined ? 1 : c.weights[i]) * (dx * dx + dy * dy);
}

/** Local minima of point 0's cost along the loop: where the matcher documents its cyclic starts. */
function cyclicStarts(c: Case, m: number): { j: number; c: number }[] {
  const minima: { j: number; c: number }[] = [];
  for (let j = 0; j < m; j++) {
    const here = cost(c, 0, j);
    if (!(here < Infinity)) continue;
    if (here <= cost(c, 0, (j + m - 1) % m) && here < cost(c, 0, (j + 1) % m)) minima.push({ j, c: here });
  }
  return minima;
}

/**
 * Exhaustive: every non-decreasing u₀ ≤ u₁ ≤ … ≤ uₙ₋₁ in 0..m−1 with u₀ ≤ firstSpan,
 * sample (first + u) mod m; the least total (Infinity when none is finite).
 */
function exhaustive(c: Case, n: number, m: number, first: number, firstSpan: number): number {
  let best = Infinity;
  const u = new Array<number>(n).fill(0);
  const visit = (i: number, from: number, sum: number): void => {
    if (i === n) {
      if (sum < best) best = sum;
      return;
    }
    const to = i === 0 ? Math.min(firstSpan, m - 1) : m - 1;
    for (let v = from; v <= to; v++) {
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

/** The dynamic programme as it was before the cost table and abandoning (Loci, earlier timing.ts). */
function plainDp(c: Case, n: number, m: number, cyclic: boolean, out: Int32Array): number {
  const pass = (first: number, span: number, unrolled: Int32Array): number => {
    let prev = new Float64Array(m);
    const arg = new Int32Array(n * m);
    for (let u = 0; u < m; u++) prev[u] = u <= span ? cost(c, 0, (first + u) % m) : Infinity;
    for (let i = 1; i < n; i++) {
      const cur = new Float64Array(m);
      let best = Infinity;
      let bestU = 0;
      for (let u = 0; u < m; u++) {
        if (prev[u] < best) {
          best = prev[u];
          bestU = u;
        }
        arg[i * m + u] = bestU;
        cur[u] = best + cost(c, i, (first + u) % m);
      }
      prev = cur;
    }
    let best = Infinity;
    let bestU = 0;
    for (let u = 0; u < m; u++) {
      if (prev[u] < best) {
        best = prev[u];
        bestU = u;
      }
    }
    unrolled[n - 1] = bestU;
    for (let i = n - 1; i > 0; i--) unrolled[i - 1] = arg[i * m + unrolled[i]];
    return best;
  };
  const unrolled = new Int32Array(n);
  if (!cyclic) {
    const total = pass(0, m - 1, unrolled);
    out.set(unrolled);
    return total;
  }
  let starts = cyclicStarts(c, m);
  // Keep the three cheapest, replacing the worst as they come (the documented rule).
  const kept: { j: number; c: number }[] = [];
  for (const s of starts) {
    if (kept.length < 3) kept.push(s);
    else {
      let worst = 0;
      for (let k = 1; k < kept.length; k++) if (kept[k].c > kept[worst].c) worst = k;
      if (s.c < kept[worst].c) kept[worst] = s;
    }
  }
  starts = kept.length > 0 ? kept : [{ j: 0, c: 0 }];
  const half = Math.max(1, Math.floor(m / 16));
  let best = Infinity;
  starts.forEach((s, k) => {
    const total = pass((s.j - half + m) % m, 2 * half, unrolled);
    if (total < best || k === 0) {
      best = total;
      for (let i = 0; i < n; i++) out[i] = s.j - half + unrolled[i];
    }
  });
  return best;
}

function randomCase(prng: Prng, n: number, m: number, opts: { weights: boolean; invalid: boolean; ties: boolean }): Case {
  const samples = new Float64Array(2 * m);
  // A wobbly closed loop, sampled in order, so the local minima and windows are realistic.
  const r = 0.5 + prng.float();
  const k = 1 + Math.floor(prng.float() * 3);
  const amp = 0.4 * prng.float();
  for (let j = 0; j < m; j++) {
    const t = (2 * Math.PI * j) / m;
    const rr = r * (1 + amp * Math.cos(k * t));
    samples[2 * j] = rr * Math.cos(t);
    samples[2 * j + 1] = rr * Math.sin(t);
  }
  if (opts.ties) {
    // Repeated samples: equal costs the tie rule must settle the same way.
    for (let j = 1; j < m; j += 3) {
      samples[2 * j] = samples[2 * j - 2];
      samples[2 * j + 1] = samples[2 * j - 1];
    }
  }
  const valid = new Uint8Array(m).fill(1);
  if (opts.invalid) {
    const from = Math.floor(prng.float() * m);
    const len = Math.floor(prng.float() * (m / 2));
    for (let q = 0; q < len; q++) valid[(from + q) % m] = 0;
  }
  const targets = new Float64Array(2 * n);
  const start = prng.float() * 2 * Math.PI;
  for (let i = 0; i < n; i++) {
    const t = start + (2 * Math.PI * i) / n + 0.3 * (prng.float() - 0.5);
    targets[2 * i] = r * Math.cos(t) + 0.2 * (prng.float() - 0.5);
    targets[2 * i + 1] = r * Math.sin(t) + 0.2 * (prng.float() - 0.5);
  }
  if (opts.ties) targets.copyWithin(2, 0, 2);
  let weights: Float64Array | undefined;
  if (opts.weights) {
    weights = new Float64Array(n);
    for (let i = 0; i < n; i++) weights[i] = opts.ties ? 1 + (i % 2) : 0.1 + 3 * prng.float();
  }
  return { samples, valid, targets, weights };
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
      for (const cyclic of [false, true]) {
        const index = new Int32Array(n);
        const got = matchInOrder(c.samples, c.valid, c.targets, c.weights, cyclic, createMatchScratch(n, m), index);
        let want: number;
        if (!cyclic) {
          want = exhaustive(c, n, m, 0, m - 1);
        } else {
          const minima = cyclicStarts(c, m).sort((a, b) => a.c - b.c);
          const starts = minima.length > 0 ? minima.slice(0, 3) : [{ j: 0, c: 0 }];
          const half = Math.max(1, Math.floor(m / 16));
          want = Math.min(...starts.map((s) => exhaustive(c, n, m, (s.j - half + m) % m, 2 * half)));
        }
        expect(relClose(got, want), `trial ${trial} cyclic ${cyclic}: ${got} vs ${want}`).toBe(true);
        if (got < Infinity) {
          for (let i = 1; i < n; i++) expect(index[i]).toBeGreaterThanOrEqual(index[i - 1]);
          if (cyclic) expect(index[n - 1] - index[0]).toBeLessThan(m);
          expect(relClose(costOf(c, index, m), got)).toBe(true);
        }
        checked++;
      }
    }
    expect(checked).toBe(600);
  });

  it('gives the plain dynamic programme its exact indices and cost, ties included, at the sizes the objective uses', () => {
    // Source: the replaced algorithm, transcribed above (a second, independent implementation).
    const prng = Prng.fromSeed(11);
    const scratch = createMatchScratch(24, 180);
    for (let trial = 0; trial < 200; trial++) {
      const c = randomCase(prng, 24, 180, { weights: trial % 2 === 1, invalid: trial % 4 === 0, ties: trial % 5 === 0 });
      for (const cyclic of [false, true]) {
        const index = new Int32Array(24);
        const want = new Int32Array(24);
        // The same scratch every time: nothing may leak from one call to the next.
        const got = matchInOrder(c.samples, c.valid, c.targets, c.weights, cyclic, scratch, index);
        const ref = plainDp(c, 24, 180, cyclic, want);
        expect(relClose(got, ref), `trial ${trial} cyclic ${cyclic}`).toBe(true);
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
      expect(matchInOrder(c.samples, none, c.targets, undefined, cyclic, createMatchScratch(4, m), index)).toBe(Infinity);
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
    const got = matchInOrder(c.samples, c.valid, c.targets, undefined, true, createMatchScratch(3, m), index);
    expect(got).toBe(plainDp(c, 3, m, true, want));
    expect(Array.from(index)).toEqual(Array.from(want));
    expect(((index[0] % m) + m) % m).toBe(9);
  });
});
