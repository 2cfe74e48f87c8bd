/**
 * A leg drawing as SVG path data in a view (results/drawing.ts's frame: world mm, y up,
 * written with y negated): the ground line, its tolerance band, hatching under the ground
 * (moved along it by an offset, so the ground can pass under a walking body), the foot's
 * trajectory with its stance pieces from their exact ends, and the linkage in one pose.
 * Pure strings, so the screen and the SVG file draw the same thing.
 */
import type { GaitFigures, XyMm } from '../../../core/gait';
import { num, polylineD, type View } from '../../results/drawing';
import { groundPoint, groundSpan, TWO_PI, type LegPoser } from './legGeometry';

/** Hatch strokes under the ground line: their spacing and depth as shares of the view's larger side. */
const HATCH_SPACING_SHARE = 0.04;
const HATCH_DEPTH_SHARE = 0.025;
/** Cap on hatch strokes, whatever the view. */
const MAX_HATCH_STROKES = 400;
/**
 * The ground runs this many of the view's larger side past the view on each side: a
 * drawing shown wider than its view box (its aspect kept) still shows ground to its edges.
 */
const GROUND_OVERRUN_VIEWS = 1;

export interface LegStatic {
  readonly groundD: string;
  readonly bandD: string;
  /** The whole trajectory, closed. */
  readonly pathD: string;
  /** The trajectory over each stance interval, from its exact start to its exact end. */
  readonly stanceD: string;
  /** The foot where each stance starts and ends (SVG coordinates). */
  readonly stanceEnds: readonly { readonly x: number; readonly y: number; readonly end: 'start' | 'end' }[];
}

function xy(view: View, p: XyMm): string {
  return `${num(p.x, view.decimals)},${num(-p.y, view.decimals)}`;
}

function viewBox(view: View) {
  return { minX: view.x, maxX: view.x + view.width, minY: -(view.y + view.height), maxY: -view.y };
}

/** Ground, band and trajectory: what does not move with the crank. */
export function legStatic(view: View, figures: GaitFigures, poser: LegPoser | null): LegStatic {
  const span = groundSpan(figures, viewBox(view), GROUND_OVERRUN_VIEWS * Math.max(view.width, view.height));
  const tol = figures.stance.toleranceMm;
  const g0 = groundPoint(figures, span.fromMm);
  const g1 = groundPoint(figures, span.toMm);
  const corners = [groundPoint(figures, span.fromMm, -tol), groundPoint(figures, span.toMm, -tol), groundPoint(figures, span.toMm, tol), groundPoint(figures, span.fromMm, tol)];
  const p = figures.path;
  const steps = figures.steps;
  const dt = TWO_PI / steps;
  const pose = poser === null ? null : new Float64Array(2 * poser.plan.slotCount);
  const footAt = (t: number): XyMm | null => {
    if (poser === null || pose === null || !poser.poseAt(t, pose)) return null;
    return { x: pose[2 * poser.footSlot], y: pose[2 * poser.footSlot + 1] };
  };
  const stanceParts: string[] = [];
  const stanceEnds: { x: number; y: number; end: 'start' | 'end' }[] = [];
  for (const r of figures.stance.intervals) {
    const pts: XyMm[] = [];
    const start = footAt(r.fromRad);
    if (start !== null) pts.push(start);
    for (let k = Math.floor(r.fromRad / dt) + 1; k * dt < r.toRad && k <= 2 * steps; k++) {
      const i = k % steps;
      pts.push({ x: p.xMm[i], y: p.yMm[i] });
    }
    const end = footAt(r.toRad);
    if (end !== null) pts.push(end);
    if (start !== null) stanceEnds.push({ x: start.x, y: -start.y, end: 'start' });
    if (end !== null) stanceEnds.push({ x: end.x, y: -end.y, end: 'end' });
    stanceParts.push(polylineD(view, pts.map((q) => q.x), pts.map((q) => q.y)));
  }
  return {
    groundD: `M${xy(view, g0)}L${xy(view, g1)}`,
    bandD: `M${corners.map((c) => xy(view, c)).join('L')}Z`,
    pathD: polylineD(view, p.xMm, p.yMm, true),
    stanceD: stanceParts.join(''),
    stanceEnds,
  };
}

/**
 * Hatch strokes under the ground line, slanting back, the ground moved `offsetMm` towards
 * the walking direction (a negative offset moves it back, as under a body walking on).
 */
export function groundHatchD(view: View, figures: GaitFigures, offsetMm: number): string {
  const size = Math.max(view.width, view.height);
  const spacing = HATCH_SPACING_SHARE * size;
  const depth = HATCH_DEPTH_SHARE * size;
  const span = groundSpan(figures, viewBox(view), spacing + GROUND_OVERRUN_VIEWS * size);
  const shift = offsetMm - spacing * Math.floor(offsetMm / spacing);
  const first = Math.floor((span.fromMm - shift) / spacing);
  const parts: string[] = [];
  for (let j = first, n = 0; n < MAX_HATCH_STROKES; j++, n++) {
    const s = j * spacing + shift;
    if (s > span.toMm) break;
    parts.push(`M${xy(view, groundPoint(figures, s))}L${xy(view, groundPoint(figures, s - depth, -depth))}`);
  }
  return parts.join('');
}

export interface LegPoseShapes {
  /** One path per moving body: a bar for two slots, a closed plate for more. */
  readonly links: readonly { readonly bodyId: string; readonly d: string }[];
  readonly joints: readonly { readonly id: string; readonly x: number; readonly y: number; readonly ground: boolean }[];
  readonly foot: { readonly x: number; readonly y: number } | null;
}

/** The linkage in a solved pose, in SVG coordinates. */
export function legPoseShapes(view: View, poser: LegPoser, pose: ArrayLike<number>): LegPoseShapes {
  const ground = new Set(poser.groundSlots);
  const links = poser.links.map((link) => ({
    bodyId: link.bodyId,
    d: polylineD(view, link.slots.map((s) => pose[2 * s]), link.slots.map((s) => pose[2 * s + 1]), link.slots.length > 2),
  }));
  const joints: { id: string; x: number; y: number; ground: boolean }[] = [];
  poser.plan.jointIds.forEach((id, s) => {
    const x = pose[2 * s];
    const y = pose[2 * s + 1];
    if (Number.isFinite(x) && Number.isFinite(y)) joints.push({ id, x, y: -y, ground: ground.has(s) });
  });
  const fx = pose[2 * poser.footSlot];
  const fy = pose[2 * poser.footSlot + 1];
  return { links, joints, foot: Number.isFinite(fx) && Number.isFinite(fy) ? { x: fx, y: -fy } : null };
}
