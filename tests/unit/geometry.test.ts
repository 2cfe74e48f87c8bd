import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  SIM_A,
  SIM_B,
  SIM_LENGTH,
  SIM_SSE,
  SIM_TX,
  SIM_TY,
  SINCOS_REDUCTION_LIMIT,
  applySimilarityInto,
  circleCircleIntersect,
  circleCircleIntersectInto,
  circleLineIntersect,
  cosSinInto,
  cross,
  distance,
  dot,
  length,
  lineLineIntersect,
  nearestOnPolyline,
  perp,
  pointToPolylineDistance,
  polarInto,
  rotate,
  similarityFit,
  similarityFitInto,
  sub,
  vec2,
} from '../../src/core/geometry';
import { Prng } from '../../src/core/optimize/prng';
import { fmin } from '../support/fmin';

const finite = fc.double({ min: -1e3, max: 1e3, noNaN: true });
const point = fc.record({ x: finite, y: finite });

describe('vec2 helpers', () => {
  it('satisfy the identities of the plane (theorem): a × b = −b × a, perp(a) ⟂ a, |perp a| = |a|, a·b = |a||b|cos', () => {
    fc.assert(
      fc.property(point, point, fc.double({ min: -10, max: 10, noNaN: true }), (a, b, angle) => {
        expect(cross(a, b)).toBeCloseTo(-cross(b, a), 9);
        expect(dot(perp(a), a)).toBeCloseTo(0, 9);
        expect(length(perp(a))).toBeCloseTo(length(a), 9);
        // Rotation keeps lengths and turns the cross product by nothing (theorem).
        const ra = rotate(a, angle);
        const rb = rotate(b, angle);
        expect(length(ra)).toBeCloseTo(length(a), 8);
        expect(cross(ra, rb)).toBeCloseTo(cross(a, b), 5);
        expect(distance(a, b)).toBeCloseTo(length(sub(a, b)), 9);
      }),
    );
  });
});

describe('polarInto / cosSinInto', () => {
  // The outside check is the JavaScript engine's Math.cos and Math.sin (V8 ports
  // fdlibm; both within 1 ulp): ours must stay within 2 ulp of 1 of them.
  const TWO_ULP = 2 * 2 ** -52;

  it('agrees with Math.cos and Math.sin over ±1e4 rad and at multiples of π/2', () => {
    const prng = Prng.fromSeed(11);
    const out = new Float64Array(2);
    let worst = 0;
    for (let i = 0; i < 200_000; i++) {
      const x = (prng.float() - 0.5) * (i < 100_000 ? 20 : 2e4);
      cosSinInto(out, 0, x);
      worst = Math.max(worst, Math.abs(out[0] - Math.cos(x)), Math.abs(out[1] - Math.sin(x)));
    }
    for (let k = -2000; k <= 2000; k++) {
      const x = (k * Math.PI) / 2;
      cosSinInto(out, 0, x);
      worst = Math.max(worst, Math.abs(out[0] - Math.cos(x)), Math.abs(out[1] - Math.sin(x)));
    }
    expect(worst).toBeLessThanOrEqual(TWO_ULP);
  });

  it('places a link tip and defers to Math beyond the reduction limit; NaN stays NaN', () => {
    const out = new Float64Array(4);
    polarInto(out, 2, 10, -5, 3, Math.PI / 2);
    expect(out[2]).toBeCloseTo(10, 14);
    expect(out[3]).toBeCloseTo(-2, 14);
    const big = 4 * SINCOS_REDUCTION_LIMIT;
    cosSinInto(out, 0, big);
    expect(out[0]).toBe(Math.cos(big));
    expect(out[1]).toBe(Math.sin(big));
    cosSinInto(out, 0, NaN);
    expect(out[0]).toBeNaN();
    expect(out[1]).toBeNaN();
  });
});

describe('circleCircleIntersect', () => {
  it('finds the 3-4-5 right triangle (theorem: Pythagoras) on the chosen side', () => {
    // Centres 5 apart, radii 3 and 4: the apex is at (9/5, ±12/5).
    const left = circleCircleIntersect(vec2(0, 0), 3, vec2(5, 0), 4, 1);
    const right = circleCircleIntersect(vec2(0, 0), 3, vec2(5, 0), 4, -1);
    expect(left?.x).toBeCloseTo(1.8, 14);
    expect(left?.y).toBeCloseTo(2.4, 14);
    expect(right?.x).toBeCloseTo(1.8, 14);
    expect(right?.y).toBeCloseTo(-2.4, 14);
  });

  it('meets both circles; the branches mirror across the line of centres (theorem: the common chord is perpendicular to it)', () => {
    fc.assert(
      fc.property(point, point, fc.double({ min: 0.05, max: 0.95, noNaN: true }), fc.double({ min: 0.2, max: 0.8, noNaN: true }), (a, b, share, spread) => {
        const d = distance(a, b);
        fc.pre(d > 1e-3);
        // Radii that always meet: rA + rB > d and |rA − rB| < d.
        const rA = d * (share + spread);
        const rB = d * (1 - share + spread);
        fc.pre(Math.abs(rA - rB) < d * 0.999);
        const p = circleCircleIntersect(a, rA, b, rB, 1);
        const q = circleCircleIntersect(a, rA, b, rB, -1);
        expect(p).not.toBeNull();
        expect(q).not.toBeNull();
        if (p === null || q === null) return;
        const tol = 1e-9 * (1 + d + rA + rB);
        expect(Math.abs(distance(p, a) - rA)).toBeLessThan(tol);
        expect(Math.abs(distance(p, b) - rB)).toBeLessThan(tol);
        expect(cross(sub(b, a), sub(p, a))).toBeGreaterThanOrEqual(0);
        expect(cross(sub(b, a), sub(q, a))).toBeLessThanOrEqual(0);
        expect(Math.abs(dot(sub(p, q), sub(b, a)))).toBeLessThan(tol * (d + rA));
      }),
    );
  });

  it('reports circles that do not meet, coincident centres and NaN as no solution (and leaves out alone)', () => {
    expect(circleCircleIntersect(vec2(0, 0), 1, vec2(5, 0), 1, 1)).toBeNull();
    expect(circleCircleIntersect(vec2(0, 0), 5, vec2(1, 0), 1, 1)).toBeNull();
    expect(circleCircleIntersect(vec2(2, 2), 1, vec2(2, 2), 1, 1)).toBeNull();
    const out = new Float64Array([7, 7]);
    expect(circleCircleIntersectInto(NaN, 0, 1, 1, 0, 1, 1, out, 0)).toBe(false);
    expect(Array.from(out)).toEqual([7, 7]);
  });
});

describe('circleLineIntersect', () => {
  it('finds the points of a line at distance r (theorem: Pythagoras), branch +1 further along the direction', () => {
    // Centre (0, 3), r = 5, line y = 0: x = ±4.
    expect(circleLineIntersect(vec2(0, 3), 5, vec2(-10, 0), vec2(2, 0), 1)).toEqual({ x: 4, y: 0 });
    expect(circleLineIntersect(vec2(0, 3), 5, vec2(-10, 0), vec2(2, 0), -1)).toEqual({ x: -4, y: 0 });
    expect(circleLineIntersect(vec2(0, 3), 5, vec2(-10, 0), vec2(-1, 0), 1)).toEqual({ x: -4, y: 0 });
  });

  it('reports a miss and a zero direction as no solution', () => {
    expect(circleLineIntersect(vec2(0, 3), 2, vec2(0, 0), vec2(1, 0), 1)).toBeNull();
    expect(circleLineIntersect(vec2(0, 3), 5, vec2(0, 0), vec2(0, 0), 1)).toBeNull();
  });
});

describe('lineLineIntersect', () => {
  it('crosses two lines and reports both parameters', () => {
    const r = lineLineIntersect(vec2(0, 0), vec2(2, 0), vec2(3, -1), vec2(0, 1));
    expect(r).toEqual({ kind: 'point', x: 3, y: 0, t: 1.5, u: 1 });
  });

  it('reports parallel lines as a value with their separation (0 when they coincide)', () => {
    const parallel = lineLineIntersect(vec2(0, 0), vec2(1, 1), vec2(0, 2), vec2(-3, -3));
    expect(parallel.kind).toBe('parallel');
    if (parallel.kind === 'parallel') expect(parallel.separation).toBeCloseTo(Math.SQRT2, 14);
    const same = lineLineIntersect(vec2(0, 0), vec2(1, 0), vec2(5, 0), vec2(2, 0));
    expect(same).toEqual({ kind: 'parallel', separation: 0 });
  });
});

describe('point-to-polyline distance', () => {
  const square = Float64Array.from([0, 0, 1, 0, 1, 1, 0, 1]);

  it('open and closed differ only by the closing segment', () => {
    // (−0.5, 0.5) is nearest to the closing edge x = 0 (distance 0.5); open, its nearest
    // point is a vertex, (0, 0) or (0, 1), at √0.5.
    expect(pointToPolylineDistance(-0.5, 0.5, square, true)).toBeCloseTo(0.5, 15);
    expect(pointToPolylineDistance(-0.5, 0.5, square, false)).toBeCloseTo(Math.SQRT1_2, 15);
    const near = nearestOnPolyline(-0.5, 0.5, square, true);
    expect(near).toMatchObject({ segment: 3, x: 0, y: 0.5 });
    expect(near.t).toBeCloseTo(0.5, 15);
  });

  it('matches a brute-force sampling of the segments', () => {
    const prng = Prng.fromSeed(5);
    const xy = new Float64Array(14);
    for (let i = 0; i < xy.length; i++) xy[i] = 100 * prng.float();
    for (let trial = 0; trial < 50; trial++) {
      const px = 120 * prng.float() - 10;
      const py = 120 * prng.float() - 10;
      let brute = Infinity;
      for (let s = 0; s < 6; s++) {
        for (let k = 0; k <= 20_000; k++) {
          const t = k / 20_000;
          const x = xy[2 * s] + t * (xy[2 * s + 2] - xy[2 * s]);
          const y = xy[2 * s + 1] + t * (xy[2 * s + 3] - xy[2 * s + 1]);
          brute = Math.min(brute, Math.hypot(x - px, y - py));
        }
      }
      const d = pointToPolylineDistance(px, py, xy, false);
      expect(d).toBeLessThanOrEqual(brute + 1e-12);
      expect(brute - d).toBeLessThan(0.01);
    }
  });

  it('treats one point as a point, propagates NaN, and refuses an empty or odd array', () => {
    expect(pointToPolylineDistance(3, 4, Float64Array.from([0, 0]), true)).toBe(5);
    expect(pointToPolylineDistance(NaN, 0, square, false)).toBeNaN();
    expect(() => pointToPolylineDistance(0, 0, new Float64Array(0), false)).toThrow(/expected an even count of at least 2/);
    expect(() => pointToPolylineDistance(0, 0, Float64Array.from([1, 2, 3]), false)).toThrow(RangeError);
  });
});

describe('similarityFit (Umeyama 1991)', () => {
  it("reproduces the numerical example of Umeyama's paper (from memory): c = 0.721, R = [[0.832, 0.555], [−0.555, 0.832]], t = (−0.800, 0.400)", () => {
    // Umeyama, IEEE Trans. PAMI 13(4), 1991, the worked example: x = {(0,0), (1,0), (0,2)},
    // y = {(0,0), (−1,0), (0,2)}; y is a reflection of x, so the best proper rotation is not exact.
    const fit = similarityFit(Float64Array.from([0, 0, 1, 0, 0, 2]), Float64Array.from([0, 0, -1, 0, 0, 2]));
    expect(fit.ok).toBe(true);
    if (!fit.ok) return;
    expect(fit.scale).toBeCloseTo(0.721, 3);
    expect(Math.cos(fit.rotationRad)).toBeCloseTo(0.832, 3);
    expect(Math.sin(fit.rotationRad)).toBeCloseTo(-0.555, 3);
    expect(fit.tx).toBeCloseTo(-0.8, 3);
    expect(fit.ty).toBeCloseTo(0.4, 3);
  });

  it('recovers an exact similarity from noise-free points (Umeyama 1991: the least-squares optimum is exact then)', () => {
    fc.assert(
      fc.property(
        fc.array(point, { minLength: 2, maxLength: 30 }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        point,
        (points, angle, scale, shift) => {
          const source = Float64Array.from(points.flatMap((p) => [p.x, p.y]));
          const spread = Math.max(...points.map((p) => distance(p, points[0])));
          fc.pre(spread > 1);
          const c = scale * Math.cos(angle);
          const s = scale * Math.sin(angle);
          const target = Float64Array.from(points.flatMap((p) => [c * p.x - s * p.y + shift.x, s * p.x + c * p.y + shift.y]));
          const fit = similarityFit(source, target);
          expect(fit.ok).toBe(true);
          if (!fit.ok) return;
          expect(fit.scale).toBeCloseTo(scale, 6);
          expect(Math.abs(Math.atan2(Math.sin(fit.rotationRad - angle), Math.cos(fit.rotationRad - angle)))).toBeLessThan(1e-8);
          const size = 1 + scale * 1e3 + Math.abs(shift.x) + Math.abs(shift.y);
          expect(Math.abs(fit.tx - shift.x)).toBeLessThan(1e-9 * size);
          expect(Math.abs(fit.ty - shift.y)).toBeLessThan(1e-9 * size);
          expect(fit.sse).toBeLessThan((1e-9 * size) ** 2 * points.length);
        },
      ),
    );
  });

  it('finds the same minimum as a brute-force Nelder–Mead search (fmin) on noisy and reflected targets', () => {
    const prng = Prng.fromSeed(3);
    for (let trial = 0; trial < 10; trial++) {
      const n = 8;
      const source = new Float64Array(2 * n);
      const target = new Float64Array(2 * n);
      const reflect = trial % 2 === 1;
      for (let i = 0; i < n; i++) {
        source[2 * i] = 50 * prng.float();
        source[2 * i + 1] = 50 * prng.float();
        const x = source[2 * i];
        const y = reflect ? -source[2 * i + 1] : source[2 * i + 1];
        target[2 * i] = 0.8 * x - 0.6 * y + 10 + 3 * prng.normal();
        target[2 * i + 1] = 0.6 * x + 0.8 * y - 4 + 3 * prng.normal();
      }
      const sse = ([a, b, tx, ty]: number[]) => {
        let sum = 0;
        for (let i = 0; i < n; i++) {
          const rx = target[2 * i] - (a * source[2 * i] - b * source[2 * i + 1] + tx);
          const ry = target[2 * i + 1] - (b * source[2 * i] + a * source[2 * i + 1] + ty);
          sum += rx * rx + ry * ry;
        }
        return sum;
      };
      // sigma: 1 (no shrink step): fmin 0.0.4's shrink step uses an undeclared variable.
      // Restarts from the best point stand in for it.
      let brute = fmin.nelderMead(sse, [1, 0, 0, 0], { maxIterations: 20_000, minErrorDelta: 1e-14, sigma: 1 });
      for (let restart = 0; restart < 5; restart++) {
        brute = fmin.nelderMead(sse, brute.x.slice(), { maxIterations: 20_000, minErrorDelta: 1e-14, sigma: 1 });
      }
      const out = new Float64Array(SIM_LENGTH);
      expect(similarityFitInto(source, target, n, out)).toBe(true);
      // The closed form is the minimum: no search beats it, and a good one reaches it.
      expect(out[SIM_SSE]).toBeLessThanOrEqual(brute.fx * (1 + 1e-12));
      expect(out[SIM_SSE]).toBeCloseTo(brute.fx, 4);
      expect(out[SIM_SSE]).toBeCloseTo(sse([out[SIM_A], out[SIM_B], out[SIM_TX], out[SIM_TY]]), 8);
      // No reflection: s R has the form [[a, −b], [b, a]] by construction, so det = a² + b² > 0.
      expect(out[SIM_A] ** 2 + out[SIM_B] ** 2).toBeGreaterThan(0);
    }
  });

  it('applies weights: a zero weight drops a point; the fit then equals the fit without it', () => {
    const source = Float64Array.from([0, 0, 10, 0, 0, 10, 7, 7]);
    const target = Float64Array.from([1, 1, 11, 2, 0, 12, 100, -50]);
    const weighted = similarityFit(source, target, Float64Array.from([1, 1, 1, 0]));
    const subset = similarityFit(source.subarray(0, 6), target.subarray(0, 6));
    expect(weighted.ok && subset.ok).toBe(true);
    if (!weighted.ok || !subset.ok) return;
    expect(weighted.scale).toBeCloseTo(subset.scale, 12);
    expect(weighted.rotationRad).toBeCloseTo(subset.rotationRad, 12);
    expect(weighted.tx).toBeCloseTo(subset.tx, 10);
    expect(weighted.sse).toBeCloseTo(subset.sse, 9);
  });

  it('handles degenerate input as values: no points, coincident source points, a target without spread', () => {
    const out = new Float64Array(SIM_LENGTH);
    expect(similarityFitInto(new Float64Array(0), new Float64Array(0), 0, out)).toBe(false);
    expect(Array.from(out).every(Number.isNaN)).toBe(true);
    // All source points coincide: no rotation or scale; the least-squares answer sends
    // every point to the target centroid (scale 0).
    const source = Float64Array.from([3, 3, 3, 3, 3, 3]);
    const target = Float64Array.from([0, 0, 6, 0, 0, 6]);
    expect(similarityFitInto(source, target, 3, out)).toBe(false);
    expect(out[SIM_A]).toBe(0);
    expect(out[SIM_B]).toBe(0);
    expect(out[SIM_TX]).toBeCloseTo(2, 14);
    expect(out[SIM_TY]).toBeCloseTo(2, 14);
    expect(out[SIM_SSE]).toBeCloseTo(8 + 20 + 20, 12);
    const coincident = similarityFit(source, target);
    expect(coincident).toEqual({ ok: false, reason: 'the source points coincide; a rotation and scale need at least two distinct source points' });
    // A target without spread: the unique best similarity has scale 0.
    const flat = similarityFit(target, Float64Array.from([5, 5, 5, 5, 5, 5]));
    expect(flat).toMatchObject({ ok: true, scale: 0, rotationRad: 0, tx: 5, ty: 5, sse: 0 });
    expect(similarityFit(Float64Array.from([0, 0, 1]), Float64Array.from([0, 0, 1]))).toMatchObject({ ok: false });
    expect(similarityFit(Float64Array.from([0, 0, NaN, 1]), Float64Array.from([0, 0, 1, 1]))).toMatchObject({ ok: false });
  });

  it('applySimilarityInto maps the source onto the fitted target', () => {
    const source = Float64Array.from([0, 0, 2, 0, 0, 1]);
    const target = Float64Array.from([1, 1, 1, 5, -1, 1]);
    const out = new Float64Array(SIM_LENGTH);
    expect(similarityFitInto(source, target, 3, out)).toBe(true);
    const mapped = new Float64Array(6);
    applySimilarityInto(out, source, 3, mapped);
    for (let i = 0; i < 6; i++) expect(mapped[i]).toBeCloseTo(target[i], 12);
  });
});
