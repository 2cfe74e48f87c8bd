/**
 * Stance: the crank angles where the foot is within the tolerance band of the ground
 * line, and the figures of the longest stance.
 *
 * Between samples the height is monotone once each sign change of its exact rate has
 * been bisected to an extremum, so each band edge is crossed at most once per piece and
 * is found by safeguarded Newton. Extrema closer together than the sample spacing (two
 * sign changes of a rate between neighbour samples) are not resolved: `steps` sets it.
 */
import { fmt, TWO_PI, type FootState, type Probe } from './probe';
import { extremum, GAIT_ANGLE_TOL_RAD, rootInBracket, signChange } from './solve';
import type { FootPath, StanceFigures, TurnRange } from './types';

export interface Band {
  readonly intervals: TurnRange[];
  /** Extrema of the height between samples, located where its exact rate changes sign. */
  readonly extrema: FootState[];
}

/** The crank ranges where |height| ≤ tol, from monotone pieces of the height (see the file's comment). */
export function stanceBand(probe: Probe, path: FootPath, steps: number, tol: number): Band {
  const extrema: FootState[] = [];
  const pieces: { fromRad: number; toRad: number }[] = [];
  const scratch = new Float64Array(2);
  let level = 0;
  const offset = (t: number, out: Float64Array): boolean => {
    const ok = probe.at(t);
    out[0] = probe.state.height - level;
    out[1] = probe.state.heightRate;
    return ok;
  };
  const crossing = (a: number, b: number, ha: number, at: number): number => {
    level = at;
    return rootInBracket(offset, a, b, ha - at, scratch);
  };
  const heightRate = (t: number): number => (probe.at(t) ? probe.state.heightRate : Number.NaN);
  const addPiece = (a: number, b: number, ha: number, hb: number): void => {
    if (Math.min(ha, hb) > tol || Math.max(ha, hb) < -tol) return;
    const from = Math.abs(ha) <= tol ? a : crossing(a, b, ha, ha > tol ? tol : -tol);
    const to = Math.abs(hb) <= tol ? b : crossing(a, b, ha, hb > tol ? tol : -tol);
    const last = pieces[pieces.length - 1];
    if (last !== undefined && from - last.toRad <= GAIT_ANGLE_TOL_RAD) last.toRad = to;
    else pieces.push({ fromRad: from, toRad: to });
  };
  const H = path.heightMm;
  const HR = path.heightRateMmPerRad;
  const T = path.turnRad;
  for (let k = 0; k < steps; k++) {
    if (HR[k] * HR[k + 1] < 0) {
      const tm = signChange(heightRate, T[k], T[k + 1], HR[k]);
      const e = probe.sample(tm);
      extrema.push(e);
      addPiece(T[k], tm, H[k], e.height);
      addPiece(tm, T[k + 1], e.height, H[k + 1]);
    } else {
      addPiece(T[k], T[k + 1], H[k], H[k + 1]);
    }
  }
  // A stance running through the reference pose is one stance, not two.
  if (pieces.length > 1 && pieces[0].fromRad <= GAIT_ANGLE_TOL_RAD && pieces[pieces.length - 1].toRad >= TWO_PI - GAIT_ANGLE_TOL_RAD) {
    const first = pieces.shift() as { fromRad: number; toRad: number };
    pieces[pieces.length - 1].toRad = TWO_PI + first.toRad;
  }
  return { intervals: pieces, extrema };
}

/** The foot's states over a stance: its exact ends, the samples inside and the extrema of height and along. */
function stancePoints(probe: Probe, band: Band, r: TurnRange, steps: number): FootState[] {
  const dt = TWO_PI / steps;
  const inside = (t: number) => t > r.fromRad + GAIT_ANGLE_TOL_RAD && t < r.toRad - GAIT_ANGLE_TOL_RAD;
  const ts: number[] = [r.fromRad, r.toRad];
  for (let k = Math.floor(r.fromRad / dt) + 1; k * dt < r.toRad; k++) if (inside(k * dt)) ts.push(k * dt);
  for (const e of band.extrema) {
    if (inside(e.t)) ts.push(e.t);
    if (inside(e.t + TWO_PI)) ts.push(e.t + TWO_PI);
  }
  ts.sort((a, b) => a - b);
  const points = ts.map((t) => probe.sample(t));
  // Extremes of the position along the ground, where its exact rate changes sign.
  const alongRate = (t: number): number => (probe.at(t) ? probe.state.alongRate : Number.NaN);
  const out: FootState[] = [points[0]];
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1];
    const b = points[i];
    if (a.alongRate * b.alongRate < 0) out.push(probe.sample(signChange(alongRate, a.t, b.t, a.alongRate)));
    out.push(b);
  }
  return out;
}

export function stanceFigures(probe: Probe, band: Band, r: TurnRange, steps: number, notes: string[]): StanceFigures {
  const pts = stancePoints(probe, band, r, steps);
  let minAlong = Infinity;
  let maxAlong = -Infinity;
  let minH = Infinity;
  let maxH = -Infinity;
  let minU = Infinity;
  let maxU = -Infinity;
  let integral = 0;
  for (let i = 0; i < pts.length; i++) {
    const p = pts[i];
    minAlong = Math.min(minAlong, p.along);
    maxAlong = Math.max(maxAlong, p.along);
    minH = Math.min(minH, p.height);
    maxH = Math.max(maxH, p.height);
    minU = Math.min(minU, -p.alongRate);
    maxU = Math.max(maxU, -p.alongRate);
    if (i > 0) integral += 0.5 * (p.t - pts[i - 1].t) * (p.height * p.height + pts[i - 1].height * pts[i - 1].height);
  }
  // The backward speed's extremes inside the stance: its rate is not known exactly, so
  // a sampled local extreme is refined by golden section between its neighbours.
  const backward = (t: number): number => (probe.at(t) ? -probe.state.alongRate : Number.NaN);
  for (let i = 1; i + 1 < pts.length; i++) {
    const u0 = -pts[i - 1].alongRate;
    const u1 = -pts[i].alongRate;
    const u2 = -pts[i + 1].alongRate;
    if (u1 > u0 && u1 >= u2) maxU = Math.max(maxU, extremum(backward, pts[i - 1].t, pts[i + 1].t, 1).value);
    if (u1 < u0 && u1 <= u2) minU = Math.min(minU, extremum(backward, pts[i - 1].t, pts[i + 1].t, -1).value);
  }
  const length = r.toRad - r.fromRad;
  // The mean over crank angle of −d(along)/dt is exactly the distance travelled over the angle.
  const mean = -(pts[pts.length - 1].along - pts[0].along) / length;
  if (!(mean > 0)) {
    notes.push('In stance the foot moves forward relative to the body: this leg would walk the other way; reverse the crank or the walking direction.');
  } else if (minU < 0) {
    notes.push(`For part of the stance the foot moves forward relative to the body (down to ${fmt(minU)} mm/rad): it would slip or drag.`);
  }
  return {
    interval: r,
    strideMm: maxAlong - minAlong,
    flatness: { peakToPeakMm: maxH - minH, rmsMm: Math.sqrt(integral / length) },
    speed: { minMmPerRad: minU, maxMmPerRad: maxU, meanMmPerRad: mean, variation: mean > 0 ? (maxU - minU) / mean : null },
  };
}
