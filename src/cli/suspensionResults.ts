/**
 * What `loci check` and `loci fit` print of a suspension problem and its candidates:
 * the summary of what a fit would search, and each candidate as JSON (its layout, pivots,
 * terms, defects, linkage file and the suspension figures), with the caution that Loci
 * computes kinematics only.
 */
import { toLinkageFile } from '../core/io/linkageFile';
import { LAYOUT_NAMES, SUSPENSION_CAUTION } from '../core/suspension';
import { createObjective, type SuspensionCandidateReport, type SuspensionProblem } from '../core/synthesis';
import { familySearchLines, familySearchSummary, type FamilySearchSummary } from './searchSummary';
import { weightedCandidateFields } from './weightedCandidate';

/** What a fit of a suspension problem would search, layout by layout. */
export function suspensionSearchSummary(problem: SuspensionProblem): FamilySearchSummary[] {
  return problem.layouts.map((kind) => familySearchSummary(createObjective(problem, kind), LAYOUT_NAMES[kind]));
}

export function suspensionSummaryText(file: string, problem: SuspensionProblem, layouts: readonly FamilySearchSummary[]): string {
  const b = problem.bicycle;
  const t = problem.targets;
  const targets: string[] = [];
  if (t.axlePath) targets.push(`axle path (${t.axlePath.points.length} points, weight ${t.axlePath.weight}, tolerance ${t.axlePath.tolerance} mm)`);
  if (t.leverageRatio) {
    targets.push(t.leverageRatio.form === 'points'
      ? `leverage ratio (${t.leverageRatio.points.length} points)`
      : `leverage ratio ${t.leverageRatio.start} → ${t.leverageRatio.end} (exponent ${t.leverageRatio.exponent})`);
  }
  if (t.antiSquatAtSag) targets.push(`anti-squat at sag ${t.antiSquatAtSag.min}–${t.antiSquatAtSag.max} % in cogs ${t.antiSquatAtSag.cogs.join(', ')} (${t.antiSquatAtSag.as})`);
  if (t.antiRiseAtSag) targets.push(`anti-rise at sag ${t.antiRiseAtSag.min}–${t.antiRiseAtSag.max} % (${t.antiRiseAtSag.as})`);
  if (t.travelMm) targets.push(`wheel travel ${t.travelMm.min}–${t.travelMm.max} mm (${t.travelMm.as})`);
  if (t.chainGrowthMm) targets.push(`chain growth ≤ ${t.chainGrowthMm.max} mm (${t.chainGrowthMm.as})`);
  if (t.kickbackDeg) targets.push(`pedal kickback ≤ ${t.kickbackDeg.max}° (${t.kickbackDeg.as})`);
  const lines = [
    `${file}: valid suspension problem ${JSON.stringify(problem.name)}`,
    `  bicycle:   rear axle (${b.rearAxleMm.x}, ${b.rearAxleMm.y}) mm, shock ${b.shock.eyeToEyeMm} × ${b.shock.strokeMm} mm, sag ${Math.round(b.sag * 100)} %, ${b.chainringTeeth}-tooth chainring`,
    `  steps:     ${problem.steps} over the stroke`,
    `  targets:   ${targets.join('; ')}`,
    `  keep-out:  ${problem.keepOut.length === 0 ? 'none' : problem.keepOut.map((k) => `${k.name} (${k.x}, ${k.y}) r ${k.r} mm`).join('; ')}`,
    `A fit would search ${layouts.length} layout${layouts.length === 1 ? '' : 's'}:`,
  ];
  lines.push(...familySearchLines(layouts));
  lines.push(SUSPENSION_CAUTION);
  return `${lines.join('\n')}\n`;
}

/** One ranked suspension candidate as `loci fit` writes it. */
export function suspensionCandidateJson(rank: number, problemName: string, report: SuspensionCandidateReport) {
  const s = report.suspension;
  return {
    rank,
    family: report.family,
    layout: report.layoutName,
    ...weightedCandidateFields(report),
    pivots: report.pivots,
    figures: s === null
      ? null
      : {
          totalTravelMm: s.totalTravelMm,
          leverageRatioStart: s.leverageRatioStart,
          leverageRatioEnd: s.leverageRatioEnd,
          progressionPct: s.progressionPct,
          sag: s.sagPoint,
          cogTeeth: s.cogTeeth,
        },
    ...(report.suspensionFailure === undefined ? {} : { analysisFailure: report.suspensionFailure }),
    x: report.x,
    linkage: toLinkageFile(report.linkage, `${problemName}: ${report.family} #${rank}, at full extension`),
  };
}
