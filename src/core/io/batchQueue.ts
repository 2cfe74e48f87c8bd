/**
 * The batch queue file ("loci-batch", version 1): named jobs run one after another,
 * each a problem file × families × budget × seed. Checked once here, with messages
 * that name the field, so the runner trusts what it reads.
 */
import { z } from 'zod';
import { capIssues, envelopeIssue, expected, formatPath, strict } from './schemaMessages';

export const BATCH_FORMAT = 'loci-batch';
export const BATCH_VERSION = 1;
/** Most jobs in one queue: a month of nights at a job an hour. */
export const MAX_BATCH_JOBS = 1000;
/** A job's name is also its results' file stem, so it keeps to characters every file system takes. */
export const JOB_NAME_PATTERN = /^[A-Za-z0-9][A-Za-z0-9._-]{0,79}$/;
const MAX_EVALUATIONS = 1_000_000_000;
const MAX_SECONDS = 30 * 24 * 3600;

export interface BatchJob {
  readonly name: string;
  /** The problem file, relative to the queue file's folder (or absolute). */
  readonly problem: string;
  /** A subset of the problem's families (or a suspension problem's layouts); all of them when absent. */
  readonly families?: readonly string[];
  readonly seed: number;
  /** Exactly one budget: evaluations (deterministic) or seconds. */
  readonly evaluations?: number;
  readonly seconds?: number;
  readonly islands?: number;
  readonly top?: number;
  /** Left in the queue but not run. */
  readonly skip: boolean;
}

export interface BatchQueue {
  readonly name: string;
  readonly jobs: readonly BatchJob[];
}

export interface BatchIssue {
  readonly path: string;
  readonly message: string;
}

export type BatchQueueResult = { readonly ok: true; readonly queue: BatchQueue } | { readonly ok: false; readonly issues: BatchIssue[] };

const whole = (min: number, max: number, what: string) =>
  z.number({ error: expected(what) }).int({ error: expected(what) }).min(min, { error: expected(what) }).max(max, { error: expected(what) });

const JOB_FIELDS = {
  name: z.string({ error: expected('a job name') }).regex(JOB_NAME_PATTERN, {
    error: expected('1 to 80 letters, digits, dots, dashes or underscores, starting with a letter or digit (it names the job\'s result files)'),
  }),
  problem: z.string({ error: expected('the problem file\'s path') }).min(1, { error: expected('the problem file\'s path') }).max(4096, { error: expected('a path of at most 4096 characters') }),
  families: z
    .array(z.string({ error: expected('a family name') }).min(1).max(64), { error: expected('an array of family names') })
    .min(1, { error: expected('at least one family') })
    .max(64, { error: expected('at most 64 families') })
    .optional(),
  seed: whole(0, Number.MAX_SAFE_INTEGER, 'a whole number ≥ 0').default(1),
  evaluations: whole(1, MAX_EVALUATIONS, `a whole number of evaluations from 1 to ${MAX_EVALUATIONS.toLocaleString('en-GB')}`).optional(),
  seconds: z.number({ error: expected('a number of seconds') }).gt(0, { error: expected('a number of seconds > 0') }).max(MAX_SECONDS, { error: expected(`at most ${MAX_SECONDS} s (30 days)`) }).optional(),
  islands: whole(1, 256, 'a whole number of islands from 1 to 256').optional(),
  top: whole(1, 1000, 'a whole number from 1 to 1000').optional(),
  skip: z.boolean({ error: expected('true or false') }).default(false),
};

const jobSchema = strict('a job', JOB_FIELDS)
  .refine((j) => !(j.evaluations !== undefined && j.seconds !== undefined), { error: 'give evaluations or seconds, not both', path: ['seconds'] })
  .refine((j) => j.evaluations !== undefined || j.seconds !== undefined, { error: 'missing; give a budget: evaluations or seconds', path: ['evaluations'] });

const queueSchema = strict('a batch queue', {
  format: z.literal(BATCH_FORMAT),
  version: z.literal(BATCH_VERSION),
  name: z.string({ error: expected('a queue name') }).min(1, { error: expected('a queue name') }).max(200, { error: expected('a name of at most 200 characters') }),
  jobs: z
    .array(jobSchema, { error: expected('an array of jobs') })
    .min(1, { error: expected('at least one job') })
    .max(MAX_BATCH_JOBS, { error: expected(`at most ${MAX_BATCH_JOBS} jobs`) }),
});

/** Reads a queue file's JSON. */
export function parseBatchQueue(json: unknown): BatchQueueResult {
  const envelope = envelopeIssue(json, BATCH_FORMAT, 'batch queue file', BATCH_VERSION);
  if (envelope !== null) return { ok: false, issues: [envelope] };
  const parsed = queueSchema.safeParse(json);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message }));
    return { ok: false, issues: capIssues(issues, (count) => ({ path: '', message: `and ${count} more issues` })) };
  }
  const issues: BatchIssue[] = [];
  const seen = new Map<string, number>();
  parsed.data.jobs.forEach((job, i) => {
    // File systems that ignore case would put two such jobs' results in one file.
    const key = job.name.toLowerCase();
    const first = seen.get(key);
    if (first !== undefined) issues.push({ path: `jobs[${i}].name`, message: `"${job.name}" is the name of jobs[${first}] too (names are compared ignoring case); give each job its own name` });
    else seen.set(key, i);
    if (job.families !== undefined && new Set(job.families).size !== job.families.length) {
      issues.push({ path: `jobs[${i}].families`, message: 'lists a family twice' });
    }
  });
  if (issues.length > 0) return { ok: false, issues };
  return { ok: true, queue: parsed.data };
}
