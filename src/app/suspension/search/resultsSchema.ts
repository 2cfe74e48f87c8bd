/**
 * The schema of the search results the project keeps (results.ts): checked when the
 * project is read back, so a damaged or hand-edited record is refused, not shown.
 */
import { z } from 'zod';
import { suspensionProblemShape } from '../../../core/io/suspensionProblemFile';
import { LAYOUT_KINDS, type LayoutKind } from '../../../core/suspension';
import type { RunningSearch, SearchRecord } from './results';

const finite = z.number().refine(Number.isFinite, 'expected a finite number');
/** A figure or score: any number, NaN for a figure that does not exist (no chain line) included; the project keeps them by structured clone. */
const anyNumber = z.custom<number>((v) => typeof v === 'number', 'expected a number');
const figureList = z.array(anyNumber).max(100);
const numbers = z.array(finite).max(10_000);
const kind = z.enum(LAYOUT_KINDS as unknown as [LayoutKind, ...LayoutKind[]]);
const text = z.string().max(10_000);

const figures = z.object({
  totalTravelMm: anyNumber,
  leverageRatioStart: anyNumber,
  leverageRatioEnd: anyNumber,
  progressionPct: anyNumber,
  cogTeeth: numbers,
  sagAntiSquatPct: figureList,
  sagAntiRisePct: anyNumber,
  endRearwardMm: anyNumber,
  endKickbackDeg: figureList,
  endChainGrowthMm: figureList,
});

const candidate = z.object({
  rank: z.number().int().min(1),
  family: kind,
  x: numbers,
  pivots: z.record(z.string().max(64), z.object({ x: finite, y: finite })),
  value: anyNumber,
  violation: anyNumber,
  feasible: z.boolean(),
  defects: z.array(text).max(100),
  figures: figures.nullable(),
  failure: text.nullable(),
});

const problem = z.object({ ...suspensionProblemShape, name: z.string().max(10_000) });
const seed = z.number().int().min(0);
const budget = z.object({ evaluations: z.number().int().min(1).nullable(), seconds: z.number().positive().nullable() });

const run = z.object({
  id: z.string().max(200),
  finishedAt: z.string().max(100),
  problem,
  seed,
  budget,
  evaluations: z.number().min(0),
  stopReason: z.enum(['budget', 'time', 'converged', 'target', 'cancelled']),
  candidates: z.array(candidate).max(1000),
});

const record = z.object({ current: run, previous: run.nullable() });

export const searchRecordSchema = record as unknown as z.ZodType<SearchRecord>;

/**
 * The field as the stored suspension reads it: absent, or a record that reads whole. A
 * record that does not read is left out rather than refusing the whole project (the
 * design, the set-up and the path work stay); the next search writes a new one.
 */
export const storedSearchRecordSchema = searchRecordSchema.optional().catch(undefined);

const running = z.object({
  runId: z.string().min(1).max(200),
  startedAt: z.string().max(100),
  problem,
  settings: z.object({ seed, budget }),
});

export const runningSearchSchema = running as unknown as z.ZodType<RunningSearch>;

/**
 * The running search as the stored suspension reads it: absent (a project kept before
 * searches resumed, or with none running), or a whole record; one that does not read is
 * left out (the search is not resumed, nothing else is refused).
 */
export const storedRunningSearchSchema = runningSearchSchema.optional().catch(undefined);
