/**
 * Where a traced image lies in bicycle coordinates (origin at the bottom-bracket centre,
 * x forward, y up, mm): a similarity from image pixels (u right, v down, from the image's
 * top-left corner; pixel i spans [i, i + 1]) to mm, and the two calibrations that set it.
 * Pure: no DOM.
 */
import type { Vec2 } from '../../../core/geometry';

/** A position on the image, in image pixels from its top-left corner (v grows downward). */
export interface PixelPoint {
  readonly u: number;
  readonly v: number;
}

/** The image's similarity into bicycle mm: pixel (0, 0) lands on the origin; a pixel is mmPerPx long; the image is turned by rotationRad (counter-clockwise). */
export interface ImagePlacement {
  readonly originXMm: number;
  readonly originYMm: number;
  readonly mmPerPx: number;
  readonly rotationRad: number;
}

export type Calibrated = { readonly ok: true; readonly placement: ImagePlacement } | { readonly ok: false; readonly reason: string };

/** Two calibration clicks closer than this on the image give a scale too coarse to trace with, image px. */
export const MIN_CALIBRATION_SPAN_PX = 10;

export function pixelToBicycleMm(p: ImagePlacement, at: PixelPoint): Vec2 {
  const c = Math.cos(p.rotationRad);
  const s = Math.sin(p.rotationRad);
  // Image v points down, bicycle y up: the pixel offset is (u, -v) before the turn and scale.
  const a = at.u;
  const b = -at.v;
  return { x: p.originXMm + p.mmPerPx * (c * a - s * b), y: p.originYMm + p.mmPerPx * (s * a + c * b) };
}

/** The SVG matrix(a b c d e f) drawing the image (its pixels as user units) in a view of `pxPerMm` with the bicycle origin at (x0Px, y0Px) and y down. */
export function placementMatrix(p: ImagePlacement, x0Px: number, y0Px: number, pxPerMm: number): [number, number, number, number, number, number] {
  const k = p.mmPerPx * pxPerMm;
  const c = Math.cos(p.rotationRad);
  const s = Math.sin(p.rotationRad);
  return [k * c, -k * s, k * s, k * c, x0Px + pxPerMm * p.originXMm, y0Px - pxPerMm * p.originYMm];
}

function spanProblem(a: PixelPoint, b: PixelPoint): string | null {
  const span = Math.hypot(b.u - a.u, b.v - a.v);
  if (span >= MIN_CALIBRATION_SPAN_PX) return null;
  return `the two points are ${span.toFixed(1)} px apart on the image; pick two points at least ${MIN_CALIBRATION_SPAN_PX} px apart`;
}

/**
 * The placement that puts pixel `a` on `aMm` and pixel `b` on `bMm` (scale and turn from
 * the two, no mirror). Used with the bottom bracket (0, 0) and the rear axle as typed.
 */
export function placementFromPairs(a: PixelPoint, aMm: Vec2, b: PixelPoint, bMm: Vec2): Calibrated {
  const problem = spanProblem(a, b);
  if (problem !== null) return { ok: false, reason: problem };
  const du = b.u - a.u;
  const dv = -(b.v - a.v);
  const dx = bMm.x - aMm.x;
  const dy = bMm.y - aMm.y;
  const lengthMm = Math.hypot(dx, dy);
  if (!(lengthMm > 0 && Number.isFinite(lengthMm))) {
    return { ok: false, reason: `the two known points are ${Number.isFinite(lengthMm) ? 'at the same place' : 'not finite'} in mm; expected two distinct points` };
  }
  const mmPerPx = lengthMm / Math.hypot(du, dv);
  const rotationRad = Math.atan2(dy, dx) - Math.atan2(dv, du);
  const c = Math.cos(rotationRad);
  const s = Math.sin(rotationRad);
  const au = a.u;
  const av = -a.v;
  return {
    ok: true,
    placement: { originXMm: aMm.x - mmPerPx * (c * au - s * av), originYMm: aMm.y - mmPerPx * (s * au + c * av), mmPerPx, rotationRad },
  };
}

/**
 * The placement of a level image (its horizontal is the bicycle's, no turn) whose pixel
 * `bottomBracket` is the origin, scaled so that `other` lies `distanceMm` from it.
 */
export function placementFromDistance(bottomBracket: PixelPoint, other: PixelPoint, distanceMm: number): Calibrated {
  const problem = spanProblem(bottomBracket, other);
  if (problem !== null) return { ok: false, reason: problem };
  if (!(distanceMm > 0 && Number.isFinite(distanceMm))) return { ok: false, reason: `the distance is ${distanceMm} mm; expected a length greater than 0 mm` };
  const mmPerPx = distanceMm / Math.hypot(other.u - bottomBracket.u, other.v - bottomBracket.v);
  return { ok: true, placement: { originXMm: -mmPerPx * bottomBracket.u, originYMm: mmPerPx * bottomBracket.v, mmPerPx, rotationRad: 0 } };
}

/** An uncalibrated image shown whole and centred in the view's mm extent (a guess of scale, only for clicking on). */
export function fitPlacement(widthPx: number, heightPx: number, view: { readonly minX: number; readonly maxX: number; readonly minY: number; readonly maxY: number }): ImagePlacement {
  const mmPerPx = Math.min((view.maxX - view.minX) / widthPx, (view.maxY - view.minY) / heightPx);
  const cx = (view.minX + view.maxX) / 2;
  const cy = (view.minY + view.maxY) / 2;
  return { originXMm: cx - (mmPerPx * widthPx) / 2, originYMm: cy + (mmPerPx * heightPx) / 2, mmPerPx, rotationRad: 0 };
}

/** A picked coordinate as the panels keep it: to the nearest 0.1 mm (and never "-0"). */
export function toTenthMm(valueMm: number): number {
  const r = Math.round(valueMm * 10) / 10;
  return r === 0 ? 0 : r;
}
