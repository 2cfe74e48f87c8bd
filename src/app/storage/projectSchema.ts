/**
 * What a saved project must look like to be opened again: checked once when it is read
 * back from storage (a damaged record, or one from a newer version, opens the demo
 * instead, with a message). An older version is brought up to this one first.
 */
import { z } from 'zod';
import type { CandidateReport } from '../../core/synthesis';
import { MAX_TERM_WEIGHT, MAX_WEIGHT } from '../../core/synthesis/problem';
import { DEFAULT_RESULTS_PER_FAMILY, MAX_CHECKPOINT_EVERY_S, MIN_CHECKPOINT_EVERY_S } from '../../engine/runSpec';
import { MAX_RESULTS_PER_FAMILY, MAX_SIZE_SPANS } from '../state/fields';
import { DEFAULT_CHECKPOINT_EVERY_S, DEFAULT_GUIDELINE_DEG } from '../state/settings';
import { FAMILY_CHOICES, type FamilyId } from '../state/families';
import { PROJECT_FORMAT, PROJECT_VERSION, type Project } from '../state/project';
import { storedSuspensionSchema } from '../suspension/stored';
import { storedLegSchema } from '../leg/stored';

const finite = z.number().refine(Number.isFinite, 'expected a finite number');
const familyIds = FAMILY_CHOICES.map((f) => f.id) as [FamilyId, ...FamilyId[]];
const range = z.tuple([finite, finite]);

const point = z.object({ x: finite, y: finite, driverDeg: finite.nullable(), weight: z.number().min(0).max(MAX_WEIGHT).optional() });
const background = z.object({
  imageId: z.string(),
  name: z.string(),
  widthPx: z.number().positive(),
  heightPx: z.number().positive(),
  leftMm: finite,
  topMm: finite,
  mmPerPx: z.number().positive(),
  opacity: z.number().min(0).max(1),
  calibrated: z.boolean(),
});
const target = z.object({
  points: z
    .array(point)
    .max(5000)
    .refine((ps) => ps.every((p) => p.weight === undefined) || ps.every((p) => p.weight !== undefined), 'expected a weight on every point or on none')
    .refine((ps) => ps.length === 0 || ps[0].weight === undefined || ps.some((p) => (p.weight ?? 0) > 0), 'every weight is 0; expected at least one above 0'),
  closed: z.boolean(),
  timing: z.enum(['prescribed', 'free', 'unprescribed']),
  background: background.nullable(),
});
const settings = z.object({
  families: z.array(z.enum(familyIds)),
  placement: z.enum(['free', 'fixed']),
  measure: z.enum(['rms', 'sum-of-squares', 'max']),
  bounds: z.partialRecord(z.enum(familyIds), z.record(z.string(), range)),
  constraints: z.object({
    fullTurnCrank: z.boolean(),
    minTransmissionDeg: finite.nullable(),
    linkLengthMm: range.nullable(),
    keepOut: z.array(z.object({ x: finite, y: finite, r: z.number().positive() })),
    // Absent in projects saved before the size limit and terms: none, as they were searched.
    maxSizeSpans: z.number().gt(1).max(MAX_SIZE_SPANS).nullable().default(null),
  }),
  terms: z
    .object({ sizeWeight: z.number().min(0).max(MAX_TERM_WEIGHT), transmissionWeight: z.number().min(0).max(MAX_TERM_WEIGHT), transmissionGuidelineDeg: z.number().gt(0).max(90) })
    .default({ sizeWeight: 0, transmissionWeight: 0, transmissionGuidelineDeg: DEFAULT_GUIDELINE_DEG }),
  resultsPerFamily: z.number().int().min(1).max(MAX_RESULTS_PER_FAMILY).default(DEFAULT_RESULTS_PER_FAMILY),
  budget: z.object({ mode: z.enum(['evaluations', 'time']), evaluations: z.number().int().positive(), seconds: z.number().positive() }),
  seed: z.number().int().min(0),
  workers: z.number().int().min(1).nullable(),
  // Absent in projects saved before the interval was a setting: the interval they ran with.
  checkpointEverySeconds: z.number().min(MIN_CHECKPOINT_EVERY_S).max(MAX_CHECKPOINT_EVERY_S).default(DEFAULT_CHECKPOINT_EVERY_S),
});
const run = z.object({
  status: z.enum(['idle', 'starting', 'running', 'pausing', 'paused', 'stopping', 'finished', 'failed']),
  runId: z.string().nullable(),
  evaluations: z.number().min(0),
  budgetEvaluations: z.number().nullable(),
  budgetSeconds: z.number().nullable(),
  elapsedMs: z.number().min(0),
  evaluationsPerSecond: z.number().min(0),
  // Absent in projects saved before runs showed their restarts.
  searchRestarts: z.number().int().min(0).default(0),
  remainingMs: z.number().nullable(),
  bestErrorMm: z.number().nullable(),
  bestFeasible: z.boolean().nullable(),
  checkpoint: z.object({ round: z.number(), evaluations: z.number(), savedAtMs: z.number() }).nullable(),
  resumedFrom: z.object({ round: z.number(), evaluations: z.number() }).nullable(),
  stopReason: z.string().nullable(),
  message: z.string().nullable(),
  // Absent in projects saved before runs kept a message's details apart.
  messageDetail: z.string().nullable().default(null),
  targetPointCount: z.number().int().min(0),
  // Absent in projects saved before the size and transmission terms: none.
  withTerms: z.boolean().default(false),
  measure: z.enum(['rms', 'sum-of-squares', 'max']),
});
// Candidates come from our own search; the check guards what the views read first.
const candidate = z.looseObject({
  family: z.string(),
  x: z.array(z.number()),
  error: z.looseObject({ rmsMm: z.number(), maxMm: z.number(), sumSquares: z.number(), perPointMm: z.array(z.number()) }),
  feasible: z.boolean(),
  linkage: z.looseObject({ joints: z.array(z.unknown()), bodies: z.array(z.unknown()) }),
});
const snapshot = z.object({ points: z.array(z.tuple([finite, finite])), closed: z.boolean() });

const project = z.object({
  format: z.literal(PROJECT_FORMAT),
  version: z.literal(PROJECT_VERSION),
  name: z.string(),
  target,
  settings,
  run,
  candidates: z.array(candidate),
  candidatesTarget: snapshot.nullable(),
  suspension: storedSuspensionSchema.optional(),
  // Absent in projects kept before the walking-leg workspace: none.
  leg: storedLegSchema.optional(),
});

export type ReadProject = { readonly ok: true; readonly project: Project } | { readonly ok: false; readonly reason: string };

/**
 * Version 1 → 2: points gained an optional weight. A version 1 project has none, so it
 * reads as it is: an unweighted target. Version 2 → 3: the project may keep a
 * rear-suspension design; an older one has none. Anything else is left for the schema
 * to refuse.
 */
function migrate(value: unknown): unknown {
  if (typeof value !== 'object' || value === null) return value;
  const record = value as Record<string, unknown>;
  if (record.format !== PROJECT_FORMAT || !(record.version === 1 || record.version === 2)) return value;
  return { ...record, version: PROJECT_VERSION };
}

export function readProject(value: unknown): ReadProject {
  const parsed = project.safeParse(migrate(value));
  if (parsed.success) {
    const data = parsed.data;
    return { ok: true, project: { ...data, candidates: data.candidates as unknown as CandidateReport[] } as Project };
  }
  const first = parsed.error.issues[0];
  const where = first.path.length > 0 ? first.path.join('.') : 'the record';
  return { ok: false, reason: `${where}: ${first.message}` };
}
