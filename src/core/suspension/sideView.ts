/**
 * A side view of a suspension design in one pose, as drawing primitives in the bicycle
 * frame (mm, origin at the bottom bracket, x forward, y up): the wheels, the bottom
 * bracket, the chainring and the chosen cog as pitch circles, the chain's upper run,
 * the shock, and the layout's pivots and links. A serializer (src/core/io) draws them.
 *
 * Conventions as the metrics': the front frame held still, the ground level through the
 * rear contact patch (the wheel radius below the axle), and the front wheel, of the
 * same radius, standing on that ground at the front contact point's x.
 */
import { compile, sweep, type Linkage } from '../linkage';
import { validateBicycle, type Bicycle } from './bicycle';
import { pitchRadiusMm, RUN_NX, RUN_NY, RUN_SCRATCH_LENGTH, upperRunInto } from './chain';
import { formatNumber } from './format';
import { AXLE_POINT, SHOCK_EYE, SHOCK_FRAME_EYE } from './layouts';

/** A pose's shock length may lie outside the stroke by at most this (mm): rounding of a figure read off a curve. */
export const SIDE_VIEW_STROKE_TOL_MM = 1e-6;

export type SideViewRole =
  | 'rearWheel'
  | 'frontWheel'
  | 'chainring'
  | 'cog'
  | 'bottomBracket'
  | 'ground'
  | 'chain'
  | 'shockBody'
  | 'shockStroke'
  | 'link'
  | 'framePivot'
  | 'pivot'
  | 'axle';

export type SideViewPrimitive =
  | { readonly kind: 'circle'; readonly role: SideViewRole; readonly label: string; readonly cxMm: number; readonly cyMm: number; readonly rMm: number }
  | { readonly kind: 'segment'; readonly role: SideViewRole; readonly label: string; readonly x1Mm: number; readonly y1Mm: number; readonly x2Mm: number; readonly y2Mm: number }
  | { readonly kind: 'point'; readonly role: SideViewRole; readonly label: string; readonly xMm: number; readonly yMm: number };

/** What the side view draws: the bicycle and the layout's linkage (as built for that bicycle). */
/** A box in bicycle coordinates, mm. */
export interface SideViewBox {
  readonly minX: number;
  readonly maxX: number;
  readonly minY: number;
  readonly maxY: number;
}

/**
 * The box that holds `start`, every primitive (a circle whole) and the `extra` points,
 * for a view or an export to frame the drawing; points that are not finite are left out.
 */
export function sideViewExtent(primitives: readonly SideViewPrimitive[], start: SideViewBox, extra: readonly { readonly x: number; readonly y: number }[] = []): SideViewBox {
  let { minX, maxX, minY, maxY } = start;
  const take = (x: number, y: number) => {
    if (!(Number.isFinite(x) && Number.isFinite(y))) return;
    minX = Math.min(minX, x);
    maxX = Math.max(maxX, x);
    minY = Math.min(minY, y);
    maxY = Math.max(maxY, y);
  };
  for (const p of primitives) {
    if (p.kind === 'circle') {
      take(p.cxMm - p.rMm, p.cyMm - p.rMm);
      take(p.cxMm + p.rMm, p.cyMm + p.rMm);
    } else if (p.kind === 'segment') {
      take(p.x1Mm, p.y1Mm);
      take(p.x2Mm, p.y2Mm);
    } else {
      take(p.xMm, p.yMm);
    }
  }
  for (const p of extra) take(p.x, p.y);
  return { minX, maxX, minY, maxY };
}

export interface SideViewDesign {
  readonly bicycle: Bicycle;
  readonly linkage: Linkage;
}

/** The pose: the shock's eye-to-eye length now (mm, within its stroke), and the cog the chain runs on (index into cogTeeth). */
export interface SideViewPose {
  readonly shockLengthMm: number;
  readonly cogIndex: number;
}

export type SideViewResult = { readonly ok: true; readonly primitives: SideViewPrimitive[] } | { readonly ok: false; readonly reason: string };

const fmt = (x: number) => formatNumber(x, 6);

/** The side view of `design` in `pose`, or what stops it, in words. */
export function sideView(design: SideViewDesign, pose: SideViewPose): SideViewResult {
  const checked = validateBicycle(design.bicycle);
  if (!checked.ok) return { ok: false, reason: `the bicycle is not valid: ${checked.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}` };
  const bike = checked.bicycle;
  const { eyeToEyeMm, strokeMm } = bike.shock;
  const s = pose.shockLengthMm;
  if (!(s >= eyeToEyeMm - strokeMm - SIDE_VIEW_STROKE_TOL_MM && s <= eyeToEyeMm + SIDE_VIEW_STROKE_TOL_MM)) {
    return { ok: false, reason: `shock length ${fmt(s)} mm is outside the shock's stroke; expected ${fmt(eyeToEyeMm - strokeMm)} to ${fmt(eyeToEyeMm)} mm` };
  }
  if (!(Number.isInteger(pose.cogIndex) && pose.cogIndex >= 0 && pose.cogIndex < bike.cogTeeth.length)) {
    return { ok: false, reason: `cog ${String(pose.cogIndex)} is not one of the cassette's; expected an index from 0 to ${bike.cogTeeth.length - 1}` };
  }
  const compiled = compile(design.linkage);
  if (!compiled.ok) return { ok: false, reason: `the layout's linkage is not valid: ${compiled.issues.map((i) => `${i.where}: ${i.message}`).join('; ')}` };
  const plan = compiled.plan;
  const axleSlot = plan.slotIndex.get(AXLE_POINT);
  if (axleSlot === undefined) return { ok: false, reason: `the layout has no rear axle point "${AXLE_POINT}"` };

  // A sweep from the drawn pose follows the drawn assembly branch to the shock length asked.
  const sw = sweep(plan, { from: plan.driverReferenceValue, to: s, steps: 2 });
  if (sw.assembled[1] !== 1 || sw.locks.length > 0) {
    return { ok: false, reason: `the layout does not reach shock length ${fmt(s)} mm from its drawn pose (${fmt(plan.driverReferenceValue)} mm)` };
  }
  const at = 2 * plan.slotCount;
  const px = (slot: number) => sw.poses[at + 2 * slot];
  const py = (slot: number) => sw.poses[at + 2 * slot + 1];

  const ax = px(axleSlot);
  const ay = py(axleSlot);
  const R = bike.wheelRadiusMm;
  const groundY = ay - R;
  const ringR = pitchRadiusMm(bike.chainringTeeth, bike.chainPitchMm);
  const cogTeeth = bike.cogTeeth[pose.cogIndex];
  const cogR = pitchRadiusMm(cogTeeth, bike.chainPitchMm);
  const run = new Float64Array(RUN_SCRATCH_LENGTH);
  if (!upperRunInto(ax, ay, cogR, 0, 0, ringR, run)) {
    return { ok: false, reason: `the ${cogTeeth}-tooth cog overlaps the ${bike.chainringTeeth}-tooth chainring in this pose: no chain line exists` };
  }
  const nx = run[RUN_NX];
  const ny = run[RUN_NY];

  const out: SideViewPrimitive[] = [
    { kind: 'segment', role: 'ground', label: 'ground', x1Mm: ax - R, y1Mm: groundY, x2Mm: bike.frontContactXMm + R, y2Mm: groundY },
    { kind: 'circle', role: 'rearWheel', label: 'rear wheel', cxMm: ax, cyMm: ay, rMm: R },
    { kind: 'circle', role: 'frontWheel', label: 'front wheel', cxMm: bike.frontContactXMm, cyMm: groundY + R, rMm: R },
    { kind: 'circle', role: 'chainring', label: `chainring ${bike.chainringTeeth} T`, cxMm: 0, cyMm: 0, rMm: ringR },
    { kind: 'circle', role: 'cog', label: `cog ${cogTeeth} T`, cxMm: ax, cyMm: ay, rMm: cogR },
    { kind: 'segment', role: 'chain', label: 'chain, upper run', x1Mm: ax + cogR * nx, y1Mm: ay + cogR * ny, x2Mm: ringR * nx, y2Mm: ringR * ny },
  ];

  const frameEye = plan.slotIndex.get(SHOCK_FRAME_EYE);
  const eye = plan.slotIndex.get(SHOCK_EYE);
  if (frameEye !== undefined && eye !== undefined) {
    // The shock's body can be no longer than the shock fully compressed; the rest, out to the eye, is the stroke left.
    const fx = px(frameEye);
    const fy = py(frameEye);
    const dx = px(eye) - fx;
    const dy = py(eye) - fy;
    const share = (eyeToEyeMm - strokeMm) / Math.hypot(dx, dy);
    const bx = fx + share * dx;
    const by = fy + share * dy;
    out.push(
      { kind: 'segment', role: 'shockBody', label: 'shock body', x1Mm: fx, y1Mm: fy, x2Mm: bx, y2Mm: by },
      { kind: 'segment', role: 'shockStroke', label: 'shock stroke left', x1Mm: bx, y1Mm: by, x2Mm: fx + dx, y2Mm: fy + dy },
    );
  }

  const axleBody = design.linkage.points?.find((p) => p.id === AXLE_POINT)?.body;
  for (const body of plan.bodies.slice(1)) {
    const slots = body.slots.filter((slot) => slot !== axleSlot);
    for (let i = 0; i < slots.length; i++) {
      for (let j = i + 1; j < slots.length; j++) {
        out.push({ kind: 'segment', role: 'link', label: body.id, x1Mm: px(slots[i]), y1Mm: py(slots[i]), x2Mm: px(slots[j]), y2Mm: py(slots[j]) });
      }
      if (body.id === axleBody) out.push({ kind: 'segment', role: 'link', label: body.id, x1Mm: px(slots[i]), y1Mm: py(slots[i]), x2Mm: ax, y2Mm: ay });
    }
  }
  const grounded = new Set(plan.bodies[0].slots);
  for (const joint of design.linkage.joints) {
    const slot = plan.slotIndex.get(joint.id) as number;
    out.push({ kind: 'point', role: grounded.has(slot) ? 'framePivot' : 'pivot', label: joint.id, xMm: px(slot), yMm: py(slot) });
  }
  out.push(
    { kind: 'point', role: 'axle', label: 'rear axle', xMm: ax, yMm: ay },
    { kind: 'point', role: 'bottomBracket', label: 'bottom bracket', xMm: 0, yMm: 0 },
  );
  return { ok: true, primitives: out };
}
