/**
 * Feasibility-first ranking shared by every optimizer.
 *
 * Each evaluated point carries a value and a violation. After `canonicalValue` and
 * `canonicalViolation` a value is finite or +Infinity and a violation is 0 (feasible),
 * positive, or +Infinity. A failed evaluation (a value that is NaN or ±Infinity) gets
 * violation +Infinity, so it ranks below every point that was evaluated at all.
 */

/** A value as ranked: finite, or +Infinity for NaN and ±Infinity; −0 becomes +0 so JSON keeps it. */
export function canonicalValue(value: number): number {
  return value > -Infinity && value < Infinity ? value + 0 : Infinity;
}

/** A violation as ranked: ≤ 0 is feasible (0), NaN is +Infinity; for a failed value always +Infinity. */
export function canonicalViolation(violation: number, rankedValue: number): number {
  if (!(rankedValue < Infinity)) return Infinity;
  return violation > 0 ? violation : violation <= 0 ? 0 : Infinity;
}

/**
 * Writes the ranked value and violation of point k (no `violations`: feasible) to
 * `outValues[at]` and `outViolations[at]`. The per-point paths use this form: a double
 * returned from a call the compiler does not inline is boxed, and `canonicalValue` is
 * just over the size it always inlines.
 */
export function canonicalInto(
  values: Float64Array,
  violations: Float64Array | undefined,
  k: number,
  outValues: Float64Array,
  outViolations: Float64Array,
  at: number,
): void {
  const v = canonicalValue(values[k]);
  outValues[at] = v;
  outViolations[at] = canonicalViolation(violations === undefined ? 0 : violations[k], v);
}

/**
 * Whether point a ranks strictly before point b, by Deb's rules (Deb, 2000, "An
 * efficient constraint handling method for genetic algorithms"): a feasible point beats
 * an infeasible one, two infeasible points compare by violation, two feasible points by
 * value. Equal violations (two failed points, say) fall back to the value. Arguments
 * must be canonical; then the unconstrained case costs two comparisons more than `<`.
 */
export function precedes(valueA: number, violationA: number, valueB: number, violationB: number): boolean {
  return violationA < violationB || (violationA <= violationB && valueA < valueB);
}

/**
 * `precedes` of entry a of (valuesA, violationsA) and entry b of (valuesB, violationsB):
 * the per-point paths' form, as a double passed to a call the compiler does not inline
 * is boxed.
 */
export function precedesAt(
  valuesA: Float64Array,
  violationsA: Float64Array,
  a: number,
  valuesB: Float64Array,
  violationsB: Float64Array,
  b: number,
): boolean {
  return precedes(valuesA[a], violationsA[a], valuesB[b], violationsB[b]);
}

/**
 * `precedesAt` of two raw entries (values and violations as an objective gives them),
 * each ranked as canonicalValue and canonicalViolation rank it, written out here: a
 * double passed to or returned from a call the compiler does not inline is boxed, and
 * the objective's own paths compare candidates this way without allocating.
 */
export function precedesRawAt(values: Float64Array, violations: Float64Array, a: number, b: number): boolean {
  const rawA = values[a];
  const rawB = values[b];
  const valueA = rawA > -Infinity && rawA < Infinity ? rawA + 0 : Infinity;
  const valueB = rawB > -Infinity && rawB < Infinity ? rawB + 0 : Infinity;
  const va = violations[a];
  const vb = violations[b];
  const violationA = !(valueA < Infinity) ? Infinity : va > 0 ? va : va <= 0 ? 0 : Infinity;
  const violationB = !(valueB < Infinity) ? Infinity : vb > 0 ? vb : vb <= 0 ? 0 : Infinity;
  return violationA < violationB || (violationA <= violationB && valueA < valueB);
}

/**
 * Writes into `order[0..n)` the indices 0..n−1 sorted best first by `precedes`, ties
 * kept in index order. A bottom-up merge sort, so the result does not depend on the
 * engine's sort; `scratch` holds at least n entries.
 */
export function rankInto(
  order: Int32Array,
  scratch: Int32Array,
  n: number,
  values: Float64Array,
  violations: Float64Array,
): void {
  for (let i = 0; i < n; i++) order[i] = i;
  let from = order;
  let to = scratch;
  for (let width = 1; width < n; width *= 2) {
    for (let lo = 0; lo < n; lo += 2 * width) {
      const mid = Math.min(lo + width, n);
      const hi = Math.min(lo + 2 * width, n);
      let i = lo;
      let j = mid;
      let k = lo;
      while (i < mid && j < hi) {
        const a = from[i];
        const b = from[j];
        // Take from the right run only when it ranks strictly before: keeps the sort stable.
        if (precedes(values[b], violations[b], values[a], violations[a])) {
          to[k++] = b;
          j++;
        } else {
          to[k++] = a;
          i++;
        }
      }
      while (i < mid) to[k++] = from[i++];
      while (j < hi) to[k++] = from[j++];
    }
    const swap = from;
    from = to;
    to = swap;
  }
  if (from !== order) for (let i = 0; i < n; i++) order[i] = from[i];
}

/** The best point seen so far (by `precedes`), kept in a buffer of its own. */
export class BestTracker {
  readonly x: Float64Array;
  value = Infinity;
  violation = Infinity;
  /** False until the first evaluated point; `x` is then the box centre. */
  seen = false;

  constructor(dim: number) {
    this.x = new Float64Array(dim).fill(0.5);
  }

  /** Offers the point stored at `buffer[offset .. offset + dim)`; returns whether it became the best. */
  offer(buffer: Float64Array, offset: number, value: number, violation: number): boolean {
    if (this.seen && !precedes(value, violation, this.value, this.violation)) return false;
    this.take(buffer, offset, value, violation);
    return true;
  }

  /**
   * `offer` with the canonical value and violation read from `values[k]` and
   * `violations[k]`: a double passed to a call the compiler does not inline is boxed,
   * so the optimizers' per-point paths pass arrays and an index.
   */
  offerAt(buffer: Float64Array, offset: number, values: Float64Array, violations: Float64Array, k: number): boolean {
    const value = values[k];
    const violation = violations[k];
    if (this.seen && !precedes(value, violation, this.value, this.violation)) return false;
    this.take(buffer, offset, value, violation);
    return true;
  }

  private take(buffer: Float64Array, offset: number, value: number, violation: number): void {
    const x = this.x;
    for (let j = 0; j < x.length; j++) x[j] = buffer[offset + j];
    this.value = value;
    this.violation = violation;
    this.seen = true;
  }
}
