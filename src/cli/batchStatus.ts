/**
 * What `loci batch` keeps beside a queue's results: each job's state, the fingerprint of
 * what it ran (the job and its problem), and its outcome. Written atomically after every
 * change, so a batch stopped at any moment (a kill, a power cut) knows on its next start
 * which jobs are done and which to resume from their checkpoints.
 */
import { z } from 'zod';

export const BATCH_STATUS_FORMAT = 'loci-batch-status';
export const BATCH_STATUS_VERSION = 1;
export const BATCH_STATUS_FILE = 'batch-status.json';

export type JobState = 'running' | 'done' | 'failed' | 'interrupted' | 'skipped';

export interface JobStatus {
  readonly fingerprint: string;
  readonly state: JobState;
  readonly startedAt: string | null;
  readonly endedAt: string | null;
  readonly exitCode: number | null;
  readonly stopReason: string | null;
  readonly best: { readonly family: string; readonly value: number; readonly feasible: boolean; readonly unit: string } | null;
  readonly evaluations: number | null;
  readonly message: string | null;
}

export interface BatchStatus {
  readonly format: typeof BATCH_STATUS_FORMAT;
  readonly version: typeof BATCH_STATUS_VERSION;
  readonly queue: string;
  readonly jobs: Readonly<Record<string, JobStatus>>;
}

const jobStatus = z.object({
  fingerprint: z.string().max(64),
  state: z.enum(['running', 'done', 'failed', 'interrupted', 'skipped']),
  startedAt: z.string().max(64).nullable(),
  endedAt: z.string().max(64).nullable(),
  exitCode: z.number().int().nullable(),
  stopReason: z.string().max(64).nullable(),
  best: z.object({ family: z.string().max(64), value: z.number(), feasible: z.boolean(), unit: z.string().max(64) }).nullable(),
  evaluations: z.number().nullable(),
  message: z.string().max(10_000).nullable(),
});

const statusSchema = z.object({
  format: z.literal(BATCH_STATUS_FORMAT),
  version: z.literal(BATCH_STATUS_VERSION),
  queue: z.string().max(200),
  jobs: z.record(z.string().max(80), jobStatus),
});

export function emptyStatus(queue: string): BatchStatus {
  return { format: BATCH_STATUS_FORMAT, version: BATCH_STATUS_VERSION, queue, jobs: {} };
}

/** The status a file holds, or why it cannot be used. */
export function readBatchStatus(text: string): { ok: true; status: BatchStatus } | { ok: false; reason: string } {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return { ok: false, reason: `not valid JSON (${error instanceof Error ? error.message : String(error)})` };
  }
  const parsed = statusSchema.safeParse(json);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    return { ok: false, reason: `not a ${BATCH_STATUS_FORMAT} file (${first.path.join('.') || 'top level'}: ${first.message})` };
  }
  return { ok: true, status: parsed.data };
}

export function withJob(status: BatchStatus, name: string, job: JobStatus): BatchStatus {
  return { ...status, jobs: { ...status.jobs, [name]: job } };
}
