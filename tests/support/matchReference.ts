/**
 * The in-order matcher's reference for tests: the plain dynamic programme (one pass per
 * start, every cost computed, nothing skipped; Bellman 1957), as timing.ts had it before
 * its cost table, abandoning and bounds (with its barriers: no two consecutive points on
 * either side of a sample that does not assemble), and the seeded cases both matcher
 * tests draw.
 */
import type { Prng } from '../../src/core/optimize/prng';
import { CYCLIC_START_CANDIDATES } from '../../src/core/synthesis/timing';

export interface Case {
  readonly samples: Float64Array;
  readonly valid: Uint8Array;
  readonly targets: Float64Array;
  readonly weights: Float64Array | undefined;
}

export function cost(c: Case, i: number, j: number): number {
  if (c.valid[j] === 0) return Infinity;
  const dx = c.samples[2 * j] - c.targets[2 * i];
  const dy = c.samples[2 * j + 1] - c.targets[2 * i + 1];
  return (c.weights === undefined ? 1 : c.weights[i]) * (dx * dx + dy * dy);
}

/** Local minima of point 0's cost along the loop: where the matcher documents its cyclic starts. */
export function cyclicStarts(c: Case, m: number): { j: number; c: number }[] {
  const minima: { j: number; c: number }[] = [];
  for (let j = 0; j < m; j++) {
    const here = cost(c, 0, j);
    if (!(here < Infinity)) continue;
    if (here <= cost(c, 0, (j + m - 1) % m) && here < cost(c, 0, (j + 1) % m)) minima.push({ j, c: here });
  }
  return minima;
}

/** The plain dynamic programme, as timing.ts had it before its cost table and abandoning; `barriers` false: points may be matched on either side of a sample that does not assemble, as before its barriers. */
export function plainDp(c: Case, n: number, m: number, cyclic: boolean, out: Int32Array, barriers = true): number {
  const pass = (first: number, span: number, unrolled: Int32Array): number => {
    let prev = new Float64Array(m);
    const arg = new Int32Array(n * m);
    for (let u = 0; u < m; u++) prev[u] = u <= span ? cost(c, 0, (first + u) % m) : Infinity;
    for (let i = 1; i < n; i++) {
      const cur = new Float64Array(m);
      let best = Infinity;
      let bestU = 0;
      for (let u = 0; u < m; u++) {
        // A sample that does not assemble: no point before it is followed by one after it.
        if (barriers && c.valid[(first + u) % m] === 0) best = Infinity;
        else if (prev[u] < best) {
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
  // Keep the CYCLIC_START_CANDIDATES cheapest, replacing the worst as they come (the documented rule).
  const kept: { j: number; c: number }[] = [];
  for (const s of starts) {
    if (kept.length < CYCLIC_START_CANDIDATES) kept.push(s);
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

export function randomCase(prng: Prng, n: number, m: number, opts: { weights: boolean; invalid: boolean; ties: boolean }): Case {
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
