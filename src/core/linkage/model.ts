/**
 * The linkage model: a design is its joint positions in one reference pose (mm);
 * link lengths follow from it. Plain data only, so a linkage crosses a worker
 * boundary or a JSON file unchanged.
 *
 * Frame: x right, y up, angles in radians counter-clockwise from +x.
 */

/** The id of the implicit ground body: every joint with `ground: true` is on it. */
export const GROUND = 'ground';

export interface JointSpec {
  readonly id: string;
  /** Position in the reference pose, mm. */
  readonly x: number;
  readonly y: number;
  /** A ground joint is fixed to the frame (a pivot). */
  readonly ground?: boolean;
}

/** A rigid link: the joints it carries. Two joints make a binary link, three a ternary. */
export interface BodySpec {
  readonly id: string;
  readonly joints: readonly string[];
}

/**
 * A prismatic pair: `joint` is constrained to a line fixed in `body` (which may be
 * `GROUND`). The line passes through the joint's reference position with direction
 * `angle` (rad) in the reference pose, unless `through` names another point of it.
 */
export interface SliderSpec {
  readonly joint: string;
  readonly body: string;
  readonly angle: number;
  readonly through?: { readonly x: number; readonly y: number };
}

/**
 * The input.
 * - `rotation`: `body` turns about the ground joint `pivot`. The driver value is the
 *   absolute angle (rad) of the line from `pivot` to `tip`, another joint of `body`.
 * - `length`: the distance (mm) between joints `from` and `to` on different bodies
 *   is prescribed, as by a linear actuator or a shock absorber.
 */
export type DriverSpec =
  | { readonly kind: 'rotation'; readonly body: string; readonly pivot: string; readonly tip: string }
  | { readonly kind: 'length'; readonly from: string; readonly to: string };

/** A named point carried by a body (a coupler point, a rear axle, a foot). */
export interface PointSpec {
  readonly id: string;
  readonly body: string;
  readonly x: number;
  readonly y: number;
}

export interface Linkage {
  readonly joints: readonly JointSpec[];
  readonly bodies: readonly BodySpec[];
  readonly sliders?: readonly SliderSpec[];
  readonly points?: readonly PointSpec[];
  readonly driver: DriverSpec;
}

/** A problem found while compiling a linkage: which part, and what was expected. */
export interface LinkageIssue {
  /** A path into the linkage, such as `bodies[2].joints` or `driver.pivot`. */
  readonly where: string;
  readonly message: string;
}

// Limits on a linkage, checked where a linkage comes in (compile, and the linkage file
// before it), so no command starts work it cannot finish. Each says why it has its size.

/**
 * Largest |x| or |y| of a joint, point or slider line (mm): 1 km, beyond any mechanism
 * Loci is for. Rounding of a coordinate is then at most 1e6 × 2^-53 ≈ 1.1e-10 mm, four
 * orders below COINCIDENT_JOINT_TOL_MM, so "two joints coincide" keeps its meaning, and
 * squares of coordinates (circle intersections) stay far from overflow.
 */
export const MAX_COORDINATE_MM = 1e6;

/**
 * Largest ratio of the linkage's reach (its largest |coordinate|, the length scale of
 * every tolerance) to its shortest link. A link's direction is known to rounding over
 * its length, about 2^-53 × reach / link, and every body placed from it inherits that
 * error over the reach: at 1e5 the error is near 2e-11 of the reach, fifty times inside
 * the compiler's check that the plan re-solves its own reference pose (1e-9).
 */
export const MAX_REACH_OVER_SHORTEST_LINK = 1e5;

/**
 * Largest |angle| of a slider line (rad). One turn either way says every direction; a
 * larger number is most likely degrees written where radians belong.
 */
export const MAX_SLIDER_ANGLE_RAD = 2 * Math.PI;

/**
 * Joints and bodies: a chain of 1,000 dyads (2,002 joints, 2,001 bodies) fits. The
 * report's work grows with bodies × slots per step, and its JSON with steps × slots.
 */
export const MAX_JOINTS = 2500;
export const MAX_BODIES = 2500;
/** Named points: a traced curve needs a few; the report's JSON grows with steps × points. */
export const MAX_POINTS = 1000;
/** Sliders: each moves one joint, so there are never more than joints. */
export const MAX_SLIDERS = MAX_JOINTS;
/** Characters of an id: ids are names read by people, printed in every message and report. */
export const MAX_ID_LENGTH = 100;

/**
 * Characters an id may not hold: C0 and C1 controls (ESC starts a terminal command, NUL
 * ends a C string) and the bidirectional formatting marks (U+202E turns the rest of a
 * line around), any of which would make a message or a report say what it does not.
 */
// eslint-disable-next-line no-control-regex -- these are the characters it must find
export const UNPRINTABLE_ID_CHARS = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/u;

/** `text` with every unprintable character (above, all in the BMP) written as JSON writes one: \u001b. */
export function escapeUnprintable(text: string): string {
  return text.replace(new RegExp(UNPRINTABLE_ID_CHARS.source, 'gu'), (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`);
}

/** An id as a message shows it: escaped, and a long id cut after 40 characters. */
export function printableId(id: string): string {
  const text = String(id); // a direct caller's bad id is reported, not thrown on
  // Cut between characters, not inside a surrogate pair.
  const end = text.length > 40 && /[\ud800-\udbff]/u.test(text[39]) ? 39 : 40;
  return escapeUnprintable(text.length > 40 ? `${text.slice(0, end)}…` : text);
}

/** An id as a message quotes it: `printableId` in single quotes. */
export function quoteId(id: string): string {
  return `'${printableId(id)}'`;
}
