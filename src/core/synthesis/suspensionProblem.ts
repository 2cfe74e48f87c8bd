/**
 * The rear-suspension synthesis problem: a bicycle, the layouts to try, targets over
 * vertical wheel travel, pivot regions and keep-out circles. Validated once here, with
 * copies, so a suspension objective built from it trusts its input and never throws.
 *
 * Design variables of a layout: every pivot of the layout at full extension (`mainPivot.x`,
 * `mainPivot.y`, …, mm), except the shock's frame eye, which sits the bicycle's
 * eye-to-eye length from the shock's other eye in the direction `shockAngle` (rad, CCW
 * from +x): the shock is then exactly at full extension in every design. The rear axle
 * is the bicycle's.
 *
 * The six-bars also take their bodies (not searched): the body that carries the axle and
 * the bodies the shock joins, by default the demo drawing's axle body and the bell crank
 * to the front frame, so a problem that names none searches exactly what it did before.
 */
import {
  DEFAULT_SHOCK_BODIES,
  LAYOUT_KINDS,
  LAYOUT_PIVOTS,
  SHOCK_END_BODIES,
  SHOCK_EYE,
  SHOCK_FRAME_EYE,
  SIX_BAR_BODIES,
  demoAxleBody,
  demoPivots,
  hasBodyChoice,
  shockBodiesIssue,
  validateBicycle,
  type Bicycle,
  type LayoutAxleBody,
  type LayoutKind,
  type ShockBodies,
  type ShockEndBody,
  type SixBarBody,
  type ValidBicycle,
} from '../suspension';

/** The variable of a layout that places the shock's frame eye: its direction from the shock's other eye, rad. */
export const SHOCK_ANGLE_VARIABLE = 'shockAngle';
/** Half-width of a pivot's default region around the layout's demo drawing, mm. */
export const DEFAULT_PIVOT_REGION_HALF_MM = 60;
/** Half-width of the shock angle's default box around the demo drawing's, rad (about 23°). */
export const DEFAULT_SHOCK_ANGLE_HALF_RAD = 0.4;
/** Samples over the stroke a search takes (both ends included), and the accepted range. */
export const DEFAULT_SUSPENSION_STEPS = 41;
export const SUSPENSION_STEPS_RANGE = [5, 401] as const;
/** Largest |coordinate| of a pivot region or keep-out circle, mm: beyond any pedal bicycle. */
export const MAX_SUSPENSION_COORDINATE_MM = 1500;
/** Largest weight of a term; weights are relative, so this loses nothing. */
export const MAX_TERM_WEIGHT = 1e6;
/** Most points of a curve target. */
export const MAX_CURVE_TARGET_POINTS = 1000;

/**
 * Default tolerance of each term: the deviation that counts as 1 once normalised. A
 * term adds weight × (deviation / tolerance)² to the value, or, as a constraint,
 * deviation / tolerance to the violation.
 */
export const DEFAULT_TOLERANCES = {
  axlePathMm: 1,
  leverageRatio: 0.05,
  antiSquatPct: 5,
  antiRisePct: 5,
  travelMm: 2,
  chainGrowthMm: 1,
  kickbackDeg: 1,
} as const;

/** How a band or limit counts: a constraint (violation, ranked first) or a penalty added to the value. */
export type BandMode = 'constraint' | 'penalty';

/** A curve over vertical wheel travel: [travel mm, value] pairs, travel increasing from 0. */
export interface CurveTarget {
  readonly points: readonly (readonly [number, number])[];
  readonly weight: number;
  readonly tolerance: number;
}

/** A leverage-ratio target: points over travel, or start and end values with a shape. */
export type LeverageTarget =
  | (CurveTarget & { readonly form: 'points' })
  /** LR(u) = start + (end − start) · u^exponent, u the share of the design's own travel. */
  | { readonly form: 'shape'; readonly start: number; readonly end: number; readonly exponent: number; readonly weight: number; readonly tolerance: number };

export interface Band {
  readonly min: number;
  readonly max: number;
  readonly as: BandMode;
  readonly weight: number;
  readonly tolerance: number;
}

export interface SuspensionTargets {
  /** Axle x (mm) over travel. */
  readonly axlePath?: CurveTarget;
  readonly leverageRatio?: LeverageTarget;
  /** Anti-squat (%) at sag for each of `cogs` (teeth, among the bicycle's). */
  readonly antiSquatAtSag?: Band & { readonly cogs: readonly number[] };
  /** Anti-rise (%) at sag, brake on the axle-carrying body. */
  readonly antiRiseAtSag?: Band;
  /** Total vertical wheel travel (mm) the stroke gives. */
  readonly travelMm?: Band;
  /** Largest |chain growth| (mm) over the travel for each of `cogs`. */
  readonly chainGrowthMm?: { readonly max: number; readonly cogs: readonly number[]; readonly as: BandMode; readonly weight: number; readonly tolerance: number };
  /** Largest |pedal kickback| (deg) over the travel for each of `cogs`. */
  readonly kickbackDeg?: { readonly max: number; readonly cogs: readonly number[]; readonly as: BandMode; readonly weight: number; readonly tolerance: number };
}

export interface SuspensionKeepOut {
  readonly name: string;
  readonly x: number;
  readonly y: number;
  readonly r: number;
}

/** A six-bar's bodies: the one that carries the axle, and the two the shock joins. */
export interface LayoutBodies {
  readonly axleBody: LayoutAxleBody;
  readonly shock: ShockBodies;
}

/** The bodies a problem builds a layout with: its own for a six-bar it names, else the defaults (demo axle body, bell crank to front frame). */
export function layoutBodiesOf(problem: Pick<SuspensionProblem, 'layoutBodies'>, kind: LayoutKind): LayoutBodies {
  return problem.layoutBodies[kind] ?? { axleBody: demoAxleBody(kind), shock: DEFAULT_SHOCK_BODIES };
}

export type SuspensionBounds = Readonly<Partial<Record<LayoutKind, Readonly<Record<string, readonly [number, number]>>>>>;

export interface SuspensionProblem {
  readonly kind: 'suspension';
  readonly name: string;
  readonly bicycle: ValidBicycle;
  /** The bicycle as given (what suspensionCurves takes). */
  readonly bicycleInput: Bicycle;
  readonly layouts: readonly LayoutKind[];
  readonly steps: number;
  readonly targets: SuspensionTargets;
  /** Circles that no pivot and no moving link may enter at any step of the travel. */
  readonly keepOut: readonly SuspensionKeepOut[];
  /** Every variable's box for every listed layout: the defaults with the problem's overrides. */
  readonly bounds: Readonly<Partial<Record<LayoutKind, Readonly<Record<string, readonly [number, number]>>>>>;
  /** Each listed six-bar's bodies (the defaults where the input names none); the other kinds have none. */
  readonly layoutBodies: Readonly<Partial<Record<LayoutKind, LayoutBodies>>>;
}

/** Plain data, as a problem file carries it (after its schema). Optional weights default to 1, `as` to 'constraint'. */
export interface SuspensionProblemInput {
  readonly kind: 'suspension';
  readonly name: string;
  readonly bicycle: Bicycle;
  readonly layouts: readonly string[];
  readonly steps?: number;
  readonly targets: {
    readonly axlePath?: { readonly points: readonly (readonly number[])[]; readonly weight?: number; readonly toleranceMm?: number };
    readonly leverageRatio?:
      | { readonly points: readonly (readonly number[])[]; readonly weight?: number; readonly tolerance?: number }
      | { readonly start: number; readonly end: number; readonly exponent?: number; readonly weight?: number; readonly tolerance?: number };
    readonly antiSquatAtSag?: { readonly cogs: readonly number[]; readonly minPct: number; readonly maxPct: number; readonly as?: BandMode; readonly weight?: number; readonly tolerancePct?: number };
    readonly antiRiseAtSag?: { readonly minPct: number; readonly maxPct: number; readonly as?: BandMode; readonly weight?: number; readonly tolerancePct?: number };
    readonly travelMm?: { readonly min: number; readonly max: number; readonly as?: BandMode; readonly weight?: number; readonly toleranceMm?: number };
    readonly chainGrowthMm?: { readonly max: number; readonly cogs?: readonly number[]; readonly as?: BandMode; readonly weight?: number; readonly toleranceMm?: number };
    readonly kickbackDeg?: { readonly max: number; readonly cogs?: readonly number[]; readonly as?: BandMode; readonly weight?: number; readonly toleranceDeg?: number };
  };
  readonly keepOut?: readonly { readonly name?: string; readonly x: number; readonly y: number; readonly r: number }[];
  readonly bounds?: Readonly<Record<string, Readonly<Record<string, readonly number[]>>>>;
  /** Six-bars only: the axle's body and the shock's bodies; what is left out takes the default. */
  readonly layoutBodies?: Readonly<Record<string, { readonly axleBody?: string; readonly shock?: { readonly eye: string; readonly frameEye: string } }>>;
}

export interface SuspensionProblemIssue {
  readonly path: string;
  readonly message: string;
}

export type SuspensionProblemResult =
  | { readonly ok: true; readonly problem: SuspensionProblem }
  | { readonly ok: false; readonly issues: SuspensionProblemIssue[] };

/** The variable names of a layout, in design-vector order. */
export function layoutVariableNames(kind: LayoutKind): string[] {
  const names: string[] = [];
  for (const pivot of LAYOUT_PIVOTS[kind]) if (pivot !== SHOCK_FRAME_EYE) names.push(`${pivot}.x`, `${pivot}.y`);
  names.push(SHOCK_ANGLE_VARIABLE);
  return names;
}

/** Default boxes of a layout: DEFAULT_PIVOT_REGION_HALF_MM around each demo pivot, DEFAULT_SHOCK_ANGLE_HALF_RAD around the demo shock's direction. */
export function defaultLayoutBounds(kind: LayoutKind): Record<string, readonly [number, number]> {
  const demo = demoPivots(kind);
  const out: Record<string, readonly [number, number]> = {};
  const h = DEFAULT_PIVOT_REGION_HALF_MM;
  for (const pivot of LAYOUT_PIVOTS[kind]) {
    if (pivot === SHOCK_FRAME_EYE) continue;
    out[`${pivot}.x`] = [demo[pivot].x - h, demo[pivot].x + h];
    out[`${pivot}.y`] = [demo[pivot].y - h, demo[pivot].y + h];
  }
  const eye = demo[SHOCK_EYE];
  const frame = demo[SHOCK_FRAME_EYE];
  const angle = Math.atan2(frame.y - eye.y, frame.x - eye.x);
  out[SHOCK_ANGLE_VARIABLE] = [angle - DEFAULT_SHOCK_ANGLE_HALF_RAD, angle + DEFAULT_SHOCK_ANGLE_HALF_RAD];
  return out;
}

function finite(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

class Checker {
  readonly issues: SuspensionProblemIssue[] = [];
  add(path: string, message: string): void {
    this.issues.push({ path, message });
  }
  weight(path: string, w: number | undefined): number {
    const v = w ?? 1;
    if (!(finite(v) && v >= 0 && v <= MAX_TERM_WEIGHT)) this.add(path, `is ${String(v)}; expected a weight from 0 to ${MAX_TERM_WEIGHT}`);
    return v;
  }
  tolerance(path: string, t: number | undefined, fallback: number, unit: string): number {
    const v = t ?? fallback;
    if (!(finite(v) && v > 0)) this.add(path, `is ${String(v)}; expected a tolerance above 0 ${unit} (the deviation that counts as 1)`);
    return v;
  }
  mode(path: string, as: unknown): BandMode {
    const v = as ?? 'constraint';
    if (v !== 'constraint' && v !== 'penalty') this.add(path, `is ${JSON.stringify(v)}; expected "constraint" or "penalty"`);
    return v as BandMode;
  }
  band(path: string, lo: number, hi: number, unit: string, loName = 'min', hiName = 'max'): void {
    if (!(finite(lo) && finite(hi))) this.add(path, `${loName} ${String(lo)}, ${hiName} ${String(hi)}; expected two finite numbers of ${unit}`);
    else if (!(lo <= hi)) this.add(path, `${loName} ${lo} is above ${hiName} ${hi} ${unit}; expected ${loName} ≤ ${hiName}`);
  }
  cogs(path: string, cogs: readonly number[] | undefined, bike: ValidBicycle | null, required: boolean): readonly number[] {
    if (cogs === undefined) {
      if (required) this.add(path, 'is missing; expected the cogs (teeth) to read it in, such as [21, 24, 28]');
      return bike === null ? [] : [...bike.cogTeeth];
    }
    if (cogs.length === 0) this.add(path, 'is empty; expected at least one cog (teeth)');
    cogs.forEach((z, i) => {
      if (bike !== null && !bike.cogTeeth.includes(z)) this.add(`${path}[${i}]`, `${String(z)} teeth is not a cog of the bicycle; expected one of ${bike.cogTeeth.join(', ')}`);
    });
    return [...cogs];
  }
  curve(path: string, points: readonly (readonly number[])[], unit: string): (readonly [number, number])[] {
    if (!Array.isArray(points) || points.length < 1 || points.length > MAX_CURVE_TARGET_POINTS) {
      this.add(path, `has ${Array.isArray(points) ? points.length : 'no'} points; expected 1 to ${MAX_CURVE_TARGET_POINTS} pairs [travel mm, ${unit}]`);
      return [];
    }
    let last = -Infinity;
    points.forEach((p, i) => {
      if (!(p.length === 2 && finite(p[0]) && finite(p[1]))) this.add(`${path}[${i}]`, `expected [travel mm, ${unit}], two finite numbers`);
      else if (!(p[0] >= 0)) this.add(`${path}[${i}]`, `travel ${p[0]} mm; expected 0 mm or more (travel from full extension)`);
      else if (!(p[0] > last)) this.add(`${path}[${i}]`, `travel ${p[0]} mm does not increase on ${last} mm; expected the points in order of travel, each travel once`);
      if (finite(p[0])) last = Math.max(last, p[0]);
    });
    return points.map((p) => [p[0], p[1]] as const);
  }
}

/** Checks plain suspension problem data and returns the problem with copies and filled-in defaults, or every issue found. */
export function createSuspensionProblem(input: SuspensionProblemInput): SuspensionProblemResult {
  const c = new Checker();
  const checked = validateBicycle(input.bicycle);
  if (!checked.ok) for (const issue of checked.issues) c.add(`bicycle.${issue.path}`, issue.message);
  const bike = checked.ok ? checked.bicycle : null;

  const layouts: LayoutKind[] = [];
  if (!Array.isArray(input.layouts) || input.layouts.length === 0) c.add('layouts', 'is empty; expected at least one layout');
  input.layouts.forEach((k, i) => {
    if (!(LAYOUT_KINDS as readonly string[]).includes(k)) c.add(`layouts[${i}]`, `"${k}" is not a layout; expected one of ${LAYOUT_KINDS.join(', ')}`);
    else if (layouts.includes(k as LayoutKind)) c.add(`layouts[${i}]`, `"${k}" is listed twice; expected each layout once`);
    else layouts.push(k as LayoutKind);
  });

  const steps = input.steps ?? DEFAULT_SUSPENSION_STEPS;
  if (!(Number.isInteger(steps) && steps >= SUSPENSION_STEPS_RANGE[0] && steps <= SUSPENSION_STEPS_RANGE[1])) {
    c.add('steps', `is ${String(steps)}; expected a whole number of samples over the stroke from ${SUSPENSION_STEPS_RANGE[0]} to ${SUSPENSION_STEPS_RANGE[1]}`);
  }

  const t = input.targets ?? {};
  const D = DEFAULT_TOLERANCES;
  const targets: {
    -readonly [K in keyof SuspensionTargets]: SuspensionTargets[K];
  } = {};
  if (t.axlePath !== undefined) {
    targets.axlePath = {
      points: c.curve('targets.axlePath.points', t.axlePath.points, 'axle x mm'),
      weight: c.weight('targets.axlePath.weight', t.axlePath.weight),
      tolerance: c.tolerance('targets.axlePath.toleranceMm', t.axlePath.toleranceMm, D.axlePathMm, 'mm'),
    };
  }
  const lr = t.leverageRatio;
  if (lr !== undefined) {
    const weight = c.weight('targets.leverageRatio.weight', lr.weight);
    const tolerance = c.tolerance('targets.leverageRatio.tolerance', lr.tolerance, D.leverageRatio, '(leverage ratio)');
    if ('points' in lr) {
      targets.leverageRatio = { form: 'points', points: c.curve('targets.leverageRatio.points', lr.points, 'leverage ratio'), weight, tolerance };
    } else {
      const exponent = lr.exponent ?? 1;
      if (!(finite(lr.start) && lr.start > 0 && finite(lr.end) && lr.end > 0)) {
        c.add('targets.leverageRatio', `start ${String(lr.start)}, end ${String(lr.end)}; expected two leverage ratios above 0`);
      }
      if (!(finite(exponent) && exponent > 0 && exponent <= 10)) c.add('targets.leverageRatio.exponent', `is ${String(exponent)}; expected a shape exponent above 0 and at most 10 (1 is a straight line)`);
      targets.leverageRatio = { form: 'shape', start: lr.start, end: lr.end, exponent, weight, tolerance };
    }
  }
  if (t.antiSquatAtSag !== undefined) {
    const a = t.antiSquatAtSag;
    c.band('targets.antiSquatAtSag', a.minPct, a.maxPct, '%', 'minPct', 'maxPct');
    targets.antiSquatAtSag = {
      min: a.minPct,
      max: a.maxPct,
      cogs: c.cogs('targets.antiSquatAtSag.cogs', a.cogs, bike, true),
      as: c.mode('targets.antiSquatAtSag.as', a.as),
      weight: c.weight('targets.antiSquatAtSag.weight', a.weight),
      tolerance: c.tolerance('targets.antiSquatAtSag.tolerancePct', a.tolerancePct, D.antiSquatPct, '%'),
    };
  }
  if (t.antiRiseAtSag !== undefined) {
    const a = t.antiRiseAtSag;
    c.band('targets.antiRiseAtSag', a.minPct, a.maxPct, '%', 'minPct', 'maxPct');
    targets.antiRiseAtSag = {
      min: a.minPct,
      max: a.maxPct,
      as: c.mode('targets.antiRiseAtSag.as', a.as),
      weight: c.weight('targets.antiRiseAtSag.weight', a.weight),
      tolerance: c.tolerance('targets.antiRiseAtSag.tolerancePct', a.tolerancePct, D.antiRisePct, '%'),
    };
  }
  if (t.travelMm !== undefined) {
    const a = t.travelMm;
    c.band('targets.travelMm', a.min, a.max, 'mm');
    if (finite(a.min) && !(a.min >= 0)) c.add('targets.travelMm.min', `is ${a.min} mm; expected 0 mm or more`);
    targets.travelMm = {
      min: a.min,
      max: a.max,
      as: c.mode('targets.travelMm.as', a.as),
      weight: c.weight('targets.travelMm.weight', a.weight),
      tolerance: c.tolerance('targets.travelMm.toleranceMm', a.toleranceMm, D.travelMm, 'mm'),
    };
  }
  if (t.chainGrowthMm !== undefined) {
    const a = t.chainGrowthMm;
    if (!(finite(a.max) && a.max >= 0)) c.add('targets.chainGrowthMm.max', `is ${String(a.max)}; expected a largest chain growth of 0 mm or more`);
    targets.chainGrowthMm = {
      max: a.max,
      cogs: c.cogs('targets.chainGrowthMm.cogs', a.cogs, bike, false),
      as: c.mode('targets.chainGrowthMm.as', a.as),
      weight: c.weight('targets.chainGrowthMm.weight', a.weight),
      tolerance: c.tolerance('targets.chainGrowthMm.toleranceMm', a.toleranceMm, D.chainGrowthMm, 'mm'),
    };
  }
  if (t.kickbackDeg !== undefined) {
    const a = t.kickbackDeg;
    if (!(finite(a.max) && a.max >= 0)) c.add('targets.kickbackDeg.max', `is ${String(a.max)}; expected a largest pedal kickback of 0° or more`);
    targets.kickbackDeg = {
      max: a.max,
      cogs: c.cogs('targets.kickbackDeg.cogs', a.cogs, bike, false),
      as: c.mode('targets.kickbackDeg.as', a.as),
      weight: c.weight('targets.kickbackDeg.weight', a.weight),
      tolerance: c.tolerance('targets.kickbackDeg.toleranceDeg', a.toleranceDeg, D.kickbackDeg, '°'),
    };
  }
  if (Object.keys(targets).length === 0) c.add('targets', 'is empty; expected at least one target (axlePath, leverageRatio, antiSquatAtSag, antiRiseAtSag, travelMm, chainGrowthMm or kickbackDeg)');

  const within = (v: number) => Math.abs(v) <= MAX_SUSPENSION_COORDINATE_MM;
  const keepOut: SuspensionKeepOut[] = (input.keepOut ?? []).map((k, i) => {
    if (!(finite(k.x) && finite(k.y) && finite(k.r) && k.r > 0 && within(k.x) && within(k.y) && within(k.r))) {
      c.add(`keepOut[${i}]`, `is { x: ${String(k.x)}, y: ${String(k.y)}, r: ${String(k.r)} }; expected a circle in mm with r > 0 and x, y and r each within ±${MAX_SUSPENSION_COORDINATE_MM} mm`);
    }
    return { name: k.name ?? `keep-out ${i + 1}`, x: k.x, y: k.y, r: k.r };
  });

  const bounds: Partial<Record<LayoutKind, Record<string, readonly [number, number]>>> = {};
  for (const kind of layouts) bounds[kind] = defaultLayoutBounds(kind);
  for (const [kind, boxes] of Object.entries(input.bounds ?? {})) {
    if (!(LAYOUT_KINDS as readonly string[]).includes(kind)) {
      c.add(`bounds.${kind}`, `"${kind}" is not a layout; expected one of ${LAYOUT_KINDS.join(', ')}`);
      continue;
    }
    const own = bounds[kind as LayoutKind];
    if (own === undefined) {
      c.add(`bounds.${kind}`, `"${kind}" is not one of the problem's layouts (${layouts.join(', ')})`);
      continue;
    }
    const names = layoutVariableNames(kind as LayoutKind);
    for (const [name, box] of Object.entries(boxes)) {
      const path = `bounds.${kind}.${name}`;
      if (!names.includes(name)) {
        c.add(path, `no such variable; expected one of ${names.join(', ')}`);
        continue;
      }
      if (!(Array.isArray(box) && box.length === 2 && finite(box[0]) && finite(box[1]))) {
        c.add(path, 'expected [lower, upper], two finite numbers');
        continue;
      }
      const [lo, hi] = box;
      const limit = name === SHOCK_ANGLE_VARIABLE ? 4 * Math.PI : MAX_SUSPENSION_COORDINATE_MM;
      const unit = name === SHOCK_ANGLE_VARIABLE ? 'rad' : 'mm';
      if (!(Math.abs(lo) <= limit && Math.abs(hi) <= limit)) c.add(path, `is [${lo}, ${hi}] ${unit}; each bound must be within ±${limit} ${unit}`);
      else if (!(lo < hi)) c.add(path, `is [${lo}, ${hi}] ${unit}; expected [lower, upper] with lower < upper, a range to search`);
      else own[name] = [lo, hi];
    }
  }
  const layoutBodies = checkLayoutBodies(c, layouts, input.layoutBodies ?? {});
  if (c.issues.length > 0 || bike === null) return { ok: false, issues: c.issues };
  return {
    ok: true,
    problem: {
      kind: 'suspension',
      name: input.name,
      bicycle: bike,
      bicycleInput: JSON.parse(JSON.stringify(input.bicycle)) as Bicycle,
      layouts,
      steps,
      targets,
      keepOut,
      bounds,
      layoutBodies,
    },
  };
}

/** Each listed six-bar's bodies from the input, checked, with the defaults filled in. */
function checkLayoutBodies(c: Checker, layouts: readonly LayoutKind[], input: NonNullable<SuspensionProblemInput['layoutBodies']>): Partial<Record<LayoutKind, LayoutBodies>> {
  const out: Partial<Record<LayoutKind, LayoutBodies>> = {};
  for (const kind of layouts) if (hasBodyChoice(kind)) out[kind] = { axleBody: demoAxleBody(kind), shock: DEFAULT_SHOCK_BODIES };
  const list = (ids: readonly string[]) => ids.map((b) => `"${b}"`).join(', ');
  for (const [kind, given] of Object.entries(input)) {
    const path = `layoutBodies.${kind}`;
    if (!(LAYOUT_KINDS as readonly string[]).includes(kind) || !hasBodyChoice(kind as LayoutKind)) {
      c.add(path, `"${kind}" has no body choice; expected a six-bar, "wattSixBar" or "stephensonSixBar"`);
      continue;
    }
    const own = out[kind as LayoutKind];
    if (own === undefined) {
      c.add(path, `"${kind}" is not one of the problem's layouts (${layouts.join(', ')})`);
      continue;
    }
    let { axleBody, shock } = own;
    if (given.axleBody !== undefined) {
      if ((SIX_BAR_BODIES as readonly string[]).includes(given.axleBody)) axleBody = given.axleBody as SixBarBody;
      else c.add(`${path}.axleBody`, `"${given.axleBody}" is not a moving body; expected one of ${list(SIX_BAR_BODIES)}`);
    }
    if (given.shock !== undefined) {
      const eyeOk = (SIX_BAR_BODIES as readonly string[]).includes(given.shock.eye);
      const frameOk = (SHOCK_END_BODIES as readonly string[]).includes(given.shock.frameEye);
      if (!eyeOk) c.add(`${path}.shock.eye`, `"${given.shock.eye}" is not a moving body; expected one of ${list(SIX_BAR_BODIES)}`);
      if (!frameOk) c.add(`${path}.shock.frameEye`, `"${given.shock.frameEye}" is not a body of the layout; expected one of ${list(SHOCK_END_BODIES)}`);
      if (eyeOk && frameOk) {
        const chosen: ShockBodies = { eye: given.shock.eye as SixBarBody, frameEye: given.shock.frameEye as ShockEndBody };
        const issue = shockBodiesIssue(chosen);
        if (issue !== null) c.add(`${path}.shock`, issue);
        else shock = chosen;
      }
    }
    out[kind as LayoutKind] = { axleBody, shock };
  }
  return out;
}
