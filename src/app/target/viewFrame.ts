/**
 * The drawing's frame: d3 linear scales from mm to screen pixels with the same scale on
 * both axes (y up on paper, down on screen), fitted to what is drawn with a margin.
 */
import { scaleLinear, type ScaleLinear } from 'd3';

export interface Extent {
  readonly minX: number;
  readonly maxX: number;
  readonly minY: number;
  readonly maxY: number;
}

export interface Frame {
  readonly x: ScaleLinear<number, number>;
  readonly y: ScaleLinear<number, number>;
}

/** What the drawing shows with nothing in it, mm. */
export const EMPTY_EXTENT: Extent = { minX: -50, maxX: 150, minY: -50, maxY: 100 };
/** A drawing is never zoomed in so far by fitting that it shows less than this across, mm. */
const MIN_SPAN_MM = 20;

export function mergeExtents(a: Extent | null, b: Extent | null): Extent | null {
  if (a === null) return b;
  if (b === null) return a;
  return { minX: Math.min(a.minX, b.minX), maxX: Math.max(a.maxX, b.maxX), minY: Math.min(a.minY, b.minY), maxY: Math.max(a.maxY, b.maxY) };
}

export function fitFrame(extent: Extent | null, widthPx: number, heightPx: number, marginPx = 36): Frame {
  const e = extent ?? EMPTY_EXTENT;
  const cx = (e.minX + e.maxX) / 2;
  const cy = (e.minY + e.maxY) / 2;
  const spanX = Math.max(MIN_SPAN_MM, e.maxX - e.minX);
  const spanY = Math.max(MIN_SPAN_MM, e.maxY - e.minY);
  const usableW = Math.max(1, widthPx - 2 * marginPx);
  const usableH = Math.max(1, heightPx - 2 * marginPx);
  const pxPerMm = Math.min(usableW / spanX, usableH / spanY);
  const halfW = widthPx / 2 / pxPerMm;
  const halfH = heightPx / 2 / pxPerMm;
  return {
    x: scaleLinear().domain([cx - halfW, cx + halfW]).range([0, widthPx]),
    y: scaleLinear().domain([cy - halfH, cy + halfH]).range([heightPx, 0]),
  };
}
