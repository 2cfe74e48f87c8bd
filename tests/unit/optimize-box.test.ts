import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { fromUnitBoxInto, toUnitBoxInto } from '../../src/core/optimize';

describe('unit box mapping x = lower + u · (upper − lower)', () => {
  it('maps corners and centre, and a degenerate coordinate to 0.5', () => {
    const lower = [-5, 0, 2];
    const upper = [5, 10, 2];
    expect(Array.from(fromUnitBoxInto([0, 1, 0.5], lower, upper, new Float64Array(3)))).toEqual([-5, 10, 2]);
    expect(Array.from(toUnitBoxInto([0, 2.5, 2], lower, upper, new Float64Array(3)))).toEqual([0.5, 0.25, 0.5]);
  });

  it('toUnitBoxInto undoes fromUnitBoxInto to rounding (property)', () => {
    const box = fc
      .tuple(fc.double({ min: -1e3, max: 1e3, noNaN: true }), fc.double({ min: 1e-3, max: 1e3, noNaN: true }))
      .map(([lo, width]) => [lo, lo + width] as const);
    fc.assert(
      fc.property(fc.array(fc.tuple(box, fc.double({ min: 0, max: 1, noNaN: true })), { minLength: 1, maxLength: 8 }), (rows) => {
        const lower = rows.map(([[lo]]) => lo);
        const upper = rows.map(([[, hi]]) => hi);
        const unit = rows.map(([, u]) => u);
        const x = fromUnitBoxInto(unit, lower, upper, new Float64Array(rows.length));
        const back = toUnitBoxInto(x, lower, upper, new Float64Array(rows.length));
        // Common practice: the round trip loses a few ulps of the larger of |lower|, |upper|, relative to the width.
        rows.forEach(([[lo, hi]], j) => {
          const scale = Math.max(Math.abs(lo), Math.abs(hi)) / (hi - lo);
          expect(Math.abs(back[j] - unit[j])).toBeLessThanOrEqual(8 * Number.EPSILON * (1 + scale));
        });
      }),
      { numRuns: 300 },
    );
  });
});
