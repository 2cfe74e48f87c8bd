/**
 * The checkpoint of a whole run, and its text form. A checkpoint is every island's
 * state, the run's archive and its counters, with the spec it runs; restoring it
 * continues the same search. The text is JSON:
 *
 *   { "format": "loci-run-checkpoint", "version": 2, "checksum": "fnv1a64:…", "payload": {…} }
 *
 * where the checksum is taken over `JSON.stringify(payload)`. JSON round-trips every
 * finite double exactly and keeps key order, so a reader recomputes the same string
 * from the parsed payload; any change to it (a truncated write, a flipped digit, a hand
 * edit) shows up as a mismatch.
 */
import type { Individual, IslandState } from '../../workers/api';
import { Fnv1a64, fnv1a64Hex } from './checksum';
import { defineRun, planIslands, type RunSpec } from './runSpec';

export const CHECKPOINT_FORMAT = 'loci-run-checkpoint';
/**
 * Version 2: the islands' states may be of version 3 (their optimizer states packed,
 * workers/api.ts); the payload is otherwise that of version 1, which is still read.
 */
export const CHECKPOINT_VERSION = 2;
/** Versions this Loci reads. */
const READABLE_VERSIONS: readonly unknown[] = [1, CHECKPOINT_VERSION];
const CHECKSUM_PREFIX = 'fnv1a64:';

export interface CheckpointPayload {
  readonly spec: RunSpec;
  /** Rounds completed (every island stepped once per round). */
  readonly rounds: number;
  /** Active (not paused) milliseconds of the run so far. */
  readonly elapsedMs: number;
  /** Evaluations of all islands so far. */
  readonly evaluations: number;
  /** Worker restarts after a failure, so far. */
  readonly restarts: number;
  /** Every island, in the order of `planIslands(spec)`. */
  readonly islands: readonly IslandState[];
  /**
   * Emigrants published at the end of a slice and not yet placed in the next island of
   * the ring (by island index); absent in checkpoints of Loci before the pipelined
   * engine, which placed them at once.
   */
  readonly emigrants?: readonly { readonly island: number; readonly slice: number; readonly individuals: readonly Individual[] }[];
  /**
   * The run's archive of each job, best first: the merge of its islands' archives (which
   * the island states hold), for readers of the checkpoint; a restored run merges anew.
   */
  readonly archive: readonly { readonly jobId: string; readonly entries: readonly Individual[] }[];
}

export type DecodeResult = { readonly ok: true; readonly payload: CheckpointPayload } | { readonly ok: false; readonly reason: string };

/** Characters of the body hashed in one step of `encodeSteps`: a few ms even before the JIT warms up. */
const HASH_STEP_CHARS = 128 * 1024;

/**
 * Builds the checkpoint text in steps, yielding between them: the counters, each island,
 * the archives, then the checksum a slice of characters at a time. The body is exactly
 * `JSON.stringify(payload)` (same keys in the same order), made of pieces, so no step
 * holds a thread for long however many islands there are.
 */
function* encodeSteps(payload: CheckpointPayload): Generator<void, string, void> {
  const { islands, emigrants, archive, ...counters } = payload;
  const head = JSON.stringify(counters);
  const pieces = [head.length > 2 ? `${head.slice(0, -1)},"islands":[` : '{"islands":['];
  for (const [k, island] of islands.entries()) {
    yield;
    pieces.push(k === 0 ? JSON.stringify(island) : `,${JSON.stringify(island)}`);
  }
  yield;
  pieces.push(emigrants === undefined ? ']' : `],"emigrants":${JSON.stringify(emigrants)}`);
  yield;
  pieces.push(`,"archive":${JSON.stringify(archive)}}`);
  const body = pieces.join('');
  const hash = new Fnv1a64();
  for (let from = 0; from < body.length; ) {
    yield;
    from = hash.updateText(body, from, from + HASH_STEP_CHARS);
  }
  const checksum = CHECKSUM_PREFIX + hash.hex();
  return `{"format":${JSON.stringify(CHECKPOINT_FORMAT)},"version":${CHECKPOINT_VERSION},"checksum":${JSON.stringify(checksum)},"payload":${body}}`;
}

/** The checkpoint as text. */
export function encodeCheckpoint(payload: CheckpointPayload): string {
  const steps = encodeSteps(payload);
  let step = steps.next();
  while (step.done !== true) step = steps.next();
  return step.value;
}

/** The checkpoint as text, each step of the encoding after `pause()` (the engine passes "the next task"). */
export async function encodeCheckpointInSteps(payload: CheckpointPayload, pause: () => Promise<void>): Promise<string> {
  const steps = encodeSteps(payload);
  let step = steps.next();
  while (step.done !== true) {
    await pause();
    step = steps.next();
  }
  return step.value;
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function isCount(v: unknown): v is number {
  return typeof v === 'number' && Number.isInteger(v) && v >= 0;
}

function isIndividual(v: unknown): boolean {
  if (!isObject(v)) return false;
  const { x, value, violation } = v;
  return Array.isArray(x) && x.every((c) => Number.isFinite(c)) && Number.isFinite(value) && typeof violation === 'number' && violation >= 0 && Number.isFinite(violation);
}

/** What is wrong with a checkpoint's emigrants, or null; absent is fine (an older checkpoint). */
function checkEmigrants(v: unknown, islands: number, rounds: number): string | null {
  if (v === undefined) return null;
  if (!Array.isArray(v)) return 'not an array';
  for (const [k, sent] of v.entries()) {
    if (!(isObject(sent) && Number.isInteger(sent.island) && (sent.island as number) >= 0 && (sent.island as number) < islands)) {
      return `[${k}].island is not an island index in [0, ${islands - 1}]`;
    }
    if (!(Number.isInteger(sent.slice) && (sent.slice as number) >= 1 && (sent.slice as number) <= rounds)) return `[${k}].slice is not a round in [1, ${rounds}]`;
    if (!(Array.isArray(sent.individuals) && sent.individuals.every(isIndividual))) return `[${k}].individuals is not an array of { x, value, violation }`;
  }
  return null;
}

/**
 * Reads a checkpoint's text: JSON, format, version, checksum, then the shape of the
 * payload and its spec. The island states themselves are checked by the workers that
 * import them.
 */
export function decodeCheckpoint(text: string): DecodeResult {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (error) {
    return { ok: false, reason: `checkpoint is not valid JSON (${error instanceof Error ? error.message : String(error)}); it may have been cut short` };
  }
  if (!isObject(doc)) return { ok: false, reason: 'checkpoint is not a JSON object' };
  if (doc.format !== CHECKPOINT_FORMAT) return { ok: false, reason: `checkpoint format is ${JSON.stringify(doc.format)}; expected "${CHECKPOINT_FORMAT}"` };
  if (!READABLE_VERSIONS.includes(doc.version)) {
    return { ok: false, reason: `checkpoint version is ${JSON.stringify(doc.version)}; this Loci reads versions ${READABLE_VERSIONS.join(' and ')}` };
  }
  if (!(typeof doc.checksum === 'string' && doc.checksum.startsWith(CHECKSUM_PREFIX))) {
    return { ok: false, reason: `checkpoint checksum is ${JSON.stringify(doc.checksum)}; expected "${CHECKSUM_PREFIX}" and 16 hex digits` };
  }
  if (!isObject(doc.payload)) return { ok: false, reason: 'checkpoint payload is not an object' };
  const actual = CHECKSUM_PREFIX + fnv1a64Hex(JSON.stringify(doc.payload));
  if (actual !== doc.checksum) {
    return { ok: false, reason: `checkpoint is corrupt: its checksum is ${doc.checksum} but its payload hashes to ${actual}` };
  }
  const p = doc.payload;
  const defined = defineRun(p.spec);
  if (!defined.ok) return { ok: false, reason: `checkpoint spec: ${defined.reason}` };
  const spec = defined.spec;
  for (const field of ['rounds', 'evaluations', 'restarts'] as const) {
    if (!isCount(p[field])) return { ok: false, reason: `checkpoint ${field} is ${JSON.stringify(p[field])}; expected an integer ≥ 0` };
  }
  if (!(typeof p.elapsedMs === 'number' && p.elapsedMs >= 0)) return { ok: false, reason: 'checkpoint elapsedMs is not a number ≥ 0' };
  const plans = planIslands(spec);
  if (!(Array.isArray(p.islands) && p.islands.length === plans.length)) {
    return { ok: false, reason: `checkpoint islands is not an array of ${plans.length} island states (one per island of its spec)` };
  }
  for (const [k, plan] of plans.entries()) {
    const island = p.islands[k] as unknown;
    if (!(isObject(island) && isObject(island.config) && island.config.islandId === plan.islandId)) {
      return { ok: false, reason: `checkpoint islands[${k}] is not the state of island ${plan.islandId}` };
    }
  }
  const emigrantsProblem = checkEmigrants(p.emigrants, plans.length, p.rounds as number);
  if (emigrantsProblem !== null) return { ok: false, reason: `checkpoint emigrants: ${emigrantsProblem}` };
  if (!(Array.isArray(p.archive) && p.archive.length === spec.jobs.length)) {
    return { ok: false, reason: `checkpoint archive is not an array of ${spec.jobs.length} job archives` };
  }
  for (const [k, job] of spec.jobs.entries()) {
    const entry = p.archive[k] as unknown;
    if (!(isObject(entry) && entry.jobId === job.id && Array.isArray(entry.entries))) {
      return { ok: false, reason: `checkpoint archive[${k}] is not the archive of job ${job.id}` };
    }
  }
  return { ok: true, payload: { ...(p as unknown as CheckpointPayload), spec } };
}
