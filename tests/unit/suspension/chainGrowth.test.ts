/**
 * The chain's growth taken term by term (wrappedRunGrowthMm: tangent length, and the wrap
 * term from the turn of the centre line less the change of the run's tilt) against the
 * plain difference of two wrapped lengths written here, tangent length plus
 * (rRing − rCog)·ψ with the normal's angle ψ from atan2.
 */
import { describe, expect, it } from 'vitest';
import {
  RUN_COS_TILT,
  RUN_LENGTH_MM,
  RUN_NX,
  RUN_NY,
  RUN_SCRATCH_LENGTH,
  RUN_SIN_TILT,
  pitchRadiusMm,
  upperRunAlongInto,
  upperRunInto,
  wrappedRunGrowthMm,
} from '../../../src/core/suspension/chain';

/** The run with the axle at (ax, ay), its centre line's direction, and its wrapped length the plain way. */
function runAt(ax: number, ay: number, rCog: number, rRing: number) {
  const plain = new Float64Array(RUN_SCRATCH_LENGTH);
  expect(upperRunInto(ax, ay, rCog, 0, 0, rRing, plain)).toBe(true);
  const d = Math.hypot(ax, ay);
  const along = new Float64Array(RUN_SCRATCH_LENGTH);
  upperRunAlongInto(ax, ay, -ax / d, -ay / d, d, rCog, rRing, along);
  const wrapped = plain[RUN_LENGTH_MM] + (rRing - rCog) * Math.atan2(plain[RUN_NY], plain[RUN_NX]);
  return { along, wrapped, normalRad: Math.atan2(plain[RUN_NY], plain[RUN_NX]), lineRad: Math.atan2(-ay, -ax) };
}

describe('chain growth taken term by term', () => {
  const ring = pitchRadiusMm(32, 12.7);
  // Axle positions over a long travel, and cogs either side of the chainring's size; the
  // last two, either side of straight below the bottom bracket, put the normal's angle
  // either side of ±π, where atan2 jumps by 2π.
  const axles: [number, number][] = [[-435, -12], [-440, 30], [-445, 80], [-430, 140], [-395, 60], [-300, -150], [-20, -300], [20, -300]];
  for (const teeth of [10, 21, 32, 51]) {
    it(`${teeth}-tooth cog: the growth is the change of the wrapped length (angle-difference identity)`, () => {
      const r = pitchRadiusMm(teeth, 12.7);
      const [ax0, ay0] = axles[0];
      const start = runAt(ax0, ay0, r, ring);
      for (const [ax, ay] of axles) {
        const now = runAt(ax, ay, r, ring);
        const growth = wrappedRunGrowthMm(
          now.along, start.along[RUN_LENGTH_MM], start.along[RUN_SIN_TILT], start.along[RUN_COS_TILT], start.normalRad, now.lineRad - start.lineRad, r, ring,
        );
        // Source: theorem (asin a − asin b = asin(a√(1 − b²) − b√(1 − a²)) for a·b ≥ 0); the plain difference rounds to about 1e-13 mm.
        expect(Math.abs(growth - (now.wrapped - start.wrapped))).toBeLessThan(1e-11);
      }
    });
  }

  it('takes the same tilt as the plain run, both for small changes (series) and large ones (asin)', () => {
    const r = pitchRadiusMm(51, 12.7);
    const near = runAt(-180, 0, r, ring);
    const far = runAt(-440, 0, r, ring);
    // The tilt changes by far more than the series' range between these two axles.
    const dTilt = Math.asin(near.along[RUN_SIN_TILT]) - Math.asin(far.along[RUN_SIN_TILT]);
    expect(Math.abs(dTilt)).toBeGreaterThan(0.1);
    const growth = wrappedRunGrowthMm(near.along, far.along[RUN_LENGTH_MM], far.along[RUN_SIN_TILT], far.along[RUN_COS_TILT], far.normalRad, near.lineRad - far.lineRad, r, ring);
    // Source: theorem (as above)
    expect(Math.abs(growth - (near.wrapped - far.wrapped))).toBeLessThan(1e-11);
  });
});
