/**
 * Golden-section search (Kiefer, 1953) for the least value of a function of the driver on
 * a bracket: the one refinement the analysis of a linkage (sweep.ts) and the synthesis'
 * lock search (lockSearch.ts) both run on a dyad's signed sine, so that the two locate
 * a minimum between samples at the same probes. Allocates nothing: the numbers cross in
 * arrays, since V8 boxes a number passed to or returned from a call it does not inline.
 */
import { SWEEP_REFINE_MAX_STEPS } from './tolerances';

/** 1 / φ, the golden section's ratio. */
const INV_PHI = (Math.sqrt(5) - 1) / 2;

/** A function of the driver: `probe` reads the value at io[GOLDEN_PROBE_AT] and writes the function's value to io[GOLDEN_PROBE_VALUE]. */
export interface DriverProbe {
  probe(io: Float64Array): void;
}

/** Layout of a probe's io, and of goldenSectionMinimum's answer: where, and the value there. */
export const GOLDEN_PROBE_AT = 0;
export const GOLDEN_PROBE_VALUE = 1;

/**
 * The least value `f` takes on [lo, hi], searched until the bracket is at most `tol`
 * wide (or SWEEP_REFINE_MAX_STEPS steps), and where: into found[GOLDEN_PROBE_AT] and
 * found[GOLDEN_PROBE_VALUE]. `io` (length 2) carries each probe.
 */
export function goldenSectionMinimum(f: DriverProbe, lo: number, hi: number, tol: number, io: Float64Array, found: Float64Array): void {
  let a = lo;
  let b = hi;
  let x1 = b - INV_PHI * (b - a);
  let x2 = a + INV_PHI * (b - a);
  io[GOLDEN_PROBE_AT] = x1;
  f.probe(io);
  let f1 = io[GOLDEN_PROBE_VALUE];
  io[GOLDEN_PROBE_AT] = x2;
  f.probe(io);
  let f2 = io[GOLDEN_PROBE_VALUE];
  for (let i = 0; i < SWEEP_REFINE_MAX_STEPS && Math.abs(b - a) > tol; i++) {
    if (f1 <= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - INV_PHI * (b - a);
      io[GOLDEN_PROBE_AT] = x1;
      f.probe(io);
      f1 = io[GOLDEN_PROBE_VALUE];
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + INV_PHI * (b - a);
      io[GOLDEN_PROBE_AT] = x2;
      f.probe(io);
      f2 = io[GOLDEN_PROBE_VALUE];
    }
  }
  found[GOLDEN_PROBE_AT] = f1 <= f2 ? x1 : x2;
  found[GOLDEN_PROBE_VALUE] = f1 <= f2 ? f1 : f2;
}
