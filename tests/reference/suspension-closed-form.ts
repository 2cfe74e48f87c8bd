/**
 * Rear-suspension layouts solved by hand for the reference tests, independently of the
 * linkage compiler: a rocker turned by the shock (law of cosines in the triangle rocker
 * pivot – shock eye – frame eye), optionally a second link from another frame pivot
 * closing a four-bar through a coupler (circle–circle intersection), and velocities per
 * mm of shock length from the instant centres (Kennedy's theorem; any kinematics text).
 */

export type V = readonly [number, number];

const sub = (a: V, b: V): V => [a[0] - b[0], a[1] - b[1]];
const add = (a: V, b: V): V => [a[0] + b[0], a[1] + b[1]];
const scale = (a: V, k: number): V => [a[0] * k, a[1] * k];
const dot = (a: V, b: V) => a[0] * b[0] + a[1] * b[1];
const cross = (a: V, b: V) => a[0] * b[1] - a[1] * b[0];
const perp = (a: V): V => [-a[1], a[0]];
const len = (a: V) => Math.hypot(a[0], a[1]);
const rot = (a: V, t: number): V => [a[0] * Math.cos(t) - a[1] * Math.sin(t), a[0] * Math.sin(t) + a[1] * Math.cos(t)];
const ang = (a: V) => Math.atan2(a[1], a[0]);

/** A body's motion per mm of shock length: its angular rate and the velocity of one of its points. */
export interface Motion {
  readonly omega: number;
  readonly at: V;
  readonly v: V;
}

/** Velocity of point x of a body with motion m. */
export function velocity(m: Motion, x: V): V {
  return add(m.v, scale(perp(sub(x, m.at)), m.omega));
}

export interface RockerFourBar {
  /** Rocker: pivot R0, coupler pin D0, shock eye E0; frame eye F. */
  readonly R0: V;
  readonly D0: V;
  readonly E0: V;
  readonly F: V;
  /** Second link: frame pivot M and coupler pin C0 (omit both for a lone rocker). */
  readonly M?: V;
  readonly C0?: V;
}

export interface Solved {
  /** Where a point drawn at x0 on the rocker, coupler or second link is now. */
  readonly rocker: (x0: V) => V;
  readonly coupler: (x0: V) => V;
  readonly link: (x0: V) => V;
  readonly rockerMotion: Motion;
  readonly couplerMotion: Motion;
  readonly linkMotion: Motion;
  /** The coupler's instant centre relative to the frame: where the rocker and link lines cross. */
  readonly couplerCentre: V;
}

/** The layout at shock length s, or null where it does not assemble. */
export function solveAt(k: RockerFourBar, s: number): Solved | null {
  const a = len(sub(k.E0, k.R0));
  const b = len(sub(k.F, k.R0));
  const cosG = (a * a + b * b - s * s) / (2 * a * b);
  if (!(Math.abs(cosG) < 1)) return null;
  const side = Math.sign(cross(sub(k.F, k.R0), sub(k.E0, k.R0)));
  const theta = ang(sub(k.F, k.R0)) + side * Math.acos(cosG) - ang(sub(k.E0, k.R0));
  const rocker = (x0: V) => add(k.R0, rot(sub(x0, k.R0), theta));
  const E = rocker(k.E0);
  // ds/dθ = (E − F)·(dE/dθ) / s, dE/dθ = perp(E − R0)
  const omegaR = s / dot(sub(E, k.F), perp(sub(E, k.R0)));
  const rockerMotion: Motion = { omega: omegaR, at: k.R0, v: [0, 0] };
  if (k.M === undefined || k.C0 === undefined) {
    return { rocker, coupler: rocker, link: rocker, rockerMotion, couplerMotion: rockerMotion, linkMotion: rockerMotion, couplerCentre: k.R0 };
  }
  const M = k.M;
  const C0 = k.C0;
  const D = rocker(k.D0);
  const l1 = len(sub(C0, M));
  const l2 = len(sub(C0, k.D0));
  const md = sub(D, M);
  const d = len(md);
  const along = (l1 * l1 - l2 * l2 + d * d) / (2 * d);
  const h2 = l1 * l1 - along * along;
  if (!(h2 > 0)) return null;
  const branch = Math.sign(cross(sub(k.D0, M), sub(C0, M)));
  const u = scale(md, 1 / d);
  const C = add(M, add(scale(u, along), scale(perp(u), branch * Math.sqrt(h2))));
  const phiC = ang(sub(D, C)) - ang(sub(k.D0, C0));
  const coupler = (x0: V) => add(C, rot(sub(x0, C0), phiC));
  const phiL = ang(sub(C, M)) - ang(sub(C0, M));
  const link = (x0: V) => add(M, rot(sub(x0, M), phiL));
  // Kennedy: the coupler's centre is on line R0–D and on line M–C.
  const dr = sub(D, k.R0);
  const dm = sub(C, M);
  const t = cross(sub(M, k.R0), dm) / cross(dr, dm);
  const I = add(k.R0, scale(dr, t));
  const vD = scale(perp(dr), omegaR);
  // v_D = ω_c perp(D − I)
  const omegaC = dot(vD, perp(sub(D, I))) / dot(sub(D, I), sub(D, I));
  const couplerMotion: Motion = { omega: omegaC, at: I, v: [0, 0] };
  const vC = velocity(couplerMotion, C);
  const omegaL = dot(vC, perp(dm)) / dot(dm, dm);
  return { rocker, coupler, link, rockerMotion, couplerMotion, linkMotion: { omega: omegaL, at: M, v: [0, 0] }, couplerCentre: I };
}

/** ISO 606 pitch circle radius, written out here: the pitch polygon's circumradius. */
export function pitchRadius(z: number, p: number): number {
  return p / 2 / Math.sin(Math.PI / z);
}

/**
 * The upper chain run from a cog at A (radius rc) to a chainring at B (radius rr), by
 * angles: the normal's angle is the centre line's angle + 90° + asin((rr − rc)/d).
 */
export function upperRun(A: V, rc: number, B: V, rr: number): { tCog: V; tRing: V; dir: V } {
  const d = len(sub(B, A));
  const psi = ang(sub(B, A)) + Math.PI / 2 + Math.asin((rr - rc) / d);
  const n: V = [Math.cos(psi), Math.sin(psi)];
  const tCog = add(A, scale(n, rc));
  const tRing = add(B, scale(n, rr));
  return { tCog, tRing, dir: scale(sub(tRing, tCog), 1 / len(sub(tRing, tCog))) };
}
