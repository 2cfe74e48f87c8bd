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
import { closureResidualMm } from './run';
import { sweep, type DeadCentreKind, type SweepDeadCentre, type SweepResult } from './sweep';
import {
  IC_FINITE,
  IC_INDETERMINATE,
  IC_INFINITE,
  fourBarLoops,
  transmissionAngleRange,
  type InstantCentrePath,
} from './analysis';
import { instantCentrePaths } from './analysis/instantCentres';
import { mobility } from './analysis/mobility';

/** Steps of a report sweep when none are asked for: 1° apart over a full turn, both ends included. */
export const DEFAULT_REPORT_STEPS = 361;
/** The most steps a report sweeps: its JSON grows with steps × (joints + points + bodies). */
export const MAX_REPORT_STEPS = 20_000;
/** A length driver's default range: the reference length ± this share of it. */
export const LENGTH_DRIVER_DEFAULT_SHARE = 0.1;
/** Samples per turn of the search for the range a rotation driver assembles in: 0.5° apart. */
const ASSEMBLY_SEARCH_STEPS_PER_TURN = 720;
/**
 * Turns the search for the assembly range follows a motion that does not come back to its
 * first pose in one turn (a Newton block's assembly that goes on to another), to find
 * where it locks: a single-degree-of-freedom loop's motion closes or locks within a few.
 */
const ASSEMBLY_SEARCH_MAX_TURNS = 4;
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
    /**
     * Dead-centre (toggle) positions met in the range or bounding a default assembly
     * range: `limit` where the motion cannot go on (an edge of a lock or of the assembly
     * range), `change point` where a dyad reaches its toggle and the motion goes on.
     */
    readonly deadCentres: readonly { readonly at: number; readonly joint: string; readonly kind: DeadCentreKind }[];
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
 *   otherwise over the range it assembles in around the reference pose, its limits
 *   found from the assembly condition (assemblyRangeRad);
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
  const deadCentres = [...chosen.limits.slice(0, 1), ...result.deadCentres, ...chosen.limits.slice(1)];
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
      instantCentres: centrePaths(plan, result),
      defects: {
        locks: result.locks.map((lock) => ({ from: toUnit(lock.from), to: toUnit(lock.to) })),
        deadCentres: deadCentres.map((d) => ({ at: toUnit(d.value), joint: d.joint, kind: d.kind })),
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
  | {
      readonly ok: true;
      readonly from: number;
      readonly to: number;
      readonly rule: RangeRule;
      readonly note: string;
      /** The dead centres just outside the range that bound it (an assembly range), from first to last. */
      readonly limits: readonly SweepDeadCentre[];
    }
  | { readonly ok: false; readonly message: string };

function chooseRange(plan: Plan, options: ReportOptions): ChosenRange {
  if (options.range) {
    return { ok: true, from: options.range.from, to: options.range.to, rule: 'given', note: 'the range given', limits: [] };
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
      limits: [],
    };
  }
  const found = assemblyRangeRad(plan, reference);
  if (!found.ok) return found;
  if (found.fullTurn) {
    return {
      ok: true, from: reference, to: reference + 2 * Math.PI, rule: 'full turn',
      note: 'a full turn from the reference angle: the driven link turns fully', limits: [],
    };
  }
  return {
    ok: true,
    from: found.from.value + ASSEMBLY_LIMIT_MARGIN_RAD,
    to: found.to.value - ASSEMBLY_LIMIT_MARGIN_RAD,
    rule: 'assembly range',
    note: 'the range the linkage assembles in around the reference pose, ending just inside the toggle positions ' +
      'listed in defects.deadCentres (the driven link does not turn fully)',
    limits: [found.from, found.to],
  };
}

/**
 * The driver range (rad) a rotation driver assembles in around `reference`, on the
 * reference branch: a sweep forward over a full turn and one backward, each of
 * ASSEMBLY_SEARCH_STEPS_PER_TURN steps; the sweep finds each limit from the assembly
 * condition itself (a dyad's reach, a Newton block's fold), not from the samples, so a
 * lock narrower than a step is found too. Each limit comes with its dead centre.
 */
function assemblyRangeRad(plan: Plan, reference: number):
  | { readonly ok: true; readonly fullTurn: true }
  | { readonly ok: true; readonly fullTurn: false; readonly from: SweepDeadCentre; readonly to: SweepDeadCentre }
  | { readonly ok: false; readonly message: string } {
  const turns = (count: number, direction: number) =>
    sweep(plan, { from: reference, to: reference + direction * count * 2 * Math.PI, steps: count * ASSEMBLY_SEARCH_STEPS_PER_TURN + 1 });
  let forward = turns(1, 1);
  if (forward.assembled[0] !== 1) return { ok: false, message: 'the linkage does not assemble at its own reference driver value' };
  if (forward.fullTurn) return { ok: true, fullTurn: true };
  // Through a turn without locking, yet not back at its first pose: the motion goes on into
  // a second turn that differs from the first, and may lock there (either way round).
  const further = forward.locks.length === 0 && forward.assembled.every((f) => f === 1);
  if (further) forward = turns(ASSEMBLY_SEARCH_MAX_TURNS, 1);
  const backward = turns(further ? ASSEMBLY_SEARCH_MAX_TURNS : 1, -1);
  if (further && forward.locks.length === 0 && backward.locks.length === 0) {
    return {
      ok: false,
      message: 'the linkage turns on without locking, but its motion does not repeat each turn (it is not back at its first pose a turn on): ' +
        'give the driver range to analyse',
    };
  }
  const to = firstLimit(forward, reference);
  const from = firstLimit(backward, reference);
  if (to === null || from === null) {
    return { ok: false, message: 'the linkage does not move from its reference driver value: it locks there' };
  }
  return { ok: true, fullTurn: false, from, to };
}

/** The first lock edge a sweep from `reference` meets, with the dead centre there; null when it locks at once. */
function firstLimit(result: SweepResult, reference: number): SweepDeadCentre | null {
  const lock = result.locks[0];
  if (lock === undefined || !(Math.abs(lock.from - reference) >= MIN_SPAN)) return null;
  const joint = result.deadCentres.find((d) => d.kind === 'limit' && d.value === lock.from)?.joint ?? '';
  return { value: lock.from, joint, kind: 'limit' };
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

/** The instant centre of every moving body relative to ground, over the sweep. */
function centrePaths(plan: Plan, result: SweepResult): ReportCentrePath[] {
  const moving = plan.bodies.slice(1);
  const paths = instantCentrePaths(plan, moving.map((body) => [body.id, 0] as const), result);
  return moving.map((body, i) => centrePath(plan, body.id, paths[i]));
}

function centrePath(plan: Plan, bodyId: string, path: InstantCentrePath): ReportCentrePath {
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
