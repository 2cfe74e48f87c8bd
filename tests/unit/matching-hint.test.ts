import { describe, expect, it } from 'vitest';
import { Prng } from '../../src/core/optimize/prng';
import { createMatchScratch, matchInOrder } from '../../src/core/synthesis/timing';

/**
 * The cyclic in-order match with a hint (an earlier match bounding the answer, so that
 * blocks of samples are skipped unevaluated) against the plain dynamic programme written
 * here, one pass per start, every cost computed, nothing skipped: the same indices and
 * the same total to the bit, whatever the hint (the optimum itself, a near one, a poor
 * one, one no pass could find), with weights, unassembled samples and ties.
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

/** The plain dynamic programme (Loci, timing.ts before its cost table and abandoning; transcribed from tests/unit/synthesis/matchInOrder.test.ts). */
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


/** A non-decreasing sequence near `base`: each index moved by up to ±spread, then sorted. */
function nearSequence(prng: Prng, base: Int32Array, spread: number): Int32Array {
  const out = Int32Array.from(base, (v) => v + Math.round((2 * prng.float() - 1) * spread));
  return out.sort();
}

describe('matchInOrder with a hint', () => {
  it('gives the plain programme its indices and total to the bit, whatever the hint', () => {
    // Source: the plain dynamic programme, transcribed above (a second implementation with no bounds); Bellman, 1957.
    const prng = Prng.fromSeed(20261203);
    const sizes = [
      [24, 180],
      [6, 40],
      [3, 17],
      [40, 200],
    ];
    for (let trial = 0; trial < 240; trial++) {
      const [n, m] = sizes[trial % sizes.length];
      const c = randomCase(prng, n, m, { weights: trial % 2 === 1, invalid: trial % 3 === 0, ties: trial % 5 === 0 });
      const want = new Int32Array(n);
      const ref = plainDp(c, n, m, true, want);
      const scratch = createMatchScratch(n, m);
      const hints = [
        Int32Array.from(want),
        nearSequence(prng, want, 2),
        nearSequence(prng, want, m / 8),
        Int32Array.from({ length: n }, (_, i) => Math.floor((i * m) / n) - m),
        new Int32Array(n).fill(Math.floor(prng.float() * m)),
        // Not a match any pass may find: decreasing, or longer than the loop.
        Int32Array.from({ length: n }, (_, i) => n - i),
        Int32Array.from({ length: n }, (_, i) => i * 2 * m),
      ];
      for (const [h, hint] of hints.entries()) {
        const index = new Int32Array(n);
        const got = matchInOrder(c.samples, c.valid, c.targets, c.weights, true, scratch, index, hint);
        expect(Object.is(got, ref), `trial ${trial} hint ${h}: ${got} vs ${ref}`).toBe(true);
        expect(Array.from(index), `trial ${trial} hint ${h}`).toEqual(Array.from(want));
      }
    }
  });
});
