/**
 * The optimizers search the unit box [0, 1]^dim; these map its points to real bounds
 * and back, coordinate by coordinate: x = lower + u · (upper − lower).
 */

/** Writes into `out` the point of the box [lower, upper] that `unit` (in [0, 1]^dim) stands for. */
export function fromUnitBoxInto(
  unit: ArrayLike<number>,
  lower: ArrayLike<number>,
  upper: ArrayLike<number>,
  out: Float64Array,
): Float64Array {
  for (let j = 0; j < out.length; j++) out[j] = lower[j] + unit[j] * (upper[j] - lower[j]);
  return out;
}

/** Writes into `out` the unit-box coordinates of `x`; a coordinate with upper ≤ lower maps to 0.5. */
export function toUnitBoxInto(
  x: ArrayLike<number>,
  lower: ArrayLike<number>,
  upper: ArrayLike<number>,
  out: Float64Array,
): Float64Array {
  for (let j = 0; j < out.length; j++) {
    const width = upper[j] - lower[j];
    out[j] = width > 0 ? (x[j] - lower[j]) / width : 0.5;
  }
  return out;
}
