/**
 * The bicycle a suspension layout is analysed on: plain, validated data.
 *
 * Frame: origin at the bottom-bracket centre, x forward (towards the front wheel), y up,
 * mm. The front frame (the ground body of the layout's linkage) is held still; the
 * ground is taken level through the rear contact patch.
 */
import { formatNumber as fmt } from './format';

/** Standard bicycle chain pitch, ½ inch (ISO 606 / ISO 9633 bicycle chain). */
export const DEFAULT_CHAIN_PITCH_MM = 12.7;

/** Standard atmosphere, kPa: an air spring's gauge pressure is above this. */
export const ATMOSPHERE_KPA = 101.325;

/**
 * Gas law of an air spring's positive chamber: `isothermal` (p V = const, slow
 * compression) or `adiabatic` (p V^γ = const with γ = 1.4 for air, fast compression).
 */
export type GasLaw = 'isothermal' | 'adiabatic';

/** Polytropic exponent of each gas law (γ = 1.4 for diatomic air). */
export const GAS_LAW_EXPONENT: Readonly<Record<GasLaw, number>> = { isothermal: 1, adiabatic: 1.4 };

export type SpringSpec =
  /** A coil: force = rate × (shortening + preload). */
  | { readonly kind: 'coil'; readonly rateNPerMm: number; readonly preloadMm?: number }
  /**
   * An air spring's positive chamber only (no negative chamber, no seal friction):
   * gauge pressure and volume at full extension, and the piston's area.
   */
  | {
      readonly kind: 'air';
      readonly pressureKPa: number;
      readonly volumeMm3: number;
      readonly pistonAreaMm2: number;
      readonly gasLaw: GasLaw;
    };

export interface Bicycle {
  /** Rear axle centre at full extension (shock fully extended), mm. */
  readonly rearAxleMm: { readonly x: number; readonly y: number };
  /** Rear wheel radius to the ground (tyre included), mm. */
  readonly wheelRadiusMm: number;
  /** x of the front tyre's contact point, mm. Give this or wheelbaseMm. */
  readonly frontContactXMm?: number;
  /** Horizontal distance from the rear axle (at full extension) to the front contact point, mm. */
  readonly wheelbaseMm?: number;
  /** Centre of mass of rider and bicycle above the ground, mm. */
  readonly comHeightMm: number;
  readonly chainringTeeth: number;
  /** Cogs of the cassette, teeth, in the order to report them. */
  readonly cogTeeth: readonly number[];
  /** Chain pitch, mm (DEFAULT_CHAIN_PITCH_MM when omitted). */
  readonly chainPitchMm?: number;
  readonly shock: { readonly eyeToEyeMm: number; readonly strokeMm: number };
  /** Sag as a share of the wheel travel (0.3 = 30 %). */
  readonly sag: number;
  readonly spring?: SpringSpec;
}

/** A bicycle after validation: every optional value filled in, copied. */
export interface ValidBicycle {
  readonly rearAxleMm: { readonly x: number; readonly y: number };
  readonly wheelRadiusMm: number;
  readonly frontContactXMm: number;
  readonly comHeightMm: number;
  readonly chainringTeeth: number;
  readonly cogTeeth: readonly number[];
  readonly chainPitchMm: number;
  readonly shock: { readonly eyeToEyeMm: number; readonly strokeMm: number };
  readonly sag: number;
  readonly spring: SpringSpec | null;
}

export interface BicycleIssue {
  /** Where in the bicycle, such as `shock.strokeMm` or `cogTeeth[3]`. */
  readonly path: string;
  readonly message: string;
}

export type BicycleValidation = { readonly ok: true; readonly bicycle: ValidBicycle } | { readonly ok: false; readonly issues: BicycleIssue[] };

/** Accepted ranges, [min, max] inclusive, in the field's unit; wide enough for any pedal bicycle. */
export const BICYCLE_RANGES = {
  rearAxleXMm: [-1000, -200],
  rearAxleYMm: [-300, 300],
  wheelRadiusMm: [100, 500],
  frontContactXMm: [200, 2000],
  wheelbaseMm: [500, 2500],
  comHeightMm: [200, 2500],
  chainringTeeth: [10, 80],
  cogTeeth: [9, 80],
  cogCount: [1, 15],
  chainPitchMm: [5, 30],
  eyeToEyeMm: [50, 600],
  strokeMm: [5, 200],
  sag: [0, 0.6],
  coilRateNPerMm: [1, 2000],
  coilPreloadMm: [0, 50],
  airPressureKPa: [1, 5000],
  airVolumeMm3: [1e3, 2e6],
  airPistonAreaMm2: [10, 5000],
} as const satisfies Record<string, readonly [number, number]>;

/** Checks every field and returns a filled-in copy, or every problem found in the user's words. */
export function validateBicycle(input: Bicycle): BicycleValidation {
  const issues: BicycleIssue[] = [];
  if (typeof input !== 'object' || input === null) return { ok: false, issues: [{ path: '', message: `the bicycle is ${String(input)}; expected an object of its measurements` }] };
  const inRange = (path: string, what: string, value: unknown, range: readonly [number, number], unit: string): value is number => {
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      issues.push({ path, message: `${what} is ${String(value)}; expected a number of ${unit}` });
      return false;
    }
    if (!(value >= range[0] && value <= range[1])) {
      issues.push({ path, message: `${what} ${fmt(value)} ${unit} is outside the accepted ${range[0]}–${range[1]} ${unit}` });
      return false;
    }
    return true;
  };
  const teeth = (path: string, what: string, value: unknown, range: readonly [number, number]): value is number => {
    if (!inRange(path, what, value, range, 'teeth')) return false;
    if (!Number.isInteger(value)) {
      issues.push({ path, message: `${what} ${fmt(value)} is not a whole number of teeth` });
      return false;
    }
    return true;
  };
  const R = BICYCLE_RANGES;
  const axle = input.rearAxleMm as { x?: unknown; y?: unknown } | undefined;
  inRange('rearAxleMm.x', 'rear axle x', axle?.x, R.rearAxleXMm, 'mm');
  inRange('rearAxleMm.y', 'rear axle y', axle?.y, R.rearAxleYMm, 'mm');
  inRange('wheelRadiusMm', 'wheel radius', input.wheelRadiusMm, R.wheelRadiusMm, 'mm');
  inRange('comHeightMm', 'centre-of-mass height', input.comHeightMm, R.comHeightMm, 'mm');

  let frontContactXMm = NaN;
  const hasFront = input.frontContactXMm !== undefined;
  const hasBase = input.wheelbaseMm !== undefined;
  if (hasFront === hasBase) {
    issues.push({ path: 'frontContactXMm', message: hasFront ? 'both the front contact x and the wheelbase are given; give one of them' : 'neither the front contact x nor the wheelbase is given; give one of them' });
  } else if (hasFront) {
    if (inRange('frontContactXMm', 'front contact x', input.frontContactXMm, R.frontContactXMm, 'mm')) frontContactXMm = input.frontContactXMm as number;
  } else if (inRange('wheelbaseMm', 'wheelbase', input.wheelbaseMm, R.wheelbaseMm, 'mm') && typeof axle?.x === 'number') {
    frontContactXMm = axle.x + (input.wheelbaseMm as number);
  }
  if (Number.isFinite(frontContactXMm) && typeof axle?.x === 'number' && !(frontContactXMm > 0)) {
    issues.push({ path: hasFront ? 'frontContactXMm' : 'wheelbaseMm', message: `the front contact point at x = ${fmt(frontContactXMm)} mm is not ahead of the bottom bracket; expected x > 0` });
  }

  teeth('chainringTeeth', 'chainring', input.chainringTeeth, R.chainringTeeth);
  const cogs: unknown = input.cogTeeth;
  if (!Array.isArray(cogs) || !(cogs.length >= R.cogCount[0] && cogs.length <= R.cogCount[1])) {
    issues.push({ path: 'cogTeeth', message: `the cassette has ${Array.isArray(cogs) ? `${cogs.length} cogs` : 'no list of cogs'}; expected ${R.cogCount[0]} to ${R.cogCount[1]}` });
  } else {
    cogs.forEach((z: unknown, i: number) => teeth(`cogTeeth[${i}]`, `cog ${i + 1}`, z, R.cogTeeth));
  }
  const chainPitchMm = input.chainPitchMm ?? DEFAULT_CHAIN_PITCH_MM;
  inRange('chainPitchMm', 'chain pitch', chainPitchMm, R.chainPitchMm, 'mm');

  const shock = input.shock as { eyeToEyeMm?: unknown; strokeMm?: unknown } | undefined;
  const eyeOk = inRange('shock.eyeToEyeMm', 'shock eye-to-eye length', shock?.eyeToEyeMm, R.eyeToEyeMm, 'mm');
  const strokeOk = inRange('shock.strokeMm', 'shock stroke', shock?.strokeMm, R.strokeMm, 'mm');
  if (eyeOk && strokeOk && !((shock?.strokeMm as number) < (shock?.eyeToEyeMm as number))) {
    issues.push({
      path: 'shock.strokeMm',
      message: `stroke ${fmt(shock?.strokeMm as number)} mm is not shorter than the eye-to-eye length ${fmt(shock?.eyeToEyeMm as number)} mm`,
    });
  }
  if (typeof input.sag === 'number' && input.sag > 1 && input.sag <= 100) {
    issues.push({ path: 'sag', message: `sag ${fmt(input.sag)} looks like a percentage; give it as a share of travel (0.3 for 30 %)` });
  } else {
    inRange('sag', 'sag', input.sag, R.sag, '(share of travel)');
  }

  const spring = input.spring === undefined ? null : validateSpring(input.spring, shock?.strokeMm, issues, inRange);
  if (issues.length > 0) return { ok: false, issues };
  return {
    ok: true,
    bicycle: {
      rearAxleMm: { x: input.rearAxleMm.x, y: input.rearAxleMm.y },
      wheelRadiusMm: input.wheelRadiusMm,
      frontContactXMm,
      comHeightMm: input.comHeightMm,
      chainringTeeth: input.chainringTeeth,
      cogTeeth: [...input.cogTeeth],
      chainPitchMm,
      shock: { eyeToEyeMm: input.shock.eyeToEyeMm, strokeMm: input.shock.strokeMm },
      sag: input.sag,
      spring,
    },
  };
}

function validateSpring(
  spring: SpringSpec,
  strokeMm: unknown,
  issues: BicycleIssue[],
  inRange: (path: string, what: string, value: unknown, range: readonly [number, number], unit: string) => boolean,
): SpringSpec | null {
  const R = BICYCLE_RANGES;
  if (spring.kind === 'coil') {
    const preloadMm = spring.preloadMm ?? 0;
    const ok = inRange('spring.rateNPerMm', 'coil spring rate', spring.rateNPerMm, R.coilRateNPerMm, 'N/mm') &&
      inRange('spring.preloadMm', 'coil preload', preloadMm, R.coilPreloadMm, 'mm');
    return ok ? { kind: 'coil', rateNPerMm: spring.rateNPerMm, preloadMm } : null;
  }
  if (spring.kind === 'air') {
    const a = inRange('spring.pressureKPa', 'air spring pressure (gauge)', spring.pressureKPa, R.airPressureKPa, 'kPa');
    const v = inRange('spring.volumeMm3', 'air chamber volume', spring.volumeMm3, R.airVolumeMm3, 'mm³');
    const p = inRange('spring.pistonAreaMm2', 'air piston area', spring.pistonAreaMm2, R.airPistonAreaMm2, 'mm²');
    if (spring.gasLaw !== 'isothermal' && spring.gasLaw !== 'adiabatic') {
      issues.push({ path: 'spring.gasLaw', message: `gas law "${String(spring.gasLaw)}" is not known; expected "isothermal" or "adiabatic" (γ = 1.4)` });
      return null;
    }
    if (!(a && v && p)) return null;
    if (typeof strokeMm === 'number' && !(spring.pistonAreaMm2 * strokeMm < spring.volumeMm3)) {
      issues.push({
        path: 'spring.volumeMm3',
        message: `the stroke would sweep ${fmt((spring.pistonAreaMm2 * strokeMm) / 1000)} cm³ (piston area × stroke), no less than the air chamber's ${fmt(spring.volumeMm3 / 1000)} cm³; expected a larger chamber`,
      });
      return null;
    }
    return { kind: 'air', pressureKPa: spring.pressureKPa, volumeMm3: spring.volumeMm3, pistonAreaMm2: spring.pistonAreaMm2, gasLaw: spring.gasLaw };
  }
  issues.push({ path: 'spring.kind', message: `spring kind "${String((spring as { kind?: unknown }).kind)}" is not known; expected "coil" or "air"` });
  return null;
}
