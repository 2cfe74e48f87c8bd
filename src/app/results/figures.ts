/**
 * The figures a row, the detail view and the compare table show for a candidate, taken
 * from its report and, where the report has none (six-bars), from its motion.
 */
import type { GrashofCondition } from '../../core/linkage/analysis';
import type { CandidateReport } from '../../core/synthesis';
import { TRANSMISSION_GUIDELINE_DEG } from '../../core/linkage/report';
import type { CandidateMotion, MotionResult } from './motion';

/** Moving bodies of a four-bar or slider-crank (the frame is no body of the file); a six-bar has five. */
const FOUR_BAR_BODIES = 3;

const CONDITION_WORDS: Readonly<Record<GrashofCondition, string>> = {
  grashof: 'Grashof',
  'non-grashof': 'non-Grashof',
  'change-point': 'change point',
};

/** Grashof condition and Barker's usual name, e.g. "Grashof crank-rocker". */
export function grashofLabel(candidate: CandidateReport, motion: MotionResult | undefined): string {
  // A six-bar has two four-bar loops: each is named (from its motion), never only the report's first.
  if (candidate.grashof && !(candidate.linkage.bodies.length > FOUR_BAR_BODIES)) return `${CONDITION_WORDS[candidate.grashof.grashof]} ${candidate.grashof.name}`;
  if (motion === undefined) return '…';
  if (!motion.ok) return '—';
  const loops = motion.motion.loops;
  if (loops.length === 0) return '—';
  if (loops.length === 1) return `${CONDITION_WORDS[loops[0].grashof]}${loops[0].className ? ` ${loops[0].className}` : ''}`;
  return loops.map((loop, k) => `loop ${k + 1}: ${CONDITION_WORDS[loop.grashof]}${loop.className ? ` ${loop.className}` : ''}`).join('; ');
}

/**
 * Least and greatest transmission angle (deg) over every four-bar loop over the
 * candidate's motion: the candidate's own figure, which `loci analyze` of its linkage file
 * repeats over that motion. A candidate saved before it carried its motion: the figure
 * of the motion the views show.
 */
export function transmissionRangeDeg(candidate: CandidateReport, motion: MotionResult | undefined): { min: number; max: number } | undefined {
  if (hasOwnMotion(candidate)) return candidate.transmissionDeg;
  if (motion === undefined) return undefined;
  if (!motion.ok) return candidate.transmissionDeg;
  return motionTransmissionDeg(motion.motion);
}

/** Width and height (mm) of everything the linkage carries over its motion: the candidate's own figure, as transmissionRangeDeg. */
export function sizeOverMotionMm(candidate: CandidateReport, motion: MotionResult | undefined): { widthMm: number; heightMm: number } | undefined {
  if (hasOwnMotion(candidate) && candidate.sizeMm !== undefined) return candidate.sizeMm;
  return motion?.ok ? motion.motion.sizeMm : undefined;
}

/** Candidates described before they carried their motion (saved projects) lack it. */
function hasOwnMotion(candidate: CandidateReport): boolean {
  return (candidate as Partial<CandidateReport>).motion !== undefined;
}

/** Where the linkage file's reference pose is, for its name: ", pose at target point 1" or nothing. */
export function referencePoseNote(candidate: CandidateReport): string {
  return (candidate as Partial<CandidateReport>).referencePose === 'target point 1' ? ', pose at target point 1' : '';
}

/** Where the exported linkage is drawn, in words for the joint table's title. */
export function referencePoseLabel(candidate: CandidateReport): string {
  return (candidate as Partial<CandidateReport>).referencePose === 'target point 1'
    ? 'Joints in the pose at target point 1 (mm)'
    : 'Joints in the reference pose (mm)';
}

export function motionTransmissionDeg(motion: CandidateMotion): { min: number; max: number } | undefined {
  let min = Infinity;
  let max = -Infinity;
  for (const loop of motion.loops) {
    for (const mu of loop.muDeg) {
      if (!Number.isFinite(mu)) continue;
      if (mu < min) min = mu;
      if (mu > max) max = mu;
    }
  }
  return max >= min ? { min, max } : undefined;
}

/** The transmission guideline the table marks rows by, degrees: 40° to 140° (common practice), as `loci analyze` reports it. */
export const GUIDELINE_LOW_DEG = TRANSMISSION_GUIDELINE_DEG.min;
export const GUIDELINE_HIGH_DEG = TRANSMISSION_GUIDELINE_DEG.max;

/** Words for a transmission range that leaves the guideline ("below 40°", "above 140°", or both), or null within it. */
export function outsideGuidelineLabel(range: { readonly min: number; readonly max: number } | undefined): string | null {
  if (range === undefined) return null;
  const low = range.min < GUIDELINE_LOW_DEG;
  const high = range.max > GUIDELINE_HIGH_DEG;
  if (!low && !high) return null;
  const where = low && high ? `below ${GUIDELINE_LOW_DEG}° and above ${GUIDELINE_HIGH_DEG}°` : low ? `below ${GUIDELINE_LOW_DEG}°` : `above ${GUIDELINE_HIGH_DEG}°`;
  return `outside ${GUIDELINE_LOW_DEG}°–${GUIDELINE_HIGH_DEG}°: ${where}`;
}

export function defectsLabel(candidate: CandidateReport): string {
  return candidate.defects.length === 0 ? 'none' : candidate.defects.join('; ');
}
