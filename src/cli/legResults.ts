/**
 * What `loci check` and `loci fit` print of a leg problem and its candidates: the
 * summary of what a fit would search, and each candidate as JSON (its family, terms,
 * defects, the gait figures of its leg file and the leg file itself), with the caution
 * that Loci computes kinematics only.
 */
import { GAIT_CAUTION } from '../core/gait';
import { toLegFile } from '../core/io/legFile';
import { MAX_NAME_LENGTH } from '../core/io/linkageFile';
import { FAMILY_NAMES, createObjective, type LegCandidateReport, type LegProblem } from '../core/synthesis';
import { familySearchLines, familySearchSummary, type FamilySearchSummary } from './searchSummary';
import { weightedCandidateFields } from './weightedCandidate';

/** What a fit of a leg problem would search, family by family. */
export function legSearchSummary(problem: LegProblem): FamilySearchSummary[] {
  return problem.families.map((family) => familySearchSummary(createObjective(problem, family), FAMILY_NAMES[family]));
}

function groundText(problem: LegProblem): string {
  const g = problem.leg.ground;
  return g.kind === 'level' ? `level at y = ${g.yMm} mm` : `through (${g.point.x}, ${g.point.y}) mm along (${g.direction.x}, ${g.direction.y})`;
}

function targetsText(problem: LegProblem): string {
  const t = problem.targets;
  const out: string[] = [];
  const w = (term: { readonly weight: number; readonly tolerance: number }, unit: string) => `weight ${term.weight}, tolerance ${term.tolerance}${unit}`;
  if (t.footPath) out.push(`foot trajectory (${t.footPath.points.length} points, ${w(t.footPath, ' mm')})`);
  if (t.strideMm) out.push(`stride ${t.strideMm.value} mm (${w(t.strideMm, ' mm')})`);
  if (t.stepHeightMm) out.push(`step height ${t.stepHeightMm.value} mm (${w(t.stepHeightMm, ' mm')})`);
  if (t.minDutyFactor) out.push(`duty factor ≥ ${t.minDutyFactor.value} (${w(t.minDutyFactor, '')})`);
  if (t.maxFlatnessMm) out.push(`stance flatness ≤ ${t.maxFlatnessMm.value} mm peak-to-peak (${w(t.maxFlatnessMm, ' mm')})`);
  if (t.maxSpeedVariation) out.push(`stance speed variation ≤ ${t.maxSpeedVariation.value} (${w(t.maxSpeedVariation, '')})`);
  if (t.minTransmissionDegInStance) out.push(`transmission angle in stance ≥ ${t.minTransmissionDegInStance.value}° (${w(t.minTransmissionDegInStance, '°')})`);
  if (t.sizeBoxMm) out.push(`size within ${t.sizeBoxMm.widthMm} × ${t.sizeBoxMm.heightMm} mm (${w(t.sizeBoxMm, ' mm')})`);
  return out.join('; ');
}

export function legSummaryText(file: string, problem: LegProblem, families: readonly FamilySearchSummary[]): string {
  const leg = problem.leg;
  const lines = [
    `${file}: valid leg problem ${JSON.stringify(problem.name)}`,
    `  ground:    ${groundText(problem)}; stance within ${leg.stanceToleranceMm} mm of it`,
    `  crank:     turns fully, ${leg.crankDirection === 1 ? 'counter-clockwise' : 'clockwise'}; the body walks towards ${leg.walkingDirection === 1 ? '+x' : '−x'}`,
    `  steps:     ${problem.steps} foot samples per turn in the search`,
    `  targets:   ${targetsText(problem)}`,
    `  keep-out:  ${problem.keepOut.length === 0 ? 'none' : problem.keepOut.map((k) => `${k.name === undefined ? '' : `${k.name} `}(${k.x}, ${k.y}) r ${k.r} mm`).join('; ')}`,
    `A fit would search ${families.length} famil${families.length === 1 ? 'y' : 'ies'} (the foot is each family's point P):`,
  ];
  lines.push(...familySearchLines(families));
  lines.push(GAIT_CAUTION);
  return `${lines.join('\n')}\n`;
}

/** One ranked leg candidate as `loci fit` writes it: its gait figures are `loci analyze` of its `legFile`. */
export function legCandidateJson(rank: number, problemName: string, report: LegCandidateReport) {
  return {
    rank,
    family: report.family,
    familyName: report.familyName,
    ...weightedCandidateFields(report),
    searchFigures: report.searchFigures,
    gait: report.gait,
    ...(report.gaitFailure === undefined ? {} : { analysisFailure: report.gaitFailure }),
    x: report.x,
    // The leg file's name is held to the length its reader takes; the rank and family stay in the candidate beside it.
    legFile: toLegFile({ name: `${problemName}: ${report.family} #${rank}`.slice(0, MAX_NAME_LENGTH), linkage: report.linkage, leg: report.leg }),
  };
}
