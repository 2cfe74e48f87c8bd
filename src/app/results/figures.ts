/**
 * The figures a row, the detail view and the compare table show for a candidate, taken
 * from its report and, where the report has none (six-bars), from its motion.
 */
import type { GrashofCondition } from '../../core/linkage/analysis';
import type { CandidateReport } from '../../core/synthesis';
import type { CandidateMotion, MotionResult } from './motion';

const CONDITION_WORDS: Readonly<Record<GrashofCondition, string>> = {
  grashof: 'Grashof',
  'non-grashof': 'non-Grashof',
  'change-point': 'change point',
};

/** Grashof condition and Barker's usual name, e.g. "Grashof crank-rocker". */
export function grashofLabel(candidate: CandidateReport, motion: MotionResult | undefined): string {
  if (candidate.grashof) return `${CONDITION_WORDS[candidate.grashof.grashof]} ${candidate.grashof.name}`;
  if (motion === undefined) return '…';
  if (!motion.ok) return '—';
  const loops = motion.motion.loops;
  if (loops.length === 0) return '—';
  return loops.map((loop) => `${CONDITION_WORDS[loop.grashof]}${loop.className ? ` ${loop.className}` : ''}`).join('; ');
}

/**
 * Least and greatest transmission angle (deg) over every four-bar loop, over the motion
 * the views show (a full turn of a crank), so the table says what the detail plot
 * shows; the search's own figure (over the target's span) only where no motion exists.
 */
export function transmissionRangeDeg(candidate: CandidateReport, motion: MotionResult | undefined): { min: number; max: number } | undefined {
  if (motion === undefined) return undefined;
  if (!motion.ok) return candidate.transmissionDeg;
  return motionTransmissionDeg(motion.motion);
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

export function defectsLabel(candidate: CandidateReport): string {
  return candidate.defects.length === 0 ? 'none' : candidate.defects.join('; ');
}
