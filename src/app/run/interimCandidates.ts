/**
 * Candidates while a search runs: each checkpoint the engine writes holds every job's
 * archive of distinct good designs (real coordinates, value, violation). The best of
 * them, ranked as the engine ranks (feasibility first, Deb 2000), are described in a
 * worker of their own through the search worker's API, so the table fills while the
 * search goes on, and straight after a reload, from the checkpoint it resumes from.
 * The page itself evaluates nothing.
 */
import { wrap, type Remote } from 'comlink';
import { precedes } from '../../core/optimize';
import type { CandidateReport } from '../../core/synthesis';
import { decodeCheckpoint, type CheckpointPayload, type CheckpointStore, type EngineEnvironment, type WorkerHandle } from '../../engine';
import type { SearchWorkerApi } from '../../../workers/api';

export interface ArchivedDesign {
  readonly jobIndex: number;
  readonly x: readonly number[];
  readonly value: number;
  readonly violation: number;
}

/** The `count` best designs of all jobs' archives, best first; ties keep job order. */
export function bestArchived(payload: Pick<CheckpointPayload, 'archive'>, count: number): ArchivedDesign[] {
  const pool = payload.archive.flatMap((job, jobIndex) => job.entries.map((e) => ({ jobIndex, x: e.x, value: e.value, violation: e.violation })));
  pool.sort((a, b) => (precedes(a.value, a.violation, b.value, b.violation) ? -1 : precedes(b.value, b.violation, a.value, a.violation) ? 1 : a.jobIndex - b.jobIndex));
  return pool.slice(0, count);
}

/** The newest checkpoint in a store that reads back whole, or null. */
export async function newestReadable(store: CheckpointStore): Promise<CheckpointPayload | null> {
  for (const text of await store.load()) {
    const decoded = decodeCheckpoint(text);
    if (decoded.ok) return decoded.payload;
  }
  return null;
}

/** A call to the describing worker takes no longer than this, ms. */
const DESCRIBE_TIMEOUT_MS = 30_000;

export class InterimDescriber {
  private readonly env: EngineEnvironment;
  private readonly count: number;
  private readonly onCandidates: (candidates: CandidateReport[]) => void;
  private worker: { handle: WorkerHandle; api: Remote<SearchWorkerApi>; failed: boolean } | null = null;
  private readonly islands = new Set<string>();
  private busy = false;
  private pending: CheckpointPayload | null = null;
  private closed = false;

  constructor(env: EngineEnvironment, count: number, onCandidates: (candidates: CandidateReport[]) => void) {
    this.env = env;
    this.count = count;
    this.onCandidates = onCandidates;
  }

  /** Describes the best designs of a checkpoint (the latest wins if one is already in hand). */
  offer(payload: CheckpointPayload): void {
    if (this.closed) return;
    if (bestArchived(payload, 1).length === 0) return;
    this.pending = payload;
    if (!this.busy) void this.drain();
  }

  private async drain(): Promise<void> {
    this.busy = true;
    try {
      for (let guard = 0; guard < 1000 && this.pending !== null && !this.closed; guard++) {
        const payload = this.pending;
        this.pending = null;
        const candidates = await this.describe(payload);
        if (candidates !== null && !this.closed) this.onCandidates(candidates);
      }
    } finally {
      this.busy = false;
    }
  }

  private start() {
    if (this.worker !== null && !this.worker.failed) return this.worker;
    const handle = this.env.spawnWorker();
    const worker = { handle, api: wrap<SearchWorkerApi>(handle.endpoint), failed: false };
    handle.onFailure(() => {
      worker.failed = true;
    });
    this.islands.clear();
    this.worker = worker;
    return worker;
  }

  private async describe(payload: CheckpointPayload): Promise<CandidateReport[] | null> {
    const best = bestArchived(payload, this.count);
    const worker = this.start();
    const byJob = new Map<number, ArchivedDesign[]>();
    for (const design of best) byJob.set(design.jobIndex, [...(byJob.get(design.jobIndex) ?? []), design]);
    const described = new Map<ArchivedDesign, CandidateReport>();
    let timer: ReturnType<typeof setTimeout> | undefined;
    const timeout = new Promise<null>((resolve) => {
      timer = setTimeout(() => resolve(null), DESCRIBE_TIMEOUT_MS);
    });
    const work = (async () => {
      for (const [jobIndex, designs] of byJob) {
        const job = payload.spec.jobs[jobIndex];
        const islandId = `describe:${job.id}`;
        if (!this.islands.has(islandId)) {
          const made = await worker.api.init({
            islandId,
            objective: job.objective,
            seed: 0,
            stream: 0,
            optimizer: { kind: 'nelder-mead' },
            maxEvaluations: 1,
            archiveCapacity: 1,
            archiveDistance: 0,
          });
          if (!made.ok) return null;
          this.islands.add(islandId);
        }
        const answer = await worker.api.describe(islandId, designs.map((d) => [...d.x]));
        if (!answer.ok) return null;
        answer.candidates.forEach((c, k) => {
          if (c.detail.kind === 'synthesis') described.set(designs[k], c.detail.candidate);
        });
      }
      return best.flatMap((d) => {
        const report = described.get(d);
        return report === undefined ? [] : [report];
      });
    })();
    try {
      return await Promise.race([work, timeout]);
    } catch {
      return null;
    } finally {
      clearTimeout(timer);
    }
  }

  /** Stops describing; a result still on its way is dropped. */
  close(): void {
    this.closed = true;
    this.pending = null;
    const worker = this.worker;
    this.worker = null;
    if (worker !== null) void worker.handle.terminate();
  }
}
