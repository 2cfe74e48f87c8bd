/**
 * The allocation-free forms of the optimizers' per-point paths give the same bits as the
 * forms they replaced: the generator's draws, the canonical value and violation, the
 * best-point, elite and archive offers (array-and-index forms beside the scalar ones),
 * the handed-out batches, and each optimizer kind's whole seeded run (every 25th exported
 * state and the last, hashed).
 */
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalInto, createOptimizer, DistinctElite, Prng, Restart } from '../../src/core/optimize';
import { PointBatch } from '../../src/core/optimize/batch';
import { BestTracker } from '../../src/core/optimize/ranking';
import { CandidateArchive } from '../../src/core/synthesis/archive';

// Source: the previous implementation (git 778d6c7, src/core/optimize/prng.ts
// nextUint32, float and int), copied verbatim over a copy of the state words.
const previousPrng = {
  nextUint32(s: Int32Array): number {
    const s0 = s[0];
    const s1 = s[1];
    const s2 = s[2] ^ s0;
    const s3 = s[3] ^ s1;
    const m = Math.imul(s1, 5);
    const result = Math.imul((m << 7) | (m >>> 25), 9) >>> 0;
    s[0] = s0 ^ s3;
    s[1] = s1 ^ s2;
    s[2] = s2 ^ (s1 << 9);
    s[3] = (s3 << 11) | (s3 >>> 21);
    return result;
  },
  float(s: Int32Array): number {
    return previousPrng.nextUint32(s) * (1 / 4294967296);
  },
  int(s: Int32Array, n: number): number {
    let m = previousPrng.nextUint32(s) * n;
    let high = Math.floor(m * (1 / 4294967296));
    let low = m - high * 4294967296;
    if (low < n) {
      const threshold = (4294967296 - n) % n;
      for (let tries = 0; low < threshold && tries < 64; tries++) {
        m = previousPrng.nextUint32(s) * n;
        high = Math.floor(m * (1 / 4294967296));
        low = m - high * 4294967296;
      }
    }
    return high;
  },
};

/**
 * Digests of the same seeded runs made with the previous implementation (git 778d6c7,
 * before the per-point paths were made allocation-free), each run to its end.
 * Source: recorded by running `digest` below against that commit's src/core/optimize.
 */
const PREVIOUS_DIGESTS: Record<string, string> = {
  lshade: '6470ac7a03f50e45c1ca1f9e035a9caf6298b365cd35f979540d841e8efd1601',
  'de-rand-1-bin': '2c97308ff3c5bf09153f6f9310f41f6de4fd2788f1ee80eff913a27243a6a5d3',
  'nelder-mead': '9615424274605683d9887995ddeec4a11b7e554015cbee4a9182b47ebecee632',
  hybrid: 'a0e4402067e7e9ed65b39d70fc0bac0b6617756dd945552c29ff73b73aaaed13',
  restart: 'ca73b48cb6061ba032b7f0336ce1b26622cb4febd67e9174944c8399f09db0bd',
};

const SCENARIOS: Record<string, Record<string, unknown>> = {
  lshade: { kind: 'lshade', dim: 5, maxEvaluations: 6000, seed: 11, stream: 2 },
  'de-rand-1-bin': { kind: 'de-rand-1-bin', dim: 5, maxEvaluations: 6000, seed: 12, stream: 1 },
  'nelder-mead': { kind: 'nelder-mead', dim: 5, maxEvaluations: 3000, seed: 13, stream: 0 },
  // The hybrids name the global share the digests were recorded with (the default then).
  hybrid: { kind: 'hybrid', dim: 5, maxEvaluations: 6000, seed: 14, stream: 3, globalShare: 0.8 },
  restart: { kind: 'restart', inner: { kind: 'hybrid', globalShare: 0.8 }, runEvaluations: 1500, growRuns: true, dim: 5, maxEvaluations: 9000, seed: 15, stream: 4 },
};

/** A seeded run to its end on a shifted Rastrigin function with a linear constraint and some failed evaluations. */
function digest(name: string): { hex: string; restarts: number } {
  const made = createOptimizer(SCENARIOS[name] as never);
  if (!made.ok) throw new Error(made.reason);
  const opt = made.optimizer;
  const hash = createHash('sha256');
  for (let batch = 0; batch < 100000 && !opt.done(); batch++) {
    const points = opt.ask();
    const n = points.length;
    const values = new Float64Array(n);
    const violations = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      const p = points[k];
      let s = 10 * p.length;
      for (let j = 0; j < p.length; j++) {
        const t = 5.12 * (2 * p[j] - 1) - 0.7;
        s += t * t - 10 * Math.cos(2 * Math.PI * t);
      }
      values[k] = k % 97 === 5 ? Number.NaN : s;
      violations[k] = p[0] + p[1] > 1.6 ? p[0] + p[1] - 1.6 : 0;
    }
    opt.tell(points, values, violations);
    if (batch % 25 === 0) hash.update(JSON.stringify(opt.exportState()));
  }
  hash.update(JSON.stringify(opt.exportState()));
  return { hex: hash.digest('hex'), restarts: opt instanceof Restart ? opt.restarts() : 0 };
}

describe('allocation-free forms give the previous bits', () => {
  for (const name of Object.keys(SCENARIOS)) {
    it(`${name}: a whole seeded run exports the same states as before`, () => {
      const { hex, restarts } = digest(name);
      expect(hex).toBe(PREVIOUS_DIGESTS[name]);
      if (name === 'restart') expect(restarts).toBeGreaterThan(0);
    });
  }

  it('the generator draws what the previous nextUint32, float and int drew', () => {
    const prng = Prng.fromSeed(42).split(3);
    const words = Int32Array.from(prng.exportState().words, (w) => w | 0);
    const ranges = [1, 2, 3, 7, 100, 2 ** 21 - 1, 2 ** 21];
    for (let k = 0; k < 20000; k++) {
      const which = k % 3;
      if (which === 0) expect(prng.nextUint32()).toBe(previousPrng.nextUint32(words));
      else if (which === 1) expect(Object.is(prng.float(), previousPrng.float(words))).toBe(true);
      else {
        const n = ranges[k % ranges.length];
        expect(prng.int(n)).toBe(previousPrng.int(words, n));
      }
    }
  });

  it('canonicalInto ranks values and violations by the documented rule', () => {
    // Source: the ranking contract in ranking.ts's header, written out here independently:
    // a value is finite (−0 as +0) or +Infinity for NaN and ±Infinity; a violation ≤ 0 is 0,
    // NaN is +Infinity, and a failed value's violation is always +Infinity.
    const rankedValue = (a: number) => (Number.isFinite(a) ? (a === 0 ? 0 : a) : Infinity);
    const rankedViolation = (a: number, b: number) => (!Number.isFinite(a) || Number.isNaN(b) ? Infinity : b > 0 ? b : 0);
    const specials = [0, -0, 1.5, -2.25, 1e308, -1e-308, Infinity, -Infinity, Number.NaN, 5e-324];
    const values = new Float64Array(specials.length * specials.length);
    const violations = new Float64Array(values.length);
    specials.forEach((a, i) => specials.forEach((b, j) => {
      values[i * specials.length + j] = a;
      violations[i * specials.length + j] = b;
    }));
    const outValues = new Float64Array(values.length);
    const outViolations = new Float64Array(values.length);
    for (let k = 0; k < values.length; k++) {
      canonicalInto(values, violations, k, outValues, outViolations, k);
      expect(Object.is(outValues[k], rankedValue(values[k]))).toBe(true);
      expect(Object.is(outViolations[k], rankedViolation(values[k], violations[k]))).toBe(true);
      canonicalInto(values, undefined, k, outValues, outViolations, k);
      expect(Object.is(outViolations[k], rankedViolation(values[k], 0))).toBe(true);
    }
  });

  it('offer, the scalar front of offerAt, keeps the same best point, elite and archive (the whole-run hashes above guard offerAt itself)', () => {
    const dim = 4;
    const prng = Prng.fromSeed(9);
    const scalarBest = new BestTracker(dim);
    const arrayBest = new BestTracker(dim);
    const scalarElite = new DistinctElite(dim, 6, 0.15);
    const arrayElite = new DistinctElite(dim, 6, 0.15);
    const lower = [0, -1, 2, -5];
    const upper = [1, 1, 3, 5];
    const scalarArchive = new CandidateArchive(8, 0.1, lower, upper);
    const arrayArchive = new CandidateArchive(8, 0.1, lower, upper);
    const values = new Float64Array(1);
    const violations = new Float64Array(1);
    const point = new Float64Array(dim);
    for (let k = 0; k < 3000; k++) {
      for (let j = 0; j < dim; j++) point[j] = prng.float();
      // Ties and repeats on purpose: coarse values, some infeasible, some failed.
      const value = k % 53 === 0 ? Infinity : Math.round(prng.float() * 40) / 4;
      const violation = k % 53 === 0 ? Infinity : prng.float() < 0.3 ? Math.round(prng.float() * 8) / 8 : 0;
      values[0] = value;
      violations[0] = violation;
      expect(arrayBest.offerAt(point, 0, values, violations, 0)).toBe(scalarBest.offer(point, 0, value, violation));
      expect(arrayElite.offerAt(point, values, violations, 0)).toBe(scalarElite.offer(point, value, violation));
      expect(arrayArchive.offerAt(point, values, violations, 0)).toBe(scalarArchive.offer(point, value, violation));
    }
    expect(arrayBest).toEqual(scalarBest);
    expect(arrayElite.count).toBe(scalarElite.count);
    expect(arrayElite.x).toEqual(scalarElite.x);
    expect(arrayElite.values).toEqual(scalarElite.values);
    expect(arrayArchive.entries()).toEqual(scalarArchive.entries());
    expect(arrayArchive.size).toBeGreaterThan(1);
  });

  it('a batch hands out the views of its first count rows, whatever sizes came before', () => {
    const dim = 3;
    const batch = new PointBatch(dim, 40);
    // Shrinking as a reduced population does, then alternating as Nelder–Mead does.
    const counts = [40, 39, 37, 37, 30, 22, 21, 20, 4, 1, 4, 3, 1, 4, 40, 1, 40];
    for (const count of counts) {
      const data = batch.begin();
      for (let k = 0; k < count * dim; k++) data[k] = k + count / 100;
      batch.commit(count);
      const points = batch.points();
      expect(points.length).toBe(count);
      for (let k = 0; k < count; k++) expect(Array.from(points[k])).toEqual(Array.from(data.subarray(k * dim, (k + 1) * dim)));
      expect(() => batch.check(points, new Float64Array(count), undefined)).not.toThrow();
    }
  });
});
