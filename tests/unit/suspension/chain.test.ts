import { describe, expect, it } from 'vitest';
import { RUN_LENGTH_MM, RUN_NX, RUN_NY, RUN_OFFSET_MM, RUN_SCRATCH_LENGTH, pitchRadiusMm, upperRunInto } from '../../../src/core/suspension/chain';

describe('the upper chain run', () => {
  it('is tangent to both pitch circles from above, and its length is the tangent length (theorem)', () => {
    const out = new Float64Array(RUN_SCRATCH_LENGTH);
    const rc = pitchRadiusMm(21, 12.7);
    const rr = pitchRadiusMm(32, 12.7);
    for (const [ax, ay] of [[-435, -12], [-430, 120], [-400, -80]]) {
      expect(upperRunInto(ax, ay, rc, 0, 0, rr, out)).toBe(true);
      const n = [out[RUN_NX], out[RUN_NY]];
      const c = out[RUN_OFFSET_MM];
      expect(Math.hypot(n[0], n[1])).toBeCloseTo(1, 14);
      // each centre lies its radius below the line, on the same side
      expect(c - (n[0] * ax + n[1] * ay)).toBeCloseTo(rc, 9);
      expect(c - 0).toBeCloseTo(rr, 9);
      expect(n[1]).toBeGreaterThan(0);
      const d = Math.hypot(ax, ay);
      expect(out[RUN_LENGTH_MM]).toBeCloseTo(Math.sqrt(d * d - (rr - rc) ** 2), 9);
    }
  });

  it('refuses overlapping sprockets', () => {
    const out = new Float64Array(RUN_SCRATCH_LENGTH);
    expect(upperRunInto(-100, 0, 60, 0, 0, 60, out)).toBe(false);
    expect(upperRunInto(Number.NaN, 0, 20, 0, 0, 60, out)).toBe(false);
  });
});
