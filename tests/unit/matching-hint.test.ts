import { describe, expect, it } from 'vitest';
import { Prng } from '../../src/core/optimize/prng';
import { createMatchScratch, matchInOrder } from '../../src/core/synthesis/timing';
import { plainDp, randomCase } from '../support/matchReference';

/**
 * The cyclic in-order match with a hint (an earlier match bounding the answer, so that
 * blocks of samples are skipped unevaluated) against the plain dynamic programme written
 * here, one pass per start, every cost computed, nothing skipped: the same indices and
 * the same total to the bit, whatever the hint (the optimum itself, a near one, a poor
 * one, one no pass could find, one across samples that do not assemble), with weights,
 * unassembled samples and ties.
 */


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
      // Barriers honoured on odd trials (a sample that does not assemble parts the points on either side).
      const barriers = trial % 2 === 1;
      const want = new Int32Array(n);
      const ref = plainDp(c, n, m, true, want, barriers);
      const scratch = createMatchScratch(n, m);
      // Across samples that do not assemble, a match can cost less than any the matcher may take.
      const acrossBarriers = new Int32Array(n);
      plainDp(c, n, m, true, acrossBarriers, false);
      const hints = [
        acrossBarriers,
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
        const got = matchInOrder(c.samples, c.valid, c.targets, c.weights, true, barriers, scratch, index, hint);
        expect(Object.is(got, ref), `trial ${trial} hint ${h}: ${got} vs ${ref}`).toBe(true);
        expect(Array.from(index), `trial ${trial} hint ${h}`).toEqual(Array.from(want));
      }
    }
  });
});
