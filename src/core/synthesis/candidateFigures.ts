/**
 * The figures a candidate carries (Grashof class, transmission-angle range, size, locks)
 * taken by the analysis `loci analyze` runs (analyzeLinkage) over the candidate's own
 * motion, so the two cannot disagree: the same code, the same range, the same steps.
 */
import type { FourBarClass } from '../linkage/analysis';
import type { Plan } from '../linkage';
import { DEFAULT_REPORT_STEPS, analyzeLinkage, type LinkageReport } from '../linkage/report';

/** Steps of a candidate's motion analysis: those of `loci analyze` by default (1° over a full turn). */
export const MOTION_ANALYSIS_STEPS = DEFAULT_REPORT_STEPS;

/** The motion a candidate's figures are taken over, in the linkage's own driver frame. */
export interface CandidateMotionRange {
  /** Driver values (rad for a rotation driver, mm for a length driver): from the first target point on. */
  readonly from: number;
  readonly to: number;
  /** `to − from` is a full turn: the driver turns fully (found exactly, not from samples). */
  readonly fullTurn: boolean;
  /** Steps of the analysis, both ends included (pass them to analyzeLinkage to repeat it). */
  readonly steps: number;
}

export interface CandidateFigures {
  /** Class of the four-bar loop through ground that holds the driven link, as the analysis gives it. */
  readonly grashof?: FourBarClass;
  /** Least and greatest transmission angle over every four-bar loop, deg. */
  readonly transmissionDeg?: { readonly min: number; readonly max: number };
  /** Bounding box of every joint and point over the motion, mm. */
  readonly sizeMm?: { readonly widthMm: number; readonly heightMm: number };
  /** Driver sub-ranges where the linkage does not assemble, in the analysis' unit (deg or mm). */
  readonly locks: readonly { readonly from: number; readonly to: number }[];
}

export type FiguresResult = { readonly ok: true; readonly figures: CandidateFigures } | { readonly ok: false; readonly reason: string };

export function candidateFigures(plan: Plan, motion: CandidateMotionRange): FiguresResult {
  const analysed = analyzeLinkage(plan, { range: { from: motion.from, to: motion.to }, steps: motion.steps });
  if (!analysed.ok) return { ok: false, reason: analysed.issues.map((i) => `${i.path}: ${i.message}`).join('; ') };
  return { ok: true, figures: figuresOf(analysed.report) };
}

/** The figures read from a linkage report (the test reads `loci analyze`'s report the same way). */
export function figuresOf(report: LinkageReport): CandidateFigures {
  let min = Infinity;
  let max = -Infinity;
  for (const loop of report.fourBarLoops) {
    const mu = loop.transmissionAngleDeg;
    if (mu === null) continue;
    min = Math.min(min, mu.min);
    max = Math.max(max, mu.max);
  }
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (const path of [...report.joints.map((j) => j.path), ...report.points.map((p) => p.path)]) {
    for (const xy of path) {
      if (xy === null) continue;
      minX = Math.min(minX, xy[0]);
      maxX = Math.max(maxX, xy[0]);
      minY = Math.min(minY, xy[1]);
      maxY = Math.max(maxY, xy[1]);
    }
  }
  const driven = report.fourBarLoops.find((l) => l.grounded && l.inputDriven);
  const grashof: FourBarClass | undefined = driven?.barker
    ? {
        grashof: driven.grashof,
        barkerType: driven.barker.type as FourBarClass['barkerType'],
        code: driven.barker.code,
        name: driven.barker.name,
        slMinusPq: driven.slMinusPqMm,
      }
    : undefined;
  return {
    ...(grashof === undefined ? {} : { grashof }),
    ...(max >= min ? { transmissionDeg: { min, max } } : {}),
    ...(maxX >= minX ? { sizeMm: { widthMm: maxX - minX, heightMm: maxY - minY } } : {}),
    locks: report.defects.locks.map((l) => ({ from: l.from, to: l.to })),
  };
}
