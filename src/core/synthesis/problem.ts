/**
 * The in-memory synthesis problem: validated once here, with defensive copies, so an
 * objective built from it trusts its input. `createProblem` takes plain data (as a
 * problem file or a worker message carries it) and says what is wrong, field by field.
 */

import { SEARCH_MAP_KINDS, searchMapMisfit, type SearchMapKind } from './searchMap';
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
   * curve, staying between its neighbours; evaluate then writes the refined values back
   * into x (Lamarckian). Default false: the values are taken as given.
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
  /** The crank must turn fully: Grashof with the crank shortest (s + l ≤ p + q). */
  readonly fullTurnCrank?: boolean;
  /**
   * Slack of the Grashof test as a share of the longest link: s + l − (p + q) ≤ tol · l
   * counts as Grashof. Default 0. Change-point designs (s + l = p + q) sit exactly on
   * the boundary; a small slack lets a search approach them from both sides.
   */
  readonly grashofTolerance?: number;
  /** Smallest transmission angle allowed, rad (μ and π − μ both at least this). */
  readonly minTransmissionRad?: number;
  /** Every link length within [min, max], mm. */
  readonly linkLengthMm?: readonly [number, number];
  /** Ground pivots must stay outside these circles (mm). */
  readonly keepOut?: readonly KeepOutCircle[];
  /** Assembly branch of `fourbar-lengths`; default 'open'. Pose-based families take theirs from the reference pose. */
  readonly branch?: Branch;
}

/**
 * Variable boxes per family, overriding the family's defaults by variable name. A
 * name without its index (`theta2`, `driver`) sets the box of every per-point driver
 * variable (`theta2_1`, `theta2_2`, …).
 */
export type BoundsOverrides = Readonly<Partial<Record<FamilyId, Readonly<Record<string, readonly [number, number]>>>>>;

export interface Problem {
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
}

export type SearchMaps = Readonly<Partial<Record<FamilyId, SearchMapKind>>>;

/** The same problem as plain data (a problem file's content after its schema). */
export interface ProblemInput {
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
}

export interface ProblemIssue {
  /** Where, as a dotted path (`target.points[3]`, `bounds.fourbar-lengths.r1`). */
  readonly path: string;
  readonly message: string;
}

export type ProblemResult = { readonly ok: true; readonly problem: Problem } | { readonly ok: false; readonly issues: ProblemIssue[] };

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
      } else if (!(box[0] < box[1])) {
        issues.push({ path, message: `lower ${box[0]} is not below upper ${box[1]}` });
      }
    }
  }
}

function checkConstraints(c: Constraints | undefined, issues: ProblemIssue[]): void {
  if (c === undefined) return;
  if (c.grashofTolerance !== undefined && !(finite(c.grashofTolerance) && c.grashofTolerance >= 0 && c.grashofTolerance < 1)) {
    issues.push({ path: 'constraints.grashofTolerance', message: `is ${c.grashofTolerance}; expected a share of the longest link in [0, 1)` });
  }
  if (c.minTransmissionRad !== undefined && !(finite(c.minTransmissionRad) && c.minTransmissionRad >= 0 && c.minTransmissionRad <= Math.PI / 2)) {
    issues.push({ path: 'constraints.minTransmissionRad', message: `is ${c.minTransmissionRad}; expected an angle in [0, π/2] rad` });
  }
  if (c.linkLengthMm !== undefined) {
    const [lo, hi] = c.linkLengthMm;
    if (!(finite(lo) && finite(hi) && lo >= 0 && lo < hi)) {
      issues.push({ path: 'constraints.linkLengthMm', message: `is [${lo}, ${hi}]; expected [min, max] mm with 0 ≤ min < max` });
    }
  }
  c.keepOut?.forEach((k, i) => {
    if (!(finite(k.x) && finite(k.y) && finite(k.r) && k.r > 0)) {
      issues.push({ path: `constraints.keepOut[${i}]`, message: 'expected a circle { x, y, r } in mm with finite centre and r > 0' });
    }
  });
}

/** Checks plain problem data and returns the problem with typed-array copies, or every issue found. */
export function createProblem(input: ProblemInput): ProblemResult {
  const issues: ProblemIssue[] = [];
  const target = validateTarget(input.target.points, input.target.closed, input.target.weights, issues);
  const n = input.target.points.length;

  let timing: Timing;
  const t = input.timing;
  if (t.mode === 'prescribed') {
    if (t.driverValues.length !== n) {
      issues.push({ path: 'timing.driverValues', message: `has ${t.driverValues.length} values; expected one per target point (${n})` });
    }
    t.driverValues.forEach((v, i) => {
      if (!finite(v)) issues.push({ path: `timing.driverValues[${i}]`, message: `is ${v}; expected a finite driver value` });
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
    if (!FAMILY_IDS.includes(f)) issues.push({ path: `families[${i}]`, message: `"${f}" is not a family; expected one of ${FAMILY_IDS.join(', ')}` });
  });
  checkBounds(input.bounds, issues);
  checkConstraints(input.constraints, issues);
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
    ...(c.grashofTolerance === undefined ? {} : { grashofTolerance: c.grashofTolerance }),
    ...(c.minTransmissionRad === undefined ? {} : { minTransmissionRad: c.minTransmissionRad }),
    ...(c.linkLengthMm === undefined ? {} : { linkLengthMm: [c.linkLengthMm[0], c.linkLengthMm[1]] as const }),
    ...(c.keepOut === undefined ? {} : { keepOut: c.keepOut.map((k) => ({ x: k.x, y: k.y, r: k.r })) }),
    ...(c.branch === undefined ? {} : { branch: c.branch }),
  };
  return {
    ok: true,
    problem: {
      name: input.name,
      target,
      timing,
      placement: input.placement,
      families: [...input.families],
      bounds,
      constraints,
      measure: input.measure ?? 'sum-of-squares',
      searchMaps,
    },
  };
}
