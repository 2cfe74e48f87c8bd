/**
 * The demo a first start opens: a transfer motion of our own invention. A machine
 * designer wants a pusher to push parts about 100 mm along a conveyor in a stroke
 * straight to within 2 mm, lift about 22 mm clear and come back, once per crank turn. The target is the path
 * of the coupler point of a four-bar we made up for it (a Grashof crank-rocker: crank
 * 26, coupler 64, rocker 62, ground 54 mm; the point 128 mm along the coupler line and
 * 6 mm to its left), sampled every 15° of crank and rounded to 0.1 mm. So a four-bar
 * exists that follows the target to within the rounding (≤ 0.071 mm at any point).
 */
import { compile, fourBar, run, type Linkage } from '../../core/linkage';
import type { TargetPoint } from '../state/project';

/** The made-up four-bar behind the demo, mm. */
export const DEMO_FOUR_BAR = {
  crankMm: 26,
  couplerMm: 64,
  rockerMm: 62,
  groundMm: 54,
  /** The coupler point: along the line from crank pin A to rocker pin B, and to its left. */
  pointAlongMm: 128,
  pointLeftMm: 6,
  /** Crank pivot A0; rocker pivot B0 is groundMm along +x from it. */
  crankPivot: { x: 5, y: -100 },
  /** Crank angle of the first sample, degrees, and the step between samples. */
  firstAngleDeg: 0,
  stepDeg: 15,
  samples: 24,
} as const;

export const DEMO_NAME = 'Demo: transfer motion of a pusher (four-bar coupler curve)';

const DEG = Math.PI / 180;

function roundTenth(mm: number): number {
  return Math.round(mm * 10) / 10;
}

/** The demo's four-bar in the reference pose at crank angle `angleDeg` (the open, upper branch). */
export function demoLinkage(angleDeg = DEMO_FOUR_BAR.firstAngleDeg): Linkage {
  const d = DEMO_FOUR_BAR;
  const a0 = d.crankPivot;
  const b0 = { x: a0.x + d.groundMm, y: a0.y };
  const a = { x: a0.x + d.crankMm * Math.cos(angleDeg * DEG), y: a0.y + d.crankMm * Math.sin(angleDeg * DEG) };
  // B: on the circle of radius coupler about A and of radius rocker about B0, above the line A–B0.
  const dx = b0.x - a.x;
  const dy = b0.y - a.y;
  const dist = Math.hypot(dx, dy);
  const along = (d.couplerMm ** 2 - d.rockerMm ** 2 + dist ** 2) / (2 * dist);
  const across = Math.sqrt(d.couplerMm ** 2 - along ** 2);
  const b = { x: a.x + (along * dx - across * dy) / dist, y: a.y + (along * dy + across * dx) / dist };
  const ux = (b.x - a.x) / d.couplerMm;
  const uy = (b.y - a.y) / d.couplerMm;
  const p = { x: a.x + d.pointAlongMm * ux - d.pointLeftMm * uy, y: a.y + d.pointAlongMm * uy + d.pointLeftMm * ux };
  return fourBar({ A0: a0, B0: b0, A: a, B: b, P: p });
}

/** The demo target: the coupler point every 15° of one crank turn, rounded to 0.1 mm, with its crank angle. */
export function demoTargetPoints(): TargetPoint[] {
  const d = DEMO_FOUR_BAR;
  const compiled = compile(demoLinkage());
  if (!compiled.ok) throw new Error(`the demo four-bar does not compile: ${compiled.issues.map((i) => i.message).join('; ')}`);
  const plan = compiled.plan;
  const pose = new Float64Array(plan.reference);
  const slot = plan.slotIndex.get('P');
  if (slot === undefined) throw new Error('the demo four-bar has no point P');
  const points: TargetPoint[] = [];
  for (let k = 0; k < d.samples; k++) {
    const angleDeg = d.firstAngleDeg + k * d.stepDeg;
    if (!run(plan, angleDeg * DEG, pose)) throw new Error(`the demo four-bar does not assemble at ${angleDeg}°`);
    points.push({ x: roundTenth(pose[2 * slot]), y: roundTenth(pose[2 * slot + 1]), driverDeg: angleDeg });
  }
  return points;
}
