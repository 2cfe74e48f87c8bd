/**
 * The project's target and settings as the engine's run: one job per family, all on one
 * problem file (src/core/io/problem.ts), with the budget, seed and checkpoint
 * interval. Lengths stay mm; the app's degrees become radians here.
 */
import { defineRun, type RunInput } from '../../engine';
import { PROBLEM_FILE_FORMAT, PROBLEM_FILE_VERSION } from '../../core/io/problem';
import { createProblem, type ProblemInput, type ProblemIssue } from '../../core/synthesis';
import { targetFrame } from '../../core/synthesis/encoding';
import { familyLabel, type FamilyId } from '../state/families';
import type { Project } from '../state/project';
import { hasWeights } from '../state/target';

/** Candidates the run describes at its end and the results table gets. */
export const CANDIDATES_SHOWN = 20;

const DEG = Math.PI / 180;

/** The target's span (the larger side of its bounding box), mm: what the size limit's multiple is of. */
export function targetSpanMm(points: readonly { readonly x: number; readonly y: number }[]): number {
  return targetFrame(Float64Array.from(points.flatMap((p) => [p.x, p.y]))).size;
}

export function problemInputOf(project: Project): ProblemInput {
  const { target, settings } = project;
  const c = settings.constraints;
  const terms = settings.terms;
  const timing: ProblemInput['timing'] =
    target.timing === 'prescribed'
      ? { mode: 'prescribed', driverValues: target.points.map((p) => (p.driverDeg ?? 0) * DEG) }
      : target.timing === 'free'
        ? { mode: 'free', wrap: true, refine: true }
        : { mode: 'unprescribed' };
  return {
    name: project.name,
    target: {
      points: target.points.map((p) => [p.x, p.y]),
      closed: target.closed,
      ...(hasWeights(target) ? { weights: target.points.map((p) => p.weight ?? 0) } : {}),
    },
    timing,
    placement: settings.placement,
    families: [...settings.families],
    bounds: settings.bounds,
    constraints: {
      fullTurnCrank: c.fullTurnCrank,
      ...(c.minTransmissionDeg === null ? {} : { minTransmissionRad: c.minTransmissionDeg * DEG }),
      ...(c.linkLengthMm === null ? {} : { linkLengthMm: [c.linkLengthMm[0], c.linkLengthMm[1]] as const }),
      ...(c.keepOut.length === 0 ? {} : { keepOut: c.keepOut.map((k) => ({ x: k.x, y: k.y, r: k.r })) }),
      ...(c.maxSizeSpans === null || target.points.length === 0 ? {} : { maxSizeMm: c.maxSizeSpans * targetSpanMm(target.points) }),
    },
    ...(terms.sizeWeight > 0 || terms.transmissionWeight > 0
      ? { terms: { sizeWeight: terms.sizeWeight, transmissionWeight: terms.transmissionWeight, transmissionGuidelineRad: terms.transmissionGuidelineDeg * DEG } }
      : {}),
    measure: settings.measure,
  };
}

/** The project's problem as a problem file (src/core/io/problem.ts), the form a worker reads. */
export function problemFileOf(project: Project): { readonly format: typeof PROBLEM_FILE_FORMAT; readonly version: typeof PROBLEM_FILE_VERSION } & ProblemInput {
  return { format: PROBLEM_FILE_FORMAT, version: PROBLEM_FILE_VERSION, ...problemInputOf(project) };
}

/** Islands per family: enough for every worker to have one, at least one each. */
export function islandsPerFamily(families: number, workers: number): number {
  return Math.max(1, Math.ceil(workers / Math.max(1, families)));
}

export function buildRunInput(project: Project, workers: number): { ok: true; input: RunInput } | { ok: false; reason: string } {
  const { settings } = project;
  if (settings.families.length === 0) return { ok: false, reason: 'no mechanism family is chosen' };
  const problem = problemFileOf(project);
  const islands = islandsPerFamily(settings.families.length, workers);
  const input: RunInput = {
    jobs: settings.families.map((family) => ({
      id: family,
      objective: { kind: 'synthesis', problem, family },
      seed: settings.seed,
      islands,
      optimizer: { kind: 'hybrid' },
    })),
    budget: settings.budget.mode === 'evaluations' ? { evaluations: settings.budget.evaluations } : { seconds: settings.budget.seconds },
    checkpointEveryMs: settings.checkpointEverySeconds * 1000,
  };
  return { ok: true, input };
}

/** Where the problem reader found an issue, as the page names that place. */
function placeOf(path: string): string {
  const bound = /^bounds\.([^.]+)\.(.+)$/.exec(path);
  if (bound !== null) return `Variable bounds, ${familyLabel(bound[1] as FamilyId)} ${bound[2]}`;
  const point = /^target\.points\[(\d+)\]/.exec(path);
  if (point !== null) return `Target point ${Number(point[1]) + 1}`;
  const weight = /^target\.weights\[(\d+)\]/.exec(path);
  if (weight !== null) return `Weight of target point ${Number(weight[1]) + 1}`;
  const circle = /^constraints\.keepOut\[(\d+)\]/.exec(path);
  if (circle !== null) return `Keep-out region ${Number(circle[1]) + 1}`;
  if (path.startsWith('constraints.minTransmission')) return 'Minimum transmission angle';
  if (path.startsWith('constraints.linkLength')) return 'Link lengths';
  if (path.startsWith('constraints.maxSize')) return 'Largest size';
  if (path.startsWith('terms.sizeWeight')) return 'Size weight';
  if (path.startsWith('terms.transmissionWeight')) return 'Transmission weight';
  if (path.startsWith('terms.transmissionGuideline')) return 'Transmission guideline';
  if (path.startsWith('target')) return 'Target path';
  return 'Search settings';
}

/** The engine's fields, as the page names them. */
const RUN_FIELDS: readonly (readonly [RegExp, string])[] = [
  [/^budget\.evaluations\b/, 'Budget in evaluations'],
  [/^budget\.seconds\b/, 'Budget in seconds'],
  [/^jobs\[\d+\]\.seed\b/, 'Seed'],
];

function inUserWords(issue: ProblemIssue): string {
  return `${placeOf(issue.path)}: ${issue.message}`;
}

/**
 * What the problem reader and the engine would refuse in this project, in the page's
 * words: the same checks a search runs at its start, made before Start is offered, so a
 * search never stops on input the page took.
 */
export function startIssuesOf(project: Project, workers: number): string[] {
  const problem = createProblem(problemInputOf(project));
  if (!problem.ok) return problem.issues.map(inUserWords);
  const built = buildRunInput(project, workers);
  if (!built.ok) return [built.reason];
  const run = defineRun(built.input);
  if (run.ok) return [];
  const field = RUN_FIELDS.find(([pattern]) => pattern.test(run.reason));
  return [field === undefined ? `Search settings: ${run.reason}` : run.reason.replace(field[0], field[1])];
}
