/**
 * A four-bar solved by hand, in closed form, for checking analysis independently of
 * the compiler (the plan carries only the public fields; it cannot be run): positions by circle–circle intersection, rates by differentiating the two
 * link-length equations (theorem). Slots: joints A0 (input pivot), A (input–coupler),
 * B (coupler–output), B0 (output pivot), then the coupler point P.
 */
import type { Linkage } from '../../src/core/linkage/model';
import type { Plan } from '../../src/core/linkage/plan';

export type Vec = readonly [number, number];

export interface ClosedFormFourBarInput {
  readonly ground: number;
  readonly input: number;
  readonly coupler: number;
  readonly output: number;
  /** Input angle from the ground line A0 → B0, rad. */
  readonly theta2: number;
  /** +1: B to the left of the line A → B0; −1: to the right. */
  readonly branch: 1 | -1;
  /** Where A0 is, and the direction of the ground line (rad). */
  readonly origin?: Vec;
  readonly groundAngle?: number;
  /** Coupler point in the coupler's frame: along A → B and to its left, mm. */
  readonly couplerPoint?: Vec;
}

export interface ClosedFormFourBar {
  readonly plan: Plan;
  readonly pose: Float64Array;
  /** d(pose)/d(input angle), mm/rad. */
  readonly rates: Float64Array;
  readonly A0: Vec;
  readonly A: Vec;
  readonly B: Vec;
  readonly B0: Vec;
  readonly P: Vec;
}

export const GROUND_BODY = 0;
export const INPUT_BODY = 1;
export const COUPLER_BODY = 2;
export const OUTPUT_BODY = 3;

/** The solved four-bar, or null where it does not assemble or sits at a dead centre. */
export function closedFormFourBar(k: ClosedFormFourBarInput): ClosedFormFourBar | null {
  const [ox, oy] = k.origin ?? [0, 0];
  const phi = k.groundAngle ?? 0;
  const [u, v] = k.couplerPoint ?? [0.5 * k.coupler, 0.3 * k.coupler];
  const A0: Vec = [ox, oy];
  const B0: Vec = [ox + k.ground * Math.cos(phi), oy + k.ground * Math.sin(phi)];
  const t = phi + k.theta2;
  const A: Vec = [ox + k.input * Math.cos(t), oy + k.input * Math.sin(t)];
  const Ad: Vec = [-k.input * Math.sin(t), k.input * Math.cos(t)];

  const dx = B0[0] - A[0];
  const dy = B0[1] - A[1];
  const f = Math.hypot(dx, dy);
  const along = (k.coupler ** 2 - k.output ** 2 + f * f) / (2 * f);
  const h2 = k.coupler ** 2 - along * along;
  if (!(h2 > 1e-9 * k.coupler ** 2)) return null;
  const h = k.branch * Math.sqrt(h2);
  const B: Vec = [A[0] + (along * dx - h * dy) / f, A[1] + (along * dy + h * dx) / f];

  // (B − A)·(Ḃ − Ȧ) = 0 and (B − B0)·Ḃ = 0, solved for Ḃ by Cramer's rule
  const r1x = B[0] - A[0];
  const r1y = B[1] - A[1];
  const r2x = B[0] - B0[0];
  const r2y = B[1] - B0[1];
  const det = r1x * r2y - r1y * r2x;
  if (!(Math.abs(det) > 1e-9 * k.coupler * k.output)) return null;
  const rhs1 = r1x * Ad[0] + r1y * Ad[1];
  const Bd: Vec = [(rhs1 * r2y) / det, (-rhs1 * r2x) / det];

  const ex = r1x / k.coupler;
  const ey = r1y / k.coupler;
  const P: Vec = [A[0] + u * ex - v * ey, A[1] + u * ey + v * ex];
  const omegaC = (r1x * (Bd[1] - Ad[1]) - r1y * (Bd[0] - Ad[0])) / k.coupler ** 2;
  const Pd: Vec = [Ad[0] - omegaC * (P[1] - A[1]), Ad[1] + omegaC * (P[0] - A[0])];

  const pose = Float64Array.from([...A0, ...A, ...B, ...B0, ...P]);
  const rates = Float64Array.from([0, 0, ...Ad, ...Bd, 0, 0, ...Pd]);
  const linkage: Linkage = {
    joints: [
      { id: 'A0', x: A0[0], y: A0[1], ground: true },
      { id: 'A', x: A[0], y: A[1] },
      { id: 'B', x: B[0], y: B[1] },
      { id: 'B0', x: B0[0], y: B0[1], ground: true },
    ],
    bodies: [
      { id: 'input', joints: ['A0', 'A'] },
      { id: 'coupler', joints: ['A', 'B'] },
      { id: 'output', joints: ['B', 'B0'] },
    ],
    points: [{ id: 'P', body: 'coupler', x: P[0], y: P[1] }],
    driver: { kind: 'rotation', body: 'input', pivot: 'A0', tip: 'A' },
  };
  const bodies = [
    { id: 'ground', slots: Int32Array.from([0, 3]) },
    { id: 'input', slots: Int32Array.from([0, 1]) },
    { id: 'coupler', slots: Int32Array.from([1, 2, 4]) },
    { id: 'output', slots: Int32Array.from([2, 3]) },
  ];
  const plan: Plan = {
    linkage,
    jointIds: ['A0', 'A', 'B', 'B0'],
    pointIds: ['P'],
    slotCount: 5,
    slotIndex: new Map([['A0', 0], ['A', 1], ['B', 2], ['B0', 3], ['P', 4]]),
    bodies,
    bodyIndex: new Map(bodies.map((b, i) => [b.id, i])),
    driverReferenceValue: t,
    newtonUnknowns: 0,
    reference: pose,
  };
  return { plan, pose, rates, A0, A, B, B0, P };
}

/** Where the lines p1 + s·d1 and p2 + t·d2 cross; null when parallel within `relTol`. */
export function lineIntersection(p1: Vec, d1: Vec, p2: Vec, d2: Vec, relTol = 1e-12): Vec | null {
  const den = d1[0] * d2[1] - d1[1] * d2[0];
  if (!(Math.abs(den) > relTol * Math.hypot(...d1) * Math.hypot(...d2))) return null;
  const s = ((p2[0] - p1[0]) * d2[1] - (p2[1] - p1[1]) * d2[0]) / den;
  return [p1[0] + s * d1[0], p1[1] + s * d1[1]];
}
