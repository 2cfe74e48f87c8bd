/**
 * The leg workspace as the project keeps it: the set-up as typed (a field still being
 * corrected is kept too), the latest search run with the one before it, and the search
 * running now (a reload resumes it). Plain JSON;
 * its schema checks it when the project is read back, so a damaged or hand-edited record
 * is refused, not shown. A kept design is its leg file, read again by the leg file's
 * reader when it is opened.
 */
import { z } from 'zod';
import { legProblemShape } from '../../core/io/legProblemFile';
import { LEG_FAMILY_IDS } from '../../core/synthesis/legProblem';
import type { PoseFamilyId } from '../../core/synthesis/poseFamilies';
import { LEG_TARGET_KEYS, type LegSetup } from './setup';
import type { LegState } from './state';

export type StoredLeg = LegState;

const text = z.string().max(10_000);
const family = z.enum(LEG_FAMILY_IDS as unknown as [PoseFamilyId, ...PoseFamilyId[]]);
const sense = z.union([z.literal(1), z.literal(-1)]);
const targetDraft = z.object({ on: z.boolean(), value: text, value2: text, weight: text, tolerance: text });

const setup = z.object({
  name: text,
  footPath: z.object({ on: z.boolean(), points: z.array(z.object({ x: text, y: text })).max(100_000), weight: text, tolerance: text }),
  ground: z.object({ kind: z.enum(['level', 'line']), yMm: text, px: text, py: text, dx: text, dy: text }),
  stanceToleranceMm: text,
  crankDirection: sense,
  walkingDirection: sense,
  steps: text,
  phasing: z.object({ legs: text, phasesDeg: text }),
  targets: z.object(Object.fromEntries(LEG_TARGET_KEYS.map((k) => [k, targetDraft])) as Record<(typeof LEG_TARGET_KEYS)[number], typeof targetDraft>),
  families: z.array(family),
  regions: z.partialRecord(family, z.array(z.object({ variable: z.string().max(64), min: text, max: text })).max(100)),
  keepOut: z.array(z.object({ name: text, x: text, y: text, r: text })).max(1000),
  budget: z.object({ evaluations: text, seconds: text }),
  seed: text,
}) satisfies z.ZodType<LegSetup>;

/** A figure or score: any number (NaN for a figure that does not exist); the project keeps them by structured clone. */
const anyNumber = z.custom<number>((v) => typeof v === 'number', 'expected a number');
const figures = z.object({
  strideMm: anyNumber.nullable(),
  stepHeightMm: anyNumber,
  dutyFactor: anyNumber,
  dutyToleranceMm: anyNumber,
  flatnessPeakToPeakMm: anyNumber.nullable(),
  speedVariation: anyNumber.nullable(),
  worstTransmissionInStanceDeg: anyNumber.nullable(),
  widthMm: anyNumber,
  heightMm: anyNumber,
});
const candidate = z.object({
  rank: z.number().int().min(1),
  family,
  value: anyNumber,
  violation: anyNumber,
  feasible: z.boolean(),
  defects: z.array(text).max(100),
  trajectoryRmsMm: anyNumber.nullable(),
  figures: figures.nullable(),
  failure: text.nullable(),
  // Read again by parseLegFile when the design is opened: only its envelope is checked here.
  legFile: z.looseObject({ format: z.literal('loci-leg'), version: z.literal(1) }),
});
const run = z.object({
  id: z.string().max(200),
  finishedAt: z.string().max(100),
  problem: z.object({ ...legProblemShape, name: z.string().max(10_000) }),
  seed: z.number().int().min(0),
  budget: z.object({ evaluations: z.number().int().min(1).nullable(), seconds: z.number().positive().nullable() }),
  evaluations: z.number().min(0),
  stopReason: z.enum(['budget', 'time', 'converged', 'target', 'cancelled']),
  candidates: z.array(candidate).max(1000),
});

/**
 * The running search: absent (a project kept before leg searches resumed, or none
 * running), or a whole record; one that does not read is left out (the search is not
 * resumed, nothing else is refused).
 */
const running = z
  .object({
    runId: z.string().min(1).max(200),
    startedAt: z.string().max(100),
    problem: z.object({ ...legProblemShape, name: z.string().max(10_000) }),
    settings: z.object({ seed: z.number().int().min(0), budget: z.object({ evaluations: z.number().int().min(1).nullable(), seconds: z.number().positive().nullable() }) }),
  })
  .optional()
  .catch(undefined);

export const storedLegSchema = z.object({
  setup,
  results: z.object({ current: run, previous: run.nullable() }).optional(),
  searchRunning: running,
});

/** What the project keeps of the workspace (the state as it is: it holds nothing else). */
export function storedLegOf(state: LegState): StoredLeg {
  return {
    setup: state.setup,
    ...(state.results === undefined ? {} : { results: state.results }),
    ...(state.searchRunning === undefined ? {} : { searchRunning: state.searchRunning }),
  };
}

