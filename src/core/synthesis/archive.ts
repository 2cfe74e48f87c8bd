/**
 * The one archive of distinct designs: at most `capacity` evaluated designs, best first
 * by feasibility-first ranking (Deb, 2000; `precedes`), any two farther apart than
 * `distance` (RMS difference of the coordinates, each as a share of its variable's
 * span). A design enters unless one within `distance` ranks at least as well; it then
 * replaces the worse designs near it, and the worst falls off a full archive. It keeps
 * the same rule as the optimizers' `DistinctElite`, in real coordinates kept exactly as
 * evaluated (a checkpoint or a described design gets the very bits the objective saw).
 *
 * An island offers it every evaluation, so it is flat typed arrays written in place:
 * most offers end at one comparison against the worst entry, and a distance stops
 * summing as soon as it exceeds `distance`. The run's archive of a job is the merge of
 * its islands' archives (`mergeArchive`).
 */
import { precedesAt } from '../optimize';

export interface ArchiveEntry {
  /** Real coordinates, as evaluated (a copy). */
  readonly x: Float64Array;
  /** Ranked value and violation (canonical: finite value, violation 0 when feasible). */
  readonly value: number;
  readonly violation: number;
}

/** Largest archive capacity: an offer that passes the quick test scans every entry. */
export const MAX_ARCHIVE_CAPACITY = 1000;

/** Share of a span by which a stored coordinate may lie outside its bounds (rounding), dimensionless. */
const BOUND_SLACK = 1e-9;

export class CandidateArchive {
  readonly capacity: number;
  /** RMS distance, box units, at or under which two designs are the same design. */
  readonly distance: number;
  readonly dim: number;
  private readonly lower: Float64Array;
  private readonly invSpan: Float64Array;
  /** Squared distance × dim: a design is near an entry when its sum of squared shares is at most this. */
  private readonly nearSum: number;
  /** Rows of the entries, best first. */
  private readonly rows: Float64Array;
  private readonly values: Float64Array;
  private readonly violations: Float64Array;
  private count = 0;
  /** `offer`'s value and violation, as `offerAt` reads them. */
  private readonly oneValue = new Float64Array(1);
  private readonly oneViolation = new Float64Array(1);

  /** `lower` and `upper` are the real bounds of each variable (copied); a span of 0 counts no distance. */
  constructor(capacity: number, distance: number, lower: ArrayLike<number>, upper: ArrayLike<number>) {
    if (!(Number.isInteger(capacity) && capacity >= 1 && capacity <= MAX_ARCHIVE_CAPACITY)) {
      throw new RangeError(`archive capacity is ${capacity}; expected an integer in [1, ${MAX_ARCHIVE_CAPACITY}]`);
    }
    if (!(distance >= 0 && distance <= 1)) throw new RangeError(`archive distance is ${distance}; expected a number in [0, 1] (box units)`);
    if (lower.length !== upper.length) throw new RangeError(`archive bounds: ${lower.length} lower and ${upper.length} upper; expected one pair per variable`);
    this.capacity = capacity;
    this.distance = distance;
    this.dim = lower.length;
    this.lower = Float64Array.from(lower);
    this.invSpan = Float64Array.from(upper, (u, i) => {
      const span = u - lower[i];
      return span > 0 ? 1 / span : 0;
    });
    this.nearSum = distance * distance * Math.max(1, this.dim);
    this.rows = new Float64Array(capacity * this.dim);
    this.values = new Float64Array(capacity);
    this.violations = new Float64Array(capacity);
  }

  get size(): number {
    return this.count;
  }

  /** Entry k (0 is the best), its x a copy. */
  entry(k: number): ArchiveEntry {
    const d = this.dim;
    return { x: this.rows.slice(k * d, (k + 1) * d), value: this.values[k], violation: this.violations[k] };
  }

  /** The first `count` entries (all by default), best first, as copies. */
  entries(count = this.count): ArchiveEntry[] {
    const n = Math.min(this.count, Math.max(0, count));
    const out: ArchiveEntry[] = [];
    for (let k = 0; k < n; k++) out.push(this.entry(k));
    return out;
  }

  /** RMS of the coordinate differences, each as a share of its span. */
  normalisedDistance(a: ArrayLike<number>, b: ArrayLike<number>): number {
    const inv = this.invSpan;
    let sum = 0;
    for (let j = 0; j < inv.length; j++) {
      const t = (a[j] - b[j]) * inv[j];
      sum += t * t;
    }
    return Math.sqrt(sum / Math.max(1, inv.length));
  }

  /**
   * Offers an evaluated design (ranked value and violation, see `canonicalValue`); copies
   * `x` if it is kept. Returns whether it entered. A failed evaluation (non-finite value
   * or violation) never enters. Allocates nothing.
   */
  offer(x: ArrayLike<number>, value: number, violation: number): boolean {
    this.oneValue[0] = value;
    this.oneViolation[0] = violation;
    return this.offerAt(x, this.oneValue, this.oneViolation, 0);
  }

  /**
   * `offer` with the value and violation read from `values[k]` and `violations[k]`: an
   * island offers every evaluation, and a double passed to a call the compiler does not
   * inline is boxed (16 bytes).
   */
  offerAt(x: ArrayLike<number>, values: Float64Array, violations: Float64Array, k: number): boolean {
    const value = values[k];
    const violation = violations[k];
    if (!(Number.isFinite(value) && violation >= 0 && Number.isFinite(violation))) return false;
    const n = this.count;
    const vals = this.values;
    const viols = this.violations;
    if (n === this.capacity && !precedesAt(values, violations, k, vals, viols, n - 1)) return false;
    let near = 0;
    for (let i = 0; i < n; i++) {
      if (!this.isNear(i, x)) continue;
      if (!precedesAt(values, violations, k, vals, viols, i)) return false;
      near++;
    }
    const d = this.dim;
    const rows = this.rows;
    // Drop the entries near x (all worse than x), keeping the order of the rest.
    let kept = n;
    if (near > 0) {
      kept = 0;
      for (let i = 0; i < n; i++) {
        if (this.isNear(i, x)) continue;
        if (kept !== i) {
          rows.copyWithin(kept * d, i * d, (i + 1) * d);
          vals[kept] = vals[i];
          viols[kept] = viols[i];
        }
        kept++;
      }
    }
    // Insert by rank, after equals. x ranks before the last entry of a full archive
    // (tested above), so `at` < capacity and that last entry falls off.
    let at = kept;
    while (at > 0 && precedesAt(values, violations, k, vals, viols, at - 1)) at--;
    const end = Math.min(kept, this.capacity - 1);
    rows.copyWithin((at + 1) * d, at * d, end * d);
    vals.copyWithin(at + 1, at, end);
    viols.copyWithin(at + 1, at, end);
    for (let j = 0; j < d; j++) rows[at * d + j] = x[j];
    vals[at] = value;
    viols[at] = violation;
    this.count = Math.min(kept + 1, this.capacity);
    return true;
  }

  /** Whether an infeasible design may enter now: not when the archive is full and its worst entry is feasible. */
  takesInfeasible(): boolean {
    const n = this.count;
    if (n < this.capacity) return true;
    return !(this.violations[n - 1] <= 0);
  }

  /** Whether `x` lies inside the bounds given at construction (to validate restored designs). */
  fits(x: ArrayLike<number>): boolean {
    if (x.length !== this.dim) return false;
    for (let j = 0; j < x.length; j++) {
      const u = (x[j] - this.lower[j]) * this.invSpan[j];
      if (!(u >= -BOUND_SLACK && u <= 1 + BOUND_SLACK)) return false;
    }
    return true;
  }

  /** Whether entry i lies within `distance` of x; stops summing once it cannot. */
  private isNear(i: number, x: ArrayLike<number>): boolean {
    const inv = this.invSpan;
    const rows = this.rows;
    const limit = this.nearSum;
    const offset = i * this.dim;
    let sum = 0;
    for (let j = 0; j < inv.length; j++) {
      const t = (x[j] - rows[offset + j]) * inv[j];
      sum += t * t;
      if (sum > limit) return false;
    }
    return true;
  }
}

/**
 * One archive of the designs of several, offered in the order given (each best first):
 * a run's archive of a job from its islands' archives, in island order, so it is the
 * same however the islands were spread over workers.
 */
export function mergeArchive(into: CandidateArchive, sources: readonly (readonly { readonly x: ArrayLike<number>; readonly value: number; readonly violation: number }[])[]): CandidateArchive {
  for (const source of sources) for (const entry of source) into.offer(entry.x, entry.value, entry.violation);
  return into;
}
