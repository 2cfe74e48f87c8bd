import { describe, expect, it } from 'vitest';
import { ATMOSPHERE_KPA, springForceN, springRateNPerMm, wheelRateNPerMm, type SpringSpec } from '../../../src/core/suspension';

const air = (gasLaw: 'isothermal' | 'adiabatic'): SpringSpec => ({ kind: 'air', pressureKPa: 1400, volumeMm3: 150_000, pistonAreaMm2: 1000, gasLaw });

describe('shock springs', () => {
  it('coil: F = k (s + preload), rate k', () => {
    // common practice: a linear coil spring
    const coil: SpringSpec = { kind: 'coil', rateNPerMm: 80, preloadMm: 2 };
    expect(springForceN(coil, 10)).toBe(960);
    expect(springRateNPerMm(coil, 10)).toBe(80);
  });

  for (const [law, n] of [['isothermal', 1], ['adiabatic', 1.4]] as const) {
    it(`air, ${law}: p V^${n} stays constant (Boyle; Poisson with γ = 1.4)`, () => {
      // Source: ideal gas, p V^n = const (theorem for an ideal gas; γ = 1.4 for air, from memory)
      const spring = air(law);
      const invariant = (s: number) => {
        const pAbsNPerMm2 = springForceN(spring, s) / 1000 + ATMOSPHERE_KPA / 1000;
        return pAbsNPerMm2 * (150_000 - 1000 * s) ** n;
      };
      for (const s of [0, 10, 30, 55]) expect(Math.abs(invariant(s) / invariant(0) - 1)).toBeLessThan(1e-12);
      expect(springForceN(spring, 0)).toBeCloseTo(1400, 9); // 1400 kPa gauge × 1000 mm² = 1400 N
    });

    it(`air, ${law}: the rate is the slope of the force (theorem)`, () => {
      const spring = air(law);
      const h = 1e-3;
      for (const s of [0.5, 20, 50]) {
        const slope = (springForceN(spring, s + h) - springForceN(spring, s - h)) / (2 * h);
        expect(Math.abs(springRateNPerMm(spring, s) / slope - 1)).toBeLessThan(1e-6);
      }
    });
  }

  it('wheel rate: k_s / LR² with a constant ratio; a falling ratio stiffens the wheel', () => {
    // Source: Barton and Fieldhouse, "Automotive Chassis Engineering", Springer, 2018, §3.9
    expect(wheelRateNPerMm(80, 1000, 2.5, 0)).toBeCloseTo(80 / 6.25, 12);
    expect(wheelRateNPerMm(80, 1000, 2.5, -0.01)).toBeGreaterThan(80 / 6.25);
  });
});
