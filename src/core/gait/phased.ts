/**
 * Several identical legs on one crankshaft, each with its own phase: how many feet are
 * in stance over the shaft's turn, and how much the body rises and falls.
 *
 * Model: every leg is the same leg (same figures, same ground line), its crank angle
 * is the shaft's plus its phase (in the crank's direction), and the hips are fixed on
 * one rigid body kept level. The body rests on the lowest foot, so its height above the
 * ground moves with minus the lowest foot height; the ripple is the range of that
 * lowest height over the turn. Heights between samples come from cubic Hermite
 * interpolation of the exact heights and slopes (error of order step⁴).
 */
import type { GaitFigures, TurnRange } from './types';
import { extremum, GAIT_ANGLE_TOL_RAD, signChange } from './solve';

/** Most legs on one shaft. */
export const MAX_PHASED_LEGS = 64;

const TWO_PI = 2 * Math.PI;

export interface PhasedOptions {
  readonly legs: number;
  /** Phase of each leg's crank ahead of the shaft (rad, in the crank's direction); one per leg. */
  readonly phasesRad: readonly number[];
}

export interface FootCountSegment extends TurnRange {
  readonly feet: number;
}

export interface PhasedFigures {
  readonly legs: number;
  readonly phasesRad: readonly number[];
  readonly toleranceMm: number;
  /** Shaft angle ranges over [0, 2π) and the number of feet in stance over each. */
  readonly feetOnGround: FootCountSegment[];
  readonly minFeet: number;
  readonly maxFeet: number;
  /** shareByFeet[n]: share of the turn with n feet in stance. */
  readonly shareByFeet: number[];
  /** Range over the turn of the lowest foot's height (mm): how far the body rises and falls. */
  readonly bodyHeightRippleMm: number;
  readonly lowestFootMinMm: number;
  readonly lowestFootMaxMm: number;
  readonly model: string;
}

export type PhasedResult = { readonly ok: true; readonly figures: PhasedFigures } | { readonly ok: false; readonly reason: string };

export const PHASED_MODEL =
  'Identical legs on one shaft, each crank ahead of the shaft by its phase; hips on one rigid body kept level; ' +
  'the body rests on the lowest foot, so its height ripple is the range over the turn of the lowest foot height.';

function wrap(t: number): number {
  return t - TWO_PI * Math.floor(t / TWO_PI);
}

/** Feet in stance and body height ripple for `legs` copies of one leg at the given phases. */
export function phasedLegs(figures: GaitFigures, options: PhasedOptions): PhasedResult {
  const { legs, phasesRad } = options;
  if (!(Number.isInteger(legs) && legs >= 1 && legs <= MAX_PHASED_LEGS)) {
    return { ok: false, reason: `legs is ${String(legs)}; expected a whole number of legs from 1 to ${MAX_PHASED_LEGS}` };
  }
  if (!Array.isArray(phasesRad) || phasesRad.length !== legs) {
    return { ok: false, reason: `${legs} legs need one phase each (rad); got ${Array.isArray(phasesRad) ? phasesRad.length : 'no list of phases'}` };
  }
  const bad = phasesRad.findIndex((p) => !Number.isFinite(p));
  if (bad >= 0) return { ok: false, reason: `the phase of leg ${bad + 1} is ${String(phasesRad[bad])}; expected a finite angle in rad` };
  const phases = phasesRad.slice();
  const intervals = figures.stance.intervals;
  const inStance = (tau: number) => intervals.some((r) => (tau >= r.fromRad && tau <= r.toRad) || (tau + TWO_PI >= r.fromRad && tau + TWO_PI <= r.toRad));

  const cuts = [0, TWO_PI];
  for (const phase of phases) {
    for (const r of intervals) cuts.push(wrap(r.fromRad - phase), wrap(r.toRad - phase));
  }
  cuts.sort((a, b) => a - b);
  const feetOnGround: FootCountSegment[] = [];
  const shareByFeet = new Array<number>(legs + 1).fill(0);
  for (let i = 0; i + 1 < cuts.length; i++) {
    if (!(cuts[i + 1] - cuts[i] > GAIT_ANGLE_TOL_RAD)) continue;
    const mid = 0.5 * (cuts[i] + cuts[i + 1]);
    let feet = 0;
    for (const phase of phases) if (inStance(wrap(mid + phase))) feet++;
    shareByFeet[feet] += (cuts[i + 1] - cuts[i]) / TWO_PI;
    const last = feetOnGround[feetOnGround.length - 1];
    if (last !== undefined && last.feet === feet) feetOnGround[feetOnGround.length - 1] = { ...last, toRad: cuts[i + 1] };
    else feetOnGround.push({ fromRad: cuts[i], toRad: cuts[i + 1], feet });
  }
  const counts = feetOnGround.map((s) => s.feet);

  const ripple = lowestFootRange(figures, phases);
  return {
    ok: true,
    figures: {
      legs,
      phasesRad: phases,
      toleranceMm: figures.stance.toleranceMm,
      feetOnGround,
      minFeet: Math.min(...counts),
      maxFeet: Math.max(...counts),
      shareByFeet,
      bodyHeightRippleMm: ripple.max - ripple.min,
      lowestFootMinMm: ripple.min,
      lowestFootMaxMm: ripple.max,
      model: PHASED_MODEL,
    },
  };
}

/** The foot height at turn angle tau by cubic Hermite interpolation of the exact samples. */
function heightAt(figures: GaitFigures, tau: number): number {
  const steps = figures.steps;
  const dt = TWO_PI / steps;
  const w = wrap(tau);
  const k = Math.min(Math.floor(w / dt), steps - 1);
  const u = (w - k * dt) / dt;
  const h = figures.path.heightMm;
  const r = figures.path.heightRateMmPerRad;
  const u2 = u * u;
  const u3 = u2 * u;
  return (2 * u3 - 3 * u2 + 1) * h[k] + (u3 - 2 * u2 + u) * dt * r[k] + (-2 * u3 + 3 * u2) * h[k + 1] + (u3 - u2) * dt * r[k + 1];
}

/** The least and greatest over the shaft's turn of the lowest foot height. */
function lowestFootRange(figures: GaitFigures, phases: readonly number[]): { min: number; max: number } {
  const lowestLeg = (t: number): number => {
    let best = 0;
    let bestH = Infinity;
    for (let i = 0; i < phases.length; i++) {
      const h = heightAt(figures, t + phases[i]);
      if (h < bestH) { bestH = h; best = i; }
    }
    return best;
  };
  const envelope = (t: number): number => heightAt(figures, t + phases[lowestLeg(t)]);
  const steps = figures.steps;
  const dt = TWO_PI / steps;
  const values = new Float64Array(steps + 1);
  const leaders = new Int32Array(steps + 1);
  for (let k = 0; k <= steps; k++) {
    leaders[k] = lowestLeg(k * dt);
    values[k] = heightAt(figures, k * dt + phases[leaders[k]]);
  }
  let min = Infinity;
  let max = -Infinity;
  for (let k = 0; k < steps; k++) {
    min = Math.min(min, values[k]);
    max = Math.max(max, values[k]);
    // Where another foot becomes the lowest, the envelope has a corner: locate it.
    if (leaders[k] !== leaders[k + 1]) {
      const a = phases[leaders[k]];
      const b = phases[leaders[k + 1]];
      const gap = (t: number) => heightAt(figures, t + a) - heightAt(figures, t + b);
      const corner = envelope(signChange(gap, k * dt, (k + 1) * dt, gap(k * dt)));
      min = Math.min(min, corner);
      max = Math.max(max, corner);
    }
  }
  // Smooth extremes between samples: refine each sampled local extreme.
  for (let k = 0; k < steps; k++) {
    const prev = values[(k + steps - 1) % steps];
    const next = values[k + 1];
    const t0 = (k - 1) * dt;
    const t1 = (k + 1) * dt;
    if (values[k] > prev && values[k] >= next) max = Math.max(max, extremum(envelope, t0, t1, 1).value);
    if (values[k] < prev && values[k] <= next) min = Math.min(min, extremum(envelope, t0, t1, -1).value);
  }
  return { min, max };
}
