/**
 * The run's slices, sent to the workers with no barrier between them.
 *
 * Slice t steps every running island once, all the islands of a worker in one `advance`
 * message. A worker is sent its next slice t as soon as:
 * - it has fewer than `depth` calls in flight (at 2, the next slice waits in its queue
 *   while it computes this one, so it never idles for a message);
 * - each island it hosts that takes immigrants at t has its sender done with the slice
 *   they come from (emigrants published at the end of slice p are placed at the start
 *   of slice p + 1 + MIGRATION_LAG: an island waits only for a sender more than one
 *   slice behind);
 * - t ≤ (the last slice every island has done) + MAX_LEAD, and t ≤ the cut, once one is
 *   set.
 * This is bounded staleness (Ho et al., 2013, "stale synchronous parallel") applied to
 * the island model. What an island computes depends only on its state, its slices and
 * its immigrants, never on which worker answers first, and the run merges results slice
 * by slice in island order: a deterministic run ends the same on any number of workers.
 *
 * A cut is a slice every island stops at; there the islands' states, the emigrants not
 * yet placed (`EmigrantLedger`) and the run's archive make a checkpoint.
 */
import type { AdvanceRequest, AdvanceResult, Individual, StepSlice } from '../../workers/api';
import { queueTask } from './nextTask';
import { WorkerLost, type WorkerClient } from './workerClient';

/** Calls a worker may have in flight: the one it computes and the next one, queued. */
export const PIPELINE_DEPTH = 2;
/**
 * Timed slices (about 200 ms each) are long beside a message: one call in flight costs
 * them little, and a pause, stop or checkpoint then waits for one slice, not two.
 */
export const TIMED_PIPELINE_DEPTH = 1;
/** Slices between an emigrant's publication and its placement, beyond the next one. */
export const MIGRATION_LAG = 1;
/** How far, in slices, a worker may run ahead of the slowest island. */
export const MAX_LEAD = 3;

export interface PipelineIsland {
  readonly islandId: string;
  readonly worker: number;
  /** The island whose emigrants this one takes (its ring predecessor), or −1. */
  readonly sender: number;
}

/** Go on, end at a cut as soon as the workers can (the last slice sent), or at a cut MAX_LEAD slices on (the same on any schedule). */
export type CutRule = 'go' | 'cut' | 'cut-after-lead';

export interface PipelineRun {
  readonly islands: readonly PipelineIsland[];
  readonly workers: readonly WorkerClient[];
  readonly callTimeoutMs: number;
  /** Calls a worker may have in flight (PIPELINE_DEPTH, or TIMED_PIPELINE_DEPTH). */
  readonly depth: number;
  /** Slices every island has done: the pipeline starts at the next one. */
  readonly done: number;
  /** Islands already stopped; they are sent nothing. */
  readonly stopped: readonly boolean[];
  /** Each island publishes its `count` best every `every` slices; count 0: no migration. */
  readonly migration: { readonly every: number; readonly count: number };
  readonly ledger: EmigrantLedger;
  /** The step of slice t. */
  slice(t: number): StepSlice;
  /** Told of each slice every island has done, in order, with the results by island (null: not stepped); says whether to go on. */
  merged(t: number, results: readonly (AdvanceResult | null)[]): CutRule;
}

/** Whether slice p ends with each island publishing its emigrants. */
export function publishes(p: number, every: number, count: number): boolean {
  return count > 0 && p >= 1 && p % every === 0;
}

/**
 * Emigrants published and not yet placed, by sender and slice, and the last emigrants of
 * each stopped island (what it sends from then on).
 */
export class EmigrantLedger {
  private readonly sent = new Map<number, Map<number, readonly Individual[]>>();
  private readonly last: (readonly Individual[] | null)[];

  constructor(islands: number) {
    this.last = Array.from({ length: islands }, () => null);
  }

  publish(island: number, slice: number, individuals: readonly Individual[]): void {
    const bySlice = this.sent.get(island) ?? new Map<number, readonly Individual[]>();
    bySlice.set(slice, individuals);
    this.sent.set(island, bySlice);
  }

  /** The island has stopped: these are its emigrants from now on. */
  stopped(island: number, individuals: readonly Individual[]): void {
    this.last[island] = individuals;
  }

  /** What `island` published at the end of slice p (its last emigrants once stopped); null if not known yet. */
  take(island: number, p: number): readonly Individual[] | null {
    return this.sent.get(island)?.get(p) ?? this.last[island];
  }

  /** Forgets publications placed by slice `placedBy` (every island has done it). */
  prune(placedBy: number): void {
    for (const bySlice of this.sent.values()) for (const p of bySlice.keys()) if (p + 1 + MIGRATION_LAG <= placedBy) bySlice.delete(p);
  }

  /** The publications still to be placed, for a checkpoint. */
  entries(): { island: number; slice: number; individuals: readonly Individual[] }[] {
    const out: { island: number; slice: number; individuals: readonly Individual[] }[] = [];
    for (const [island, bySlice] of [...this.sent.entries()].sort((a, b) => a[0] - b[0])) {
      for (const [slice, individuals] of [...bySlice.entries()].sort((a, b) => a[0] - b[0])) out.push({ island, slice, individuals });
    }
    return out;
  }
}

/**
 * Runs slices until a cut (every island stopped at the same slice, or stopped for good),
 * then resolves. On a failure it sends nothing more, waits for the calls in flight,
 * merges the slices they complete, and rejects with the first failure (a lost worker
 * first).
 */
export function runPipeline(run: PipelineRun): Promise<void> {
  const { islands, workers, ledger, migration } = run;
  const nIslands = islands.length;
  const hosted = workers.map((_, w) => islands.map((island, k) => (island.worker === w ? k : -1)).filter((k) => k >= 0));
  /** Slice at which each island was seen stopped (its later slices are not needed); Infinity: running. */
  const stoppedAt = run.stopped.map((s) => (s ? run.done : Infinity));
  const sentUpTo = workers.map(() => run.done);
  const returnedUpTo = workers.map(() => run.done);
  const returned = workers.map(() => new Set<number>());
  const inFlight = workers.map(() => 0);
  const results = new Map<number, (AdvanceResult | null)[]>();
  let mergedUpTo = run.done;
  let limit = Infinity;
  let mergeScheduled = false;
  const failures: unknown[] = [];
  const fail = (error: unknown) => failures.push(error);

  const senderDone = (sender: number, p: number) => stoppedAt[sender] <= p || returnedUpTo[islands[sender].worker] >= p;

  const active = (w: number) => hosted[w].filter((k) => stoppedAt[k] === Infinity);

  function ready(w: number): boolean {
    const t = sentUpTo[w] + 1;
    if (failures.length > 0 || inFlight[w] >= run.depth || t > limit || t > mergedUpTo + MAX_LEAD) return false;
    const mine = active(w);
    if (mine.length === 0) return false;
    const p = t - 1 - MIGRATION_LAG;
    if (!publishes(p, migration.every, migration.count)) return true;
    return mine.every((k) => islands[k].sender < 0 || senderDone(islands[k].sender, p));
  }

  function request(k: number, t: number, slice: StepSlice): AdvanceRequest {
    const sender = islands[k].sender;
    const p = t - 1 - MIGRATION_LAG;
    let immigrants: readonly Individual[] = [];
    if (sender >= 0 && publishes(p, migration.every, migration.count)) {
      const sent = ledger.take(sender, p);
      if (sent === null) throw new Error(`pipeline: island ${islands[sender].islandId} has not published slice ${p} yet`);
      immigrants = sent;
    }
    return { islandId: islands[k].islandId, slice, immigrants, emigrants: migration.count, publish: publishes(t, migration.every, migration.count) };
  }

  return new Promise<void>((resolve, reject) => {
    const settle = () => {
      if (mergeScheduled || inFlight.some((n) => n > 0)) return;
      // A lost worker before anything else: the engine recovers from it.
      if (failures.length > 0) reject(failures.find((f) => f instanceof WorkerLost) ?? failures[0]);
      else resolve();
    };

    /** Merges the next slice if every island has done it; says whether it did. */
    const mergeNext = (): boolean => {
      const t = mergedUpTo + 1;
      if (t > Math.max(...sentUpTo)) return false;
      const complete = islands.every((island, k) => stoppedAt[k] < t || returnedUpTo[island.worker] >= t);
      // Sent before it was known that every island had stopped: nobody's slice.
      if (!complete || stoppedAt.every((at) => at < t)) return false;
      const row = results.get(t) ?? Array.from({ length: nIslands }, () => null);
      results.delete(t);
      mergedUpTo = t;
      ledger.prune(t);
      // After a failure the slices the other calls complete are still merged: the run's results keep them.
      const rule = run.merged(t, row);
      if (rule === 'cut') limit = Math.min(limit, Math.max(t, ...sentUpTo));
      else if (rule === 'cut-after-lead') limit = Math.min(limit, t + MAX_LEAD);
      return true;
    };

    // One slice merged per task: on a page's thread, answers that arrive together never make one long task.
    const scheduleMerge = () => {
      if (mergeScheduled) return;
      mergeScheduled = true;
      queueTask(() => {
        mergeScheduled = false;
        try {
          if (mergeNext()) scheduleMerge();
        } catch (error) {
          fail(error);
        }
        pump();
      });
    };

    const pump = () => {
      try {
        for (let w = 0; w < workers.length; w++) while (ready(w)) send(w);
      } catch (error) {
        fail(error);
      }
      settle();
    };

    const send = (w: number) => {
      const t = ++sentUpTo[w];
      const mine = active(w);
      const slice = run.slice(t);
      const requests = mine.map((k) => request(k, t, slice));
      inFlight[w]++;
      workers[w]
        .call('advance', run.callTimeoutMs, (api) => api.advance(requests))
        .then(
          (answer) => {
            const row = results.get(t) ?? Array.from({ length: nIslands }, () => null);
            for (const [j, k] of mine.entries()) {
              // Stopped before this slice (not known when it was sent): it did nothing and publishes nothing.
              if (stoppedAt[k] < t) continue;
              const result = answer.results[j];
              row[k] = result;
              if (publishes(t, migration.every, migration.count)) ledger.publish(k, t, result.emigrants);
              if (result.progress.stopReason !== null && stoppedAt[k] === Infinity) {
                stoppedAt[k] = t;
                ledger.stopped(k, result.emigrants);
              }
            }
            results.set(t, row);
            returned[w].add(t);
            while (returned[w].delete(returnedUpTo[w] + 1)) returnedUpTo[w]++;
          },
          (error: unknown) => fail(error),
        )
        .finally(() => {
          inFlight[w]--;
          scheduleMerge();
          pump();
        });
    };

    pump();
  });
}
