/**
 * The kinematic report of one linkage over a driver range, as plain JSON-ready data:
 * the range used, joint and point paths, mobility, Grashof and Barker class and
 * transmission-angle range of every four-bar loop, the instant centre of every body
 * relative to ground, defects (locks, dead-centres) and the closure residual. The
 * command line prints it (`loci analyze`); the app can show it.
 *
 * Units: the driver's own unit on the way in (rad for a rotation driver, mm for a
 * length driver, as everywhere in core); on the way out every angle is in degrees and
 * every key says its unit, since the report is read by people.
 */
import type { DriverSpec } from './model';
import type { Plan } from './plan';
import { run, closureResidualMm } from './run';
import { sweep, type SweepResult } from './sweep';
import {
  IC_FINITE,
  IC_INDETERMINATE,
  IC_INFINITE,
  fourBarLoops,
  instantCentrePath,
  transmissionAngleRange,
} from './analysis';
import { mobility } from './analysis/mobility';

/** Steps of a report sweep when none are asked for: 1° apart over a full turn, both ends included. */
export const DEFAULT_REPORT_STEPS = 361;
/** The most steps a report sweeps: its JSON grows with steps × (joints + points + bodies). */
export const MAX_REPORT_STEPS = 20_000;
/** A length driver's default range: the reference length ± this share of it. */
export const LENGTH_DRIVER_DEFAULT_SHARE = 0.1;
/** Step (rad) of the search for the range a rotation driver assembles in: 0.5°. */
const ASSEMBLY_SEARCH_STEP_RAD = Math.PI / 360;
/** Bisection of an assembly limit stops below this bracket width (rad). */
const ASSEMBLY_LIMIT_TOL_RAD = 1e-10;
/** Cap on bisection steps (the bracket halves from 0.5° to below 1e-10 rad in 26). */
const ASSEMBLY_LIMIT_MAX_BISECTIONS = 60;
/**
 * The default range stops this far (rad) inside an assembly limit: at the limit itself a
 * dyad is at its toggle and rates are infinite; 1e-7 rad inside they are large but finite.
 */
const ASSEMBLY_LIMIT_MARGIN_RAD = 1e-7;
/** Smallest driver span (rad or mm) a report sweeps. */
const MIN_SPAN = 1e-9;
/** The transmission-angle guideline, degrees (common practice, often credited to Alt, 1932). */
export const TRANSMISSION_GUIDELINE_DEG = { min: 40, max: 140 } as const;

const DEG_PER_RAD = 180 / Math.PI;

export interface ReportOptions {
  /** Driver range in the driver's unit (rad or mm); default as described on `analyzeLinkage`. */
  readonly range?: { readonly from: number; readonly to: number };
  /** Number of driver values, both ends included; default DEFAULT_REPORT_STEPS. */
  readonly steps?: number;
}

/** A problem with the options (`from`, `to`, `steps`) or with the linkage's motion (`driver`). */
export interface ReportIssue {
  readonly path: 'from' | 'to' | 'steps' | 'driver';
  readonly message: string;
}

export type Xy = readonly [number, number];

export type RangeRule = 'given' | 'full turn' | 'assembly range' | 'share of reference length';

export interface LinkageReport {
  readonly driver: {
    readonly spec: DriverSpec;
    /** Unit of every driver value in this report. */
    readonly unit: 'deg' | 'mm';
    readonly reference: number;
    readonly from: number;
    readonly to: number;
    readonly steps: number;
    /** How the range was chosen, and why, in words. */
    readonly rangeRule: RangeRule;
    readonly rangeNote: string;
    /** A rotation driver that turned through a full turn without locking. */
    readonly fullTurn: boolean;
  };
  readonly mobility: { readonly mobility: number; readonly links: number; readonly fullJoints: number; readonly halfJoints: number };
  /** Driver value of each step, in `driver.unit`. */
  readonly values: readonly number[];
  readonly assembled: readonly boolean[];
  /** Each joint's position per step; null where the linkage did not assemble. */
  readonly joints: readonly { readonly id: string; readonly ground: boolean; readonly path: readonly (Xy | null)[] }[];
  /** Each named point's position per step. */
  readonly points: readonly { readonly id: string; readonly body: string; readonly path: readonly (Xy | null)[] }[];
  readonly fourBarLoops: readonly ReportLoop[];
  /** Instant centre of each moving body relative to ground, per step. */
  readonly instantCentres: readonly ReportCentrePath[];
  readonly defects: {
    /** Driver sub-ranges where the linkage cannot assemble, in `driver.unit`. */
    readonly locks: readonly { readonly from: number; readonly to: number }[];
    /** Dead-centre (toggle) positions of a dyad met in the range, or bounding a default assembly range. */
    readonly deadCentres: readonly { readonly at: number; readonly joint: string }[];
    readonly unassembledSteps: number;
  };
  readonly closureResidualMm: {
    /** Largest constraint violation over the assembled steps: the verifier of every pose. */
    readonly max: number;
    readonly at: number | null;
    readonly reference: number;
  };
}

export interface ReportLoop {
  /** Bodies in loop order; a loop through ground reads (ground, input, coupler, output). */
  readonly bodies: readonly string[];
  /** `joints[i]` joins `bodies[i]` and `bodies[i + 1]`. */
  readonly joints: readonly string[];
  readonly lengthsMm: readonly number[];
  readonly grounded: boolean;
  /** The loop's input is the driven body. */
  readonly inputDriven: boolean;
  readonly grashof: 'grashof' | 'non-grashof' | 'change-point';
  readonly slMinusPqMm: number;
  /** Barker's type over (ground, input, coupler, output); null for a loop without ground. */
  readonly barker: { readonly type: number; readonly code: string; readonly name: string } | null;
  /** Transmission angle μ at the coupler–output joint over the assembled steps; null if none assembled. */
  readonly transmissionAngleDeg: {
    readonly min: number;
    readonly max: number;
    /** Driver values (in `driver.unit`) where μ is least and greatest. */
    readonly minAt: number;
    readonly maxAt: number;
    /** Least of min(μ, 180° − μ): the figure the guideline bounds. */
    readonly worst: number;
    readonly worstAt: number;
    readonly withinGuideline: boolean;
  } | null;
}

export type CentreKind = 'finite' | 'infinite' | 'indeterminate' | 'unassembled';

export interface ReportCentrePath {
  readonly body: string;
  readonly relativeTo: string;
  /** Per step: a finite centre, a centre at infinity (relative translation), indeterminate (no relative motion), or unassembled. */
  readonly kind: readonly CentreKind[];
  /** Per step: the centre (finite, mm), or the unit direction to it (infinite); null otherwise. */
  readonly xy: readonly (Xy | null)[];
}

export type ReportResult =
  | { readonly ok: true; readonly report: LinkageReport }
  | { readonly ok: false; readonly issues: readonly ReportIssue[] };

/**
 * Analyses `plan` over a driver range. Without `options.range`:
 * - a rotation driver turns a full turn from its reference angle when it can (a crank);
 *   otherwise over the range it assembles in around the reference pose, found by
 *   stepping 0.5° each way from the reference and bisecting each limit;
 * - a length driver moves over its reference length ± LENGTH_DRIVER_DEFAULT_SHARE.
 */
export function analyzeLinkage(plan: Plan, options: ReportOptions = {}): ReportResult {
  const issues = checkOptions(plan, options);
  if (issues.length > 0) return { ok: false, issues };
  const steps = options.steps ?? DEFAULT_REPORT_STEPS;
  const chosen = chooseRange(plan, options);
  if (!chosen.ok) return { ok: false, issues: [{ path: 'driver', message: chosen.message }] };

  const result = sweep(plan, { from: chosen.from, to: chosen.to, steps });
  // An assembly range ends just inside the toggle positions that bound it: name them too.
  const deadCentres = chosen.rule === 'assembly range'
    ? [
        ...deadCentresPast(plan, chosen.from, chosen.from - ASSEMBLY_SEARCH_STEP_RAD),
        ...result.deadCentres,
        ...deadCentresPast(plan, chosen.to, chosen.to + ASSEMBLY_SEARCH_STEP_RAD),
      ]
    : result.deadCentres;
  const rotation = plan.linkage.driver.kind === 'rotation';
  const toUnit = rotation ? (v: number) => v * DEG_PER_RAD : (v: number) => v;
  const fullTurn = rotation && result.fullTurn;
  return {
    ok: true,
    report: {
      driver: {
        spec: plan.linkage.driver,
        unit: rotation ? 'deg' : 'mm',
        reference: toUnit(plan.driverReferenceValue),
        from: toUnit(chosen.from),
        to: toUnit(chosen.to),
        steps,
        rangeRule: chosen.rule,
        rangeNote: chosen.note,
        fullTurn,
      },
      mobility: { ...mobility(plan.linkage) },
      values: Array.from(result.values, toUnit),
      assembled: Array.from(result.assembled, (a) => a === 1),
      joints: plan.jointIds.map((jointId) => ({
        id: jointId,
        ground: plan.linkage.joints.find((j) => j.id === jointId)?.ground === true,
        path: slotPath(plan, result, slotOf(plan, jointId)),
      })),
      points: plan.pointIds.map((pointId) => ({
        id: pointId,
        body: plan.linkage.points?.find((p) => p.id === pointId)?.body ?? '',
        path: slotPath(plan, result, slotOf(plan, pointId)),
      })),
      fourBarLoops: fourBarLoops(plan).map((loop) => {
        const mu = transmissionAngleRange(loop, result);
        const k = loop.classification;
        return {
          bodies: [...loop.bodyIds],
          joints: [...loop.jointIds],
          lengthsMm: [...loop.lengthsMm],
          grounded: loop.grounded,
          inputDriven: loop.inputDriven,
          grashof: loop.grashof,
          slMinusPqMm: loop.slMinusPq,
          barker: k ? { type: k.barkerType, code: k.code, name: k.name } : null,
          transmissionAngleDeg: mu.ok
            ? {
                min: mu.minRad * DEG_PER_RAD,
                max: mu.maxRad * DEG_PER_RAD,
                minAt: toUnit(mu.minAt),
                maxAt: toUnit(mu.maxAt),
                worst: mu.worstRad * DEG_PER_RAD,
                worstAt: toUnit(mu.worstAt),
                withinGuideline:
                  mu.minRad * DEG_PER_RAD >= TRANSMISSION_GUIDELINE_DEG.min &&
                  mu.maxRad * DEG_PER_RAD <= TRANSMISSION_GUIDELINE_DEG.max,
              }
            : null,
        };
      }),
      instantCentres: plan.bodies.slice(1).map((body) => centrePath(plan, body.id, result)),
      defects: {
        locks: result.locks.map((lock) => ({ from: toUnit(lock.from), to: toUnit(lock.to) })),
        deadCentres: deadCentres.map((d) => ({ at: toUnit(d.value), joint: d.joint })),
        unassembledSteps: result.assembled.reduce((n, a) => n + (a === 1 ? 0 : 1), 0),
      },
      closureResidualMm: residuals(plan, result, toUnit),
    },
  };
}

function checkOptions(plan: Plan, options: ReportOptions): ReportIssue[] {
  const issues: ReportIssue[] = [];
  const steps = options.steps;
  if (steps !== undefined && !(Number.isInteger(steps) && steps >= 2 && steps <= MAX_REPORT_STEPS)) {
    issues.push({ path: 'steps', message: `expected a whole number of steps from 2 to ${MAX_REPORT_STEPS}, got ${steps}` });
  }
  const range = options.range;
  if (range === undefined) return issues;
  const length = plan.linkage.driver.kind === 'length';
  for (const end of ['from', 'to'] as const) {
    const v = range[end];
    if (!Number.isFinite(v)) issues.push({ path: end, message: `expected a finite driver value, got ${v}` });
    else if (length && !(v > 0)) issues.push({ path: end, message: `expected a length > 0 mm for the length driver, got ${v}` });
  }
  if (issues.length === 0 && !(Math.abs(range.to - range.from) >= MIN_SPAN)) {
    issues.push({ path: 'to', message: 'expected a driver value different from --from (the range is empty)' });
  }
  return issues;
}

type ChosenRange =
  | { readonly ok: true; readonly from: number; readonly to: number; readonly rule: RangeRule; readonly note: string }
  | { readonly ok: false; readonly message: string };

function chooseRange(plan: Plan, options: ReportOptions): ChosenRange {
  if (options.range) {
    return { ok: true, from: options.range.from, to: options.range.to, rule: 'given', note: 'the range given' };
  }
  const reference = plan.driverReferenceValue;
  if (plan.linkage.driver.kind === 'length') {
    const share = LENGTH_DRIVER_DEFAULT_SHARE;
    return {
      ok: true,
      from: reference * (1 - share),
      to: reference * (1 + share),
      rule: 'share of reference length',
      note: `the reference length ± ${share * 100} %`,
    };
  }
  const found = assemblyRangeRad(plan, reference);
  if (!found.ok) return found;
  if (found.fullTurn) {
    return { ok: true, from: reference, to: reference + 2 * Math.PI, rule: 'full turn', note: 'a full turn from the reference angle: the driven link turns fully' };
  }
  return {
    ok: true,
    from: found.from + ASSEMBLY_LIMIT_MARGIN_RAD,
    to: found.to - ASSEMBLY_LIMIT_MARGIN_RAD,
    rule: 'assembly range',
    note: 'the range the linkage assembles in around the reference pose, ending just inside the toggle positions ' +
      'listed in defects.deadCentres (the driven link does not turn fully)',
  };
}

/**
 * The driver range (rad) a rotation driver assembles in around `reference`: steps of
 * ASSEMBLY_SEARCH_STEP_RAD forward up to a full turn, then backward over what is left,
 * each limit bisected to ASSEMBLY_LIMIT_TOL_RAD.
 */
function assemblyRangeRad(
  plan: Plan,
  reference: number,
): { readonly ok: true; readonly fullTurn: boolean; readonly from: number; readonly to: number } | { readonly ok: false; readonly message: string } {
  const pose = Float64Array.from(plan.reference);
  if (!run(plan, reference, pose)) {
    return { ok: false, message: 'the linkage does not assemble at its own reference driver value' };
  }
  const stepsPerTurn = Math.round((2 * Math.PI) / ASSEMBLY_SEARCH_STEP_RAD);
  const forward = stepUntilLock(plan, reference, pose, ASSEMBLY_SEARCH_STEP_RAD, stepsPerTurn);
  if (forward.steps === stepsPerTurn) return { ok: true, fullTurn: true, from: reference, to: reference + 2 * Math.PI };
  pose.set(plan.reference);
  run(plan, reference, pose);
  const backward = stepUntilLock(plan, reference, pose, -ASSEMBLY_SEARCH_STEP_RAD, stepsPerTurn - forward.steps);
  return { ok: true, fullTurn: false, from: backward.limit, to: forward.limit };
}

/**
 * Steps the driver from `start` (where `pose` is solved) by `step` until it fails to
 * assemble or `maxSteps` are taken; returns the steps taken and the last value that
 * assembled, refined by bisection towards the first that did not.
 */
function stepUntilLock(
  plan: Plan,
  start: number,
  pose: Float64Array,
  step: number,
  maxSteps: number,
): { readonly steps: number; readonly limit: number } {
  const trial = new Float64Array(pose.length);
  let good = start;
  for (let k = 1; k <= maxSteps; k++) {
    const value = start + k * step;
    trial.set(pose);
    if (!run(plan, value, trial)) return { steps: k - 1, limit: bisectLimit(plan, good, value, pose, trial) };
    pose.set(trial);
    good = value;
  }
  return { steps: maxSteps, limit: good };
}

/** The last assembling value between `good` (solved in `pose`) and `bad`; `trial` is scratch. */
function bisectLimit(plan: Plan, good: number, bad: number, pose: Float64Array, trial: Float64Array): number {
  for (let i = 0; i < ASSEMBLY_LIMIT_MAX_BISECTIONS && Math.abs(bad - good) > ASSEMBLY_LIMIT_TOL_RAD; i++) {
    const mid = 0.5 * (good + bad);
    trial.set(pose);
    if (run(plan, mid, trial)) {
      pose.set(trial);
      good = mid;
    } else {
      bad = mid;
    }
  }
  return good;
}

/** The dead centres a two-sample sweep from `inside` (assembles) to `outside` (does not) locates between them. */
function deadCentresPast(plan: Plan, inside: number, outside: number): SweepResult['deadCentres'] {
  return sweep(plan, { from: inside, to: outside, steps: 2 }).deadCentres;
}

function slotOf(plan: Plan, id: string): number {
  const slot = plan.slotIndex.get(id);
  if (slot === undefined) throw new Error(`report: plan has no slot for "${id}"`);
  return slot;
}

function slotPath(plan: Plan, result: SweepResult, slot: number): (Xy | null)[] {
  const stride = 2 * plan.slotCount;
  const path: (Xy | null)[] = [];
  for (let k = 0; k < result.values.length; k++) {
    const x = result.poses[k * stride + 2 * slot];
    const y = result.poses[k * stride + 2 * slot + 1];
    path.push(result.assembled[k] === 1 && Number.isFinite(x) && Number.isFinite(y) ? [x, y] : null);
  }
  return path;
}

function centrePath(plan: Plan, bodyId: string, result: SweepResult): ReportCentrePath {
  const path = instantCentrePath(plan, bodyId, 0, result);
  const kind: CentreKind[] = [];
  const xy: (Xy | null)[] = [];
  for (let k = 0; k < path.kind.length; k++) {
    const code = path.kind[k];
    const finite = Number.isFinite(path.x[k]) && Number.isFinite(path.y[k]);
    if (code === IC_FINITE && finite) {
      kind.push('finite');
      xy.push([path.x[k], path.y[k]]);
    } else if (code === IC_INFINITE && finite) {
      kind.push('infinite');
      xy.push([path.x[k], path.y[k]]);
    } else {
      kind.push(code === IC_INDETERMINATE ? 'indeterminate' : 'unassembled');
      xy.push(null);
    }
  }
  return { body: bodyId, relativeTo: plan.bodies[0].id, kind, xy };
}

function residuals(plan: Plan, result: SweepResult, toUnit: (v: number) => number): LinkageReport['closureResidualMm'] {
  const stride = 2 * plan.slotCount;
  let max = 0;
  let at: number | null = null;
  for (let k = 0; k < result.values.length; k++) {
    if (result.assembled[k] !== 1) continue;
    const r = closureResidualMm(plan, result.poses.subarray(k * stride, (k + 1) * stride));
    // NaN must show, not hide: it takes the branch that records it.
    if (!(r <= max)) {
      max = r;
      at = toUnit(result.values[k]);
      if (Number.isNaN(r)) break;
    }
  }
  return { max, at, reference: closureResidualMm(plan, plan.reference) };
}
