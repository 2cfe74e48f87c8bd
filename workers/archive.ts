/**
 * A bounded archive of the best distinct candidates, best first by feasibility-first
 * ranking (Deb, 2000; `precedes` of src/core/optimize). Two candidates are distinct
 * when their RMS coordinate difference, each coordinate as a share of its bound's span,
 * exceeds `distance`; of two that are not, only the better is kept.
 *
 * Used by an island (fed with every evaluation) and by the engine (fed with the
 * islands' elites), so both keep the same notion of "distinct".
 */
import { precedes } from '../src/core/optimize';

export interface ArchiveEntry {
  readonly x: Float64Array;
  readonly value: number;
  readonly violation: number;
  /** Counter value when it entered; later entries have larger values. */
  readonly entered: number;
}

/** Largest archive capacity: every offer that passes the quick test scans all entries. */
export const MAX_ARCHIVE_CAPACITY = 1000;

export class CandidateArchive {
  readonly capacity: number;
  readonly distance: number;
  private readonly lower: Float64Array;
  private readonly invSpan: Float64Array;
  private readonly list: ArchiveEntry[] = [];
  private counter = 0;

  /** `lower` and `upper` are the real bounds of each coordinate (copied). */
  constructor(capacity: number, distance: number, lower: ArrayLike<number>, upper: ArrayLike<number>) {
    if (!(Number.isInteger(capacity) && capacity >= 1 && capacity <= MAX_ARCHIVE_CAPACITY)) {
      throw new RangeError(`archive capacity is ${capacity}; expected an integer in [1, ${MAX_ARCHIVE_CAPACITY}]`);
    }
    if (!(distance >= 0 && distance <= 1)) throw new RangeError(`archive distance is ${distance}; expected a number in [0, 1]`);
    this.capacity = capacity;
    this.distance = distance;
    this.lower = Float64Array.from(lower);
    this.invSpan = Float64Array.from(upper, (u, i) => {
      const span = u - lower[i];
      return span > 0 ? 1 / span : 0;
    });
  }

  get size(): number {
    return this.list.length;
  }

  /** The entries, best first (do not modify). */
  entries(): readonly ArchiveEntry[] {
    return this.list;
  }

  /** The counter: `entered` of the newest entry ever accepted. */
  get entered(): number {
    return this.counter;
  }

  /** RMS of the coordinate differences, each as a share of its span. */
  normalisedDistance(a: ArrayLike<number>, b: ArrayLike<number>): number {
    const inv = this.invSpan;
    let sum = 0;
    for (let j = 0; j < inv.length; j++) {
      const d = (a[j] - b[j]) * inv[j];
      sum += d * d;
    }
    return Math.sqrt(sum / Math.max(1, inv.length));
  }

  /**
   * Offers a candidate (ranked value and violation, see `canonicalValue`); copies `x` if
   * it is kept. Returns whether it entered. A failed evaluation (non-finite value or
   * violation) never enters.
   */
  offer(x: ArrayLike<number>, value: number, violation: number, entered = this.counter + 1): boolean {
    if (!(Number.isFinite(value) && violation >= 0 && Number.isFinite(violation))) return false;
    const list = this.list;
    if (list.length >= this.capacity) {
      const worst = list[list.length - 1];
      if (!precedes(value, violation, worst.value, worst.violation)) return false;
    }
    let near = 0;
    for (const entry of list) {
      if (this.normalisedDistance(x, entry.x) > this.distance) continue;
      if (!precedes(value, violation, entry.value, entry.violation)) return false;
      near++;
    }
    if (near > 0) {
      for (let i = list.length - 1; i >= 0; i--) {
        if (this.normalisedDistance(x, list[i].x) <= this.distance) list.splice(i, 1);
      }
    }
    let at = list.length;
    while (at > 0 && precedes(value, violation, list[at - 1].value, list[at - 1].violation)) at--;
    this.counter = Math.max(this.counter, entered);
    list.splice(at, 0, { x: Float64Array.from({ length: this.invSpan.length }, (_, j) => x[j]), value, violation, entered });
    if (list.length > this.capacity) list.pop();
    return true;
  }

  /** Entries that entered after counter value `after`, best first. */
  enteredAfter(after: number): ArchiveEntry[] {
    return this.list.filter((entry) => entry.entered > after);
  }

  /** Sets the counter (when restoring a saved archive). */
  restoreCounter(entered: number): void {
    this.counter = Math.max(this.counter, entered);
  }

  /** Whether `x` lies inside the bounds given at construction (to validate restored entries). */
  fits(x: ArrayLike<number>): boolean {
    if (x.length !== this.invSpan.length) return false;
    for (let j = 0; j < x.length; j++) {
      const u = (x[j] - this.lower[j]) * this.invSpan[j];
      if (!(u >= -BOUND_SLACK && u <= 1 + BOUND_SLACK)) return false;
    }
    return true;
  }
}

/** Share of a span by which a stored coordinate may lie outside its bounds (rounding), dimensionless. */
const BOUND_SLACK = 1e-9;
