/**
 * A search run: the islands of a spec spread over N workers, stepped in slices.
 *
 * Slice t steps every running island once. The slices go to the workers through a
 * pipeline with no barrier (pipeline.ts): each worker gets one message per slice for all
 * its islands, has its next slice queued while it computes, and waits only for an
 * island it takes immigrants from that is more than one slice behind. Every few slices
 * each island publishes its best few, and the next island of its job's ring (island k
 * sends to island k + 1) places them two slices later. Each slice the engine only
 * counts and reports progress: the run's archive of a job is the merge of its islands'
 * archives in island order, taken at cuts (checkpoints, pause, export, the end), so the
 * thread that orchestrates does next to nothing per slice however many workers there
 * are, and the result does not depend on how the islands were spread over them.
 * Checkpoints, pause, cancel and exports happen at cuts: slices every island stops at.
 * A worker that dies or stops answering is replaced, and the whole run goes back to
 * the last checkpoint, so a deterministic run still ends as it would have.
 *
 * Every evaluation happens in the workers; this side only orchestrates: the rounds, the
 * pause/resume states, checkpoints taken at cuts and recovery from a lost worker. Its
 * other parts are rooms of their own: what callers see (runTypes.ts), the clock
 * (runClock.ts), the archives and ranking (runResults.ts), saving checkpoints
 * (checkpointSaver.ts) and taking a run up from a store (restoreFromStore.ts).
 */
import type { AdvanceResult, DescribedCandidate, IslandInfo, IslandProgress, IslandState, IslandStopReason, StepSlice } from '../../workers/api';
import { isObjectiveError } from '../../workers/objectiveError';
import { decodeCheckpoint, type CheckpointPayload } from './checkpoint';
import { CheckpointSaver, encodeInTasks } from './checkpointSaver';
import type { EngineEnvironment } from './environment';
import { EmigrantLedger, PIPELINE_DEPTH, runPipeline, TIMED_PIPELINE_DEPTH, type CutRule, type PipelineIsland } from './pipeline';
import { nextTask } from './nextTask';
import { RunClock } from './runClock';
import { JobArchives } from './runResults';
import { defineRun, planIslands, type IslandPlan, type RunInput, type RunSpec } from './runSpec';
import type { MakeRunResult, RankedCandidate, Run, RunOptions, RunProgress, RunResult, RunStatus, RunStopReason } from './runTypes';
import { WorkerClient, WorkerLost, WorkerRefused } from './workerClient';

export const DEFAULT_TOP_K = 10;
const DEFAULT_CALL_TIMEOUT_MS = 120_000;
const DEFAULT_MAX_RESTARTS = 3;
/** Every loop has a cap: no run goes beyond this many rounds (slices), nor this many cuts. */
const MAX_ROUNDS = 1_000_000_000;
/** A time-budget step is never shorter than this, ms. */
const MIN_STEP_MS = 1;

/** A failure the run cannot recover from; its message is the run's `reason`. */
class RunFailure extends Error {}

/** An objective threw in a worker: the run ends with the best results of the rounds before. */
class ObjectiveFailure extends RunFailure {}

interface IslandView {
  readonly plan: IslandPlan;
  worker: number;
  evaluations: number;
  stopReason: IslandStopReason | null;
  /** The island's best so far, from its last slice (null before one, and after going back to a checkpoint). */
  best: { readonly value: number; readonly violation: number } | null;
  /** Fresh runs the island's restart scheme has started, as of its last slice. */
  searchRestarts: number;
}

function checkOptions(options: RunOptions, spec: RunSpec, env: EngineEnvironment): string | null {
  const islands = planIslands(spec).length;
  const { workers, topK, perJob, callTimeoutMs, maxRestarts, checkpointEveryMs } = options;
  if (workers !== undefined && !(Number.isInteger(workers) && workers >= 1 && workers <= 1024)) return `workers is ${workers}; expected an integer in [1, 1024]`;
  if (topK !== undefined && !(Number.isInteger(topK) && topK >= 0 && topK <= 10_000)) return `topK is ${topK}; expected an integer in [0, 10000]`;
  if (perJob !== undefined && !(Number.isInteger(perJob) && perJob >= 0 && perJob <= spec.archive.capacity)) {
    return `perJob is ${perJob}; expected an integer in [0, ${spec.archive.capacity}] (the run's archive capacity per job; raise archive.capacity to keep more)`;
  }
  if (callTimeoutMs !== undefined && !(callTimeoutMs > 0)) return `callTimeoutMs is ${callTimeoutMs}; expected a number > 0`;
  if (maxRestarts !== undefined && !(Number.isInteger(maxRestarts) && maxRestarts >= 0)) return `maxRestarts is ${maxRestarts}; expected an integer ≥ 0`;
  if (checkpointEveryMs !== undefined && !(checkpointEveryMs > 0 && checkpointEveryMs < Infinity)) {
    return `checkpointEveryMs is ${checkpointEveryMs}; expected a finite number of milliseconds > 0`;
  }
  if (islands < 1) return 'the run has no islands';
  if (!(env.defaultWorkerCount() >= 1)) return 'the environment reports no workers';
  return null;
}

/** A new run of `input` (checked, defaults filled in). Nothing starts until `start()`. */
export function createRun(env: EngineEnvironment, input: RunInput, options: RunOptions = {}): MakeRunResult {
  const defined = defineRun(input);
  if (!defined.ok) return defined;
  const problem = checkOptions(options, defined.spec, env);
  if (problem !== null) return { ok: false, reason: problem };
  return { ok: true, run: new Engine(env, defined.spec, null, options) };
}

/** The run a checkpoint holds, ready to `start()` where it left off. */
export function restoreRun(env: EngineEnvironment, checkpointText: string, options: RunOptions = {}): MakeRunResult {
  const decoded = decodeCheckpoint(checkpointText);
  if (!decoded.ok) return decoded;
  const problem = checkOptions(options, decoded.payload.spec, env);
  if (problem !== null) return { ok: false, reason: problem };
  return { ok: true, run: new Engine(env, decoded.payload.spec, decoded.payload, options) };
}

class Engine implements Run {
  readonly spec: RunSpec;
  private readonly env: EngineEnvironment;
  private readonly topK: number;
  private readonly bestOfEachJob: boolean;
  private readonly perJob: number;
  private readonly callTimeoutMs: number;
  private readonly maxRestarts: number;
  private readonly checkpointEveryMs: number;
  private readonly saver: CheckpointSaver;
  private readonly workerCount: number;
  private readonly islands: IslandView[];
  private readonly pipelineIslands: PipelineIsland[];
  /** Emigrants published and not yet placed; part of every checkpoint. */
  private ledger: EmigrantLedger;
  private checkpointWanted = false;
  private readonly listeners = new Set<(progress: RunProgress) => void>();
  private readonly from: CheckpointPayload | null;

  private state: RunStatus = 'idle';
  private started = false;
  private workers: WorkerClient[] = [];
  private readonly archives: JobArchives;
  private readonly clock: RunClock;
  private rounds = 0;
  private restarts = 0;
  private restartsSinceCheckpoint = 0;
  private snapshot: CheckpointPayload | null = null;
  private checkpointRound: number | null = null;
  private lastCheckpointAtMs = 0;
  private finalPayload: CheckpointPayload | null = null;

  private pauseRequested = false;
  private cancelRequested = false;
  private pauseWaiters: (() => void)[] = [];
  private wake: (() => void) | null = null;
  private exportRequests: { resolve: (text: string) => void; reject: (error: Error) => void }[] = [];

  constructor(env: EngineEnvironment, spec: RunSpec, from: CheckpointPayload | null, options: RunOptions) {
    this.env = env;
    this.spec = spec;
    this.from = from;
    this.topK = options.topK ?? DEFAULT_TOP_K;
    this.bestOfEachJob = options.bestOfEachJob === true;
    this.perJob = options.perJob ?? 0;
    this.callTimeoutMs = options.callTimeoutMs ?? DEFAULT_CALL_TIMEOUT_MS;
    this.maxRestarts = options.maxRestarts ?? DEFAULT_MAX_RESTARTS;
    this.checkpointEveryMs = options.checkpointEveryMs ?? spec.checkpointEveryMs;
    this.saver = new CheckpointSaver(options.store ?? null, options.onCheckpoint ?? null, options.onSaveError ?? null);
    const plans = planIslands(spec);
    this.workerCount = Math.min(plans.length, options.workers ?? env.defaultWorkerCount());
    this.islands = plans.map((plan, k) => ({ plan, worker: k % this.workerCount, evaluations: 0, stopReason: null, best: null, searchRestarts: 0 }));
    this.pipelineIslands = this.islands.map((island, k) => ({ islandId: island.plan.islandId, worker: island.worker, sender: this.senderOf(k) }));
    this.ledger = new EmigrantLedger(this.islands.length);
    this.archives = new JobArchives(spec);
    this.clock = new RunClock(() => env.now(), from?.elapsedMs ?? 0);
    if (from !== null) {
      this.rounds = from.rounds;
      this.restarts = from.restarts;
    }
  }

  /** The island before island k in its job's ring, or −1 when it takes no immigrants. */
  private senderOf(k: number): number {
    if (this.spec.migration.count === 0) return -1;
    const ring = this.islands.map((island, j) => (island.plan.jobIndex === this.islands[k].plan.jobIndex ? j : -1)).filter((j) => j >= 0);
    if (ring.length < 2) return -1;
    const at = ring.indexOf(k);
    return ring[(at + ring.length - 1) % ring.length];
  }

  status(): RunStatus {
    return this.state;
  }

  onProgress(listener: (progress: RunProgress) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  progress(): RunProgress {
    const evaluations = this.islands.reduce((sum, island) => sum + island.evaluations, 0);
    const elapsedMs = this.clock.elapsedMs();
    const rate = this.clock.evaluationsPerSecond();
    const budget = this.spec.budget;
    let remainingMs: number | null = null;
    if (budget.evaluations !== null && rate > 0) remainingMs = (Math.max(0, budget.evaluations - evaluations) / rate) * 1000;
    if (budget.seconds !== null) {
      const left = Math.max(0, budget.seconds * 1000 - elapsedMs);
      remainingMs = remainingMs === null ? left : Math.min(remainingMs, left);
    }
    if (this.state === 'finished') remainingMs = 0;
    return {
      status: this.state,
      rounds: this.rounds,
      evaluations,
      budgetEvaluations: budget.evaluations,
      elapsedMs,
      evaluationsPerSecond: rate,
      remainingMs,
      best: this.best(),
      islands: this.islands.length,
      islandsRunning: this.islands.filter((island) => island.stopReason === null).length,
      workers: this.workers.length,
      restarts: this.restarts,
      searchRestarts: this.searchRestarts(),
      checkpointRound: this.checkpointRound,
      ...(this.saver.error === null ? {} : { checkpointError: this.saver.error }),
    };
  }

  pause(): Promise<void> {
    if (this.state === 'paused') return Promise.resolve();
    if (this.state !== 'running') return Promise.resolve();
    this.pauseRequested = true;
    return new Promise((resolve) => this.pauseWaiters.push(resolve));
  }

  resume(): void {
    this.pauseRequested = false;
    // A pause asked for and withdrawn before it took effect: its promise still settles.
    if (this.state !== 'paused') for (const resolve of this.pauseWaiters.splice(0)) resolve();
    this.wake?.();
  }

  cancel(): void {
    this.cancelRequested = true;
    this.wake?.();
  }

  exportCheckpoint(): Promise<string> {
    if (this.finalPayload !== null) return encodeInTasks(this.finalPayload);
    if (this.state === 'paused') return this.collect().then(encodeInTasks);
    if (this.state === 'idle') return Promise.reject(new Error('exportCheckpoint: the run has not started'));
    if (this.state === 'failed') return Promise.reject(new Error('exportCheckpoint: the run failed; its last checkpoint is the one in its store'));
    return new Promise((resolve, reject) => this.exportRequests.push({ resolve, reject }));
  }

  async start(): Promise<RunResult> {
    if (this.started) throw new Error('start(): a run starts once');
    this.started = true;
    this.state = 'running';
    try {
      await this.launch();
      this.clock.begin();
      const stopReason = await this.loop();
      // The end is several steps of main-thread work (encode, save, describe, report);
      // each gets a task of its own, so a page running the engine never stalls on one.
      const payload = await this.collect();
      this.finalPayload = payload;
      await nextTask();
      const finalText = await this.save(payload);
      if (this.exportRequests.length > 0) {
        const text = finalText ?? (await encodeInTasks(payload));
        for (const request of this.exportRequests.splice(0)) request.resolve(text);
      }
      await nextTask();
      const candidates = await this.describeTop();
      await nextTask();
      this.clock.end();
      this.state = 'finished';
      this.emit();
      return {
        ok: true,
        stopReason,
        evaluations: payload.evaluations,
        elapsedMs: this.clock.elapsedMs(),
        rounds: this.rounds,
        restarts: this.restarts,
        searchRestarts: this.searchRestarts(),
        jobs: this.spec.jobs.map((job, j) => ({
          jobId: job.id,
          evaluations: this.islands.filter((island) => island.plan.jobIndex === j).reduce((sum, island) => sum + island.evaluations, 0),
        })),
        candidates,
      };
    } catch (error) {
      this.clock.end();
      this.state = 'failed';
      for (const request of this.exportRequests.splice(0)) request.reject(new Error('the run failed'));
      this.emit();
      // Anything else is a bug (in the engine, or thrown inside a worker): the caller sees it as thrown.
      if (!(error instanceof RunFailure || error instanceof WorkerLost || error instanceof WorkerRefused)) throw error;
      const reason = error.message;
      const failed = { ok: false, reason, evaluations: this.progress().evaluations, rounds: this.rounds } as const;
      if (!(error instanceof ObjectiveFailure)) return failed;
      // The last checkpoint stays as it is (the failing step left an island mid-batch). The
      // islands' archives hold every design evaluated before the throw; if they cannot be
      // read, the archives of the last cut do.
      await this.readArchives().catch(() => {});
      const candidates = await this.describeTop().catch(() => null);
      return candidates === null ? failed : { ...failed, candidates };
    } finally {
      await this.closeWorkers();
      for (const resolve of this.pauseWaiters.splice(0)) resolve();
    }
  }

  // --- the loop ----------------------------------------------------------------------

  private async loop(): Promise<RunStopReason> {
    for (let guard = 0; guard < MAX_ROUNDS; guard++) {
      if (this.cancelRequested) return 'cancelled';
      if (this.pauseRequested) {
        await this.pauseHere();
        continue;
      }
      const stop = this.stopReason();
      if (stop !== null) return stop;
      if (this.rounds >= MAX_ROUNDS) throw new RunFailure(`the run reached the cap of ${MAX_ROUNDS} rounds`);
      try {
        // Slices until a cut: every island then stands at the same slice.
        await this.runSlices();
        if (this.checkpointWanted) {
          await this.checkpoint();
          // Its round (and a failed save's reason) reach the listeners now, not a slice later.
          this.emit();
        }
        await this.answerExports();
      } catch (error) {
        if (isObjectiveError(error)) throw new ObjectiveFailure(error.message);
        if (!(error instanceof WorkerLost)) throw error;
        await this.recover(error);
        this.emit();
      }
    }
    throw new RunFailure(`the run reached the cap of ${MAX_ROUNDS} cuts`);
  }

  private stopReason(): RunStopReason | null {
    const { seconds } = this.spec.budget;
    const running = this.islands.filter((island) => island.stopReason === null).length;
    if (running === 0) {
      if (this.islands.every((island) => island.stopReason === 'budget')) return 'budget';
      return this.islands.some((island) => island.stopReason === 'target') ? 'target' : 'converged';
    }
    if (seconds !== null && this.clock.elapsedMs() >= seconds * 1000) return 'time';
    return null;
  }

  private slice(): StepSlice {
    if (this.spec.deterministic) return { evaluations: this.spec.stepEvaluations };
    const { seconds } = this.spec.budget;
    let ms = this.spec.stepMs;
    if (seconds !== null) {
      const perWorker = Math.ceil(this.islands.length / this.workerCount);
      ms = Math.min(ms, Math.max(MIN_STEP_MS, (seconds * 1000 - this.clock.elapsedMs()) / perWorker));
    }
    return { ms };
  }

  private runSlices(): Promise<void> {
    const { count, everyRounds } = this.spec.migration;
    return runPipeline({
      islands: this.pipelineIslands,
      workers: this.workers,
      callTimeoutMs: this.callTimeoutMs,
      depth: this.spec.deterministic ? PIPELINE_DEPTH : TIMED_PIPELINE_DEPTH,
      done: this.rounds,
      stopped: this.islands.map((island) => island.stopReason !== null),
      migration: { every: everyRounds, count },
      ledger: this.ledger,
      slice: () => this.slice(),
      merged: (t, results) => this.merged(t, results),
    });
  }

  /**
   * One slice every island has done, its results in island order whatever order the
   * workers answered in: the archive then does not depend on timing. Says where to cut.
   * The clock is read here only, once per slice in slice order, so a run on a clock that
   * moves with each reading (tests) is the same on any schedule.
   */
  private merged(t: number, results: readonly (AdvanceResult | null)[]): CutRule {
    for (const [k, result] of results.entries()) {
      const island = this.islands[k];
      // An island stopped in an earlier slice may have been sent this one before that was known: nothing to record.
      if (result !== null && island.stopReason === null) this.record(island, result.progress);
    }
    this.rounds = t;
    if (this.env.now() - this.lastCheckpointAtMs >= this.checkpointEveryMs) this.checkpointWanted = true;
    this.emit();
    if (this.cancelRequested || this.pauseRequested || this.exportRequests.length > 0 || t >= MAX_ROUNDS) return 'cut';
    const stop = this.stopReason();
    if (stop !== null && stop !== 'time') return 'cut';
    if (stop !== 'time' && !this.checkpointWanted) return 'go';
    // A fixed number of slices after the time is up or a checkpoint falls due, so where a
    // deterministic run stops, and where it saves, is the same on any schedule.
    return this.spec.deterministic ? 'cut-after-lead' : 'cut';
  }

  private searchRestarts(): number {
    return this.islands.reduce((sum, island) => sum + island.searchRestarts, 0);
  }

  private record(island: IslandView, progress: IslandProgress): void {
    island.evaluations = progress.evaluations;
    island.stopReason = progress.stopReason;
    island.searchRestarts = progress.restarts;
    this.clock.count(progress.stepEvaluations);
    if (progress.bestValue !== null && progress.bestViolation !== null) island.best = { value: progress.bestValue, violation: progress.bestViolation };
  }

  private async pauseHere(): Promise<void> {
    await this.checkpoint();
    this.clock.end();
    this.state = 'paused';
    this.emit();
    for (const resolve of this.pauseWaiters.splice(0)) resolve();
    await this.answerExports();
    while (this.pauseRequested && !this.cancelRequested) {
      await new Promise<void>((resolve) => {
        this.wake = resolve;
      });
      this.wake = null;
    }
    this.state = 'running';
    this.clock.begin();
    this.emit();
  }

  // --- workers, checkpoints and recovery ------------------------------------------------

  /** Starts the workers and creates (or restores) every island on its worker. */
  private async launch(): Promise<void> {
    for (let w = 0; w < this.workerCount; w++) this.workers.push(new WorkerClient(w, this.env.spawnWorker()));
    const from = this.from;
    try {
      await this.placeIslands(from === null ? null : from.islands);
    } catch (error) {
      if (!(error instanceof WorkerLost) || from !== null) throw error;
      // A worker lost while starting a new run: start it once more from scratch.
      await this.replaceLostWorkers();
      await this.placeIslands(null);
    }
    await this.loadLedger(from);
    const payload = await this.collect();
    this.snapshot = payload;
    this.checkpointRound = this.rounds;
    this.lastCheckpointAtMs = this.env.now();
    if (from === null) await this.save(payload);
    this.emit();
  }

  private async placeIslands(states: readonly IslandState[] | null): Promise<void> {
    const settled = await Promise.allSettled(
      this.islands.map((island, k) => {
        const worker = this.workers[island.worker];
        if (states !== null) return worker.call('importState', this.callTimeoutMs, (api) => api.importState(states[k]));
        const { plan } = island;
        const { spec } = this;
        return worker.call('init', this.callTimeoutMs, (api) =>
          api.init({
            islandId: plan.islandId,
            objective: plan.job.objective,
            seed: plan.job.seed,
            stream: plan.stream,
            optimizer: plan.job.optimizer,
            maxEvaluations: plan.maxEvaluations,
            archiveCapacity: spec.archive.capacity,
            archiveDistance: spec.archive.distance,
          }),
        );
      }),
    );
    const placed = throwFirst(settled);
    for (const [k, island] of this.islands.entries()) this.adopt(island, placed[k].island);
  }

  private adopt(island: IslandView, info: IslandInfo): void {
    island.evaluations = info.evaluations;
    island.stopReason = info.stopReason;
    island.best = null;
    this.archives.noteBounds(island.plan.jobIndex, info.lower, info.upper);
  }

  /** Each job's archive: its islands' archives merged in island order. */
  private mergeArchives(states: readonly Pick<IslandState, 'archive'>[]): void {
    this.archives.merge(states, (k) => this.islands[k].plan.jobIndex);
  }

  /**
   * The emigrants a checkpoint holds, and each stopped island's last emigrants (what it
   * sends from then on, asked of its worker).
   */
  private async loadLedger(payload: CheckpointPayload | null): Promise<void> {
    const ledger = new EmigrantLedger(this.islands.length);
    for (const sent of payload?.emigrants ?? []) ledger.publish(sent.island, sent.slice, sent.individuals);
    const { count } = this.spec.migration;
    const stopped = this.islands.flatMap((island, k) => (island.stopReason === null ? [] : [k]));
    const settled = await Promise.allSettled(
      stopped.map((k) => this.workers[this.islands[k].worker].call('emigrants', this.callTimeoutMs, (api) => api.emigrants(this.islands[k].plan.islandId, count))),
    );
    for (const [j, answer] of throwFirst(settled).entries()) ledger.stopped(stopped[j], answer.individuals);
    this.ledger = ledger;
  }

  /** Merges the islands' archives as they are now, read without their states (after a failure). */
  private async readArchives(): Promise<void> {
    const { capacity } = this.spec.archive;
    const settled = await Promise.allSettled(
      this.islands.map((island) => this.workers[island.worker].call('emigrants', this.callTimeoutMs, (api) => api.emigrants(island.plan.islandId, capacity))),
    );
    this.mergeArchives(throwFirst(settled).map((answer) => ({ archive: answer.individuals })));
  }

  /** Every island's state, the archives, the emigrants not yet placed and the counters, taken at a cut. */
  private async collect(): Promise<CheckpointPayload> {
    const settled = await Promise.allSettled(
      this.islands.map((island) =>
        this.workers[island.worker].call('exportState', this.callTimeoutMs, (api) => api.exportState(island.plan.islandId)),
      ),
    );
    const states = throwFirst(settled).map((answer) => answer.state);
    this.mergeArchives(states);
    return {
      spec: this.spec,
      rounds: this.rounds,
      elapsedMs: this.clock.elapsedMs(),
      evaluations: this.islands.reduce((sum, island) => sum + island.evaluations, 0),
      restarts: this.restarts,
      islands: states,
      emigrants: this.ledger.entries(),
      archive: this.spec.jobs.map((job, j) => ({
        jobId: job.id,
        entries: this.archives.entries(j).map((entry) => ({ x: Array.from(entry.x), value: entry.value, violation: entry.violation })),
      })),
    };
  }

  private save(payload: CheckpointPayload): Promise<string | null> {
    return this.saver.save(payload);
  }

  private async checkpoint(): Promise<void> {
    const payload = await this.collect();
    await this.save(payload);
    this.snapshot = payload;
    this.checkpointRound = this.rounds;
    this.lastCheckpointAtMs = this.env.now();
    this.restartsSinceCheckpoint = 0;
    this.checkpointWanted = false;
  }

  private async answerExports(): Promise<void> {
    if (this.exportRequests.length === 0) return;
    const text = await encodeInTasks(await this.collect());
    for (const request of this.exportRequests.splice(0)) request.resolve(text);
  }

  /** Replaces lost workers and takes every island back to the last checkpoint. */
  private async recover(lost: WorkerLost): Promise<void> {
    const snapshot = this.snapshot;
    this.restarts++;
    this.restartsSinceCheckpoint++;
    if (snapshot === null || this.restartsSinceCheckpoint > this.maxRestarts) {
      throw new RunFailure(`${lost.message}; gave up after ${this.restartsSinceCheckpoint - 1} restart(s) without progress`);
    }
    for (let attempt = 0; ; attempt++) {
      try {
        await this.replaceLostWorkers();
        await this.placeIslands(snapshot.islands);
        break;
      } catch (error) {
        if (!(error instanceof WorkerLost) || attempt >= this.maxRestarts) throw error;
        this.restarts++;
      }
    }
    this.rounds = snapshot.rounds;
    this.mergeArchives(snapshot.islands);
    await this.loadLedger(snapshot);
    this.emit();
  }

  private async replaceLostWorkers(): Promise<void> {
    for (const [w, worker] of this.workers.entries()) {
      if (worker.failure === null) continue;
      await worker.close().catch(() => {});
      this.workers[w] = new WorkerClient(w, this.env.spawnWorker());
    }
  }

  private async closeWorkers(): Promise<void> {
    const workers = this.workers;
    this.workers = [];
    await Promise.allSettled(workers.map((worker) => worker.close()));
  }

  // --- results ----------------------------------------------------------------------------

  /** The best of the archives at the last cut and of the islands' slices since, first of equals in job order. */
  private best(): RunProgress['best'] {
    let best = this.archives.best();
    for (const island of this.islands) {
      if (island.best !== null) best = JobArchives.better(best, this.spec.jobs[island.plan.jobIndex].id, island.best.value, island.best.violation);
    }
    return best;
  }

  /**
   * The topK best candidates of all jobs, then each job's own best (its `perJob` best, or
   * with `bestOfEachJob` its first) that the topK left out, described by a worker of each
   * job. All in the order of the whole pool, each with its rank there.
   */
  private async describeTop(): Promise<RankedCandidate[]> {
    const chosen = this.archives.choose(this.topK, Math.max(this.perJob, this.bestOfEachJob ? 1 : 0));
    const described = new Map<number, DescribedCandidate[]>();
    const jobs = [...new Set(chosen.map((c) => c.j))];
    const settled = await Promise.allSettled(
      jobs.map((j) => {
        const island = this.islands.find((candidate) => candidate.plan.jobIndex === j) as IslandView;
        const designs = chosen.filter((c) => c.j === j).map((c) => Array.from(c.entry.x));
        return this.workers[island.worker].call('describe', this.callTimeoutMs, (api) => api.describe(island.plan.islandId, designs));
      }),
    );
    for (const [k, answer] of throwFirst(settled).entries()) described.set(jobs[k], answer.candidates);
    const next = new Map<number, number>();
    return chosen.map((c) => {
      const at = next.get(c.j) ?? 0;
      next.set(c.j, at + 1);
      const candidate = (described.get(c.j) as DescribedCandidate[])[at];
      return { ...candidate, rank: c.rank, jobId: this.spec.jobs[c.j].id };
    });
  }

  // --- events ---------------------------------------------------------------------------

  private emit(): void {
    if (this.listeners.size === 0) return;
    const progress = this.progress();
    for (const listener of this.listeners) listener(progress);
  }
}

/** The values of settled calls, or the first failure (a lost worker before anything else). */
function throwFirst<T>(settled: readonly PromiseSettledResult<T>[]): T[] {
  const failures = settled.filter((s): s is PromiseRejectedResult => s.status === 'rejected').map((s) => s.reason as unknown);
  if (failures.length > 0) throw failures.find((f) => f instanceof WorkerLost) ?? failures[0];
  return settled.map((s) => (s as PromiseFulfilledResult<T>).value);
}
