import { describe, expect, it } from 'vitest';
import { DEFAULT_CHAIN_PITCH_MM, DEMO_TRAIL_BIKE, validateBicycle, type Bicycle } from '../../../src/core/suspension';

function issues(b: unknown): { path: string; message: string }[] {
  const v = validateBicycle(b as Bicycle);
  return v.ok ? [] : v.issues;
}

describe('validateBicycle', () => {
  it('accepts the demo trail bike and fills in the front contact and defaults', () => {
    const v = validateBicycle({ ...DEMO_TRAIL_BIKE, chainPitchMm: undefined });
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    expect(v.bicycle.frontContactXMm).toBe(DEMO_TRAIL_BIKE.rearAxleMm.x + (DEMO_TRAIL_BIKE.wheelbaseMm as number));
    expect(v.bicycle.chainPitchMm).toBe(DEFAULT_CHAIN_PITCH_MM);
    expect(v.bicycle.spring).toEqual({ kind: 'coil', rateNPerMm: 80, preloadMm: 0 });
  });

  it('copies what it keeps', () => {
    const cogs = [11, 13, 15];
    const v = validateBicycle({ ...DEMO_TRAIL_BIKE, cogTeeth: cogs });
    cogs[0] = 99;
    expect(v.ok && v.bicycle.cogTeeth[0]).toBe(11);
  });

  it('says when the stroke is longer than the eye-to-eye length', () => {
    expect(issues({ ...DEMO_TRAIL_BIKE, shock: { eyeToEyeMm: 65, strokeMm: 80 } })).toContainEqual({
      path: 'shock.strokeMm',
      message: 'stroke 80 mm is not shorter than the eye-to-eye length 65 mm',
    });
  });

  it('names every bad field, in the user’s words', () => {
    const found = issues({
      ...DEMO_TRAIL_BIKE,
      wheelRadiusMm: Number.NaN,
      comHeightMm: -5,
      chainringTeeth: 32.5,
      cogTeeth: [10, 7],
      sag: 30,
    });
    const byPath = Object.fromEntries(found.map((i) => [i.path, i.message]));
    expect(byPath.wheelRadiusMm).toBe('wheel radius is NaN; expected a number of mm');
    expect(byPath.comHeightMm).toBe('centre-of-mass height -5 mm is outside the accepted 200–2500 mm');
    expect(byPath.chainringTeeth).toBe('chainring 32.5 is not a whole number of teeth');
    expect(byPath['cogTeeth[1]']).toBe('cog 2 7 teeth is outside the accepted 9–80 teeth');
    expect(byPath.sag).toBe('sag 30 looks like a percentage; give it as a share of travel (0.3 for 30 %)');
  });

  it('needs exactly one of front contact x and wheelbase', () => {
    expect(issues({ ...DEMO_TRAIL_BIKE, frontContactXMm: 790 })[0].message).toBe('both the front contact x and the wheelbase are given; give one of them');
    expect(issues({ ...DEMO_TRAIL_BIKE, wheelbaseMm: undefined })[0].message).toBe('neither the front contact x nor the wheelbase is given; give one of them');
  });

  it('checks an air spring: gas law, and a chamber the stroke cannot empty', () => {
    const air = { kind: 'air', pressureKPa: 1400, volumeMm3: 150_000, pistonAreaMm2: 2000, gasLaw: 'adiabatic' } as const;
    // 2000 mm² × 55 mm = 110 cm³ of a 150 cm³ chamber
    expect(validateBicycle({ ...DEMO_TRAIL_BIKE, spring: air }).ok).toBe(true);
    expect(issues({ ...DEMO_TRAIL_BIKE, spring: { ...air, pistonAreaMm2: 3000 }, shock: { eyeToEyeMm: 230, strokeMm: 60 } })[0].message).toBe(
      "the stroke would sweep 180 cm³ (piston area × stroke), no less than the air chamber's 150 cm³; expected a larger chamber",
    );
    expect(issues({ ...DEMO_TRAIL_BIKE, spring: { ...air, gasLaw: 'polytropic' } })[0].message).toBe(
      'gas law "polytropic" is not known; expected "isothermal" or "adiabatic" (γ = 1.4)',
    );
  });
});
