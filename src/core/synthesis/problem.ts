/**
 * The in-memory synthesis problem: validated once here, with defensive copies, so an
 * objective built from it trusts its input. `createProblem` takes plain data (as a
 * problem file or a worker message carries it) and says what is wrong, field by field.
 */

import { SEARCH_MAP_KINDS, searchMapMisfit, type SearchMapKind } from './searchMap';
import { MAX_COORDINATE_MM, MAX_REACH_OVER_SHORTEST_LINK } from '../linkage/model';
import { COINCIDENT_JOINT_TOL_MM } from '../linkage/tolerances';
import { TRANSMISSION_GUIDELINE_DEG } from '../linkage/report';
import { targetFrame } from './encoding';
import { driverVariablePrefix, mechanismVariableNames } from './familyVariables';
import { validateTarget, type Target } from './target';

export type FamilyId =
  | 'fourbar-lengths'
  | 'fourbar'
  | 'slider-crank'
  | 'watt-i'
  | 'watt-ii'
  | 'stephenson-i'
  | 'stephenson-ii'
  | 'stephenson-iii';

export const FAMILY_IDS: readonly FamilyId[] = [
  'fourbar-lengths',
  'fourbar',
  'slider-crank',
  'watt-i',
  'watt-ii',
  'stephenson-i',
  'stephenson-ii',
  'stephenson-iii',
];

/** Each family in the trade's words, as views and reports name it. */
export const FAMILY_NAMES: Readonly<Record<FamilyId, string>> = {
  'fourbar-lengths': 'four-bar (link lengths)',
  fourbar: 'four-bar',
  'slider-crank': 'slider-crank',
  'watt-i': 'Watt I six-bar',
  'watt-ii': 'Watt II six-bar',
  'stephenson-i': 'Stephenson I six-bar',
  'stephenson-ii': 'Stephenson II six-bar',
  'stephenson-iii': 'Stephenson III six-bar',
};

/**
 * Which driver value goes with each target point. Driver values are rad: for
 * `fourbar-lengths` the crank angle θ2 from the ground line (the literature form); for
 * the pose-based families the crank's rotation from its reference-pose angle.
 */
export type Timing =
  | { readonly mode: 'prescribed'; readonly driverValues: Float64Array }
  /**
   * One driver value per point is a design variable; the sequence must increase (`wrap`:
   * cyclically, passing through 2π at most once). `refine`: before the error is taken,
   * each value is moved by a few safeguarded Newton steps to the nearest point of the
   * curve (a free placement's: nearest the target taken into the design's frame),
   * staying between its neighbours; evaluate then writes the refined values back into x
   * (Lamarckian), and the search's fitBetter refits them where the target matched in
   * order on the curve puts a point on another stretch of it (pathResponse.ts). Default
   * false: the values are taken as given.
   */
  | { readonly mode: 'free'; readonly wrap: boolean; readonly refine?: boolean }
  /**
   * Each point matched to the nearest point of the output curve sampled at `samples`
   * driver values over one turn, in order (`wrap`, default true: the match may pass
   * through the turn's start), then refined by Newton on the continuous curve.
   */
  | { readonly mode: 'unprescribed'; readonly wrap?: boolean; readonly samples?: number };

export type Placement = 'fixed' | 'free';
export type Measure = 'sum-of-squares' | 'rms' | 'max';
export type Branch = 'open' | 'crossed' | 'either';

export interface KeepOutCircle {
  readonly x: number;
  readonly y: number;
  readonly r: number;
}

export interface Constraints {
  /**
   * The driver must turn fully. For the four-bars: Grashof with the crank (or, for the
   * pose four-bar, the ground) shortest, strictly: a change point (s + l = p + q within
   * the classifier's band) does not turn fully. For the other families: no lock over a
   * full turn, found exactly, not only at samples.
   */
  readonly fullTurnCrank?: boolean;
  /** Smallest transmission angle allowed, rad (μ and π − μ both at least this). */
  readonly minTransmissionRad?: number;
  /** Every link length within [min, max], mm. */
  readonly linkLengthMm?: readonly [number, number];
  /** Ground pivots must stay outside these circles (mm). */
  readonly keepOut?: readonly KeepOutCircle[];
  /** Assembly branch of `fourbar-lengths`; default 'open'. Pose-based families take theirs from the reference pose. */
  readonly branch?: Branch;
  /**
   * Largest side (width or height) of the bounding box of every joint and point over the
   * design's motion, mm: a full turn where the driver turns fully, else the travel the
   * target needs (the motion `loci analyze` is given for the candidate).
   */
  readonly maxSizeMm?: number;
}

/**
 * Optional terms added to the measure, each a weight times a dimensionless figure of
 * the design's motion; a weight of 1 makes one unit of the figure cost as much as an
 * error of TERM_ERROR_SHARE of the target's span at every point. Absent or 0: no term.
 */
export interface ObjectiveTerms {
  /** Weight of the size term: the motion's largest side beyond the target's span, in target spans. */
  readonly sizeWeight?: number;
  /** Weight of the transmission term: the worst transmission angle's shortfall from the guideline, as a share of the guideline. */
  readonly transmissionWeight?: number;
  /** The guideline, rad: μ within [guideline, π − guideline] costs nothing. Default DEFAULT_TRANSMISSION_GUIDELINE_RAD. */
  readonly transmissionGuidelineRad?: number;
}

/** The low end of the transmission guideline `loci analyze` reports against (40°, so 40° to 140°), rad. */
export const DEFAULT_TRANSMISSION_GUIDELINE_RAD = (TRANSMISSION_GUIDELINE_DEG.min * Math.PI) / 180;
/** The error share of the target's span a term of weight 1 and figure 1 costs (5 %): a dead point (transmission figure 1) at weight 1 costs as much as missing every point by a twentieth of the span. */
export const TERM_ERROR_SHARE = 0.05;
/** Largest weight of an objective term. */
export const MAX_TERM_WEIGHT = 1e6;

/**
 * Variable boxes per family, overriding the family's defaults by variable name. A
 * name without its index (`theta2`, `driver`) sets the box of every per-point driver
 * variable (`theta2_1`, `theta2_2`, …).
 */
export type BoundsOverrides = Readonly<Partial<Record<FamilyId, Readonly<Record<string, readonly [number, number]>>>>>;

/**
 * A path problem. The synthesis problem is a union by kind: this, or a rear-suspension
 * problem (suspensionProblem.ts); `SynthesisProblem` in the objective names the union.
 */
export interface Problem {
  readonly kind: 'path';
  readonly name: string;
  readonly target: Target;
  readonly timing: Timing;
  readonly placement: Placement;
  readonly families: readonly FamilyId[];
  readonly bounds: BoundsOverrides;
  readonly constraints: Constraints;
  /** What the search minimises; all three are reported for every candidate. */
  readonly measure: Measure;
  /**
   * How the search's box maps to the designs of a family (searchMap.ts), where it is not
   * the default 'affine'. The problem, its bounds and its values stay the same.
   */
  readonly searchMaps: SearchMaps;
  /** Terms added to the measure; absent when the problem has none. */
  readonly terms?: ObjectiveTerms;
}

export type SearchMaps = Readonly<Partial<Record<FamilyId, SearchMapKind>>>;

/** The same problem as plain data (a problem file's content after its schema). */
export interface ProblemInput {
  /** Absent in files written before problems had kinds: a path problem. */
  readonly kind?: 'path';
  readonly name: string;
  readonly target: {
    readonly points: readonly (readonly number[])[];
    readonly closed: boolean;
    readonly weights?: readonly number[];
  };
  readonly timing:
    | { readonly mode: 'prescribed'; readonly driverValues: readonly number[] }
    | { readonly mode: 'free'; readonly wrap: boolean; readonly refine?: boolean }
    | { readonly mode: 'unprescribed'; readonly wrap?: boolean; readonly samples?: number };
  readonly placement: Placement;
  readonly families: readonly FamilyId[];
  readonly bounds?: BoundsOverrides;
  readonly constraints?: Constraints;
  readonly measure?: Measure;
  readonly searchMaps?: SearchMaps;
  readonly terms?: ObjectiveTerms;
}

export interface ProblemIssue {
  /** Where, as a dotted path (`target.points[3]`, `bounds.fourbar-lengths.r1`). */
  readonly path: string;
  readonly message: string;
}

export type ProblemResult = { readonly ok: true; readonly problem: Problem } | { readonly ok: false; readonly issues: ProblemIssue[] };

// Limits on what a problem may hold, each checked when it is read so that every value
// reaching a computation is finite and of a size the computation can use.

/** Most points of a target: every evaluation visits each point. */
export const MAX_TARGET_POINTS = 5000;
/**
 * Largest |x| or |y| of a target point, mm (20 m): a fiftieth of the linkage's own limit
 * (MAX_COORDINATE_MM, 1 km). A design from the default boxes reaches about 13 spans from
 * the target's centre (ground pivots 3 spans away, links up to 3 spans, the coupler point
 * up to 3√2 from its link), and the span is at most twice this limit: 20 m + 13 × 40 m
 * stays within the linkage's limit, so every candidate of the defaults can be reported.
 */
export const MAX_TARGET_COORDINATE_MM = MAX_COORDINATE_MM / 50;
/**
 * Smallest span of a target (the larger side of its bounding box), mm. Default link
 * lengths start at 5 % of the span, and the kinematics takes joints closer than
 * COINCIDENT_JOINT_TOL_MM (1e-6 mm) for one joint: 1e-3 mm keeps them 50 times apart.
 */
export const MIN_TARGET_SPAN_MM = 1000 * COINCIDENT_JOINT_TOL_MM;
/**
 * Smallest span of a target as a share of its largest |coordinate| (1e-3). A linkage the
 * size of the target, with default links from 5 % of the span, has a reach over its
 * shortest link of about 20 / share: this keeps it five times inside the linkage's
 * MAX_REACH_OVER_SHORTEST_LINK, where rounding still lets the linkage close.
 */
export const MIN_TARGET_SPAN_SHARE = 100 / MAX_REACH_OVER_SHORTEST_LINK;
/** Largest weight of a target point; weights are relative, so this loses nothing. */
export const MAX_WEIGHT = 1e6;
/**
 * Largest |value| of a prescribed driver value, rad (about 16 turns either way). An
 * evaluation follows the mechanism over the whole range of driver values, so its cost
 * grows with the range; a range of thousands of turns made a search crawl.
 */
export const MAX_DRIVER_VALUE_RAD = 100;
/** Largest |lower| or |upper| of a variable's bounds (mm, rad or ground-link units, as the variable is): the linkage's coordinate limit. */
export const MAX_BOUND_MAGNITUDE = MAX_COORDINATE_MM;
/** Largest |x|, |y| or r of a keep-out circle, and largest link length limit, mm. */
export const MAX_CONSTRAINT_MM = MAX_COORDINATE_MM;

/** The span a target needs: MIN_TARGET_SPAN_MM, and MIN_TARGET_SPAN_SHARE of its largest |coordinate|. */
export function minTargetSpanMm(largestCoordinateMm: number): number {
  return Math.max(MIN_TARGET_SPAN_MM, MIN_TARGET_SPAN_SHARE * largestCoordinateMm);
}

/** Fewest and most curve samples of an unprescribed match. */
export const MIN_MATCH_SAMPLES = 16;
export const MAX_MATCH_SAMPLES = 20000;
export const DEFAULT_MATCH_SAMPLES = 180;

function finite(v: unknown): v is number {
  return typeof v === 'number' && Number.isFinite(v);
}

function checkBounds(bounds: BoundsOverrides | undefined, issues: ProblemIssue[]): void {
  if (bounds === undefined) return;
  for (const [family, boxes] of Object.entries(bounds)) {
    if (!(FAMILY_IDS as readonly string[]).includes(family)) {
      issues.push({ path: `bounds.${family}`, message: `"${family}" is not a family; expected one of ${FAMILY_IDS.join(', ')}` });
      continue;
    }
    for (const [name, box] of Object.entries(boxes ?? {})) {
      const path = `bounds.${family}.${name}`;
      if (!Array.isArray(box) || box.length !== 2 || !finite(box[0]) || !finite(box[1])) {
        issues.push({ path, message: 'expected [lower, upper], two finite numbers' });
        continue;
      }
      const [lo, hi] = box;
      if (!(Math.abs(lo) <= MAX_BOUND_MAGNITUDE && Math.abs(hi) <= MAX_BOUND_MAGNITUDE)) {
        issues.push({ path, message: `is [${lo}, ${hi}]; each bound may be at most ${MAX_BOUND_MAGNITUDE} in size (mm, rad or ground-link units, as the variable is)` });
      } else if (lo > hi) {
        issues.push({ path, message: `is [${lo}, ${hi}]: the lower bound ${lo} is above the upper bound ${hi}; expected [lower, upper] with lower < upper (did you mean [${hi}, ${lo}]?)` });
      } else if (!(lo < hi)) {
        issues.push({ path, message: `is [${lo}, ${hi}]: the lower and upper bounds are equal; expected [lower, upper] with lower < upper, a range to search` });
      }
    }
  }
}

/**
 * Every bound names a variable of its family (with free timing, also a per-point driver
 * variable or their common prefix), so building an objective from the problem never
 * meets an unknown name.
 */
function checkBoundNames(input: ProblemInput, issues: ProblemIssue[]): void {
  const n = input.target.points.length;
  for (const [family, boxes] of Object.entries(input.bounds ?? {})) {
    const own = mechanismVariableNames(family, input.placement);
    if (own === null) continue; // an unknown family is reported by checkBounds
    const prefix = driverVariablePrefix(family);
    const perPoint = input.timing.mode === 'free';
    for (const name of Object.keys(boxes ?? {})) {
      const index = perPoint && name.startsWith(`${prefix}_`) ? Number(name.slice(prefix.length + 1)) : NaN;
      const known = own.includes(name) || (perPoint && (name === prefix || (Number.isInteger(index) && index >= 1 && index <= n)));
      if (!known) {
        const quoted = own.map((v) => JSON.stringify(v)).join(', ');
        const extra = perPoint ? `, "${prefix}_1" … "${prefix}_${n}" (or "${prefix}" for every per-point driver value)` : '';
        issues.push({ path: `bounds.${family}.${name}`, message: `"${name}" is not a variable of ${family} here; expected one of ${quoted}${extra}` });
      }
    }
  }
}

/** Coordinates within MAX_TARGET_COORDINATE_MM, a span the kinematics can represent, weights within MAX_WEIGHT. */
function checkTargetRange(target: Target, issues: ProblemIssue[]): void {
  const p = target.points;
  const n = p.length / 2;
  let largest = 0;
  let outside = false;
  for (let i = 0; i < n; i++) {
    const m = Math.max(Math.abs(p[2 * i]), Math.abs(p[2 * i + 1]));
    if (!(m <= MAX_TARGET_COORDINATE_MM)) {
      issues.push({ path: `target.points[${i}]`, message: `is [${p[2 * i]}, ${p[2 * i + 1]}]; each coordinate must be within ±${MAX_TARGET_COORDINATE_MM} mm (move the target nearer the origin)` });
      outside = true;
    } else if (m > largest) largest = m;
  }
  if (!outside) {
    // The span the default boxes are scaled by (encoding.ts).
    const spanMm = targetFrame(p).size;
    const needed = minTargetSpanMm(largest);
    if (!(spanMm >= needed)) {
      issues.push({
        path: 'target.points',
        message: `span ${spanMm} mm (the larger side of their bounding box); a target must span at least ${needed} mm (${MIN_TARGET_SPAN_MM} mm, and ${MIN_TARGET_SPAN_SHARE} × its largest coordinate) for its shape to be represented`,
      });
    }
  }
  target.weights?.forEach((w, i) => {
    if (!(w <= MAX_WEIGHT)) issues.push({ path: `target.weights[${i}]`, message: `is ${w}; expected a weight from 0 to ${MAX_WEIGHT} (weights are relative: scale them down)` });
  });
}

function checkConstraints(c: Constraints | undefined, issues: ProblemIssue[]): void {
  if (c === undefined) return;
  if (c.minTransmissionRad !== undefined && !(finite(c.minTransmissionRad) && c.minTransmissionRad >= 0 && c.minTransmissionRad <= Math.PI / 2)) {
    issues.push({ path: 'constraints.minTransmissionRad', message: `is ${c.minTransmissionRad}; expected an angle in [0, π/2] rad` });
  }
  if (c.linkLengthMm !== undefined) {
    const [lo, hi] = c.linkLengthMm;
    if (!(finite(lo) && finite(hi) && lo >= 0 && lo < hi && hi <= MAX_CONSTRAINT_MM)) {
      issues.push({ path: 'constraints.linkLengthMm', message: `is [${lo}, ${hi}]; expected [min, max] mm with 0 ≤ min < max ≤ ${MAX_CONSTRAINT_MM}` });
    }
  }
  if (c.maxSizeMm !== undefined && !(finite(c.maxSizeMm) && c.maxSizeMm > 0 && c.maxSizeMm <= MAX_CONSTRAINT_MM)) {
    issues.push({ path: 'constraints.maxSizeMm', message: `is ${c.maxSizeMm}; expected a size in mm above 0 and at most ${MAX_CONSTRAINT_MM}` });
  }
  c.keepOut?.forEach((k, i) => {
    const within = (v: number) => Math.abs(v) <= MAX_CONSTRAINT_MM;
    if (!(finite(k.x) && finite(k.y) && finite(k.r) && k.r > 0 && within(k.x) && within(k.y) && within(k.r))) {
      issues.push({ path: `constraints.keepOut[${i}]`, message: `is { x: ${k.x}, y: ${k.y}, r: ${k.r} }; expected a circle in mm with r > 0 and x, y and r each at most ${MAX_CONSTRAINT_MM} in size` });
    }
  });
}

function checkTerms(t: ObjectiveTerms | undefined, issues: ProblemIssue[]): void {
  if (t === undefined) return;
  for (const key of ['sizeWeight', 'transmissionWeight'] as const) {
    const w = t[key];
    if (w !== undefined && !(finite(w) && w >= 0 && w <= MAX_TERM_WEIGHT)) {
      issues.push({ path: `terms.${key}`, message: `is ${w}; expected a weight from 0 (no term) to ${MAX_TERM_WEIGHT}` });
    }
  }
  const g = t.transmissionGuidelineRad;
  if (g !== undefined && !(finite(g) && g > 0 && g <= Math.PI / 2)) {
    issues.push({ path: 'terms.transmissionGuidelineRad', message: `is ${g}; expected an angle above 0 and at most π/2 rad (the common guideline is 40°, ${DEFAULT_TRANSMISSION_GUIDELINE_RAD} rad)` });
  }
}

/** Checks plain problem data and returns the problem with typed-array copies, or every issue found. */
export function createProblem(input: ProblemInput): ProblemResult {
  const issues: ProblemIssue[] = [];
  const n = input.target.points.length;
  if (n > MAX_TARGET_POINTS) {
    // Refused before each point is read: the answer is the same, and it is quick.
    return { ok: false, issues: [{ path: 'target.points', message: `has ${n} points; a target may have at most ${MAX_TARGET_POINTS} (resample it first)` }] };
  }
  const target = validateTarget(input.target.points, input.target.closed, input.target.weights, issues);
  if (target !== null) checkTargetRange(target, issues);

  let timing: Timing;
  const t = input.timing;
  if (t.mode === 'prescribed') {
    if (t.driverValues.length !== n) {
      issues.push({ path: 'timing.driverValues', message: `has ${t.driverValues.length} values; expected one per target point (${n})` });
    }
    t.driverValues.forEach((v, i) => {
      if (!(finite(v) && Math.abs(v) <= MAX_DRIVER_VALUE_RAD)) {
        issues.push({ path: `timing.driverValues[${i}]`, message: `is ${v} rad; expected a driver value from −${MAX_DRIVER_VALUE_RAD} to ${MAX_DRIVER_VALUE_RAD} rad` });
      }
    });
    timing = { mode: 'prescribed', driverValues: Float64Array.from(t.driverValues) };
  } else if (t.mode === 'free') {
    timing = { mode: 'free', wrap: t.wrap, refine: t.refine === true };
  } else {
    const samples = t.samples ?? DEFAULT_MATCH_SAMPLES;
    if (!(Number.isInteger(samples) && samples >= MIN_MATCH_SAMPLES && samples <= MAX_MATCH_SAMPLES)) {
      issues.push({ path: 'timing.samples', message: `is ${samples}; expected an integer from ${MIN_MATCH_SAMPLES} to ${MAX_MATCH_SAMPLES}` });
    }
    timing = { mode: 'unprescribed', wrap: t.wrap ?? true, samples };
  }

  if (input.families.length === 0) issues.push({ path: 'families', message: 'is empty; expected at least one family' });
  input.families.forEach((f, i) => {
    const first = input.families.indexOf(f);
    if (!FAMILY_IDS.includes(f)) issues.push({ path: `families[${i}]`, message: `"${f}" is not a family; expected one of ${FAMILY_IDS.join(', ')}` });
    else if (first < i) issues.push({ path: `families[${i}]`, message: `"${f}" is listed twice (also families[${first}]); expected each family once` });
  });
  checkBounds(input.bounds, issues);
  checkBoundNames(input, issues);
  checkConstraints(input.constraints, issues);
  checkTerms(input.terms, issues);
  const searchMaps: Partial<Record<FamilyId, SearchMapKind>> = {};
  for (const [family, kind] of Object.entries(input.searchMaps ?? {})) {
    const path = `searchMaps.${family}`;
    if (!input.families.includes(family as FamilyId)) {
      issues.push({ path, message: `"${family}" is not one of the problem's families (${input.families.join(', ')})` });
    } else if (!(SEARCH_MAP_KINDS as readonly unknown[]).includes(kind)) {
      issues.push({ path, message: `is ${JSON.stringify(kind)}; expected one of ${SEARCH_MAP_KINDS.join(', ')}` });
    } else {
      const misfit = searchMapMisfit(kind, family, input.placement);
      if (misfit !== null) issues.push({ path, message: misfit });
      else searchMaps[family as FamilyId] = kind;
    }
  }
  if (issues.length > 0 || target === null) return { ok: false, issues };

  const bounds: Partial<Record<FamilyId, Record<string, readonly [number, number]>>> = {};
  for (const [family, boxes] of Object.entries(input.bounds ?? {})) {
    const copy: Record<string, readonly [number, number]> = {};
    for (const [name, box] of Object.entries(boxes ?? {})) copy[name] = [box[0], box[1]];
    bounds[family as FamilyId] = copy;
  }
  const c = input.constraints ?? {};
  const constraints: Constraints = {
    ...(c.fullTurnCrank === undefined ? {} : { fullTurnCrank: c.fullTurnCrank }),
    ...(c.minTransmissionRad === undefined ? {} : { minTransmissionRad: c.minTransmissionRad }),
    ...(c.linkLengthMm === undefined ? {} : { linkLengthMm: [c.linkLengthMm[0], c.linkLengthMm[1]] as const }),
    ...(c.keepOut === undefined ? {} : { keepOut: c.keepOut.map((k) => ({ x: k.x, y: k.y, r: k.r })) }),
    ...(c.branch === undefined ? {} : { branch: c.branch }),
    ...(c.maxSizeMm === undefined ? {} : { maxSizeMm: c.maxSizeMm }),
  };
  const terms = input.terms;
  return {
    ok: true,
    problem: {
      kind: 'path',
      name: input.name,
      target,
      timing,
      placement: input.placement,
      families: [...input.families],
      bounds,
      constraints,
      measure: input.measure ?? 'sum-of-squares',
      searchMaps,
      ...(terms === undefined
        ? {}
        : {
            terms: {
              ...(terms.sizeWeight === undefined ? {} : { sizeWeight: terms.sizeWeight }),
              ...(terms.transmissionWeight === undefined ? {} : { transmissionWeight: terms.transmissionWeight }),
              ...(terms.transmissionGuidelineRad === undefined ? {} : { transmissionGuidelineRad: terms.transmissionGuidelineRad }),
            },
          }),
    },
  };
}
