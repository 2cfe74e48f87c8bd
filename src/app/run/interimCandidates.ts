/**
 * Candidates while a search runs: each checkpoint the engine writes holds every job's
 * archive of distinct good designs (real coordinates, value, violation). The best of
 * them, ranked as the engine ranks (feasibility first, Deb 2000), are described by the
 * engine's describer (a worker of its own), so the table fills while the search goes
 * on, and straight after a reload, from the checkpoint it resumes from. The page itself
 * evaluates nothing.
 */
import { precedes } from '../../core/optimize';
import type { CandidateReport } from '../../core/synthesis';
import { decodeCheckpoint, DesignDescriber, type CheckpointPayload, type CheckpointStore, type EngineEnvironment } from '../../engine';

export interface ArchivedDesign {
  readonly jobIndex: number;
  readonly x: readonly number[];
  readonly value: number;
  readonly violation: number;
}

/**
 * The `count` best designs of all jobs' archives, then each job's `perJob` best that
 * those left out (so a family another one outranks still shows), in the order of the
 * whole pool, best first; ties keep job order.
 */
export function bestArchived(payload: Pick<CheckpointPayload, 'archive'>, count: number, perJob = 0): ArchivedDesign[] {
  const pool = payload.archive.flatMap((job, jobIndex) => job.entries.map((e) => ({ jobIndex, x: e.x, value: e.value, violation: e.violation })));
  pool.sort((a, b) => (precedes(a.value, a.violation, b.value, b.violation) ? -1 : precedes(b.value, b.violation, a.value, a.violation) ? 1 : a.jobIndex - b.jobIndex));
  const taken = payload.archive.map(() => 0);
  return pool.filter((d, k) => {
    const keep = k < count || taken[d.jobIndex] < perJob;
    taken[d.jobIndex]++;
    return keep;
  });
}

/** Designs of each family the table shows while a search runs, beside the overall best. */
export const INTERIM_PER_FAMILY = 1;

/** The newest checkpoint in a store that reads back whole, or null. */
export async function newestReadable(store: CheckpointStore): Promise<CheckpointPayload | null> {
  for (const text of await store.load()) {
    const decoded = decodeCheckpoint(text);
    if (decoded.ok) return decoded.payload;
  }
  return null;
}

export class InterimDescriber {
  private readonly describer: DesignDescriber;
  private readonly count: number;
  private readonly onCandidates: (candidates: CandidateReport[]) => void;
  private busy = false;
  private pending: CheckpointPayload | null = null;
  private closed = false;

  constructor(env: EngineEnvironment, count: number, onCandidates: (candidates: CandidateReport[]) => void) {
    this.describer = new DesignDescriber(env);
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

  /** The best designs of a checkpoint described, best first; null when the engine could not describe them. */
  private async describe(payload: CheckpointPayload): Promise<CandidateReport[] | null> {
    const best = bestArchived(payload, this.count, INTERIM_PER_FAMILY);
    const byJob = new Map<number, ArchivedDesign[]>();
    for (const design of best) byJob.set(design.jobIndex, [...(byJob.get(design.jobIndex) ?? []), design]);
    const described = new Map<ArchivedDesign, CandidateReport>();
    for (const [jobIndex, designs] of byJob) {
      const answer = await this.describer.describe(payload.spec.jobs[jobIndex].objective, designs.map((d) => [...d.x]));
      if (!answer.ok) return null;
      answer.candidates.forEach((c, k) => {
        if (c.detail.kind === 'synthesis') described.set(designs[k], c.detail.candidate);
      });
    }
    return best.flatMap((d) => {
      const report = described.get(d);
      return report === undefined ? [] : [report];
    });
  }

  /** Stops describing; a result still on its way is dropped. */
  close(): void {
    this.closed = true;
    this.pending = null;
    this.describer.close();
  }
}
