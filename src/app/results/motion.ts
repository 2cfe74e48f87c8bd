/**
 * The motion of one candidate, as the results views draw it: the linkage swept over the
 * driver range it traces the target in, the output point's path, the instant centre of
 * the output body relative to ground, the transmission angle of every four-bar loop, and
 * the box the linkage sweeps. Pure: no DOM, so the exporters and the unit tests share it.
 *
 * The range: the candidate's own motion (the one its figures were taken over) where it
 * carries one. Otherwise a rotation driver that turns fully is swept through one turn,
 * starting at the first target point's driver value and turning the way the target is
 * traced; any other driver is swept from the first target point's driver value to the last.
 */
import { GROUND, compile, run, runWithRates, sweep, type Linkage, type Plan, type SweepResult } from '../../core/linkage';
import {
  IC_SCRATCH_LENGTH,
  fourBarLoops,
  instantCentreInto,
  instantCentrePath,
  transmissionAngleRad,
  type GrashofCondition,
} from '../../core/linkage/analysis';

/** Steps of the sweep behind a table row's small drawing. */
export const TABLE_STEPS = 121;
/** Steps of the sweep behind the detail view, the compare view and the exports. */
export const DETAIL_STEPS = 361;
/** A driver span shorter than this (rad or mm) is no motion: the sweep falls back to a full turn or ± a share. */
const MIN_DRIVER_SPAN = 1e-9;
/** A length driver with no span of its own moves over its reference length ± this share. */
const LENGTH_FALLBACK_SHARE = 0.1;

const DEG_PER_RAD = 180 / Math.PI;
const TWO_PI = 2 * Math.PI;

export interface MotionInput {
  readonly linkage: Linkage;
  /** The driver value matched to each target point, in the linkage's own frame (rad or mm), in target order. */
  readonly linkageDriverValues: readonly number[];
  /** The output point at each target point (x0, y0, x1, y1, …, mm), as the search placed it. */
  readonly points?: readonly number[];
  /**
   * The motion the candidate's figures were taken over (CandidateReport.motion, in the
   * linkage's driver frame): the views sweep exactly that. Absent in candidates saved
   * before it existed; the range is then chosen as described above.
   */
  readonly motion?: { readonly from: number; readonly to: number; readonly fullTurn: boolean };
}

export interface Box {
  readonly minX: number;
  readonly minY: number;
  readonly maxX: number;
  readonly maxY: number;
}

export interface MotionLoop {
  /** The loop's bodies in order, as the linkage names them. */
  readonly bodyIds: readonly string[];
  readonly grashof: GrashofCondition;
  /** Barker's usual name of a loop through ground (crank-rocker, …); null otherwise. */
  readonly className: string | null;
  /** Transmission angle per step, deg; NaN where the linkage does not assemble. */
  readonly muDeg: Float64Array;
}

export interface LinkDrawing {
  readonly bodyId: string;
  /** Slots of the joints and points the body carries, in the body's order. */
  readonly slots: readonly number[];
}

export interface CandidateMotion {
  readonly plan: Plan;
  readonly driver: {
    readonly kind: 'rotation' | 'length';
    /** The unit the views show driver values in; the arrays below stay in rad or mm. */
    readonly unit: 'deg' | 'mm';
    /** The sweep is one full turn of a crank. */
    readonly fullTurn: boolean;
    readonly from: number;
    readonly to: number;
  };
  readonly steps: number;
  /** Driver value per step, rad or mm. */
  readonly values: Float64Array;
  readonly poses: Float64Array;
  /** Numbers per pose: 2 × slotCount. */
  readonly stride: number;
  readonly assembled: Uint8Array;
  readonly output: {
    readonly pointId: string;
    readonly bodyId: string;
    readonly bodyIndex: number;
    readonly slot: number;
    /** The output point per step, mm; NaN where the linkage does not assemble. */
    readonly x: Float64Array;
    readonly y: Float64Array;
  };
  /** Instant centre of the output body relative to ground per step (IC_* kinds of core). */
  readonly centre: { readonly kind: Uint8Array; readonly x: Float64Array; readonly y: Float64Array };
  readonly loops: readonly MotionLoop[];
  /** The output point at each target point's own driver value, mm (NaN where it does not assemble). */
  readonly matched: { readonly x: Float64Array; readonly y: Float64Array };
  /** Everything the linkage carries, over the whole motion. */
  readonly bounds: Box;
  readonly sizeMm: { readonly widthMm: number; readonly heightMm: number };
  readonly links: readonly LinkDrawing[];
  readonly groundSlots: readonly number[];
  readonly groundSlides: readonly { readonly slot: number; readonly angleRad: number }[];
  /** Steps that did not assemble. */
  readonly unassembledSteps: number;
}

export type MotionResult = { readonly ok: true; readonly motion: CandidateMotion } | { readonly ok: false; readonly reason: string };

export function computeMotion(input: MotionInput, steps: number): MotionResult {
  if (!(Number.isInteger(steps) && steps >= 2)) throw new RangeError(`computeMotion: steps ${steps}; expected a whole number ≥ 2`);
  const compiled = compile(input.linkage);
  if (!compiled.ok) {
    return { ok: false, reason: `the linkage does not compile: ${compiled.issues.map((i) => `${i.where}: ${i.message}`).join('; ')}` };
  }
  const plan = compiled.plan;
  const points = plan.linkage.points ?? [];
  const outputPoint = points.find((p) => p.id === 'P') ?? points[0];
  if (outputPoint === undefined) return { ok: false, reason: 'the linkage has no named output point' };
  const outputBody = plan.bodyIndex.get(outputPoint.body);
  const outputSlot = plan.slotIndex.get(outputPoint.id);
  if (outputBody === undefined || outputSlot === undefined) {
    return { ok: false, reason: `the output point ${outputPoint.id} is on an unknown body ${outputPoint.body}` };
  }

  const rotation = plan.linkage.driver.kind === 'rotation';
  const own = input.linkageDriverValues;
  const driverValues = rotation ? unwrapAngles(own) : [...own];
  const given = input.motion;
  const chosen = given !== undefined && Number.isFinite(given.from) && Number.isFinite(given.to) && Math.abs(given.to - given.from) > MIN_DRIVER_SPAN
    ? { from: given.from, to: given.to, fullTurn: given.fullTurn, result: sweep(plan, { from: given.from, to: given.to, steps }) }
    : chooseSweep(plan, driverValues, steps, rotation);
  const result = chosen.result;
  const stride = 2 * plan.slotCount;

  const outX = new Float64Array(steps).fill(Number.NaN);
  const outY = new Float64Array(steps).fill(Number.NaN);
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  let unassembledSteps = 0;
  for (let k = 0; k < steps; k++) {
    if (result.assembled[k] !== 1) {
      unassembledSteps++;
      continue;
    }
    const at = k * stride;
    outX[k] = result.poses[at + 2 * outputSlot];
    outY[k] = result.poses[at + 2 * outputSlot + 1];
    for (let s = 0; s < plan.slotCount; s++) {
      const x = result.poses[at + 2 * s];
      const y = result.poses[at + 2 * s + 1];
      if (!(Number.isFinite(x) && Number.isFinite(y))) continue;
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
  }
  if (!(maxX >= minX)) return { ok: false, reason: 'the linkage assembles nowhere in its range of motion' };

  const centre = instantCentrePath(plan, outputBody, 0, result);
  const loops = fourBarLoops(plan).map((loop): MotionLoop => {
    const muDeg = new Float64Array(steps).fill(Number.NaN);
    for (let k = 0; k < steps; k++) {
      if (result.assembled[k] === 1) muDeg[k] = transmissionAngleRad(loop, result.poses.subarray(k * stride, (k + 1) * stride)) * DEG_PER_RAD;
    }
    return { bodyIds: [...loop.bodyIds], grashof: loop.grashof, className: loop.classification?.name ?? null, muDeg };
  });

  const driver: CandidateMotion['driver'] = {
    kind: rotation ? 'rotation' : 'length',
    unit: rotation ? 'deg' : 'mm',
    fullTurn: chosen.fullTurn,
    from: chosen.from,
    to: chosen.to,
  };
  const matched = matchedPoints({ plan, values: result.values, poses: result.poses, stride, steps, driver }, driverValues, outputSlot);
  const groundIds = new Set(plan.linkage.joints.filter((j) => j.ground === true).map((j) => j.id));

  return {
    ok: true,
    motion: {
      plan,
      driver,
      steps,
      values: result.values,
      poses: result.poses,
      stride,
      assembled: result.assembled,
      output: { pointId: outputPoint.id, bodyId: outputPoint.body, bodyIndex: outputBody, slot: outputSlot, x: outX, y: outY },
      centre: { kind: centre.kind, x: centre.x, y: centre.y },
      loops,
      matched,
      bounds: { minX, minY, maxX, maxY },
      sizeMm: { widthMm: maxX - minX, heightMm: maxY - minY },
      links: plan.bodies.slice(1).map((body) => ({ bodyId: body.id, slots: Array.from(body.slots) })),
      groundSlots: plan.jointIds.flatMap((id, slot) => (groundIds.has(id) ? [slot] : [])),
      groundSlides: (plan.linkage.sliders ?? []).flatMap((s) => {
        const slot = plan.slotIndex.get(s.joint);
        return s.body === GROUND && slot !== undefined ? [{ slot, angleRad: s.angle }] : [];
      }),
      unassembledSteps,
    },
  };
}

/**
 * A driver value in the unit the views show: mm for a length driver; degrees for a
 * rotation driver, shifted by whole turns so that the motion starts in (−180°, 180°]
 * (the sweep itself runs on unwrapped angles, which may lie turns away).
 */
export function driverDisplayValue(motion: Pick<CandidateMotion, 'driver'>, value: number): number {
  return motion.driver.kind === 'rotation' ? (value - wholeTurnsRad(motion.driver.from)) * DEG_PER_RAD : value;
}

export function driverFromDisplayValue(motion: Pick<CandidateMotion, 'driver'>, shown: number): number {
  return motion.driver.kind === 'rotation' ? shown / DEG_PER_RAD + wholeTurnsRad(motion.driver.from) : shown;
}

/** The whole turns (rad) to take off `from` to bring it into (−π, π]. */
function wholeTurnsRad(from: number): number {
  return TWO_PI * Math.ceil((from - Math.PI) / TWO_PI);
}

/** The step whose driver value is nearest `value` (clamped to the sweep). */
export function nearestStep(motion: Pick<CandidateMotion, 'driver' | 'steps'>, value: number): number {
  const { from, to } = motion.driver;
  const span = to - from;
  if (!(Math.abs(span) > 0)) return 0;
  const k = Math.round(((value - from) / span) * (motion.steps - 1));
  return Math.min(motion.steps - 1, Math.max(0, k));
}

/** Scratch for `solveAt`: a pose, its rates and the instant-centre output. */
export interface SolveScratch {
  readonly pose: Float64Array;
  readonly rates: Float64Array;
  readonly centre: Float64Array;
}

export function createSolveScratch(motion: Pick<CandidateMotion, 'stride'>): SolveScratch {
  return { pose: new Float64Array(motion.stride), rates: new Float64Array(motion.stride), centre: new Float64Array(IC_SCRATCH_LENGTH) };
}

/**
 * The pose at any driver value (not only at a sweep step), started from the nearest step
 * so a Newton block keeps its branch, with the output body's instant centre. Returns the
 * instant-centre kind (an IC_* code; IC_UNASSEMBLED when it does not assemble).
 */
export function solveAt(motion: CandidateMotion, value: number, scratch: SolveScratch): number {
  const k = nearestStep(motion, value);
  scratch.pose.set(motion.poses.subarray(k * motion.stride, (k + 1) * motion.stride));
  if (motion.assembled[k] !== 1) scratch.pose.set(motion.plan.reference);
  if (!runWithRates(motion.plan, value, scratch.pose, scratch.rates)) return 0;
  return instantCentreInto(motion.plan, motion.output.bodyIndex, 0, scratch.pose, scratch.rates, scratch.centre);
}

/** Successive angles moved by whole turns so that no step exceeds half a turn. */
function unwrapAngles(values: readonly number[]): number[] {
  const out: number[] = [];
  for (let i = 0; i < values.length; i++) {
    if (i === 0) {
      out.push(values[0]);
      continue;
    }
    const step = values[i] - values[i - 1];
    out.push(out[i - 1] + (step - TWO_PI * Math.round(step / TWO_PI)));
  }
  return out;
}

function chooseSweep(
  plan: Plan,
  driverValues: readonly number[],
  steps: number,
  rotation: boolean,
): { readonly from: number; readonly to: number; readonly fullTurn: boolean; readonly result: SweepResult } {
  const first = driverValues.length > 0 && Number.isFinite(driverValues[0]) ? driverValues[0] : plan.driverReferenceValue;
  const lastRaw = driverValues.length > 0 ? driverValues[driverValues.length - 1] : first;
  const last = Number.isFinite(lastRaw) ? lastRaw : first;
  if (rotation) {
    const turn = last < first ? -TWO_PI : TWO_PI;
    const full = sweep(plan, { from: first, to: first + turn, steps });
    if (full.fullTurn || !(Math.abs(last - first) > MIN_DRIVER_SPAN)) {
      return { from: first, to: first + turn, fullTurn: full.fullTurn, result: full };
    }
    return { from: first, to: last, fullTurn: false, result: sweep(plan, { from: first, to: last, steps }) };
  }
  if (Math.abs(last - first) > MIN_DRIVER_SPAN) {
    return { from: first, to: last, fullTurn: false, result: sweep(plan, { from: first, to: last, steps }) };
  }
  const reference = plan.driverReferenceValue;
  const from = reference * (1 - LENGTH_FALLBACK_SHARE);
  const to = reference * (1 + LENGTH_FALLBACK_SHARE);
  return { from, to, fullTurn: false, result: sweep(plan, { from, to, steps }) };
}

function matchedPoints(
  motion: Pick<CandidateMotion, 'plan' | 'values' | 'poses' | 'stride' | 'steps' | 'driver'>,
  driverValues: readonly number[],
  outputSlot: number,
): CandidateMotion['matched'] {
  const n = driverValues.length;
  const x = new Float64Array(n).fill(Number.NaN);
  const y = new Float64Array(n).fill(Number.NaN);
  const pose = new Float64Array(motion.stride);
  for (let i = 0; i < n; i++) {
    const k = nearestStep(motion, driverValues[i]);
    pose.set(motion.poses.subarray(k * motion.stride, (k + 1) * motion.stride));
    if (!pose.every(Number.isFinite)) pose.set(motion.plan.reference);
    if (!run(motion.plan, driverValues[i], pose)) continue;
    x[i] = pose[2 * outputSlot];
    y[i] = pose[2 * outputSlot + 1];
  }
  return { x, y };
}
