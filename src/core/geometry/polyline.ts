/**
 * Distance from a point to a polyline given as interleaved coordinates
 * [x0, y0, x1, y1, ...] (mm). A closed polyline also has the segment from the last
 * point back to the first. A polyline of one point is that point. A NaN coordinate
 * gives a NaN distance.
 */

function checkPolyline(xy: ArrayLike<number>, where: string): number {
  const n = xy.length >> 1;
  if (n < 1 || (xy.length & 1) !== 0) {
    throw new RangeError(`${where}: polyline has ${xy.length} numbers; expected an even count of at least 2 (x, y pairs)`);
  }
  return n;
}

/** Parameter in [0, 1] of the point of segment (ax, ay)–(bx, by) nearest to (px, py). */
function segmentParam(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  const t = len2 > 0 ? ((px - ax) * dx + (py - ay) * dy) / len2 : 0;
  return t > 1 ? 1 : t > 0 ? t : 0;
}

/** Squared distance from (px, py) to the segment (ax, ay)–(bx, by). */
function segmentDistanceSq(px: number, py: number, ax: number, ay: number, bx: number, by: number): number {
  const t = segmentParam(px, py, ax, ay, bx, by);
  const ex = ax + t * (bx - ax) - px;
  const ey = ay + t * (by - ay) - py;
  return ex * ex + ey * ey;
}

export interface PolylineNearest {
  /** Distance (mm) from the point to the polyline. */
  readonly distance: number;
  /** Index of the nearest segment: from point `segment` to point `segment + 1` (wrapping when closed). */
  readonly segment: number;
  /** Parameter along that segment, in [0, 1]. */
  readonly t: number;
  readonly x: number;
  readonly y: number;
}

/** The nearest point of the polyline to (px, py). */
export function nearestOnPolyline(px: number, py: number, xy: ArrayLike<number>, closed: boolean): PolylineNearest {
  const n = checkPolyline(xy, 'nearestOnPolyline');
  let best = Infinity;
  let bestSegment = 0;
  const segments = n === 1 ? 1 : closed ? n : n - 1;
  for (let i = 0; i < segments; i++) {
    const j = i + 1 < n ? i + 1 : 0;
    const d2 = segmentDistanceSq(px, py, xy[2 * i], xy[2 * i + 1], xy[2 * j], xy[2 * j + 1]);
    if (d2 < best) {
      best = d2;
      bestSegment = i;
    } else if (Number.isNaN(d2)) {
      best = NaN;
      break;
    }
  }
  const j = bestSegment + 1 < n ? bestSegment + 1 : 0;
  const ax = xy[2 * bestSegment];
  const ay = xy[2 * bestSegment + 1];
  const bestT = segmentParam(px, py, ax, ay, xy[2 * j], xy[2 * j + 1]);
  return {
    distance: Math.sqrt(best),
    segment: bestSegment,
    t: bestT,
    x: ax + bestT * (xy[2 * j] - ax),
    y: ay + bestT * (xy[2 * j + 1] - ay),
  };
}

/** Distance (mm) from (px, py) to the polyline; allocation-free. */
export function pointToPolylineDistance(px: number, py: number, xy: ArrayLike<number>, closed: boolean): number {
  const n = checkPolyline(xy, 'pointToPolylineDistance');
  let best = Infinity;
  const segments = n === 1 ? 1 : closed ? n : n - 1;
  for (let i = 0; i < segments; i++) {
    const j = i + 1 < n ? i + 1 : 0;
    const d2 = segmentDistanceSq(px, py, xy[2 * i], xy[2 * i + 1], xy[2 * j], xy[2 * j + 1]);
    if (d2 < best) best = d2;
    else if (Number.isNaN(d2)) return NaN;
  }
  return Math.sqrt(best);
}
