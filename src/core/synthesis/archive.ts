/**
 * A bounded archive of distinct candidates in real coordinates: at most `capacity`,
 * best first by feasibility-first ranking, any two farther apart than `minDistance`
 * (RMS difference of the coordinates as shares of each variable's box). The keeping
 * rule is the optimizers' DistinctElite; this adds the normalisation to real bounds so
 * the engine, the CLI and tests can archive what an objective evaluates.
 */
import { DistinctElite, canonicalValue, canonicalViolation, toUnitBoxInto } from '../optimize';

export interface ArchiveEntry {
  readonly x: Float64Array;
  readonly value: number;
  readonly violation: number;
}

export class CandidateArchive {
  readonly dim: number;
  private readonly lower: Float64Array;
  private readonly upper: Float64Array;
  private readonly elite: DistinctElite;
  private readonly unit: Float64Array;

  constructor(lower: ArrayLike<number>, upper: ArrayLike<number>, capacity: number, minDistance: number) {
    if (lower.length !== upper.length) throw new RangeError(`CandidateArchive: ${lower.length} lower and ${upper.length} upper bounds; expected one pair per variable`);
    if (!(Number.isInteger(capacity) && capacity >= 0)) throw new RangeError(`CandidateArchive: capacity is ${capacity}; expected an integer ≥ 0`);
    if (!(minDistance >= 0)) throw new RangeError(`CandidateArchive: minDistance is ${minDistance}; expected a share of the box ≥ 0`);
    this.dim = lower.length;
    this.lower = Float64Array.from(lower);
    this.upper = Float64Array.from(upper);
    this.elite = new DistinctElite(this.dim, capacity, minDistance);
    this.unit = new Float64Array(this.dim);
  }

  get size(): number {
    return this.elite.count;
  }

  /** Offers an evaluated design (real coordinates); returns whether it entered. No allocation. */
  offer(x: ArrayLike<number>, value: number, violation: number): boolean {
    toUnitBoxInto(x, this.lower, this.upper, this.unit);
    const v = canonicalValue(value);
    return this.elite.offer(this.unit, v, canonicalViolation(violation, v));
  }

  /** The entries, best first, as copies in real coordinates. */
  entries(): ArchiveEntry[] {
    const out: ArchiveEntry[] = [];
    for (let k = 0; k < this.elite.count; k++) {
      const u = this.elite.point(k);
      const x = new Float64Array(this.dim);
      for (let j = 0; j < this.dim; j++) x[j] = this.lower[j] + u[j] * (this.upper[j] - this.lower[j]);
      out.push({ x, value: this.elite.values[k], violation: this.elite.violations[k] });
    }
    return out;
  }
}
