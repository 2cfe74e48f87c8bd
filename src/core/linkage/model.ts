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
