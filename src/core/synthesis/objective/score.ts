/**
 * Scoring: the violation of a design is the sum of its normalised constraint slots, and
 * designs (or the branches of one design) rank feasibility first (ranking.ts). Each kind
 * of problem adds its own value on top: the path measure here, the weighted suspension
 * terms in suspensionScore.ts.
 */
import { compareRanks } from '../ranking';

/**
 * Sum of the violation slots, in slot order, into `out[index]`: the evaluation's form,
 * since a double returned from a call that is not inlined is boxed (an allocation).
 */
export function sumViolationsInto(parts: Float64Array, count: number, out: Float64Array, index: number): void {
  let violation = 0;
  for (let s = 0; s < count; s++) violation += parts[s];
  out[index] = violation;
}

/** sumViolations' answer before it is returned (no call in between can reenter). */
const sumScratch = new Float64Array(1);

/** Sum of the violation slots, in slot order (see sumViolationsInto). */
export function sumViolations(parts: Float64Array, count: number): number {
  sumViolationsInto(parts, count, sumScratch, 0);
  return sumScratch[0];
}

/** The slots a design breaks (any above 0, or NaN), in words, in slot order. */
export function violatedSlotNames(parts: Float64Array, count: number, names: readonly string[]): string[] {
  const out: string[] = [];
  for (let s = 0; s < count; s++) if (parts[s] > 0 || Number.isNaN(parts[s])) out.push(names[s]);
  return out;
}

/** Index of the best of `count` (value, violation) pairs stored flat in `evaluation`, feasibility first. */
export function bestRanked(evaluation: Float64Array, count: number): number {
  let best = 0;
  for (let k = 1; k < count; k++) {
    if (compareRanks(evaluation[2 * k], evaluation[2 * k + 1], evaluation[2 * best], evaluation[2 * best + 1]) < 0) best = k;
  }
  return best;
}
