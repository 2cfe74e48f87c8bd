/**
 * One evaluation of the leg at any crank angle: the pose and its exact rates, and the
 * foot's position and rates along and above the ground line.
 */
import { runWithRates, type Plan, type SweepResult } from '../linkage';
import type { Leg } from './leg';

export const TWO_PI = 2 * Math.PI;
export const DEG_PER_RAD = 180 / Math.PI;

/** A number as messages show it: four significant digits. */
export function fmt(v: number, digits = 4): string {
  return String(Number(v.toPrecision(digits)));
}

/** The foot at one crank angle: position along and above the ground line and their rates. */
export interface FootState {
  t: number;
  along: number;
  height: number;
  alongRate: number;
  heightRate: number;
}

/** Everything one evaluation at a crank angle needs; probes write into its scratch. */
export class Probe {
  readonly pose: Float64Array;
  readonly rates: Float64Array;
  readonly state: FootState = { t: 0, along: 0, height: 0, alongRate: 0, heightRate: 0 };
  private readonly stride: number;
  private readonly dt: number;

  constructor(
    private readonly plan: Plan,
    private readonly leg: Leg,
    private readonly sw: SweepResult,
    private readonly footSlot: number,
    private readonly theta0: number,
    steps: number,
  ) {
    this.stride = 2 * plan.slotCount;
    this.pose = new Float64Array(this.stride);
    this.rates = new Float64Array(this.stride);
    this.dt = TWO_PI / steps;
  }

  /** Solves at turn angle t (any real), starting Newton blocks from the nearest sample. */
  at(t: number): boolean {
    const wrapped = t - TWO_PI * Math.floor(t / TWO_PI);
    const k = Math.min(Math.round(wrapped / this.dt), this.sw.values.length - 1);
    this.pose.set(this.sw.poses.subarray(k * this.stride, (k + 1) * this.stride));
    const ok = runWithRates(this.plan, this.theta0 + this.leg.crankDirection * t, this.pose, this.rates);
    footState(this.leg, this.footSlot, this.pose, this.rates, 0, t, this.state);
    return ok;
  }

  /** A copy of the state at t. */
  sample(t: number): FootState {
    this.at(t);
    return { ...this.state };
  }
}

/** The foot's state from a pose and its rates stored from `offset`. */
export function footState(leg: Leg, slot: number, pose: Float64Array, rates: Float64Array, offset: number, t: number, out: FootState): void {
  const i = offset + 2 * slot;
  const dx = pose[i] - leg.originMm.x;
  const dy = pose[i + 1] - leg.originMm.y;
  const vx = leg.crankDirection * rates[i];
  const vy = leg.crankDirection * rates[i + 1];
  out.t = t;
  out.along = dx * leg.along.x + dy * leg.along.y;
  out.height = dx * leg.up.x + dy * leg.up.y;
  out.alongRate = vx * leg.along.x + vy * leg.along.y;
  out.heightRate = vx * leg.up.x + vy * leg.up.y;
}
