import { describe, expect, it } from 'vitest';
import type { CurveEvaluator } from '../../../src/core/synthesis/curve';
import { RippleCurve } from '../../support/rippleCurve';
import { SampledCurve } from '../../../src/core/synthesis/sampledCurve';
import { curveAt } from '../../support/curveAt';

/** The curve sampled as the path response samples it, sample `failed` (if any) marked as not assembling. */
function sample(curve: CurveEvaluator, count: number, failed = -1): SampledCurve {
  const sampled = new SampledCurve(count);
  const buf = new Float64Array(8);
  for (let j = 0; j < count; j++) {
    curveAt(curve, (2 * Math.PI * j) / count, 1, buf);
    sampled.samples.set(buf.subarray(0, 4), 4 * j);
    sampled.valid[j] = j === failed ? 0 : 1;
  }
  sampled.sampledFrom(curve);
  return sampled;
}

/** Largest error of position and of rate over a fine grid of one turn. */
function worstErrors(curve: RippleCurve, sampled: SampledCurve): { position: number; rate: number } {
  const exact = new Float64Array(8);
  const read = new Float64Array(8);
  let position = 0;
  let rate = 0;
  for (let q = 0; q <= 20_000; q++) {
    const t = (2 * Math.PI * q) / 20_000;
    curveAt(curve, t, 1, exact);
    curveAt(sampled, t, 1, read);
    position = Math.max(position, Math.abs(read[0] - exact[0]), Math.abs(read[1] - exact[1]));
    rate = Math.max(rate, Math.abs(read[2] - exact[2]), Math.abs(read[3] - exact[3]));
  }
  return { position, rate };
}

describe('a curve read between its samples', () => {
  it('is within the cubic Hermite error bound h⁴/384 · max|f⁗| of the curve', () => {
    // Source: the error of cubic Hermite interpolation on an interval of length h (Burden &
    // Faires, Numerical Analysis, § 3.4). Here x⁗ = r0 cos t + 81 ripple cos 3t, so
    // max|x⁗|, max|y⁗| ≤ r0 + 81 ripple.
    for (const [r0, ripple, count] of [
      [40, 0, 180],
      [30, 6, 180],
      [25, 3, 48],
      [50, 8, 1000],
    ]) {
      const curve = new RippleCurve(r0, ripple);
      const h = (2 * Math.PI) / count;
      const bound = ((h ** 4) / 384) * (r0 + 81 * ripple);
      const { position } = worstErrors(curve, sample(curve, count));
      expect(position, `r0 ${r0}, ripple ${ripple}, ${count} samples`).toBeLessThanOrEqual(bound * (1 + 1e-6) + 1e-12);
    }
  });

  it('has rates whose error falls as the cube of the sample step', () => {
    // Source: theorem (the derivative of a cubic Hermite interpolant errs by O(h³); Burden &
    // Faires, § 3.4): halving h divides the worst rate error by about 8.
    const curve = new RippleCurve(30, 6);
    const coarse = worstErrors(curve, sample(curve, 90)).rate;
    const fine = worstErrors(curve, sample(curve, 180)).rate;
    expect(coarse / fine).toBeGreaterThan(7);
    expect(coarse / fine).toBeLessThan(9);
  });

  it('is exact at the samples and periodic over turns of the driver', () => {
    // Source: definition (the interpolant passes through its data; the samples span one turn).
    const curve = new RippleCurve(30, 6);
    const sampled = sample(curve, 36);
    const exact = new Float64Array(8);
    const read = new Float64Array(8);
    for (let j = 0; j < 36; j++) {
      const t = (2 * Math.PI * j) / 36;
      curveAt(curve, t, 1, exact);
      for (const turns of [-1, 0, 2]) {
        curveAt(sampled, t + 2 * Math.PI * turns, 1, read);
        for (let k = 0; k < 4; k++) expect(read[k]).toBeCloseTo(exact[k], 9);
      }
    }
  });

  it('asks the curve itself between samples that did not assemble', () => {
    // Source: definition (no cubic spans a sample that did not assemble).
    const curve = new RippleCurve(30, 6);
    const sampled = sample(curve, 36, 10);
    const read = new Float64Array(8);
    const exact = new Float64Array(8);
    const between = (2 * Math.PI * 9.5) / 36;
    // Between samples 9 and 10 (10 did not assemble): one call of the curve, its answer.
    curve.calls = 0;
    curveAt(sampled, between, 1, read);
    expect(curve.calls).toBe(1);
    curveAt(curve, between, 1, exact);
    expect(Array.from(read.subarray(0, 4))).toEqual(Array.from(exact.subarray(0, 4)));
    // Between samples 12 and 13, both assembled: the cubic, no call.
    curve.calls = 0;
    curveAt(sampled, (2 * Math.PI * 12.5) / 36, 1, read);
    expect(curve.calls).toBe(0);
  });

  it('asks the curve itself where a sample moves much faster or slower than its chord', () => {
    // Source: design rule of SampledCurve (an end's rate times the step within a factor 2
    // of the chord); near a lock a dyad's rates grow without bound, as here at sample 5.
    const curve = new RippleCurve(30, 6);
    const sampled = new SampledCurve(36);
    const buf = new Float64Array(8);
    for (let j = 0; j < 36; j++) {
      curveAt(curve, (2 * Math.PI * j) / 36, 1, buf);
      const speedUp = j === 5 ? 10 : 1;
      sampled.samples.set([buf[0], buf[1], speedUp * buf[2], speedUp * buf[3]], 4 * j);
      sampled.valid[j] = 1;
    }
    sampled.sampledFrom(curve);
    const read = new Float64Array(8);
    curve.calls = 0;
    for (const at of [4.5, 5.5]) curveAt(sampled, (2 * Math.PI * at) / 36, 1, read);
    expect(curve.calls).toBe(2);
    for (const at of [3.5, 6.5]) curveAt(sampled, (2 * Math.PI * at) / 36, 1, read);
    expect(curve.calls).toBe(2);
  });
});
