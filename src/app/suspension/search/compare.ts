/**
 * The compare view's data: each design compared analysed again by the core
 * (suspensionCurves on its pivots, the problem's bicycle and steps: the analysis the
 * engine's report and `loci analyze` run), its style (colour and dash, so no design is
 * told apart by colour alone), and the CSV of the compared curves.
 */
import type { Linkage } from '../../../core/linkage';
import {
  DEFAULT_SHOCK_BODIES,
  LAYOUT_NAMES,
  SUSPENSION_CAUTION,
  buildLayout,
  demoAxleBody,
  suspensionCurves,
  type LayoutAxleBody,
  type LayoutKind,
  type ShockBodies,
  type SuspensionReport,
} from '../../../core/suspension';
import { DEFAULT_SUSPENSION_STEPS, type LayoutBodies, type SuspensionProblemInput } from '../../../core/synthesis';
import type { SearchCandidate } from './results';

/** At most this many designs are compared at once. */
export const MAX_COMPARED = 4;
export const MIN_COMPARED = 2;

/** Colour and dash of each compared design, in the order ticked. */
export const COMPARE_STYLES: readonly { readonly colour: string; readonly dash: string | undefined; readonly dashName: string }[] = [
  { colour: '#1f5fa8', dash: undefined, dashName: 'solid' },
  { colour: '#c2410c', dash: '7 4', dashName: 'dashed' },
  { colour: '#15803d', dash: '2 3', dashName: 'dotted' },
  { colour: '#7c3aed', dash: '9 3 2 3', dashName: 'dash-dot' },
];

export interface ComparedDesign {
  readonly candidate: SearchCandidate;
  /** "#3 single pivot": rank and layout. */
  readonly label: string;
  readonly colour: string;
  readonly dash: string | undefined;
  readonly dashName: string;
  readonly linkage: Linkage;
  readonly report: SuspensionReport | null;
  readonly failure: string | null;
}

export function designLabel(c: SearchCandidate): string {
  return `#${c.rank} ${LAYOUT_NAMES[c.family]}`;
}

/** The bodies a run searched a layout with: the problem's, checked when the run was made; absent means the defaults. */
export function runLayoutBodies(problem: SuspensionProblemInput, kind: LayoutKind): LayoutBodies {
  const given = problem.layoutBodies?.[kind];
  return {
    axleBody: (given?.axleBody as LayoutAxleBody | undefined) ?? demoAxleBody(kind),
    shock: (given?.shock as ShockBodies | undefined) ?? DEFAULT_SHOCK_BODIES,
  };
}

/** A searched design's linkage and curves on the problem's bicycle, as the search's report took them. */
export function analyseCandidate(problem: SuspensionProblemInput, c: SearchCandidate): { linkage: Linkage; report: SuspensionReport | null; failure: string | null } {
  const bodies = runLayoutBodies(problem, c.family);
  const linkage = buildLayout(c.family, c.pivots, problem.bicycle.rearAxleMm, bodies.axleBody, bodies.shock);
  const result = suspensionCurves(linkage, problem.bicycle, { steps: problem.steps ?? DEFAULT_SUSPENSION_STEPS });
  return result.ok ? { linkage, report: result.report, failure: null } : { linkage, report: null, failure: result.reason };
}

export function comparedDesigns(problem: SuspensionProblemInput, candidates: readonly SearchCandidate[]): ComparedDesign[] {
  return candidates.slice(0, MAX_COMPARED).map((c, i) => ({ candidate: c, label: designLabel(c), ...COMPARE_STYLES[i], ...analyseCandidate(problem, c) }));
}

/**
 * The compared curves as CSV: the caution and what the file holds as `#` lines, then a
 * header (units in the names) and one row per design per travel sample. Per-gear
 * columns are in the chosen cog. Numbers in full; a value that does not exist is empty.
 */
export function compareCsv(problemName: string, designs: readonly ComparedDesign[], cogIndex: number): string {
  const teeth = designs.find((d) => d.report !== null)?.report?.cogTeeth[cogIndex];
  const cog = teeth === undefined ? `cog${cogIndex + 1}` : `${teeth}t`;
  const lines = [
    `# Loci: compared rear-suspension designs of "${problemName.replace(/[\r\n"]/g, ' ')}"; per-gear columns in the ${cog} cog`,
    `# ${SUSPENSION_CAUTION}`,
    ['design', 'layout', 'step', 'travel_mm', 'shock_length_mm', 'leverage_ratio', `anti_squat_pct_${cog}`, 'anti_rise_pct', 'axle_x_mm', 'axle_y_mm', 'axle_rearward_mm', `chain_growth_mm_${cog}`, `kickback_deg_${cog}`].join(','),
  ];
  const cell = (v: number) => (Number.isFinite(v) ? String(v) : '');
  for (const d of designs) {
    if (d.report === null) continue;
    const c = d.report.curves;
    for (let k = 0; k < c.steps; k++) {
      lines.push([
        `#${d.candidate.rank}`,
        d.candidate.family,
        String(k),
        cell(c.travelMm[k]),
        cell(c.shockLengthMm[k]),
        cell(c.leverageRatio[k]),
        cell(c.antiSquatPct[cogIndex]?.[k] ?? NaN),
        cell(c.antiRisePct[k]),
        cell(c.axleXMm[k]),
        cell(c.axleYMm[k]),
        cell(c.rearwardMm[k]),
        cell(c.chainGrowthMm[cogIndex]?.[k] ?? NaN),
        cell(c.kickbackDeg[cogIndex]?.[k] ?? NaN),
      ].join(','));
    }
  }
  return `${lines.join('\r\n')}\r\n`;
}
