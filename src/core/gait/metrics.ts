/**
 * Gait figures of a crank-driven leg over one crank turn at constant speed: the foot's
 * path and exact velocity, stance and its figures (stance.ts), step height, duty
 * factor, poor transmission in stance and the leg's size (linkageFigures.ts).
 * Conventions are stated in GAIT_CONVENTIONS.
 */
import { compile, printableId, sweep, type Linkage, type SweepResult } from '../linkage';
import { fourBarLoops } from '../linkage/analysis';
import { TRANSMISSION_GUIDELINE_DEG } from '../linkage/report';
import { GAIT_CAUTION } from './conventions';
import { validateLeg, type Leg, type LegSpec } from './leg';
import { legSize, loopTransmission } from './linkageFigures';
import { DEG_PER_RAD, fmt, footState, Probe, TWO_PI, type FootState } from './probe';
import { stanceBand, stanceFigures } from './stance';
import type { FootPath, GaitOptions, GaitResult } from './types';

/** Samples over the turn by default (0.5° apart) and the accepted range. */
export const DEFAULT_GAIT_STEPS = 720;
export const GAIT_STEPS_RANGE = [36, 100_000] as const;

/** The gait figures of `linkage` as the leg `legSpec` describes, over one crank turn. */
export function gaitFigures(linkage: Linkage, legSpec: LegSpec, options: GaitOptions = {}): GaitResult {
  const checked = validateLeg(legSpec, linkage);
  if (!checked.ok) return { ok: false, reason: checked.issues.map((i) => `${i.path}: ${i.message}`).join('; ') };
  const leg = checked.leg;
  const steps = options.steps ?? DEFAULT_GAIT_STEPS;
  if (!(Number.isInteger(steps) && steps >= GAIT_STEPS_RANGE[0] && steps <= GAIT_STEPS_RANGE[1])) {
    return { ok: false, reason: `steps is ${String(steps)}; expected a whole number of samples per turn from ${GAIT_STEPS_RANGE[0]} to ${GAIT_STEPS_RANGE[1]}` };
  }
  const compiled = compile(linkage);
  if (!compiled.ok) return { ok: false, reason: `the linkage does not compile: ${compiled.issues.map((i) => `${i.where}: ${i.message}`).join('; ')}` };
  const plan = compiled.plan;
  const theta0 = plan.driverReferenceValue;
  const dir = leg.crankDirection;
  const sw = sweep(plan, { from: theta0, to: theta0 + dir * TWO_PI, steps: steps + 1 });
  const turnDeg = (v: number) => fmt(dir * (v - theta0) * DEG_PER_RAD);
  if (!sw.fullTurn || sw.locks.length > 0) {
    const where = sw.locks.map((l) => `${turnDeg(l.from)}° to ${turnDeg(l.to)}°`).join(', ');
    const span = where === '' ? 'somewhere in the turn' : `from ${where} of the turn from the reference pose`;
    return { ok: false, reason: `the crank cannot turn fully: the linkage does not assemble ${span}; a leg needs a crank that turns through full turns` };
  }
  const deadCentre = sw.deadCentres[0];
  if (deadCentre !== undefined) {
    return { ok: false, reason: `joint '${printableId(deadCentre.joint)}' passes a dead centre at ${turnDeg(deadCentre.value)}° of the turn, where its motion may take either branch and its velocity is not defined` };
  }
  const footSlot = plan.slotIndex.get(leg.foot) as number;
  const path = footPath(leg, sw, footSlot, steps);
  for (let k = 0; k <= steps; k++) {
    if (!(Number.isFinite(path.heightRateMmPerRad[k]) && Number.isFinite(path.alongRateMmPerRad[k]))) {
      return { ok: false, reason: `the foot's velocity is not finite at ${fmt(path.turnRad[k] * DEG_PER_RAD)}° of the turn (a dead centre)` };
    }
  }

  const probe = new Probe(plan, leg, sw, footSlot, theta0, steps);
  const tol = leg.stanceToleranceMm;
  const band = stanceBand(probe, path, steps, tol);
  const notes: string[] = [`Duty factor and stance are for a stance tolerance of ${fmt(tol)} mm about the ground line.`];
  let stepHeightMm = -Infinity;
  let lowestMm = Infinity;
  for (let k = 0; k < steps; k++) {
    stepHeightMm = Math.max(stepHeightMm, path.heightMm[k]);
    lowestMm = Math.min(lowestMm, path.heightMm[k]);
  }
  for (const e of band.extrema) {
    stepHeightMm = Math.max(stepHeightMm, e.height);
    lowestMm = Math.min(lowestMm, e.height);
  }
  if (lowestMm < -tol) notes.push(`The foot passes ${fmt(-lowestMm)} mm below the ground line, more than the stance tolerance: it would dig in; place the ground line at the path's lowest stretch.`);

  let longest = -1;
  let stanceRad = 0;
  band.intervals.forEach((r, i) => {
    stanceRad += r.toRad - r.fromRad;
    if (longest < 0 || r.toRad - r.fromRad > band.intervals[longest].toRad - band.intervals[longest].fromRad) longest = i;
  });
  if (band.intervals.length === 0) notes.push(`The foot never comes within ${fmt(tol)} mm of the ground line: there is no stance.`);
  if (band.intervals.length > 1) notes.push(`The foot enters the stance band ${band.intervals.length} times per turn; stride, flatness and speed are for the longest stance.`);
  const longestStance = longest >= 0 ? stanceFigures(probe, band, band.intervals[longest], steps, notes) : null;

  return {
    ok: true,
    figures: {
      leg,
      steps,
      referenceCrankRad: theta0,
      path,
      stance: { toleranceMm: tol, intervals: band.intervals, longest },
      dutyFactor: { value: stanceRad / TWO_PI, toleranceMm: tol },
      stepHeightMm,
      lowestMm,
      longestStance,
      transmission: {
        guidelineDeg: { min: TRANSMISSION_GUIDELINE_DEG.min, max: TRANSMISSION_GUIDELINE_DEG.max },
        loops: fourBarLoops(plan).map((loop) => loopTransmission(probe, loop, band.intervals, steps)),
      },
      size: legSize(probe, sw, plan.slotCount, steps),
      notes,
      caution: GAIT_CAUTION,
    },
  };
}

function footPath(leg: Leg, sw: SweepResult, slot: number, steps: number): FootPath {
  const n = steps + 1;
  const p: FootPath = {
    turnRad: new Float64Array(n),
    xMm: new Float64Array(n),
    yMm: new Float64Array(n),
    vxMmPerRad: new Float64Array(n),
    vyMmPerRad: new Float64Array(n),
    heightMm: new Float64Array(n),
    heightRateMmPerRad: new Float64Array(n),
    alongMm: new Float64Array(n),
    alongRateMmPerRad: new Float64Array(n),
  };
  const stride = sw.poses.length / n;
  const s: FootState = { t: 0, along: 0, height: 0, alongRate: 0, heightRate: 0 };
  for (let k = 0; k < n; k++) {
    const t = (TWO_PI * k) / steps;
    footState(leg, slot, sw.poses, sw.rates, k * stride, t, s);
    const i = k * stride + 2 * slot;
    p.turnRad[k] = t;
    p.xMm[k] = sw.poses[i];
    p.yMm[k] = sw.poses[i + 1];
    p.vxMmPerRad[k] = leg.crankDirection * sw.rates[i];
    p.vyMmPerRad[k] = leg.crankDirection * sw.rates[i + 1];
    p.heightMm[k] = s.height;
    p.heightRateMmPerRad[k] = s.heightRate;
    p.alongMm[k] = s.along;
    p.alongRateMmPerRad[k] = s.alongRate;
  }
  return p;
}
