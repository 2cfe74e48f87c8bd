/**
 * Uniform start points kept away from basins a search has found already: a draw within
 * `radius` (RMS coordinate difference, box units) of a basin point is redrawn, at most
 * `attempts` times, the last draw standing if every one is near (rejection sampling,
 * as the restart scheme of restart.ts uses it to steer fresh runs elsewhere).
 */
import type { Prng } from './prng';

export interface Avoidance {
  /** Basin points, `count` × dim, row-major, box units. */
  readonly points: Float64Array;
  readonly count: number;
  /** RMS distance, box units, within which a draw counts as in a known basin. */
  readonly radius: number;
  /** Draws per point, at least 1. */
  readonly attempts: number;
}

function near(out: Float64Array, at: number, dim: number, avoid: Avoidance): boolean {
  const limit = avoid.radius * avoid.radius * dim;
  const p = avoid.points;
  for (let k = 0; k < avoid.count; k++) {
    let sum = 0;
    for (let j = 0; j < dim; j++) {
      const d = out[at + j] - p[k * dim + j];
      sum += d * d;
    }
    if (sum <= limit) return true;
  }
  return false;
}

/** Writes a uniform point of [0, 1]^dim into `out[at .. at + dim)`, redrawn while it lies in a basin. */
export function drawAwayInto(rng: Prng, out: Float64Array, at: number, dim: number, avoid: Avoidance): void {
  for (let attempt = 0; attempt < avoid.attempts; attempt++) {
    for (let j = 0; j < dim; j++) out[at + j] = rng.float();
    if (!near(out, at, dim, avoid)) return;
  }
}
