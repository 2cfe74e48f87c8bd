/**
 * The geometry of a results drawing, as SVG path data: the view, the target, the output
 * path, the instant-centre path with direction markers for centres off the drawing or at
 * infinity, and the linkage in one pose. Pure strings and numbers, so the screen and
 * the exported SVG file draw exactly the same thing.
 *
 * Frames: the world is x right, y up, mm; SVG is y down. Every function here takes world
 * coordinates and writes SVG ones (y negated).
 */
import { IC_FINITE, IC_INFINITE } from '../../core/linkage/analysis';
import type { Box, CandidateMotion } from './motion';

export interface View {
  /** SVG user units (mm), y down. */
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
  /** Decimals that resolve 1/10 000 of the view in path data. */
  readonly decimals: number;
}

/** Share of the larger side added round a view. */
export const VIEW_MARGIN_SHARE = 0.08;
/**
 * Instant centres farther outside the view than this share of its size are drawn as
 * direction markers; the path runs a little past the edge (drawings clip it there).
 */
export const CENTRE_LIMIT_VIEWS = 0.25;
/** The smallest view side, mm, so a design that sweeps no area still gets a drawing. */
const MIN_VIEW_MM = 1e-3;
/** A run of far centres gets a second marker where it returns when the two differ by more than this (deg). */
const MARKER_SEPARATION_DEG = 10;
/** Path data resolves this share of the view's diagonal. */
const PATH_RESOLUTION_SHARE = 1e-4;

export function unionBox(boxes: readonly (Box | null | undefined)[]): Box | null {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const b of boxes) {
    if (!b) continue;
    minX = Math.min(minX, b.minX);
    minY = Math.min(minY, b.minY);
    maxX = Math.max(maxX, b.maxX);
    maxY = Math.max(maxY, b.maxY);
  }
  return maxX >= minX && maxY >= minY ? { minX, minY, maxX, maxY } : null;
}

export function pointsBox(points: readonly (readonly [number, number])[]): Box | null {
  if (points.length === 0) return null;
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const [x, y] of points) {
    if (!(Number.isFinite(x) && Number.isFinite(y))) continue;
    minX = Math.min(minX, x);
    minY = Math.min(minY, y);
    maxX = Math.max(maxX, x);
    maxY = Math.max(maxY, y);
  }
  return maxX >= minX ? { minX, minY, maxX, maxY } : null;
}

/** The box of the output point's path over the motion. */
export function outputPathBox(motion: Pick<CandidateMotion, 'output'>): Box | null {
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  const { x, y } = motion.output;
  for (let k = 0; k < x.length; k++) {
    if (!(Number.isFinite(x[k]) && Number.isFinite(y[k]))) continue;
    minX = Math.min(minX, x[k]);
    minY = Math.min(minY, y[k]);
    maxX = Math.max(maxX, x[k]);
    maxY = Math.max(maxY, y[k]);
  }
  return maxX >= minX ? { minX, minY, maxX, maxY } : null;
}

/** The SVG view of a world box with a margin. */
export function viewOf(box: Box, marginShare = VIEW_MARGIN_SHARE): View {
  const w = Math.max(box.maxX - box.minX, MIN_VIEW_MM);
  const h = Math.max(box.maxY - box.minY, MIN_VIEW_MM);
  const margin = marginShare * Math.max(w, h);
  const width = w + 2 * margin;
  const height = h + 2 * margin;
  const cx = 0.5 * (box.minX + box.maxX);
  const cy = 0.5 * (box.minY + box.maxY);
  const resolution = PATH_RESOLUTION_SHARE * Math.hypot(width, height);
  const decimals = Math.min(8, Math.max(0, Math.ceil(-Math.log10(resolution))));
  return { x: cx - width / 2, y: -cy - height / 2, width, height, decimals };
}

export function viewBoxAttr(view: View): string {
  return [view.x, view.y, view.width, view.height].map((v) => num(v, view.decimals)).join(' ');
}

/** A number for path data: fixed decimals, no "-0". */
export function num(v: number, decimals: number): string {
  const s = v.toFixed(decimals);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/** SVG coordinates of a world point, as "x,y". */
function xy(view: View, x: number, y: number): string {
  return `${num(x, view.decimals)},${num(-y, view.decimals)}`;
}

/**
 * Path data of a polyline through (xs[k], ys[k]), broken where a point is not finite or
 * `keep(k)` says no. `closed` joins the last point to the first when neither is broken.
 */
export function polylineD(view: View, xs: ArrayLike<number>, ys: ArrayLike<number>, closed = false, keep?: (k: number) => boolean): string {
  const parts: string[] = [];
  let open = false;
  const n = xs.length;
  const ok = (k: number) => Number.isFinite(xs[k]) && Number.isFinite(ys[k]) && (keep === undefined || keep(k));
  for (let k = 0; k < n; k++) {
    if (!ok(k)) {
      open = false;
      continue;
    }
    parts.push(`${open ? 'L' : 'M'}${xy(view, xs[k], ys[k])}`);
    open = true;
  }
  if (closed && n > 1 && ok(0) && ok(n - 1)) parts.push('Z');
  return parts.join('');
}

/** A unit vector in SVG coordinates. */
type Direction = readonly [number, number];

/** A direction marker: where on the view's edge, and which way it points (deg, SVG frame, 0 = +x, clockwise). */
export interface DirectionMarker {
  readonly x: number;
  readonly y: number;
  readonly angleDeg: number;
}

export interface CentreGeometry {
  /** Path data of the finite centres that lie near the view. */
  readonly d: string;
  /** Where the centre leaves the drawing (far away or at infinity): arrows on the edge pointing to it. */
  readonly markers: readonly DirectionMarker[];
  /** Steps whose centre is at infinity (a relative translation). */
  readonly atInfinity: number;
}

/**
 * The instant-centre path in a view. A finite centre within CENTRE_LIMIT_VIEWS view
 * sizes of the view joins the path; a run of centres beyond that or at infinity breaks
 * it and is marked by an arrow on the view's edge, pointing the way the centre went (a
 * centre at infinity has a direction, never a coordinate).
 */
export function centreGeometry(view: View, centre: CandidateMotion['centre']): CentreGeometry {
  const steps = centre.kind.length;
  const limit = limitBox(view);
  const near = (k: number) => centre.kind[k] === IC_FINITE && insideView(limit, centre.x[k], -centre.y[k]);
  // Between two samples a centre can pass through infinity and come back from the other
  // side while both samples stay near: a jump longer than the view's diagonal is never joined.
  const jumpMm = Math.hypot(view.width, view.height);
  const parts: string[] = [];
  let open = false;
  for (let k = 0; k < steps; k++) {
    if (!near(k)) {
      open = false;
      continue;
    }
    if (open && Math.hypot(centre.x[k] - centre.x[k - 1], centre.y[k] - centre.y[k - 1]) > jumpMm) open = false;
    parts.push(`${open ? 'L' : 'M'}${xy(view, centre.x[k], centre.y[k])}`);
    open = true;
  }

  const markers: DirectionMarker[] = [];
  let atInfinity = 0;
  const far = (k: number) => centre.kind[k] === IC_INFINITE || (centre.kind[k] === IC_FINITE && !near(k));
  // The way to the centre in SVG coordinates; ±(dx, dy) is one point at infinity, so
  // take the sign closest to the way the path was heading.
  const directionAt = (k: number, heading: Direction | null): Direction | null => {
    if (centre.kind[k] === IC_INFINITE) {
      const d: Direction = [centre.x[k], -centre.y[k]];
      return heading && d[0] * heading[0] + d[1] * heading[1] < 0 ? [-d[0], -d[1]] : d;
    }
    return unit(centre.x[k] - viewCentreX(view), -centre.y[k] - viewCentreY(view));
  };
  let heading: Direction | null = null;
  for (let k = 0; k < steps; k++) {
    if (centre.kind[k] === IC_INFINITE) atInfinity++;
    if (near(k)) {
      heading = directionAt(k, heading);
      continue;
    }
    if (!far(k)) continue;
    let last = k;
    while (last + 1 < steps && far(last + 1)) {
      last++;
      if (centre.kind[last] === IC_INFINITE) atInfinity++;
    }
    const enter = directionAt(k, heading);
    let leave = enter;
    for (let j = k + 1; j <= last; j++) leave = directionAt(j, leave);
    if (enter) markers.push(edgeMarker(view, enter));
    if (leave && last > k && (!enter || angleBetweenDeg(enter, leave) > MARKER_SEPARATION_DEG)) markers.push(edgeMarker(view, leave));
    heading = leave;
    k = last;
  }
  return { d: parts.join(''), markers, atInfinity };
}

/** Where the marker of a centre in SVG direction (dx, dy) from the view's centre sits on the edge. */
export function edgeMarker(view: View, direction: Direction): DirectionMarker {
  const [dx, dy] = direction;
  const inset = 0.06;
  const halfW = view.width * (0.5 - inset);
  const halfH = view.height * (0.5 - inset);
  const t = Math.min(Math.abs(dx) > 0 ? halfW / Math.abs(dx) : Infinity, Math.abs(dy) > 0 ? halfH / Math.abs(dy) : Infinity);
  const scale = Number.isFinite(t) ? t : 0;
  return {
    x: viewCentreX(view) + dx * scale,
    y: viewCentreY(view) + dy * scale,
    angleDeg: (Math.atan2(dy, dx) * 180) / Math.PI,
  };
}

/** Path data of an arrow head of `size` at a marker, pointing along it. */
export function markerD(view: View, marker: DirectionMarker, size: number): string {
  const a = (marker.angleDeg * Math.PI) / 180;
  const c = Math.cos(a);
  const s = Math.sin(a);
  const pt = (u: number, v: number) => `${num(marker.x + u * c - v * s, view.decimals)},${num(marker.y + u * s + v * c, view.decimals)}`;
  return `M${pt(size, 0)}L${pt(-size * 0.6, size * 0.6)}L${pt(-size * 0.2, 0)}L${pt(-size * 0.6, -size * 0.6)}Z`;
}

export interface LinkageShapes {
  /** One path per moving body: a bar for two slots, a closed plate for more. */
  readonly links: readonly { readonly bodyId: string; readonly d: string }[];
  /** Each joint's id (the linkage file's), for its label. */
  readonly joints: readonly { readonly id: string; readonly x: number; readonly y: number; readonly ground: boolean }[];
  readonly output: { readonly x: number; readonly y: number } | null;
  /** Lines the ground sliders run on, across the view. */
  readonly slides: readonly string[];
}

/** The linkage in `pose` (a solved pose of `motion.plan`), in SVG coordinates. */
export function linkageShapes(view: View, motion: CandidateMotion, pose: ArrayLike<number>): LinkageShapes {
  const jointCount = motion.plan.jointIds.length;
  const ground = new Set(motion.groundSlots);
  const links = motion.links.map((link) => {
    const xs = link.slots.map((s) => pose[2 * s]);
    const ys = link.slots.map((s) => pose[2 * s + 1]);
    return { bodyId: link.bodyId, d: polylineD(view, xs, ys, link.slots.length > 2) };
  });
  const joints: { id: string; x: number; y: number; ground: boolean }[] = [];
  for (let s = 0; s < jointCount; s++) {
    const x = pose[2 * s];
    const y = pose[2 * s + 1];
    if (Number.isFinite(x) && Number.isFinite(y)) joints.push({ id: motion.plan.jointIds[s], x, y: -y, ground: ground.has(s) });
  }
  const ox = pose[2 * motion.output.slot];
  const oy = pose[2 * motion.output.slot + 1];
  const reach = Math.hypot(view.width, view.height);
  const slides = motion.groundSlides.map(({ slot, angleRad }) => {
    const x = pose[2 * slot];
    const y = pose[2 * slot + 1];
    const c = Math.cos(angleRad) * reach;
    const s = Math.sin(angleRad) * reach;
    return `M${xy(view, x - c, y - s)}L${xy(view, x + c, y + s)}`;
  });
  return { links, joints, output: Number.isFinite(ox) && Number.isFinite(oy) ? { x: ox, y: -oy } : null, slides };
}

/** Share of the view's width a scale bar aims for. */
const SCALE_BAR_SHARE = 0.2;
/** Share of the view's smaller side the axis arrows of the corner indicator take. */
const AXIS_ARROW_SHARE = 0.08;
/** Share of the view's larger side between a joint and its label. */
const LABEL_OFFSET_SHARE = 0.012;

/** The largest 1, 2 or 5 × 10^k mm that is at most `mm` (the length of a readable scale bar). */
export function niceLengthMm(mm: number): number {
  if (!(mm > 0 && Number.isFinite(mm))) return 1;
  const decade = 10 ** Math.floor(Math.log10(mm));
  const lead = mm / decade;
  return (lead >= 5 ? 5 : lead >= 2 ? 2 : 1) * decade;
}

/** A scale bar's text: "50 mm", "0.2 mm". */
export function scaleLabel(lengthMm: number): string {
  return `${Number(lengthMm.toPrecision(1))} mm`;
}

export interface DrawingFrame {
  /** The world's x and y axes (y = 0 and x = 0) where they cross the view; empty where they miss it. */
  readonly axesD: string;
  /** The origin in SVG coordinates when it lies in the view. */
  readonly origin: { readonly x: number; readonly y: number } | null;
  /** Corner indicator: arrows along +x and +y from the lower-left corner, with where their letters go. */
  readonly indicatorD: string;
  readonly xLabel: { readonly x: number; readonly y: number };
  readonly yLabel: { readonly x: number; readonly y: number };
  /** Scale bar in the lower-right corner: path, its length and where its label goes. */
  readonly scaleD: string;
  readonly scaleMm: number;
  readonly scaleLabelAt: { readonly x: number; readonly y: number };
  /** Font size for labels, SVG units. */
  readonly fontSize: number;
  /** Offset of a joint's label from the joint, SVG units. */
  readonly labelOffset: number;
}

/** Axes, origin, axis directions and a scale bar for a view: what makes a drawing readable as a drawing. */
export function drawingFrame(view: View): DrawingFrame {
  const d = (v: number) => num(v, view.decimals);
  const size = Math.max(view.width, view.height);
  const small = Math.min(view.width, view.height);
  const fontSize = size * 0.022;
  const inset = small * 0.05;
  const axes: string[] = [];
  // World y = 0 is SVG y = 0; world x = 0 is SVG x = 0.
  if (view.y <= 0 && 0 <= view.y + view.height) axes.push(`M${d(view.x)},0H${d(view.x + view.width)}`);
  if (view.x <= 0 && 0 <= view.x + view.width) axes.push(`M0,${d(view.y)}V${d(view.y + view.height)}`);
  const origin = insideView(view, 0, 0) ? { x: 0, y: 0 } : null;
  const arrow = small * AXIS_ARROW_SHARE;
  const head = arrow * 0.25;
  const cx = view.x + inset;
  const cy = view.y + view.height - inset;
  const indicatorD =
    `M${d(cx)},${d(cy)}H${d(cx + arrow)}M${d(cx + arrow - head)},${d(cy - head * 0.6)}L${d(cx + arrow)},${d(cy)}L${d(cx + arrow - head)},${d(cy + head * 0.6)}` +
    `M${d(cx)},${d(cy)}V${d(cy - arrow)}M${d(cx - head * 0.6)},${d(cy - arrow + head)}L${d(cx)},${d(cy - arrow)}L${d(cx + head * 0.6)},${d(cy - arrow + head)}`;
  const scaleMm = niceLengthMm(view.width * SCALE_BAR_SHARE);
  const right = view.x + view.width - inset;
  const tick = fontSize * 0.4;
  const scaleD = `M${d(right - scaleMm)},${d(cy - tick)}V${d(cy)}H${d(right)}V${d(cy - tick)}`;
  return {
    axesD: axes.join(''),
    origin,
    indicatorD,
    xLabel: { x: cx + arrow + fontSize * 0.3, y: cy + fontSize * 0.35 },
    yLabel: { x: cx - fontSize * 0.35, y: cy - arrow - fontSize * 0.3 },
    scaleD,
    scaleMm,
    scaleLabelAt: { x: right - scaleMm / 2, y: cy - tick - fontSize * 0.3 },
    fontSize,
    labelOffset: size * LABEL_OFFSET_SHARE,
  };
}

/** The view `zoom` times closer about its centre, moved by (dx, dy) SVG units (a zoom of 1 and no move is `view`). */
export function zoomedView(view: View, zoom: number, dx: number, dy: number): View {
  const z = zoom > 0 && Number.isFinite(zoom) ? zoom : 1;
  const width = view.width / z;
  const height = view.height / z;
  const cx = view.x + view.width / 2 + (Number.isFinite(dx) ? dx : 0);
  const cy = view.y + view.height / 2 + (Number.isFinite(dy) ? dy : 0);
  const decimals = Math.min(8, view.decimals + Math.max(0, Math.ceil(Math.log10(z))));
  return { x: cx - width / 2, y: cy - height / 2, width, height, decimals };
}

/** Lines from each target point to the output point matched to it: the error, drawn. */
export function errorWhiskersD(view: View, target: readonly (readonly [number, number])[], matched: CandidateMotion['matched']): string {
  const parts: string[] = [];
  for (let i = 0; i < target.length && i < matched.x.length; i++) {
    const [tx, ty] = target[i];
    if (!(Number.isFinite(matched.x[i]) && Number.isFinite(matched.y[i]))) continue;
    parts.push(`M${xy(view, tx, ty)}L${xy(view, matched.x[i], matched.y[i])}`);
  }
  return parts.join('');
}

/** Whether an SVG point lies in the view. */
export function insideView(view: View, x: number, y: number): boolean {
  return x >= view.x && x <= view.x + view.width && y >= view.y && y <= view.y + view.height;
}

function limitBox(view: View): View {
  return {
    x: view.x - CENTRE_LIMIT_VIEWS * view.width,
    y: view.y - CENTRE_LIMIT_VIEWS * view.height,
    width: (1 + 2 * CENTRE_LIMIT_VIEWS) * view.width,
    height: (1 + 2 * CENTRE_LIMIT_VIEWS) * view.height,
    decimals: view.decimals,
  };
}

function viewCentreX(view: View): number {
  return view.x + view.width / 2;
}

function viewCentreY(view: View): number {
  return view.y + view.height / 2;
}

function unit(dx: number, dy: number): Direction | null {
  const n = Math.hypot(dx, dy);
  return n > 0 && Number.isFinite(n) ? [dx / n, dy / n] : null;
}

function angleBetweenDeg(a: Direction, b: Direction): number {
  return (Math.acos(Math.max(-1, Math.min(1, a[0] * b[0] + a[1] * b[1]))) * 180) / Math.PI;
}
