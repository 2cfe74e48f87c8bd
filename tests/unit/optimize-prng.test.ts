import { describe, expect, it } from 'vitest';
import { MAX_INT_RANGE, Prng } from '../../src/core/optimize';

function draws(rng: Prng, n: number): number[] {
  return Array.from({ length: n }, () => rng.nextUint32());
}

// Check values: the reference C code of Blackman and Vigna (prng.di.unimi.it,
// xoshiro128starstar.c: next() and jump()) and Vigna's splitmix64.c, compiled with gcc and
// run; the two 64-bit SplitMix64 outputs fill the state as (low, high, low, high) words.
// SplitMix64 from seed 0 first gives 0xe220a8397b1dcdaf, which those words confirm.
const REFERENCE = {
  raw1234: [11520, 0, 5927040, 70819200, 2031721883, 1637235492],
  seed0: {
    words: [2065550767, 3793791033, 2713282036, 1853398634],
    out: [3737715805, 2584255861, 2876756834, 3286328325, 1553311962, 1625202774],
    jump1: [3627099225, 346338634, 1796495240, 3319821680, 3325258706, 328727121],
    jump3: [3111776731, 437878938, 871636892, 2413884762, 2949050279, 1128117593],
  },
  seed42: {
    words: [803958421, 3184996902, 2993090819, 686809907],
    out: [1776835114, 4165204688, 17111135, 2317295270, 2792088233, 2554630222],
    jump1: [2449739786, 2605826980, 3103900246, 3575675664, 3003299767, 1915705012],
    after1000: [2461400489, 3880440499, 1625279119, 3870270417],
  },
  seedMaxSafe: {
    words: [4021704095, 616124332, 3074421144, 818148089],
    out: [1233166643, 1287031142, 661813442, 2960669951, 2601079046, 1036114921],
  },
};

describe('xoshiro128** against the reference C implementation', () => {
  it('gives the reference outputs from a raw state', () => {
    const rng = Prng.fromState({ algorithm: 'xoshiro128**', words: [1, 2, 3, 4] });
    expect(draws(rng, 6)).toEqual(REFERENCE.raw1234);
  });

  it('seeds through SplitMix64 as the reference does', () => {
    expect(Prng.fromSeed(0).exportState().words).toEqual(REFERENCE.seed0.words);
    expect(draws(Prng.fromSeed(0), 6)).toEqual(REFERENCE.seed0.out);
    expect(Prng.fromSeed(42).exportState().words).toEqual(REFERENCE.seed42.words);
    expect(draws(Prng.fromSeed(42), 6)).toEqual(REFERENCE.seed42.out);
    expect(Prng.fromSeed(Number.MAX_SAFE_INTEGER).exportState().words).toEqual(REFERENCE.seedMaxSafe.words);
    expect(draws(Prng.fromSeed(Number.MAX_SAFE_INTEGER), 6)).toEqual(REFERENCE.seedMaxSafe.out);
  });

  it('splits by the reference jump: stream k is k + 1 jumps of 2^64 draws', () => {
    expect(draws(Prng.fromSeed(0).split(0), 6)).toEqual(REFERENCE.seed0.jump1);
    expect(draws(Prng.fromSeed(0).split(2), 6)).toEqual(REFERENCE.seed0.jump3);
    expect(draws(Prng.fromSeed(42).split(0), 6)).toEqual(REFERENCE.seed42.jump1);
  });

  it('reaches the reference state after 1000 draws', () => {
    const rng = Prng.fromSeed(42);
    draws(rng, 1000);
    expect(rng.exportState().words).toEqual(REFERENCE.seed42.after1000);
  });
});

describe('Prng state and streams', () => {
  it('continues exactly after a JSON round trip of its state', () => {
    const a = Prng.fromSeed(7);
    draws(a, 123);
    const b = Prng.fromState(JSON.parse(JSON.stringify(a.exportState())));
    expect(draws(b, 50)).toEqual(draws(a, 50));
  });

  it('split leaves the parent unchanged and gives distinct, reproducible streams', () => {
    const parent = Prng.fromSeed(9);
    const before = parent.exportState();
    const streams = [0, 1, 2, 3].map((k) => draws(parent.split(k), 8));
    expect(parent.exportState()).toEqual(before);
    expect(draws(parent.split(1), 8)).toEqual(streams[1]);
    const all = [draws(parent.clone(), 8), ...streams].map((s) => s.join(','));
    expect(new Set(all).size).toBe(5);
  });

  it('rejects seeds, streams and states that are not what it needs', () => {
    expect(() => Prng.fromSeed(-1)).toThrow(/seed is -1/);
    expect(() => Prng.fromSeed(1.5)).toThrow(/safe integer/);
    expect(() => Prng.fromSeed(0).split(-1)).toThrow(/stream/);
    expect(Prng.checkState({ algorithm: 'xoshiro128**', words: [0, 0, 0, 0] })).toMatch(/all zero/);
    expect(Prng.checkState({ algorithm: 'xoshiro128**', words: [1, 2, 3] })).toMatch(/4 integers/);
    expect(Prng.checkState({ algorithm: 'xoshiro128**', words: [1, 2, 3, 2 ** 32] })).toMatch(/\[0, 2\^32\)/);
    expect(Prng.checkState({ algorithm: 'mt19937', words: [1, 2, 3, 4] })).toMatch(/algorithm/);
    expect(Prng.checkState(null)).toMatch(/not an object/);
  });
});

describe('Prng distributions', () => {
  const N = 200_000;

  it('float is in [0, 1) with mean 1/2 and variance 1/12 (uniform law)', () => {
    const rng = Prng.fromSeed(1);
    let sum = 0;
    let sumSq = 0;
    let min = 1;
    let max = 0;
    for (let i = 0; i < N; i++) {
      const u = rng.float();
      sum += u;
      sumSq += u * u;
      min = Math.min(min, u);
      max = Math.max(max, u);
    }
    expect(min).toBeGreaterThanOrEqual(0);
    expect(max).toBeLessThan(1);
    const mean = sum / N;
    // Standard error of the mean of U(0,1): sqrt(1/12/N); 5 standard errors.
    expect(Math.abs(mean - 0.5)).toBeLessThan(5 * Math.sqrt(1 / 12 / N));
    expect(Math.abs(sumSq / N - mean * mean - 1 / 12)).toBeLessThan(1e-3);
  });

  it('fillFloats gives the numbers float() would', () => {
    const a = Prng.fromSeed(3);
    const b = Prng.fromSeed(3);
    const block = new Float64Array(37);
    a.fillFloats(block, 37);
    expect(Array.from(block)).toEqual(Array.from({ length: 37 }, () => b.float()));
    expect(a.exportState()).toEqual(b.exportState());
  });

  it('int(n) stays in range and passes a chi-square test of uniformity', () => {
    const rng = Prng.fromSeed(2);
    const n = 7;
    const counts = new Array<number>(n).fill(0);
    for (let i = 0; i < 70_000; i++) counts[rng.int(n)]++;
    const expected = 70_000 / n;
    const chi2 = counts.reduce((s, c) => s + ((c - expected) * (c - expected)) / expected, 0);
    // Critical value of chi-square, 6 degrees of freedom, alpha = 0.001: 22.458
    // (NIST/SEMATECH e-Handbook of Statistical Methods, table 1.3.6.7.4; from memory).
    expect(chi2).toBeLessThan(22.458);
    let wrong = 0;
    for (let i = 0; i < 1000; i++) if (rng.int(1) !== 0) wrong++;
    for (let i = 0; i < 1000; i++) {
      const k = rng.int(MAX_INT_RANGE);
      if (!(k >= 0 && k < MAX_INT_RANGE && Number.isInteger(k))) wrong++;
    }
    expect(wrong).toBe(0);
    expect(() => rng.int(0)).toThrow(RangeError);
    expect(() => rng.int(2.5)).toThrow(RangeError);
    expect(() => rng.int(MAX_INT_RANGE + 1)).toThrow(RangeError);
    expect(() => rng.int(Number.NaN)).toThrow(RangeError);
  });

  it('normal has mean 0, variance 1 and P(|Z| < 1) = erf(1/√2) = 0.682689', () => {
    const rng = Prng.fromSeed(4);
    let sum = 0;
    let sumSq = 0;
    let inside = 0;
    for (let i = 0; i < N; i++) {
      const z = rng.normal();
      sum += z;
      sumSq += z * z;
      if (Math.abs(z) < 1) inside++;
    }
    expect(Math.abs(sum / N)).toBeLessThan(5 / Math.sqrt(N));
    // Var of the sample variance of N(0,1) is 2/N; 5 standard errors.
    expect(Math.abs(sumSq / N - 1)).toBeLessThan(5 * Math.sqrt(2 / N));
    // Standard normal: P(|Z| < 1) = 0.6826894921 (any table of the normal law).
    const p = 0.6826894921;
    expect(Math.abs(inside / N - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / N));
  });

  it('fillNormals, which uses both deviates of each disc point, has the same law', () => {
    const rng = Prng.fromSeed(6);
    const z = new Float64Array(N + 1); // odd count: the last pair is cut
    rng.fillNormals(z, N + 1);
    let sum = 0;
    let sumSq = 0;
    let inside = 0;
    let product = 0;
    for (let i = 0; i < N; i++) {
      sum += z[i];
      sumSq += z[i] * z[i];
      if (Math.abs(z[i]) < 1) inside++;
      if (i % 2 === 0) product += z[i] * z[i + 1];
    }
    expect(Math.abs(sum / N)).toBeLessThan(5 / Math.sqrt(N));
    expect(Math.abs(sumSq / N - 1)).toBeLessThan(5 * Math.sqrt(2 / N));
    const p = 0.6826894921;
    expect(Math.abs(inside / N - p)).toBeLessThan(5 * Math.sqrt((p * (1 - p)) / N));
    // The two deviates of a pair are independent (Marsaglia and Bray, 1964): E[z1 z2] = 0, Var = 1.
    expect(Math.abs(product / (N / 2))).toBeLessThan(5 / Math.sqrt(N / 2));
  });

  it('cauchy has median 0 and quartiles ±1 (standard Cauchy: F(x) = 1/2 + atan(x)/π)', () => {
    const rng = Prng.fromSeed(5);
    let inside = 0;
    let above = 0;
    let positive = 0;
    let nonFinite = 0;
    for (let i = 0; i < N; i++) {
      const c = rng.cauchy();
      if (!Number.isFinite(c)) nonFinite++;
      if (Math.abs(c) < 1) inside++;
      if (c > 1) above++;
      if (c > 0) positive++;
    }
    expect(nonFinite).toBe(0);
    const se = (p: number) => 5 * Math.sqrt((p * (1 - p)) / N);
    expect(Math.abs(inside / N - 0.5)).toBeLessThan(se(0.5));
    expect(Math.abs(above / N - 0.25)).toBeLessThan(se(0.25));
    expect(Math.abs(positive / N - 0.5)).toBeLessThan(se(0.5));
  });
});
