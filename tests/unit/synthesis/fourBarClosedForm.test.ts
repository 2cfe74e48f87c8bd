import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { FOUR_BAR_OUT_LENGTH, fourBarCouplerPointInto, fourBarJointsInto } from '../../../src/core/synthesis';

const out = new Float64Array(FOUR_BAR_OUT_LENGTH);

describe('literature four-bar in closed form', () => {
  it('traces the Chebyshev–Hoeken straight line', () => {
    // Hoeken's proportions (reference README; from memory, verify against a mechanism
    // handbook): crank 1, ground 2, rocker 2.5, coupler 2.5, tracing point 5 from the
    // crank pin along the coupler. Crank pivot (0, 0), rocker pivot (−2, 0): θ0 = π.
    // Absolute crank angle 0 is θ2 = −π from the ground line. Rocker joint above the
    // ground line: the 'crossed' sign in our convention (checked below on the joints).
    const p = Float64Array.from([2, 1, 2.5, 2.5, 5, 0, Math.PI, 0, 0]);
    const joints = new Float64Array(8);
    fourBarJointsInto(p, 0, -Math.PI, -1, joints);
    expect(joints[5]).toBeGreaterThan(0);
    fourBarCouplerPointInto(p, 0, -Math.PI, -1, 1, out);
    expect(out[0]).toBeCloseTo(-2, 12);
    expect(out[1]).toBeCloseTo(4, 12);
    // Moves along the flat part at 4/3 crank radii per radian (theorem from these proportions).
    expect(Math.hypot(out[2], out[3])).toBeCloseTo(4 / 3, 12);
    expect(out[3]).toBeCloseTo(0, 12);
    // At 180° the point is (−2, 2√6).
    fourBarCouplerPointInto(p, 0, 0, -1, 0, out);
    expect(out[0]).toBeCloseTo(-2, 12);
    expect(out[1]).toBeCloseTo(2 * Math.sqrt(6), 12);
  });

  it('satisfies Freudenstein’s equation on both branches', () => {
    // Freudenstein, "Approximate synthesis of four-bar linkages", Trans. ASME 77, 1955
    // (form from memory): input a, coupler b, output c, ground d along +x, θ4 the output
    // link's angle at the rocker pivot: K1 cos θ4 − K2 cos θ2 + K3 = cos(θ2 − θ4),
    // K1 = d/a, K2 = d/c, K3 = (a² − b² + c² + d²)/(2ac).
    const joints = new Float64Array(8);
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 5, noNaN: true }),
        fc.double({ min: 2, max: 5, noNaN: true }),
        fc.double({ min: 2, max: 5, noNaN: true }),
        fc.double({ min: 2, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
        fc.constantFrom(1, -1),
        (a, b, c, d, theta2, sign) => {
          const p = Float64Array.from([d, a, b, c, 0, 0, 0, 0, 0]);
          const margin = fourBarJointsInto(p, 0, theta2, sign, joints);
          if (!(margin > 1e-6)) return;
          const theta4 = Math.atan2(joints[5] - joints[7], joints[4] - joints[6]);
          const k1 = d / a;
          const k2 = d / c;
          const k3 = (a * a - b * b + c * c + d * d) / (2 * a * c);
          expect(k1 * Math.cos(theta4) - k2 * Math.cos(theta2) + k3).toBeCloseTo(Math.cos(theta2 - theta4), 9);
          // The coupler keeps its length and the rocker its length.
          expect(Math.hypot(joints[4] - joints[2], joints[5] - joints[3])).toBeCloseTo(b, 9);
          expect(Math.hypot(joints[4] - joints[6], joints[5] - joints[7])).toBeCloseTo(c, 9);
        },
      ),
      { numRuns: 300, seed: 7 },
    );
  });

  it('gives first and second derivatives that match central differences', () => {
    // Independent check of the hand-written derivatives (common practice: finite
    // differences as a test oracle only, never in the product).
    const a = new Float64Array(FOUR_BAR_OUT_LENGTH);
    const b = new Float64Array(FOUR_BAR_OUT_LENGTH);
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 2, max: 6, noNaN: true }), { minLength: 4, maxLength: 4 }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.double({ min: -3, max: 3, noNaN: true }),
        fc.double({ min: 0, max: 6, noNaN: true }),
        fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
        fc.constantFrom(1, -1),
        (r, rcx, rcy, theta0, theta2, sign) => {
          const p = Float64Array.from([r[0], 1, r[1], r[2], rcx, rcy, theta0, 0.5, -0.25]);
          const h = 1e-5;
          if (!(fourBarCouplerPointInto(p, 0, theta2 - 2 * h, sign, 0, a) > 1e-3)) return;
          if (!(fourBarCouplerPointInto(p, 0, theta2 + 2 * h, sign, 0, a) > 1e-3)) return;
          fourBarCouplerPointInto(p, 0, theta2, sign, 2, out);
          fourBarCouplerPointInto(p, 0, theta2 + h, sign, 2, a);
          fourBarCouplerPointInto(p, 0, theta2 - h, sign, 2, b);
          const scale = 1 + Math.hypot(out[2], out[3]) + Math.hypot(out[4], out[5]);
          for (let k = 0; k < 4; k++) expect(Math.abs((a[k] - b[k]) / (2 * h) - out[k + 2]) / scale).toBeLessThan(1e-5);
        },
      ),
      { numRuns: 300, seed: 11 },
    );
  });

  it('reports a negative margin where the loop cannot close, and a finite point', () => {
    // Non-Grashof (s + l > p + q): crank 4 with ground 5, coupler 1, rocker 1 cannot reach θ2 = 0.
    const p = Float64Array.from([5, 4, 1, 1, 0.5, 0, 0, 0, 0]);
    const margin = fourBarCouplerPointInto(p, 0, Math.PI, 1, 0, out);
    expect(margin).toBeLessThan(0);
    expect(Number.isFinite(out[0]) && Number.isFinite(out[1])).toBe(true);
  });
});
