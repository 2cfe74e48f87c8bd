/**
 * `loci check PROBLEM.json [--json]`: validates a problem file and prints what a fit
 * would search (each family's variables and their bounds), or every issue, one a line
 * with the field it concerns, and exit code 2.
 */
import { MAX_PROBLEM_FILE_CHARS } from '../core/io/problem';
import { MAX_LISTED_ISSUES } from '../core/io/schemaMessages';
import { MAX_DIM } from '../core/optimize/config';
import { MIN_TARGET_POINTS, createObjective, type Problem } from '../core/synthesis';
import {
  DEFAULT_TRANSMISSION_GUIDELINE_RAD,
  MAX_BOUND_MAGNITUDE,
  MAX_CONSTRAINT_MM,
  MAX_DRIVER_VALUE_RAD,
  MAX_TARGET_COORDINATE_MM,
  MAX_TARGET_POINTS,
  MAX_WEIGHT,
  MIN_TARGET_SPAN_MM,
  MIN_TARGET_SPAN_SHARE,
} from '../core/synthesis/problem';
import { singleFile, type OptionSpec } from './args';
import { EXIT_OK, EXIT_USAGE, startCommand, type CliIo } from './command';
import { formatJson } from './formatJson';
import { readProblemFile } from './problemInput';
import { suspensionSearchSummary, suspensionSummaryText } from './suspensionResults';
import { legSearchSummary, legSummaryText } from './legResults';
import { GAIT_CAUTION } from '../core/gait';
import { SUSPENSION_CAUTION } from '../core/suspension';

const count = (n: number) => n.toLocaleString('en-GB');

export const usage = `usage: loci check PROBLEM.json [--json]

Validates a problem file (format "loci-problem") and prints what \`loci fit\` would
search: the target, timing, placement, measure and constraints, and for each family
its variables with their bounds. A file with issues gets one line per issue, naming
the field, on stderr (the first ${MAX_LISTED_ISSUES}, then a count of the rest), and exit
code 2. A file \`check\` accepts, \`fit\` accepts too.

A leg problem ("kind": "leg") is summarised with its ground line and stance tolerance,
the crank's and the walking direction, its gait targets, its keep-out circles and each
family's variables (the foot is each family's point P), with the caution for walking
machines.

Limits (each refused with the field and the limit):
  file             at most ${count(MAX_PROBLEM_FILE_CHARS / 1000)} kB
  target.points    ${MIN_TARGET_POINTS} to ${count(MAX_TARGET_POINTS)} points, each within ±${count(MAX_TARGET_COORDINATE_MM)} mm;
                   spanning at least ${MIN_TARGET_SPAN_MM} mm and ${MIN_TARGET_SPAN_SHARE} × the largest |coordinate|;
                   with free timing, at most ${count(MAX_DIM)} variables in all (points + the
                   family's own variables)
  target.weights   0 to ${count(MAX_WEIGHT)}, not all 0
  timing.driverValues  within ±${MAX_DRIVER_VALUE_RAD} rad (±${Math.floor((MAX_DRIVER_VALUE_RAD * 180) / Math.PI)}°)
  bounds           lower < upper, each within ±${count(MAX_BOUND_MAGNITUDE)}
  constraints      lengths and keep-out circles within ${count(MAX_CONSTRAINT_MM)} mm

  --json      print the summary as JSON instead of text.
  --help, -h  this text.

Exit codes: 0 valid, 2 bad input (unreadable file, not JSON, issues, bad flags), 1 an
unexpected failure (a bug).
`;

const OPTIONS: readonly OptionSpec[] = [
  { name: 'json', kind: 'flag' },
  { name: 'help', kind: 'flag' },
];

interface FamilySummary {
  readonly family: string;
  readonly dim: number;
  /** How the search's box maps to designs (src/core/synthesis/searchMap.ts). */
  readonly searchMap: string;
  readonly variables: { readonly name: string; readonly lower: number; readonly upper: number }[];
}

/** What a fit of `problem` would search, family by family. */
export function searchSummary(problem: Problem): FamilySummary[] {
  return problem.families.map((family) => {
    const objective = createObjective(problem, family);
    return {
      family,
      dim: objective.dim,
      searchMap: objective.searchMap,
      variables: objective.variableNames.map((name, j) => ({ name, lower: objective.lower[j], upper: objective.upper[j] })),
    };
  });
}

function timingText(problem: Problem): string {
  const t = problem.timing;
  if (t.mode === 'prescribed') return `prescribed (${t.driverValues.length} driver values)`;
  if (t.mode === 'free') return `free (one driver value per point is a variable${t.wrap ? ', may wrap through a full turn' : ''}${t.refine ? ', refined' : ''})`;
  return `unprescribed (matched in order to ${t.samples ?? 'the default number of'} curve samples${t.wrap === false ? '' : ', may wrap'})`;
}

function constraintsText(problem: Problem): string {
  const c = problem.constraints;
  const parts: string[] = [];
  if (c.fullTurnCrank) parts.push('crank turns fully (Grashof)');
  if (c.minTransmissionRad !== undefined) parts.push(`transmission angle ≥ ${((c.minTransmissionRad * 180) / Math.PI).toFixed(1)}°`);
  if (c.linkLengthMm !== undefined) parts.push(`link lengths ${c.linkLengthMm[0]} to ${c.linkLengthMm[1]} mm`);
  if (c.keepOut !== undefined && c.keepOut.length > 0) parts.push(`${c.keepOut.length} keep-out circle${c.keepOut.length > 1 ? 's' : ''}`);
  if (c.branch !== undefined) parts.push(`branch ${c.branch}`);
  if (c.maxSizeMm !== undefined) parts.push(`motion at most ${c.maxSizeMm} mm wide and high`);
  const t = problem.terms;
  if (t?.sizeWeight !== undefined && t.sizeWeight > 0) parts.push(`size weighted ${t.sizeWeight}`);
  if (t?.transmissionWeight !== undefined && t.transmissionWeight > 0) {
    const guideline = ((t.transmissionGuidelineRad ?? DEFAULT_TRANSMISSION_GUIDELINE_RAD) * 180) / Math.PI;
    parts.push(`transmission outside ${guideline.toFixed(1)}°–${(180 - guideline).toFixed(1)}° weighted ${t.transmissionWeight}`);
  }
  return parts.length === 0 ? 'none beyond the variable bounds' : parts.join('; ');
}

function formatBound(value: number): string {
  return String(Number(value.toPrecision(6)));
}

function summaryText(file: string, problem: Problem, families: readonly FamilySummary[]): string {
  const points = problem.target.points.length / 2;
  const lines = [
    `${file}: valid problem ${JSON.stringify(problem.name)}`,
    `  target:      ${points} points, ${problem.target.closed ? 'closed' : 'open'}${problem.target.weights ? ', weighted' : ''}`,
    `  timing:      ${timingText(problem)}`,
    `  placement:   ${problem.placement}`,
    `  measure:     ${problem.measure}`,
    `  constraints: ${constraintsText(problem)}`,
    `A fit would search ${families.length} famil${families.length === 1 ? 'y' : 'ies'}:`,
  ];
  for (const f of families) {
    lines.push(`  ${f.family}: ${f.dim} variables${f.searchMap === 'affine' ? '' : `, searched through the "${f.searchMap}" search map`}`);
    const width = Math.max(...f.variables.map((v) => v.name.length));
    for (const v of f.variables) lines.push(`    ${v.name.padEnd(width)}  ${formatBound(v.lower)} … ${formatBound(v.upper)}`);
  }
  return `${lines.join('\n')}\n`;
}

export async function run(args: readonly string[], io: CliIo): Promise<number> {
  const start = startCommand('check', usage, args, OPTIONS, io);
  if (typeof start === 'number') return start;
  const { usageError } = start;
  const one = singleFile(start.args, 'problem file');
  if (!one.ok) return usageError(one.message);
  const file = one.file;

  const read = await readProblemFile(file, io);
  if (!read.ok) {
    io.stderr(`${read.lines.join('\n')}\n`);
    return EXIT_USAGE;
  }
  if (read.problem.kind === 'suspension') {
    const p = read.problem;
    const layouts = suspensionSearchSummary(p);
    io.stdout(start.args.options.has('json')
      ? `${formatJson({ file, valid: true, kind: 'suspension', name: p.name, steps: p.steps, targets: p.targets, keepOut: p.keepOut, layouts, caution: SUSPENSION_CAUTION })}\n`
      : suspensionSummaryText(file, p, layouts));
    return EXIT_OK;
  }
  if (read.problem.kind === 'leg') {
    const p = read.problem;
    const families = legSearchSummary(p);
    io.stdout(start.args.options.has('json')
      ? `${formatJson({ file, valid: true, kind: 'leg', name: p.name, leg: p.leg, steps: p.steps, targets: p.targets, keepOut: p.keepOut, families, caution: GAIT_CAUTION })}\n`
      : legSummaryText(file, p, families));
    return EXIT_OK;
  }
  const families = searchSummary(read.problem);
  if (start.args.options.has('json')) {
    const p = read.problem;
    io.stdout(
      `${formatJson({
        file,
        valid: true,
        name: p.name,
        target: { points: p.target.points.length / 2, closed: p.target.closed, weighted: p.target.weights !== undefined },
        timing: p.timing.mode,
        placement: p.placement,
        measure: p.measure,
        constraints: p.constraints,
        ...(p.terms === undefined ? {} : { terms: p.terms }),
        families,
      })}\n`,
    );
  } else {
    io.stdout(summaryText(file, read.problem, families));
  }
  return EXIT_OK;
}
