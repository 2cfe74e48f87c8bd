/**
 * The golden-section search the analysis and the lock search share for a dyad's sine
 * (src/core/linkage/goldenSection.ts), against analytic minima and the search's own
 * contraction (Kiefer, 1953: each probe shrinks the bracket by 1/φ).
 */
import { describe, expect, it } from 'vitest';
import { GOLDEN_PROBE_AT, GOLDEN_PROBE_VALUE, goldenSectionMinimum, type DriverProbe } from '../../src/core/linkage/goldenSection';

function counted(f: (x: number) => number): DriverProbe & { calls: number } {
  const probe = {
    calls: 0,
    probe(io: Float64Array) {
      probe.calls++;
      io[GOLDEN_PROBE_VALUE] = f(io[GOLDEN_PROBE_AT]);
    },
  };
  return probe;
}

describe('goldenSectionMinimum', () => {
  it('finds a V-shaped minimum to its tolerance: |x − 0.7| on [0, 2], as a sine through a dead centre falls (analytic)', () => {
    const found = new Float64Array(2);
    goldenSectionMinimum(counted((x) => Math.abs(x - 0.7)), 0, 2, 1e-9, new Float64Array(2), found);
    expect(Math.abs(found[GOLDEN_PROBE_AT] - 0.7)).toBeLessThan(1e-9);
    expect(found[GOLDEN_PROBE_VALUE]).toBeLessThan(1e-9);
  });

  it('finds the minimum of cos on [2, 4] at π, to the √ε of a smooth minimum (Press et al., Numerical Recipes, §10.1)', () => {
    const found = new Float64Array(2);
    goldenSectionMinimum(counted(Math.cos), 2, 4, 1e-9, new Float64Array(2), found);
    // cos(π + e) = −1 + e²/2 rounds to −1 for |e| below about √(2^-53): the flat bottom hides π within it.
    expect(Math.abs(found[GOLDEN_PROBE_AT] - Math.PI)).toBeLessThan(Math.PI * Math.sqrt(Number.EPSILON));
    expect(found[GOLDEN_PROBE_VALUE]).toBe(-1);
  });

  it('goes to the end of the bracket a function falls towards (x² on [1, 3])', () => {
    const found = new Float64Array(2);
    goldenSectionMinimum(counted((x) => x * x), 1, 3, 1e-6, new Float64Array(2), found);
    expect(found[GOLDEN_PROBE_AT] - 1).toBeGreaterThanOrEqual(0);
    expect(found[GOLDEN_PROBE_AT] - 1).toBeLessThan(1e-6);
  });

  it('probes twice, then once per step until the bracket is within the tolerance: (1/φ)^n of it after n steps (Kiefer, 1953)', () => {
    const invPhi = (Math.sqrt(5) - 1) / 2;
    for (const tol of [1e-2, 1e-5, 1e-9]) {
      const f = counted((x) => (x - 0.3) ** 2);
      goldenSectionMinimum(f, 0, 1, tol, new Float64Array(2), new Float64Array(2));
      const steps = Math.ceil(Math.log(tol) / Math.log(invPhi));
      // Rounding of the bracket's ends can leave it a hair above (1/φ)^n: one step either way.
      expect(f.calls - 2).toBeGreaterThanOrEqual(steps - 1);
      expect(f.calls - 2).toBeLessThanOrEqual(steps + 1);
    }
  });

  it('probes only inside the bracket', () => {
    const seen: number[] = [];
    goldenSectionMinimum({ probe: (io) => { seen.push(io[GOLDEN_PROBE_AT]); io[GOLDEN_PROBE_VALUE] = Math.sin(5 * io[GOLDEN_PROBE_AT]); } }, -1, 2, 1e-8, new Float64Array(2), new Float64Array(2));
    for (const x of seen) {
      expect(x).toBeGreaterThanOrEqual(-1);
      expect(x).toBeLessThanOrEqual(2);
    }
  });
});
