/**
 * Feasibility-first ranking of candidates (Deb, 2000, "An efficient constraint handling
 * method for genetic algorithms"): a feasible candidate (violation 0) beats an
 * infeasible one; two feasible ones compare by value; two infeasible ones by violation,
 * then value. The same rule the optimizers use (src/core/optimize/ranking.ts), applied
 * here to reports and archives; NaN ranks worst.
 */
import { canonicalValue, canonicalViolation, precedes } from '../optimize';

export interface Ranked {
  readonly value: number;
  readonly violation: number;
}

/** Negative when a ranks before b, positive after, 0 when tied: a comparator for Array.prototype.sort. */
export function compareCandidates(a: Ranked, b: Ranked): number {
  return compareRanks(a.value, a.violation, b.value, b.violation);
}

/** `compareCandidates` on bare numbers, for hot loops. */
export function compareRanks(valueA: number, violationA: number, valueB: number, violationB: number): number {
  const va = canonicalValue(valueA);
  const vb = canonicalValue(valueB);
  const ca = canonicalViolation(violationA, va);
  const cb = canonicalViolation(violationB, vb);
  if (precedes(va, ca, vb, cb)) return -1;
  if (precedes(vb, cb, va, ca)) return 1;
  return 0;
}
