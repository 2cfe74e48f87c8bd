/**
 * The traced image's mapping from image pixels to bicycle mm, and its two calibrations,
 * against examples worked by hand (pixel v grows downward, bicycle y upward).
 */
import { describe, expect, it } from 'vitest';
import {
  MIN_CALIBRATION_SPAN_PX,
  fitPlacement,
  pixelToBicycleMm,
  placementFromDistance,
  placementFromPairs,
  placementMatrix,
  toTenthMm,
  type ImagePlacement,
} from '../../../src/app/suspension/trace/placement';

/** Rounding only: the examples are exact in decimals (mm). */
const TOL_MM = 1e-9;

function placed(result: ReturnType<typeof placementFromPairs>): ImagePlacement {
  if (!result.ok) throw new Error(result.reason);
  return result.placement;
}

describe('a level image calibrated by the bottom bracket and a known distance', () => {
  // worked by hand: BB at pixel (500, 400), second point at (20, 260): 480 px across and 140 px up,
  // 500 px apart (a 7-24-25 triangle scaled by 20); 450 mm between them gives 0.9 mm/px.
  const p = placed(placementFromDistance({ u: 500, v: 400 }, { u: 20, v: 260 }, 450));

  it('gives 0.9 mm per pixel, no turn, and the bottom bracket at the origin', () => {
    expect(p.mmPerPx).toBeCloseTo(0.9, 12); // worked by hand
    expect(p.rotationRad).toBe(0);
    const bb = pixelToBicycleMm(p, { u: 500, v: 400 });
    expect(Math.abs(bb.x)).toBeLessThan(TOL_MM);
    expect(Math.abs(bb.y)).toBeLessThan(TOL_MM);
  });

  it('maps the second point and a third one where the hand computation puts them', () => {
    // worked by hand: (20 − 500)·0.9 = −432, (400 − 260)·0.9 = 126; 432² + 126² = 450².
    const b = pixelToBicycleMm(p, { u: 20, v: 260 });
    expect(b.x).toBeCloseTo(-432, 9);
    expect(b.y).toBeCloseTo(126, 9);
    // worked by hand: (23 − 500)·0.9 = −429.3, (400 − 413)·0.9 = −11.7.
    const axle = pixelToBicycleMm(p, { u: 23, v: 413 });
    expect(axle.x).toBeCloseTo(-429.3, 9);
    expect(axle.y).toBeCloseTo(-11.7, 9);
  });

  it('refuses a distance that is not a length, and two clicks too close together', () => {
    for (const d of [0, -5, Number.NaN, Infinity]) {
      const r = placementFromDistance({ u: 0, v: 0 }, { u: 100, v: 0 }, d);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.reason).toContain('expected a length greater than 0 mm');
    }
    const near = placementFromDistance({ u: 10, v: 10 }, { u: 13, v: 14 }, 100);
    expect(near.ok).toBe(false);
    if (!near.ok) expect(near.reason).toBe(`the two points are 5.0 px apart on the image; pick two points at least ${MIN_CALIBRATION_SPAN_PX} px apart`);
  });
});

describe('an image calibrated by the bottom bracket and the rear axle (scale and turn)', () => {
  it('turns an image lying on its side a quarter turn clockwise', () => {
    // worked by hand: BB at pixel (0, 0), axle at pixel (0, 200) straight below it, the axle at (−400, 0) mm:
    // 2 mm/px; image down is bicycle rearward, so image right is bicycle down: (u, v) → (−2v, −2u).
    const p = placed(placementFromPairs({ u: 0, v: 0 }, { x: 0, y: 0 }, { u: 0, v: 200 }, { x: -400, y: 0 }));
    expect(p.mmPerPx).toBeCloseTo(2, 12);
    const q = pixelToBicycleMm(p, { u: 50, v: 200 });
    expect(q.x).toBeCloseTo(-400, 9);
    expect(q.y).toBeCloseTo(-100, 9);
    const r = pixelToBicycleMm(p, { u: 50, v: 0 });
    expect(r.x).toBeCloseTo(0, 9);
    expect(r.y).toBeCloseTo(-100, 9);
  });

  it('puts a third pixel where the 3-4-5 triangles drawn by hand put it', () => {
    // worked by hand: BB at pixel (100, 100), axle at pixel (500, 400): 400 right and 300 down, 500 px;
    // the axle at (−500, 0) mm gives 1 mm/px and a turn of π + atan(3/4) (cos −0.8, sin −0.6).
    // Pixel (100, 400) is 300 px below the BB: (0, −300) turned is (−180, 240) mm,
    // 300 mm from the BB and 400 mm from the axle, as on the image.
    const p = placed(placementFromPairs({ u: 100, v: 100 }, { x: 0, y: 0 }, { u: 500, v: 400 }, { x: -500, y: 0 }));
    expect(p.mmPerPx).toBeCloseTo(1, 12);
    const q = pixelToBicycleMm(p, { u: 100, v: 400 });
    expect(q.x).toBeCloseTo(-180, 9);
    expect(q.y).toBeCloseTo(240, 9);
    const axle = pixelToBicycleMm(p, { u: 500, v: 400 });
    expect(axle.x).toBeCloseTo(-500, 9);
    expect(axle.y).toBeCloseTo(0, 9);
  });

  it('refuses a rear axle at the bottom bracket', () => {
    const r = placementFromPairs({ u: 0, v: 0 }, { x: 0, y: 0 }, { u: 100, v: 0 }, { x: 0, y: 0 });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toContain('at the same place');
  });
});

describe('drawing the placed image', () => {
  it('gives the SVG matrix of a level placement worked by hand', () => {
    // worked by hand: 0.5 mm/px at 2 px/mm is 1 view px per image px; origin (10, 20) mm → (100 + 20, 200 − 40).
    const m = placementMatrix({ originXMm: 10, originYMm: 20, mmPerPx: 0.5, rotationRad: 0 }, 100, 200, 2);
    // + 0 reads −0 (from −k·sin 0) as 0: SVG draws both alike.
    expect(m.map((v) => v + 0)).toEqual([1, 0, 0, 1, 120, 160]);
  });

  it('draws each pixel where its bicycle mm fall in the view (a turned placement)', () => {
    // theorem: the matrix is the composition of the placement and the view's scale (y down).
    const p: ImagePlacement = { originXMm: -300, originYMm: 250, mmPerPx: 0.73, rotationRad: 0.21 };
    const [a, b, c, d, e, f] = placementMatrix(p, 480, 270, 0.8);
    for (const px of [{ u: 0, v: 0 }, { u: 640, v: 0 }, { u: 123, v: 456 }]) {
      const mm = pixelToBicycleMm(p, px);
      expect(a * px.u + c * px.v + e).toBeCloseTo(480 + 0.8 * mm.x, 9);
      expect(b * px.u + d * px.v + f).toBeCloseTo(270 - 0.8 * mm.y, 9);
    }
  });

  it('fits an uncalibrated image whole in the view', () => {
    // worked by hand: 200 × 100 px in a view 400 × 200 mm wide → 2 mm/px, centred at (100, 50) mm.
    expect(fitPlacement(200, 100, { minX: -100, maxX: 300, minY: -50, maxY: 150 })).toEqual({ originXMm: -100, originYMm: 150, mmPerPx: 2, rotationRad: 0 });
  });
});

describe('a picked coordinate', () => {
  it('is kept to the nearest 0.1 mm, never as −0', () => {
    expect(toTenthMm(12.345)).toBe(12.3); // worked by hand
    expect(toTenthMm(-429.26)).toBe(-429.3);
    expect(toTenthMm(799.96)).toBe(800);
    expect(Object.is(toTenthMm(-0.04), 0)).toBe(true);
    expect(String(toTenthMm(-11.70000000001))).toBe('-11.7');
  });
});
