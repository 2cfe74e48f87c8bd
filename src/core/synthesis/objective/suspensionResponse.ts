/**
 * The response of a rear-suspension layout to one design: the layout's plan is compiled
 * once, each design sets its reference pose (the pivots at full extension, the axle at
 * the bicycle's, the shock's frame eye the eye-to-eye length away), then the shock is
 * stepped through its stroke and the suspension kernel (fillCurveSteps) fills every
 * curve the targets read. Feasibility is added into violation slots: a lock inside the
 * stroke, an axle that does not rise, a cog that overlaps the chainring, a pivot or a
 * moving link inside a keep-out circle. Allocates nothing per design.
 */
import { compile, linkJointPairs, runWithRates, setReferencePose, type Plan } from '../../linkage';
import {
  AXLE_POINT,
  SHOCK_EYE,
  SHOCK_FRAME_EYE,
  LAYOUT_PIVOTS,
  buildLayout,
  demoPivots,
  pitchRadiusMm,
  type LayoutKind,
  type ValidBicycle,
  type LayoutAxleBody,
  type ShockBodies,
} from '../../suspension';
import { chainAtFullExtensionInto, createChain0, createCurves, createCurveScratch, fillCurveSteps, type CurveContext, type SuspensionCurves } from '../../suspension/curves';
import { layoutBodiesOf, type SuspensionKeepOut, type SuspensionProblem } from '../suspensionProblem';

/** Violation slots of a suspension design; each normalised (~1 = badly broken). */
export const S_BOUNDS = 0;
/** The layout locks inside the stroke (or its drawing is degenerate): the share of the stroke it cannot reach. */
export const S_LOCK = 1;
/** The axle does not rise as the shock shortens: the share of the steps where LR ≤ 0. */
export const S_REVERSAL = 2;
/** A cog overlaps the chainring: the share of the steps where it does. */
export const S_CHAIN = 3;
export const S_KEEP_OUT = 4;
/** Curve targets reach beyond the travel the design gives: the shortfall over the farthest target travel. */
export const S_TRAVEL = 5;
/** Bands and limits set as constraints: their normalised deviations. */
export const S_BAND = 6;
/** A figure a target reads is undefined (NaN) for this design. */
export const S_UNDEFINED = 7;
export const S_SLOTS = 8;

export const SUSPENSION_DEFECT_NAMES: readonly string[] = [
  'pivot outside its region (variable outside its bounds)',
  'locks inside the stroke: cannot give the travel (or the drawing is degenerate)',
  'the axle does not rise as the shock shortens (leverage ratio ≤ 0)',
  'a cog overlaps the chainring: no chain line',
  'a pivot or a moving link enters a keep-out circle',
  'gives less wheel travel than the curve targets reach',
  'a band or limit set as a constraint is not met',
  'a target figure is undefined for this design',
];

export interface SuspensionResponse {
  readonly kind: LayoutKind;
  readonly plan: Plan;
  readonly names: readonly string[];
  /** The pivots (joint ids) that are design variables, in design-vector order, two numbers each. */
  readonly pivotIds: readonly string[];
  readonly steps: number;
  /** Samples the last design reached before a lock (steps when none). */
  reached: number;
  readonly curves: SuspensionCurves;
  /** The cogs the curves hold (teeth), the union of those the targets read. */
  readonly cogTeeth: readonly number[];
  readonly parts: Float64Array;
  readonly axleBody: LayoutAxleBody;
  /** The bodies the shock joins (a six-bar's choice; the default for the other kinds). */
  readonly shock: ShockBodies;
  /** Sets the design, steps the stroke, fills the curves and the feasibility slots (not S_BOUNDS, S_TRAVEL, S_BAND, S_UNDEFINED). */
  respond(x: Float64Array): void;
  /** The design's pivots (the shock's frame eye included), for its linkage. */
  pivotsOf(x: Float64Array): Record<string, { x: number; y: number }>;
}

/** The cogs (teeth) whose curves the targets read, in the bicycle's order. */
function scoredCogs(problem: SuspensionProblem): number[] {
  const t = problem.targets;
  const wanted = new Set<number>([...(t.antiSquatAtSag?.cogs ?? []), ...(t.chainGrowthMm?.cogs ?? []), ...(t.kickbackDeg?.cogs ?? [])]);
  return problem.bicycle.cogTeeth.filter((z, i) => wanted.has(z) && problem.bicycle.cogTeeth.indexOf(z) === i);
}

/** Normalised depth of point (px, py) inside circle c: (r − d) / r, 0 outside; 1 for NaN. */
function depth(px: number, py: number, c: SuspensionKeepOut): number {
  // sqrt, not Math.hypot: V8's hypot boxes its arguments, and this runs per joint, circle and step.
  const dx = px - c.x;
  const dy = py - c.y;
  const d = Math.sqrt(dx * dx + dy * dy);
  if (d >= c.r) return 0;
  return Number.isNaN(d) ? 1 : (c.r - d) / c.r;
}

/** Normalised depth of segment (ax, ay)–(bx, by) inside circle c, by the distance from the centre to the segment. */
function segmentDepth(ax: number, ay: number, bx: number, by: number, c: SuspensionKeepOut): number {
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  let s = len2 > 0 ? ((c.x - ax) * dx + (c.y - ay) * dy) / len2 : 0;
  s = s < 0 ? 0 : s > 1 ? 1 : s;
  return depth(ax + s * dx, ay + s * dy, c);
}

export function createSuspensionResponse(problem: SuspensionProblem, kind: LayoutKind, names: readonly string[]): SuspensionResponse {
  const bicycle: ValidBicycle = problem.bicycle;
  const axle = bicycle.rearAxleMm;
  const { axleBody: axleBodyId, shock } = layoutBodiesOf(problem, kind);
  const compiled = compile(buildLayout(kind, demoPivots(kind), axle, axleBodyId, shock));
  if (!compiled.ok) throw new Error(`layout ${kind} does not compile: ${compiled.issues.map((i) => `${i.where}: ${i.message}`).join('; ')}`);
  const plan = compiled.plan;
  const stride = 2 * plan.slotCount;
  const slotAt = (id: string) => 2 * (plan.slotIndex.get(id) as number);
  const pivotIds = LAYOUT_PIVOTS[kind].filter((p) => p !== SHOCK_FRAME_EYE);
  const pivotSlots = Int32Array.from(pivotIds, slotAt);
  const eyeAt = slotAt(SHOCK_EYE);
  const frameEyeAt = slotAt(SHOCK_FRAME_EYE);
  const axleAt = slotAt(AXLE_POINT);
  const axlePoint = plan.linkage.points?.find((p) => p.id === AXLE_POINT);
  const axleBody = plan.bodyIndex.get(axlePoint?.body ?? '') as number;
  const axleBodySlots = plan.bodies[axleBody].slots;
  const angleIndex = names.length - 1;
  const { eyeToEyeMm, strokeMm } = bicycle.shock;
  const steps = problem.steps;

  const cogTeeth = scoredCogs(problem);
  const pitch = bicycle.chainPitchMm;
  const ringRadiusMm = pitchRadiusMm(bicycle.chainringTeeth, pitch);
  const cogRadiusMm = Float64Array.from(cogTeeth, (z) => pitchRadiusMm(z, pitch));
  let largestCogMm = 0;
  for (const z of bicycle.cogTeeth) largestCogMm = Math.max(largestCogMm, pitchRadiusMm(z, pitch));

  // The kernel's context, per design: the search takes no spring (wheel rate is not a target).
  const ctx: { -readonly [K in keyof CurveContext]: CurveContext[K] } = {
    plan,
    bicycle: { ...bicycle, spring: null },
    eyeToEyeMm,
    axleBody,
    axleAt,
    axleRefAt: axleAt,
    brakeBody: -1,
    brakeAt: -1,
    brakeRefAt: -1,
    cogRadiusMm,
    ringRadiusMm,
    axleX0: axle.x,
    axleY0: axle.y,
    chain0: createChain0(cogTeeth.length),
    bodyDx0: 0,
    bodyDy0: 0,
    scratch: createCurveScratch(plan, steps),
  };
  const curves = createCurves(steps, cogTeeth.length, false, false, cogTeeth);
  const sw = { values: new Float64Array(steps), poses: new Float64Array(steps * stride), rates: new Float64Array(steps * stride) };
  const reference = new Float64Array(stride);
  const pose = new Float64Array(stride);
  const rate = new Float64Array(stride);
  const parts = new Float64Array(S_SLOTS);
  const keepOut = problem.keepOut;
  // The links drawn as segments.
  const segments = linkJointPairs(plan);
  const jointCount = plan.jointIds.length;
  const moving = new Uint8Array(jointCount);
  for (let b = 1; b < plan.bodies.length; b++) for (const s of plan.bodies[b].slots) if (s < jointCount) moving[s] = 1;
  const spacing = -strokeMm / (steps - 1);
  for (let k = 0; k < steps; k++) sw.values[k] = eyeToEyeMm + spacing * k;

  const response: SuspensionResponse = {
    kind,
    plan,
    names,
    pivotIds,
    steps,
    reached: 0,
    curves,
    cogTeeth,
    parts,
    axleBody: axleBodyId,
    shock,
    respond,
    pivotsOf,
  };

  function setDesign(x: Float64Array): void {
    reference.set(plan.reference);
    for (let i = 0; i < pivotSlots.length; i++) {
      reference[pivotSlots[i]] = x[2 * i];
      reference[pivotSlots[i] + 1] = x[2 * i + 1];
    }
    const a = x[angleIndex];
    reference[frameEyeAt] = reference[eyeAt] + eyeToEyeMm * Math.cos(a);
    reference[frameEyeAt + 1] = reference[eyeAt + 1] + eyeToEyeMm * Math.sin(a);
    reference[axleAt] = axle.x;
    reference[axleAt + 1] = axle.y;
    setReferencePose(plan, reference);
  }

  function pivotsOf(x: Float64Array): Record<string, { x: number; y: number }> {
    setDesign(x);
    const out: Record<string, { x: number; y: number }> = {};
    for (const id of LAYOUT_PIVOTS[kind]) out[id] = { x: reference[slotAt(id)], y: reference[slotAt(id) + 1] };
    return out;
  }

  /** The slot of the axle body farthest from the axle in the reference pose (as suspensionCurves picks it). */
  function farthestFromAxle(): number {
    let best = axleAt;
    let bestD = 0;
    for (let i = 0; i < axleBodySlots.length; i++) {
      const s = 2 * axleBodySlots[i];
      const dx = reference[s] - reference[axleAt];
      const dy = reference[s + 1] - reference[axleAt + 1];
      const d = Math.sqrt(dx * dx + dy * dy);
      if (d > bestD) {
        bestD = d;
        best = s;
      }
    }
    return best;
  }

  /**
   * The kernel's full-extension state: axle, body direction, the chain per cog. Its own
   * small function, so the calls with doubles inside are inlined (a call V8 does not
   * inline boxes each double it passes).
   */
  function setFullExtension(): void {
    const ax0 = sw.poses[axleAt];
    const ay0 = sw.poses[axleAt + 1];
    ctx.axleX0 = ax0;
    ctx.axleY0 = ay0;
    ctx.axleRefAt = farthestFromAxle();
    ctx.bodyDx0 = reference[ctx.axleRefAt] - ax0;
    ctx.bodyDy0 = reference[ctx.axleRefAt + 1] - ay0;
    chainAtFullExtensionInto(ax0, ay0, cogRadiusMm, ringRadiusMm, ctx.chain0, ctx.scratch.run);
  }

  function keepOutDepth(reached: number): number {
    if (keepOut.length === 0) return 0;
    let fixedDepth = 0;
    let movingDepth = 0;
    for (let q = 0; q < keepOut.length; q++) {
      const c = keepOut[q];
      for (let j = 0; j < jointCount; j++) if (moving[j] === 0) fixedDepth += depth(reference[2 * j], reference[2 * j + 1], c);
      for (let k = 0; k < reached; k++) {
        const at = k * stride;
        for (let j = 0; j < jointCount; j++) if (moving[j] === 1) movingDepth += depth(sw.poses[at + 2 * j], sw.poses[at + 2 * j + 1], c);
        for (let g = 0; g < segments.length; g += 2) {
          const p = at + segments[g];
          const r = at + segments[g + 1];
          movingDepth += segmentDepth(sw.poses[p], sw.poses[p + 1], sw.poses[r], sw.poses[r + 1], c);
        }
      }
    }
    return fixedDepth + (reached > 0 ? movingDepth / reached : 0);
  }

  function respond(x: Float64Array): void {
    parts.fill(0);
    setDesign(x);
    pose.set(plan.reference);
    let reached = 0;
    for (let k = 0; k < steps; k++) {
      // Warm-started from the previous step, as a sweep is, so a Newton block keeps its branch.
      if (!runWithRates(plan, sw.values[k], pose, rate)) break;
      sw.poses.set(pose, k * stride);
      sw.rates.set(rate, k * stride);
      reached++;
    }
    response.reached = reached;
    parts[S_LOCK] = reached >= steps ? 0 : reached === 0 ? 1 + 1 / (steps - 1) : (steps - reached) / (steps - 1);
    if (reached === 0) return;

    setFullExtension();
    fillCurveSteps(ctx, sw, reached, curves);

    let reversed = 0;
    let overlapping = 0;
    for (let k = 0; k < reached; k++) {
      const lr = curves.leverageRatio[k];
      if (!(lr > 0 && lr < Infinity)) reversed++;
      const ax = curves.axleXMm[k];
      const ay = curves.axleYMm[k];
      if (!(Math.sqrt(ax * ax + ay * ay) > largestCogMm + ringRadiusMm)) overlapping++;
    }
    parts[S_REVERSAL] = reversed / reached;
    parts[S_CHAIN] = overlapping / reached;
    parts[S_KEEP_OUT] = keepOutDepth(reached);
  }

  return response;
}
