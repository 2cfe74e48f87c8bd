/**
 * A leg problem as plain data: which point of a crank-driven linkage is the foot, the
 * ground line, the stance tolerance, the crank's turning direction and the body's
 * walking direction, with the foot trajectory the designer wants. Checked once here;
 * the gait figures trust what passes.
 *
 * Frame: x right, y up (mm), angles counter-clockwise from +x, as everywhere in Loci.
 */
import { MAX_COORDINATE_MM, printableId, type Linkage } from '../linkage';

export interface XyMm {
  readonly x: number;
  readonly y: number;
}

/**
 * The ground line: level at a height, or through a point along a direction (a slope).
 * Its up side is the side of +y, so a vertical line has none and is refused.
 */
export type GroundLineSpec =
  | { readonly kind: 'level'; readonly yMm: number }
  | { readonly kind: 'line'; readonly point: XyMm; readonly direction: XyMm };

export interface LegSpec {
  /** The foot: a moving joint or a named point of the linkage. */
  readonly foot: string;
  readonly ground: GroundLineSpec;
  /** The foot is in stance while within this distance of the ground line (mm, > 0). */
  readonly stanceToleranceMm: number;
  /** +1: the crank turns counter-clockwise (the driver angle grows); −1: clockwise. */
  readonly crankDirection: 1 | -1;
  /** +1: the body walks towards +x (along the ground line); −1: towards −x. */
  readonly walkingDirection: 1 | -1;
  /** The closed foot trajectory wanted (mm; the last point joins the first), as drawn or traced. */
  readonly footPath?: readonly XyMm[];
}

/** A checked leg: the ground line as an origin and two unit vectors. */
export interface Leg {
  readonly foot: string;
  /** A point of the ground line (mm). */
  readonly originMm: XyMm;
  /** Unit vector along the ground line, pointing where the body walks. */
  readonly along: XyMm;
  /** Unit normal of the ground line on its up side (y > 0). */
  readonly up: XyMm;
  readonly stanceToleranceMm: number;
  readonly crankDirection: 1 | -1;
  readonly walkingDirection: 1 | -1;
  readonly footPath: readonly XyMm[];
}

export interface LegIssue {
  readonly path: string;
  readonly message: string;
}

export type LegValidation = { readonly ok: true; readonly leg: Leg } | { readonly ok: false; readonly issues: LegIssue[] };

/**
 * A ground direction whose x share is below this (of its length, a pure number) is
 * taken as vertical: it has no up side, and heights square to it would measure sideways.
 */
export const GROUND_VERTICAL_REL_TOL = 1e-9;

/** A drawn or traced foot trajectory: at least 3 points, at most this many. */
export const MAX_FOOT_PATH_POINTS = 100_000;

function isCoordinate(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v) && Math.abs(v) <= MAX_COORDINATE_MM;
}

function describe(v: unknown): string {
  return typeof v === 'number' || typeof v === 'string' ? String(v) : v === null ? 'null' : typeof v;
}

/** Checks a leg problem against its linkage; every problem is reported in the user's words. */
export function validateLeg(input: LegSpec, linkage: Linkage): LegValidation {
  if (typeof input !== 'object' || input === null) {
    return { ok: false, issues: [{ path: '', message: `the leg is ${describe(input)}; expected an object with foot, ground, stanceToleranceMm, crankDirection and walkingDirection` }] };
  }
  const issues: LegIssue[] = [];
  if (linkage.driver.kind !== 'rotation') {
    issues.push({ path: 'linkage.driver', message: 'the linkage is driven by a length; a leg needs a crank (a rotation driver) that turns fully' });
  }
  const foot: unknown = input.foot;
  if (typeof foot !== 'string') {
    issues.push({ path: 'foot', message: `the foot is ${describe(foot)}; expected the id of a joint or point of the linkage` });
  } else {
    const joint = linkage.joints.find((j) => j.id === foot);
    const point = linkage.points?.find((p) => p.id === foot);
    if (joint === undefined && point === undefined) {
      issues.push({ path: 'foot', message: `the foot '${printableId(foot)}' is not a joint or point of the linkage` });
    } else if (joint?.ground === true) {
      issues.push({ path: 'foot', message: `the foot '${printableId(foot)}' is a ground pivot: it does not move; expected a moving joint or a point on a link` });
    }
  }

  let originMm: XyMm = { x: 0, y: 0 };
  let dir: XyMm = { x: 1, y: 0 };
  const g = input.ground as GroundLineSpec | undefined;
  if (typeof g !== 'object' || g === null) {
    issues.push({ path: 'ground', message: `the ground line is ${describe(g)}; expected { kind: 'level', yMm } or { kind: 'line', point, direction }` });
  } else if (g.kind === 'level') {
    if (isCoordinate(g.yMm)) originMm = { x: 0, y: g.yMm };
    else issues.push({ path: 'ground.yMm', message: `the ground height is ${describe(g.yMm)}; expected a number of mm within ±${MAX_COORDINATE_MM}` });
  } else if (g.kind === 'line') {
    const p = g.point as Partial<XyMm> | undefined;
    const d = g.direction as Partial<XyMm> | undefined;
    if (isCoordinate(p?.x) && isCoordinate(p?.y)) originMm = { x: p.x, y: p.y };
    else issues.push({ path: 'ground.point', message: `the ground line's point is (${describe(p?.x)}, ${describe(p?.y)}); expected two numbers of mm within ±${MAX_COORDINATE_MM}` });
    if (!(isCoordinate(d?.x) && isCoordinate(d?.y))) {
      issues.push({ path: 'ground.direction', message: `the ground line's direction is (${describe(d?.x)}, ${describe(d?.y)}); expected two finite numbers, not both zero` });
    } else {
      const length = Math.hypot(d.x, d.y);
      if (!(length > 0)) issues.push({ path: 'ground.direction', message: 'the ground line\'s direction is (0, 0); expected a direction along the ground' });
      else if (!(Math.abs(d.x) > GROUND_VERTICAL_REL_TOL * length)) issues.push({ path: 'ground.direction', message: 'the ground line is vertical, so it has no up side; expected a level or sloping line' });
      else dir = { x: d.x / length, y: d.y / length };
    }
  } else {
    issues.push({ path: 'ground.kind', message: `ground kind '${describe((g as { kind?: unknown }).kind)}' is not known; expected 'level' or 'line'` });
  }

  const tol: unknown = input.stanceToleranceMm;
  if (!(typeof tol === 'number' && tol > 0 && tol <= MAX_COORDINATE_MM)) {
    issues.push({ path: 'stanceToleranceMm', message: `the stance tolerance is ${describe(tol)}; expected a distance in mm greater than 0 (the duty factor means nothing without it)` });
  }
  const crank: unknown = input.crankDirection;
  if (crank !== 1 && crank !== -1) {
    issues.push({ path: 'crankDirection', message: `the crank direction is ${describe(crank)}; expected 1 (counter-clockwise) or -1 (clockwise)` });
  }
  const walk: unknown = input.walkingDirection;
  if (walk !== 1 && walk !== -1) {
    issues.push({ path: 'walkingDirection', message: `the walking direction is ${describe(walk)}; expected 1 (towards +x) or -1 (towards −x)` });
  }
  const footPath: XyMm[] = [];
  if (input.footPath !== undefined) {
    const pts: unknown = input.footPath;
    if (!Array.isArray(pts) || pts.length < 3 || pts.length > MAX_FOOT_PATH_POINTS) {
      issues.push({ path: 'footPath', message: `the foot trajectory has ${Array.isArray(pts) ? `${pts.length} points` : 'no list of points'}; expected 3 to ${MAX_FOOT_PATH_POINTS} points of a closed curve` });
    } else {
      for (let i = 0; i < pts.length; i++) {
        const q = pts[i] as Partial<XyMm> | null;
        if (isCoordinate(q?.x) && isCoordinate(q?.y)) footPath.push({ x: q.x, y: q.y });
        else issues.push({ path: `footPath[${i}]`, message: `point ${i + 1} of the foot trajectory is (${describe(q?.x)}, ${describe(q?.y)}); expected two numbers of mm within ±${MAX_COORDINATE_MM}` });
      }
    }
  }
  if (issues.length > 0) return { ok: false, issues };

  const walking = walk as 1 | -1;
  // Along points where the body walks; up is the normal on the +y side.
  const sign = Math.sign(dir.x) === walking ? 1 : -1;
  const along = { x: sign * dir.x, y: sign * dir.y };
  const upSign = along.x > 0 ? 1 : -1; // perp(along) = (−ay, ax) has y = ax
  return {
    ok: true,
    leg: {
      foot: foot as string,
      originMm,
      along,
      up: { x: -upSign * along.y, y: upSign * along.x },
      stanceToleranceMm: tol as number,
      crankDirection: crank as 1 | -1,
      walkingDirection: walking,
      footPath,
    },
  };
}
