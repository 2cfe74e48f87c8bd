/**
 * The geometry behind the leg views, as plain numbers: which samples of the turn are in
 * stance, the stance intervals in degrees, the ground line and its tolerance band across
 * a box, the box a leg drawing needs, and the linkage posed at any crank angle. Pure (no
 * DOM), so the screen, the SVG file and the unit tests draw from the same numbers.
 *
 * Frames: world x right, y up, mm, as the core; crank angles are the core's turn angles
 * (from the reference pose, in the crank's direction).
 */
import type { GaitFigures, TurnRange, XyMm } from '../../../core/gait';
import { compile, run, sweep, type Linkage, type Plan } from '../../../core/linkage';
import type { Box } from '../../results/motion';

export const TWO_PI = 2 * Math.PI;
export const DEG_PER_RAD = 180 / Math.PI;

/** Whether turn angle `t` (rad, 0 to 2π) lies in one of the stance intervals; an interval may run past 2π. */
export function inStanceAt(intervals: readonly TurnRange[], t: number): boolean {
  for (const r of intervals) {
    if ((t >= r.fromRad && t <= r.toRad) || (t + TWO_PI >= r.fromRad && t + TWO_PI <= r.toRad)) return true;
  }
  return false;
}

/** 1 at the samples of the path that lie in stance, from the core's intervals (exact ends). */
export function stanceMask(figures: GaitFigures): Uint8Array {
  const t = figures.path.turnRad;
  const mask = new Uint8Array(t.length);
  for (let k = 0; k < t.length; k++) mask[k] = inStanceAt(figures.stance.intervals, t[k]) ? 1 : 0;
  return mask;
}

/** A stance interval in degrees of turn within 0–360°: one piece, or two where it runs through the reference pose. */
export interface DegRange {
  readonly fromDeg: number;
  readonly toDeg: number;
}

/** An angle range (rad) as the page writes it, in degrees within 0–360°: "358.3°–48.1°" runs through 0°. */
export function turnRangeText(fromRad: number, toRad: number): string {
  const wrapDeg = (r: number) => (r - TWO_PI * Math.floor(r / TWO_PI)) * DEG_PER_RAD;
  const to = toRad - fromRad >= TWO_PI ? 360 : wrapDeg(toRad);
  return `${wrapDeg(fromRad).toFixed(1)}°–${(to === 0 && toRad > fromRad ? 360 : to).toFixed(1)}°`;
}

/** The pieces of an angle range (rad, may run past 2π or start below 0) laid on 0–360°. */
export function rangeOnTurnDeg(fromRad: number, toRad: number): DegRange[] {
  const shift = TWO_PI * Math.floor(fromRad / TWO_PI);
  const a = fromRad - shift;
  const b = toRad - shift;
  if (b <= TWO_PI) return [{ fromDeg: a * DEG_PER_RAD, toDeg: b * DEG_PER_RAD }];
  return [
    { fromDeg: a * DEG_PER_RAD, toDeg: 360 },
    { fromDeg: 0, toDeg: Math.min(b - TWO_PI, TWO_PI) * DEG_PER_RAD },
  ];
}

export function stanceRangesDeg(figures: GaitFigures): DegRange[] {
  return figures.stance.intervals.flatMap((r) => rangeOnTurnDeg(r.fromRad, r.toRad));
}

/**
 * How fast the ground passes the body, mm per rad of crank: the mean backward speed of
 * the foot over the longest stance (the speed at which the body walks when other legs
 * carry it through the swing). Null without a stance that pushes the body forward.
 */
export function groundSpeedMmPerRad(figures: GaitFigures): number | null {
  const mean = figures.longestStance?.speed.meanMmPerRad;
  return mean !== undefined && mean > 0 ? mean : null;
}

/** A point of the ground line `s` mm along it (towards the walking direction) and `h` mm above it. */
export function groundPoint(figures: Pick<GaitFigures, 'leg'>, s: number, h = 0): XyMm {
  const { originMm: o, along: a, up: u } = figures.leg;
  return { x: o.x + s * a.x + h * u.x, y: o.y + s * a.y + h * u.y };
}

/** Where a world point lies along the ground line (mm from its origin, towards the walking direction). */
export function alongOf(figures: Pick<GaitFigures, 'leg'>, p: XyMm): number {
  const { originMm: o, along: a } = figures.leg;
  return (p.x - o.x) * a.x + (p.y - o.y) * a.y;
}

/** The stretch of the ground line (along positions, mm) that spans a box and `extraMm` beyond it. */
export function groundSpan(figures: Pick<GaitFigures, 'leg'>, box: Box, extraMm: number): { readonly fromMm: number; readonly toMm: number } {
  const corners = [
    { x: box.minX, y: box.minY },
    { x: box.maxX, y: box.minY },
    { x: box.minX, y: box.maxY },
    { x: box.maxX, y: box.maxY },
  ].map((p) => alongOf(figures, p));
  return { fromMm: Math.min(...corners) - extraMm, toMm: Math.max(...corners) + extraMm };
}

/**
 * The box of the foot path and the ground line and band under it, and of everything the
 * leg carries over the turn unless `footOnly`.
 */
export function legBox(figures: GaitFigures, footOnly = false): Box {
  const s = figures.size;
  const p = figures.path;
  let minX = footOnly ? Infinity : s.minXMm;
  let maxX = footOnly ? -Infinity : s.maxXMm;
  let minY = footOnly ? Infinity : s.minYMm;
  let maxY = footOnly ? -Infinity : s.maxYMm;
  const tol = figures.stance.toleranceMm;
  // The ground line and its band where the foot passes over them.
  for (let k = 0; k < p.xMm.length; k++) {
    if (Number.isFinite(p.xMm[k]) && Number.isFinite(p.yMm[k])) {
      minX = Math.min(minX, p.xMm[k]);
      maxX = Math.max(maxX, p.xMm[k]);
      minY = Math.min(minY, p.yMm[k]);
      maxY = Math.max(maxY, p.yMm[k]);
    }
    for (const h of [-tol, 0, tol]) {
      const g = groundPoint(figures, p.alongMm[k], h);
      if (!(Number.isFinite(g.x) && Number.isFinite(g.y))) continue;
      minX = Math.min(minX, g.x);
      maxX = Math.max(maxX, g.x);
      minY = Math.min(minY, g.y);
      maxY = Math.max(maxY, g.y);
    }
  }
  return { minX, minY, maxX, maxY };
}

export interface LegPoser {
  readonly plan: Plan;
  /** Slots of each moving body (joints then points), for drawing the links. */
  readonly links: readonly { readonly bodyId: string; readonly slots: readonly number[] }[];
  readonly groundSlots: readonly number[];
  readonly footSlot: number;
  /** Writes the pose at turn angle `t` (rad from the reference pose, in the crank's direction) into `out`; false where it does not assemble. */
  readonly poseAt: (t: number, out: Float64Array) => boolean;
}

/** Poses sampled over the turn to start each solve from, so a pose keeps the branch of the turn. */
const POSE_SEED_STEPS = 360;

/**
 * The linkage posed at any crank angle of the turn the figures were taken over: the
 * nearest of a sweep's poses seeds the core's solver at the exact angle.
 */
export function legPoser(linkage: Linkage, figures: GaitFigures): LegPoser | null {
  const compiled = compile(linkage);
  if (!compiled.ok) return null;
  const plan = compiled.plan;
  const theta0 = figures.referenceCrankRad;
  const dir = figures.leg.crankDirection;
  const seeds = sweep(plan, { from: theta0, to: theta0 + dir * TWO_PI, steps: POSE_SEED_STEPS + 1 });
  const stride = 2 * plan.slotCount;
  const footSlot = plan.slotIndex.get(figures.leg.foot);
  if (footSlot === undefined) return null;
  const groundIds = new Set(plan.linkage.joints.filter((j) => j.ground === true).map((j) => j.id));
  const poseAt = (t: number, out: Float64Array): boolean => {
    const u = t - TWO_PI * Math.floor(t / TWO_PI);
    const k = Math.min(POSE_SEED_STEPS, Math.max(0, Math.round((u / TWO_PI) * POSE_SEED_STEPS)));
    if (seeds.assembled[k] === 1) out.set(seeds.poses.subarray(k * stride, (k + 1) * stride));
    else out.set(plan.reference);
    return run(plan, theta0 + dir * u, out);
  };
  return {
    plan,
    links: plan.bodies.slice(1).map((b) => ({ bodyId: b.id, slots: Array.from(b.slots) })),
    groundSlots: plan.jointIds.flatMap((id, slot) => (groundIds.has(id) ? [slot] : [])),
    footSlot,
    poseAt,
  };
}

/** Height of a world point above the ground line (mm, positive on its up side). */
export function heightOf(figures: Pick<GaitFigures, 'leg'>, p: XyMm): number {
  const { originMm: o, up: u } = figures.leg;
  return (p.x - o.x) * u.x + (p.y - o.y) * u.y;
}
