/**
 * An image to trace the foot trajectory over (a photograph or drawing of a leg's foot
 * path): kept with the project (traceStore.ts), shown fitted into the drawing until two
 * of its points are given in mm, then placed by that similarity (placement.ts of the
 * suspension trace). Pure parts: the image as shown and the mm ↔ image-pixel maps.
 */
import type { Vec2 } from '../../../core/geometry';
import type { KeptImageRef } from '../../suspension/trace/keptImage';
import { pixelToBicycleMm, type ImagePlacement, type PixelPoint } from '../../suspension/trace/placement';

export interface TraceImage extends KeptImageRef {
  /** A blob: URL of the image for this page; null when its kept bytes could not be read back (the notice says why). */
  readonly url: string | null;
  /** Null until calibrated: shown fitted into the view, only to click on. */
  readonly placement: ImagePlacement | null;
}

/** The image pixel under a point in mm (the inverse of pixelToBicycleMm). */
export function mmToPixel(p: ImagePlacement, at: Vec2): PixelPoint {
  const c = Math.cos(p.rotationRad);
  const s = Math.sin(p.rotationRad);
  const dx = (at.x - p.originXMm) / p.mmPerPx;
  const dy = (at.y - p.originYMm) / p.mmPerPx;
  // Turn back by −rotation; image v points down.
  return { u: c * dx + s * dy, v: -(-s * dx + c * dy) };
}

/** The image's four corners in mm. */
export function imageCornersMm(p: ImagePlacement, widthPx: number, heightPx: number): Vec2[] {
  return [{ u: 0, v: 0 }, { u: widthPx, v: 0 }, { u: widthPx, v: heightPx }, { u: 0, v: heightPx }].map((q) => pixelToBicycleMm(p, q));
}
