/**
 * The report of one design of a path problem: the response of its best branch, its
 * defects in words, and the design as a linkage drawn at target point 1 with the
 * figures `loci analyze` gives over its own motion. Allocates; for the archive and the
 * top candidates only.
 */
import { compile } from '../../linkage';
import { DEFECT_NAMES, V_ASSEMBLY, V_BRANCH, V_CRANK, V_SLOTS } from '../encoding';
import { MOTION_ANALYSIS_STEPS, candidateFigures, type CandidateMotionRange } from '../candidateFigures';
import { errorSummary } from '../measures';
import type { FamilyId, Problem } from '../problem';
import { SIM_A, SIM_B, SIM_TX, SIM_TY } from '../../geometry';
import { variableRecord, type PathDesignSpace } from './designSpace';
import { violatedSlotNames } from './score';
import { PE_PENALTY, PE_SIZE_VIOLATION, PE_TRANSMISSION_VIOLATION } from './pathExtent';
import type { PathResponse } from './pathResponse';
import type { CandidateReport } from './types';

const TAU = 2 * Math.PI;

/** The defects that mean a lock on the way: the motion analysis finding one adds none of its own. */
const LOCK_DEFECTS: readonly string[] = [DEFECT_NAMES[V_CRANK], DEFECT_NAMES[V_ASSEMBLY], DEFECT_NAMES[V_BRANCH]];
/** Violation counted for a lock only the motion analysis met (the share of a turn of one of its 1° steps). */
const MISSED_LOCK_VIOLATION = 1 / 360;
/**
 * Violation counted for a design whose linkage cannot be analysed (it breaks a limit of
 * the linkage file, such as its reach over its shortest link): as much as a design that
 * does not assemble at all, so it ranks below every design that can be built.
 */
const UNANALYSABLE_VIOLATION = 1;
/** The defect of a motion larger than the problem's size limit. */
export const SIZE_DEFECT = 'motion larger than the size limit';
/** The defect of a motion within the limit but inside the margin the search keeps below it (pathExtent.ts). */
export const SIZE_MARGIN_DEFECT = 'motion within the sampling margin of the size limit (counted over it)';

/** The defect of a transmission angle below the problem's least one somewhere along the motion. */
export const TRANSMISSION_DEFECT = 'transmission angle below the least allowed along the motion';
/** The defect of a worst angle at or above the limit but inside the margin the search keeps above it (pathExtent.ts). */
export const TRANSMISSION_MARGIN_DEFECT = 'transmission angle within the sampling margin of the least allowed (counted below it)';

/** A motion shorter than this (rad) is none: the figures are taken over a full turn. */
const MIN_MOTION_RAD = 1e-9;

export function describePathDesign(problem: Problem, family: FamilyId, space: PathDesignSpace, response: PathResponse, xIn: Float64Array): CandidateReport {
  const { encoding, names, mechanismDim: m } = space;
  const { n, times, parts, unwrapped, points, d2, sim, evaluation, weights, refineFree } = response;
  const freePlacement = problem.placement === 'free';
  const x = Float64Array.from(xIn);
  const best = response.evaluateAll(x);
  if (refineFree) for (let i = 0; i < n; i++) x[m + i] = times[best * n + i];
  // Leave the scratch (points, parts, sim, unwrapped) describing the kept branch.
  response.evaluateBranch(x, best, false);
  const value = evaluation[2 * best];
  let violation = evaluation[2 * best + 1];
  const defects = violatedSlotNames(parts, V_SLOTS, DEFECT_NAMES);
  const t = times.slice(best * n, best * n + n);
  const path = unwrapped.slice(0, n);
  const sa = freePlacement ? sim[SIM_A] : 1;
  const sb = freePlacement ? sim[SIM_B] : 0;
  const tx = freePlacement ? sim[SIM_TX] : 0;
  const ty = freePlacement ? sim[SIM_TY] : 0;
  // Drawn at target point 1, so the exported pose sits on the fitted motion; where that
  // pose does not compile (it does not assemble there), in the design's own reference.
  let part = encoding.report(t[0], sa, sb, tx, ty);
  let compiled = compile(part.linkage);
  if (!compiled.ok && part.drawnAt !== 0) {
    part = encoding.report(0, sa, sb, tx, ty);
    compiled = compile(part.linkage);
  }
  // Both frames measure the same input (a rotation about the same pivot; the placement
  // is a similarity without reflection), so they differ by a constant.
  const offset = compiled.ok ? compiled.plan.driverReferenceValue - part.drawnAt : 0;
  const motion = motionRange(path, offset, part.turnsFully);
  const found = compiled.ok
    ? candidateFigures(compiled.plan, motion)
    : { ok: false as const, reason: compiled.issues[0].message };
  // A design the search could evaluate but the analysis cannot take (past a linkage
  // limit) is reported, not thrown: infeasible, with the reason, so a run keeps its results.
  const figures = found.ok ? found.figures : { locks: [] };
  if (!found.ok) {
    defects.push(`the design cannot be analysed: ${found.reason}`);
    violation += UNANALYSABLE_VIOLATION;
  }
  if (figures.locks.length > 0 && !defects.some((d) => LOCK_DEFECTS.includes(d))) {
    // The analysis meets a lock the search's checks did not: say so, and count it.
    defects.push(DEFECT_NAMES[V_BRANCH]);
    violation += MISSED_LOCK_VIOLATION;
  }
  const maxSizeMm = problem.constraints.maxSizeMm;
  if (maxSizeMm !== undefined && found.ok) {
    // The limit on the analysed motion (the candidate's own), not only on the search's samples.
    const box = found.figures.sizeMm;
    const sizeMm = box === undefined ? Infinity : Math.max(box.widthMm, box.heightMm);
    const searchExcess = response.extent === null ? 0 : response.extent.figures[PE_SIZE_VIOLATION];
    const excess = sizeMm <= maxSizeMm ? 0 : sizeMm < Infinity ? (sizeMm - maxSizeMm) / maxSizeMm : 1;
    if (excess > 0) defects.push(SIZE_DEFECT);
    else if (searchExcess > 0) defects.push(SIZE_MARGIN_DEFECT);
    if (!(searchExcess > 0)) violation += excess;
  }
  const minMu = problem.constraints.minTransmissionRad ?? 0;
  if (minMu > 0 && found.ok) {
    // The limit on the analysed motion's exact range, as for the size: the range the candidate reports.
    const range = found.figures.transmissionDeg;
    const worstRad = range === undefined ? NaN : (Math.min(range.min, 180 - range.max) * Math.PI) / 180;
    const searchShortfall = response.extent === null ? 0 : response.extent.figures[PE_TRANSMISSION_VIOLATION];
    const shortfall = worstRad >= minMu ? 0 : worstRad >= 0 ? (minMu - worstRad) / minMu : 0;
    if (shortfall > 0) defects.push(TRANSMISSION_DEFECT);
    else if (searchShortfall > 0) defects.push(TRANSMISSION_MARGIN_DEFECT);
    if (!(searchShortfall > 0)) violation += shortfall;
  }
  const feasible = violation <= 0;
  const grashof = found.ok ? (found.figures.grashof ?? part.grashof) : part.grashof;
  return {
    family,
    x: Array.from(x),
    variables: variableRecord(names, x),
    error: errorSummary(d2, n, weights),
    value,
    ...(response.extent === null || !(response.extent.figures[PE_PENALTY] > 0) ? {} : { termsValue: response.extent.figures[PE_PENALTY] }),
    violation,
    feasible,
    defects,
    linkage: part.linkage,
    referencePose: part.drawnAt === t[0] ? 'target point 1' : 'design reference',
    driverValues: Array.from(t),
    linkageDriverValues: Array.from(t, (v) => offset + v),
    motion,
    points: Array.from(points),
    ...(freePlacement ? { placement: { scale: Math.hypot(sa, sb), rotationRad: Math.atan2(sb, sa), tx, ty } } : {}),
    ...(grashof === undefined ? {} : { grashof }),
    ...(found.ok && found.figures.transmissionDeg !== undefined ? { transmissionDeg: found.figures.transmissionDeg } : {}),
    ...(found.ok && found.figures.sizeMm !== undefined ? { sizeMm: found.figures.sizeMm } : {}),
  };
}

/**
 * The motion a candidate makes, in the linkage's frame (problem-frame value + `offset`):
 * from the first target point's driver value, a full turn the way the target is traced
 * when the driver turns fully, else to the farthest driver value the target reaches.
 */
function motionRange(path: Float64Array, offset: number, turnsFully: boolean): CandidateMotionRange {
  const first = path[0];
  const forward = path[path.length - 1] >= first;
  let lo = first;
  let hi = first;
  for (let i = 1; i < path.length; i++) {
    lo = Math.min(lo, path[i]);
    hi = Math.max(hi, path[i]);
  }
  const from = offset + first;
  if (turnsFully || !(hi - lo > MIN_MOTION_RAD)) {
    return { from, to: from + (forward ? TAU : -TAU), fullTurn: turnsFully, steps: MOTION_ANALYSIS_STEPS };
  }
  return { from, to: offset + (forward ? hi : lo), fullTurn: false, steps: MOTION_ANALYSIS_STEPS };
}
