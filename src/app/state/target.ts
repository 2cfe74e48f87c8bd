/** Pure updates of the target: each takes a target and returns a new one. */
import { REPEATED_POINT_TOL_MM, firstRepeats } from '../../core/io/pointsCsv';
import { MAX_WEIGHT } from '../../core/synthesis/problem';
import type { BackgroundImage, TargetPoint, TargetState, TimingMode } from './project';

export const EMPTY_TARGET: TargetState = { points: [], closed: false, timing: 'unprescribed', background: null };

/** Coordinates are kept to this many decimals of a mm (1 µm): more is noise from a mouse or a float sum. */
const MM_DECIMALS = 3;

export function roundMm(mm: number): number {
  const f = 10 ** MM_DECIMALS;
  return Math.round(mm * f) / f;
}

/** The weight a point gets when it joins a weighted target (a new point, or weights switched on). */
export const DEFAULT_WEIGHT = 1;

function point(x: number, y: number, driverDeg: number | null = null, weight?: number): TargetPoint {
  return weight === undefined ? { x: roundMm(x), y: roundMm(y), driverDeg } : { x: roundMm(x), y: roundMm(y), driverDeg, weight };
}

/** Whether the target's points carry weights (all of them do, or none). */
export function hasWeights(target: TargetState): boolean {
  return target.points.length > 0 && target.points.every((p) => p.weight !== undefined);
}

/** A weight a point can hold: finite, 0 … MAX_WEIGHT (the problem's limit). */
export function isWeight(w: number): boolean {
  return w >= 0 && w <= MAX_WEIGHT;
}

/** Points keep their weights only when every one has a valid weight: a target is weighted whole or not at all. */
export function setPoints(target: TargetState, points: readonly TargetPoint[]): TargetState {
  const weighted = points.length > 0 && points.every((p) => p.weight !== undefined && isWeight(p.weight));
  return { ...target, points: points.map((p) => point(p.x, p.y, p.driverDeg, weighted ? p.weight : undefined)) };
}

/** Adds a point at the end, or after `afterIndex`; on a weighted target it gets DEFAULT_WEIGHT. */
export function addPoint(target: TargetState, x: number, y: number, afterIndex: number | null = null): TargetState {
  const at = afterIndex === null ? target.points.length : Math.max(0, Math.min(target.points.length, afterIndex + 1));
  const points = [...target.points];
  points.splice(at, 0, point(x, y, null, hasWeights(target) ? DEFAULT_WEIGHT : undefined));
  return { ...target, points };
}

export function movePoint(target: TargetState, index: number, x: number, y: number): TargetState {
  if (!(index >= 0 && index < target.points.length)) return target;
  const points = [...target.points];
  points[index] = point(x, y, points[index].driverDeg, points[index].weight);
  return { ...target, points };
}

/** Gives every point DEFAULT_WEIGHT (on), or drops the weights so every point counts the same (off). */
export function setWeighted(target: TargetState, on: boolean): TargetState {
  if (on === hasWeights(target) || target.points.length === 0) return target;
  return { ...target, points: target.points.map((p) => point(p.x, p.y, p.driverDeg, on ? DEFAULT_WEIGHT : undefined)) };
}

export type PointField = 'x' | 'y' | 'driverDeg' | 'weight';

/**
 * Sets one field of one point (from the point table). What the table's fields refuse is
 * refused here too, leaving the target unchanged: a non-finite number, an empty x or y, a
 * weight outside 0 … MAX_WEIGHT or on an unweighted target.
 */
export function editPoint(target: TargetState, index: number, field: PointField, value: number | null): TargetState {
  if (!(index >= 0 && index < target.points.length)) return target;
  const old = target.points[index];
  if (field === 'weight') {
    if (value === null || !isWeight(value) || old.weight === undefined) return target;
    const points = [...target.points];
    points[index] = { ...old, weight: value };
    return { ...target, points };
  }
  if (field === 'driverDeg') {
    if (value !== null && !Number.isFinite(value)) return target;
    const points = [...target.points];
    points[index] = { ...old, driverDeg: value };
    return { ...target, points };
  }
  if (value === null || !Number.isFinite(value)) return target;
  return movePoint(target, index, field === 'x' ? value : old.x, field === 'y' ? value : old.y);
}

export function deletePoint(target: TargetState, index: number): TargetState {
  if (!(index >= 0 && index < target.points.length)) return target;
  return { ...target, points: target.points.filter((_, i) => i !== index) };
}

export function setClosed(target: TargetState, closed: boolean): TargetState {
  return { ...target, closed };
}

export function setTiming(target: TargetState, timing: TimingMode): TargetState {
  return { ...target, timing };
}

/** Spreads crank angles evenly over the points (one turn for a closed path, 0…360° × (n−1)/n). */
export function spreadAngles(target: TargetState): TargetState {
  const n = target.points.length;
  if (n === 0) return target;
  const step = target.closed ? 360 / n : 360 / Math.max(1, n - 1);
  return { ...target, points: target.points.map((p, i) => ({ ...p, driverDeg: Math.round(i * step * 1000) / 1000 })) };
}

export function setBackground(target: TargetState, background: BackgroundImage | null): TargetState {
  return { ...target, background };
}

export function updateBackground(target: TargetState, patch: Partial<Omit<BackgroundImage, 'imageId'>>): TargetState {
  if (target.background === null) return target;
  return { ...target, background: { ...target.background, ...patch } };
}

/**
 * Scales the image so that two points picked on it, `a` and `b` (mm, in the drawing),
 * are `distanceMm` apart; `a` stays where it is.
 */
export function calibrateBackground(
  target: TargetState,
  a: { readonly x: number; readonly y: number },
  b: { readonly x: number; readonly y: number },
  distanceMm: number,
): { readonly ok: true; readonly target: TargetState } | { readonly ok: false; readonly reason: string } {
  const bg = target.background;
  if (bg === null) return { ok: false, reason: 'there is no image to calibrate' };
  if (!(distanceMm > 0 && Number.isFinite(distanceMm))) return { ok: false, reason: `the distance is ${distanceMm}; expected a length in mm greater than 0` };
  const measured = Math.hypot(b.x - a.x, b.y - a.y);
  if (!(measured > 1e-9)) return { ok: false, reason: 'the two calibration points are in the same place; pick two points some way apart' };
  const factor = distanceMm / measured;
  // Scaling about a keeps a fixed: the corner moves along the line from a, by the same factor.
  const background: BackgroundImage = {
    ...bg,
    mmPerPx: bg.mmPerPx * factor,
    leftMm: a.x + (bg.leftMm - a.x) * factor,
    topMm: a.y + (bg.topMm - a.y) * factor,
    calibrated: true,
  };
  return { ok: true, target: { ...target, background } };
}

/** What is wrong with a target for a search, or null. */
export function targetProblem(target: TargetState): string | null {
  const n = target.points.length;
  if (n < 3) return `the target has ${n} point${n === 1 ? '' : 's'}; a path needs at least 3`;
  if (target.timing === 'prescribed') {
    const missing = target.points.findIndex((p) => p.driverDeg === null);
    if (missing !== -1) return `point ${missing + 1} has no crank angle; prescribed timing needs one at every point`;
  }
  const xs = target.points.map((p) => p.x);
  const ys = target.points.map((p) => p.y);
  const repeats = firstRepeats(xs, ys, n, REPEATED_POINT_TOL_MM);
  const i = repeats.findIndex((j) => j !== -1);
  if (i !== -1) return `points ${repeats[i] + 1} and ${i + 1} are in the same place; each point must be different`;
  if (hasWeights(target) && !target.points.some((p) => (p.weight ?? 0) > 0)) return 'every point has weight 0; expected at least one point with a weight above 0';
  return null;
}

/** The bounding box of the points and of the image, mm; null when there is nothing. */
export function targetExtent(target: TargetState): { minX: number; maxX: number; minY: number; maxY: number } | null {
  const xs = target.points.map((p) => p.x);
  const ys = target.points.map((p) => p.y);
  const bg = target.background;
  if (bg !== null) {
    xs.push(bg.leftMm, bg.leftMm + bg.widthPx * bg.mmPerPx);
    ys.push(bg.topMm, bg.topMm - bg.heightPx * bg.mmPerPx);
  }
  if (xs.length === 0) return null;
  return { minX: Math.min(...xs), maxX: Math.max(...xs), minY: Math.min(...ys), maxY: Math.max(...ys) };
}
