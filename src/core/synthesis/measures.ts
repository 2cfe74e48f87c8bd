/**
 * Error measures of a fitted path, from the squared distance of each output point to
 * its target point (mm²): the weighted sum of squares (the measure of the published
 * benchmarks: no mean, no square root), the weighted RMS distance and the largest
 * distance, in mm. Points of weight 0 take no part.
 */
import type { Measure } from './problem';

export const MEASURES: readonly Measure[] = ['sum-of-squares', 'rms', 'max'];

export interface ErrorSummary {
  /** Σ wᵢ dᵢ², mm². */
  readonly sumSquares: number;
  /** √(Σ wᵢ dᵢ² / Σ wᵢ), mm. */
  readonly rmsMm: number;
  /** max dᵢ over points with wᵢ > 0, mm. */
  readonly maxMm: number;
  readonly perPointMm: number[];
}

/**
 * The value of `measure` for squared distances `d2[0..n)`, into `out[index]`: the
 * evaluation's form, since a double returned from a call that is not inlined is boxed
 * (an allocation).
 */
export function measureValueInto(
  measure: Measure,
  d2: Float64Array,
  n: number,
  weights: Float64Array | undefined,
  out: Float64Array,
  index: number,
): void {
  let sum = 0;
  let sumW = 0;
  let max = 0;
  for (let i = 0; i < n; i++) {
    const w = weights === undefined ? 1 : weights[i];
    sum += w * d2[i];
    sumW += w;
    // NaN propagates: a NaN distance must not hide behind the max.
    if (w > 0 && !(d2[i] <= max)) max = d2[i];
  }
  if (measure === 'sum-of-squares') out[index] = sum;
  else if (measure === 'rms') out[index] = Math.sqrt(sum / sumW);
  else out[index] = Math.sqrt(max);
}

/** measureValue's answer before it is returned (no call in between can reenter). */
const valueScratch = new Float64Array(1);

/** The value of `measure` for squared distances `d2[0..n)` (for reports; see measureValueInto). */
export function measureValue(measure: Measure, d2: Float64Array, n: number, weights: Float64Array | undefined): number {
  measureValueInto(measure, d2, n, weights, valueScratch, 0);
  return valueScratch[0];
}

/** All three measures and the distance of each point (allocates; for reports). */
export function errorSummary(d2: Float64Array, n: number, weights: Float64Array | undefined): ErrorSummary {
  const perPointMm: number[] = [];
  for (let i = 0; i < n; i++) perPointMm.push(Math.sqrt(d2[i]));
  return {
    sumSquares: measureValue('sum-of-squares', d2, n, weights),
    rmsMm: measureValue('rms', d2, n, weights),
    maxMm: measureValue('max', d2, n, weights),
    perPointMm,
  };
}
