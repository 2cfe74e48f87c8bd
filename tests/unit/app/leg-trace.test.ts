/**
 * Tracing over an image in the leg workspace: the mm → image-pixel map is the inverse of
 * the placement's pixel → mm similarity, and a two-point calibration puts its two pixels
 * on the two points typed.
 */
import { describe, expect, it } from 'vitest';
import { imageCornersMm, mmToPixel } from '../../../src/app/leg/setup/traceImage';
import { pixelToBicycleMm, placementFromPairs } from '../../../src/app/suspension/trace/placement';

const TOL_MM = 1e-9;

describe('leg trace image', () => {
  it('maps mm back to the pixel the placement put there, at any scale and turn', () => {
    // theorem: a similarity with non-zero scale is invertible; applying it after its inverse is the identity.
    for (const placement of [
      { originXMm: 10, originYMm: -5, mmPerPx: 0.25, rotationRad: 0 },
      { originXMm: -40, originYMm: 22, mmPerPx: 1.7, rotationRad: 0.6 },
      { originXMm: 3, originYMm: 3, mmPerPx: 0.05, rotationRad: -2.4 },
    ]) {
      for (const at of [{ x: 0, y: 0 }, { x: 12.5, y: -30 }, { x: -8, y: 44 }]) {
        const back = pixelToBicycleMm(placement, mmToPixel(placement, at));
        expect(Math.abs(back.x - at.x)).toBeLessThan(TOL_MM);
        expect(Math.abs(back.y - at.y)).toBeLessThan(TOL_MM);
      }
    }
  });

  it('a two-point calibration puts the clicked pixels on the typed points, and the corners follow', () => {
    const placed = placementFromPairs({ u: 100, v: 400 }, { x: -12, y: -30 }, { u: 500, v: 400 }, { x: 12, y: -30 });
    if (!placed.ok) throw new Error(placed.reason);
    const p = placed.placement;
    expect(mmToPixel(p, { x: -12, y: -30 }).u).toBeCloseTo(100, 9);
    expect(mmToPixel(p, { x: 12, y: -30 }).v).toBeCloseTo(400, 9);
    // 400 px span 24 mm: 0.06 mm per pixel; the image's top-left corner is 100 px left of and 400 px above the first point.
    const [topLeft] = imageCornersMm(p, 600, 500);
    expect(topLeft.x).toBeCloseTo(-12 - 100 * 0.06, 9);
    expect(topLeft.y).toBeCloseTo(-30 + 400 * 0.06, 9);
  });
});
