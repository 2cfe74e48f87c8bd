/**
 * The best points seen that are pairwise distinct: at most `capacity` of them, best
 * first by feasibility-first ranking, any two farther apart than `radius` (RMS
 * coordinate difference, box units). A point enters unless a point within `radius` is
 * as good; it then replaces the worse points near it, and the worst falls off a full
 * list. A failed evaluation never enters. Most offers end at the first comparison,
 * against the worst entry, so offering every evaluated point is cheap.
 */
import { precedesAt } from './ranking';

/** RMS coordinate difference of two points, box units. */
export function rmsDistance(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let sum = 0;
  for (let j = 0; j < a.length; j++) {
    const t = a[j] - b[j];
    sum += t * t;
  }
  return Math.sqrt(sum / a.length);
}

export class DistinctElite {
  readonly dim: number;
  readonly capacity: number;
  readonly radius: number;
  /** Rows of the entries, best first. */
  readonly x: Float64Array;
  readonly values: Float64Array;
  readonly violations: Float64Array;
  count = 0;
  /** `offer`'s value and violation, as `offerAt` reads them. */
  private readonly oneValue = new Float64Array(1);
  private readonly oneViolation = new Float64Array(1);

  constructor(dim: number, capacity: number, radius: number) {
    this.dim = dim;
    this.capacity = capacity;
    this.radius = radius;
    this.x = new Float64Array(capacity * dim);
    this.values = new Float64Array(capacity);
    this.violations = new Float64Array(capacity);
  }

  /** Offers a point with its canonical value and violation; returns whether it entered. */
  offer(p: ArrayLike<number>, value: number, violation: number): boolean {
    this.oneValue[0] = value;
    this.oneViolation[0] = violation;
    return this.offerAt(p, this.oneValue, this.oneViolation, 0);
  }

  /**
   * `offer` with the value and violation read from `values[k]` and `violations[k]`: a
   * double passed to a call the compiler does not inline is boxed, and a hybrid offers
   * every point of its global phase.
   */
  offerAt(p: ArrayLike<number>, values: Float64Array, violations: Float64Array, k: number): boolean {
    const value = values[k];
    const violation = violations[k];
    const capacity = this.capacity;
    const n = this.count;
    const vals = this.values;
    const viols = this.violations;
    if (!(violation < Infinity)) return false;
    if (capacity === 0 || (n === capacity && !precedesAt(values, violations, k, vals, viols, n - 1))) return false;
    const d = this.dim;
    const x = this.x;
    for (let i = 0; i < n; i++) {
      if (this.near(i, p) && !precedesAt(values, violations, k, vals, viols, i)) return false;
    }
    // Drop the entries near p (all worse than p), keeping the order of the rest.
    let kept = 0;
    for (let i = 0; i < n; i++) {
      if (this.near(i, p)) continue;
      if (kept !== i) {
        x.copyWithin(kept * d, i * d, (i + 1) * d);
        vals[kept] = vals[i];
        viols[kept] = viols[i];
      }
      kept++;
    }
    // Insert p by rank, after equals. It ranks before the last entry of a full list
    // (tested above), so `at` < capacity, and that last entry falls off.
    let at = kept;
    while (at > 0 && precedesAt(values, violations, k, vals, viols, at - 1)) at--;
    const end = Math.min(kept, capacity - 1);
    x.copyWithin((at + 1) * d, at * d, end * d);
    vals.copyWithin(at + 1, at, end);
    viols.copyWithin(at + 1, at, end);
    for (let j = 0; j < d; j++) x[at * d + j] = p[j];
    vals[at] = value;
    viols[at] = violation;
    this.count = Math.min(kept + 1, capacity);
    return true;
  }

  /**
   * Whether the RMS coordinate difference between entry i and `p` is at most `radius`; a
   * boolean, as a double passed to or returned from a call not inlined is boxed.
   */
  private near(i: number, p: ArrayLike<number>): boolean {
    const x = this.x;
    const offset = i * this.dim;
    let sum = 0;
    for (let j = 0; j < p.length; j++) {
      const t = x[offset + j] - p[j];
      sum += t * t;
    }
    return Math.sqrt(sum / p.length) <= this.radius;
  }

  /** Whether an infeasible point may enter now: not when the list is full and its worst entry feasible, nor when it has no room at all. */
  takesInfeasible(): boolean {
    const n = this.count;
    if (n < this.capacity) return true;
    return n > 0 && !(this.violations[n - 1] <= 0);
  }

  /** A copy of entry k. */
  point(k: number): Float64Array {
    return this.x.slice(k * this.dim, (k + 1) * this.dim);
  }
}
