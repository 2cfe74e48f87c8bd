/**
 * The host's side of hosted runs (runHost.ts): runs made and driven where the service
 * lives (the browser's engine worker), on the caller's behalf, through comlink. What
 * cannot cross a thread stays with the caller and is reached back through comlink
 * proxies: the checkpoint store (the app's IndexedDB) and the run's listeners. Every
 * report carries a sequence number, and so does every answer that changes the run's
 * status, so the caller keeps the newest whatever order two ports deliver in.
 */
import { releaseProxy } from 'comlink';
import type { CheckpointPayload } from './checkpoint';
import type { CheckpointListing, CheckpointStore } from './checkpointStore';
import type { EngineEnvironment } from './environment';
import { restoreRunFromStore } from './restoreFromStore';
import { createRun } from './run';
import type { RestoreFromStoreResult, Run, RunOptions, RunProgress, RunResult } from './runTypes';
import type { RunInput, RunSpec } from './runSpec';

/** The run's progress as of the `seq`th report (higher is newer). */
export interface ProgressReport {
  readonly seq: number;
  readonly progress: RunProgress;
}

/** The caller's listeners, called back across the thread (return values are ignored). */
export interface RunEvents {
  progress(report: ProgressReport): unknown;
  checkpoint(payload: CheckpointPayload): unknown;
  saveError(reason: string): unknown;
}

/** The caller's checkpoint store, reached back across the thread; `list` only where the store has one (`listed`). */
export interface StoreLink {
  save(text: string): Promise<void>;
  load(): Promise<string[]>;
  list(): Promise<CheckpointListing>;
}

/** RunOptions that cross: the callbacks become flags (the events say them), the store a link. */
export interface HostedOptions extends Omit<RunOptions, 'store' | 'onCheckpoint' | 'onSaveError'> {
  readonly onCheckpoint: boolean;
  readonly onSaveError: boolean;
}

export type HostedMade = { readonly ok: true; readonly report: ProgressReport } | { readonly ok: false; readonly reason: string };

/** `RestoreFromStoreResult` as it crosses: the run stays with the service, its spec and progress come back. */
export type HostedRestored =
  | (Omit<Extract<RestoreFromStoreResult, { ok: true }>, 'run'> & { readonly spec: RunSpec; readonly report: ProgressReport })
  | Extract<RestoreFromStoreResult, { ok: false }>;

/**
 * Runs are named by the caller's ids. Each answer that moves a run's status carries its
 * progress then. A run is kept until `forget` (its caller's object is gone): a finished
 * run still exports its final checkpoint.
 */
export interface RunServiceApi {
  createRun(id: number, input: RunInput, options: HostedOptions, store: StoreLink | null, listed: boolean, events: RunEvents): HostedMade;
  restoreRunFromStore(id: number, store: StoreLink, listed: boolean, options: HostedOptions, events: RunEvents): Promise<HostedRestored>;
  start(id: number): Promise<{ readonly report: ProgressReport; readonly result: RunResult }>;
  pause(id: number): Promise<ProgressReport>;
  resume(id: number): ProgressReport;
  cancel(id: number): ProgressReport;
  exportCheckpoint(id: number): Promise<string>;
  forget(id: number): void;
}

/** Lets go of a comlink proxy (its port); nothing for a plain object. */
function release(link: object | null): void {
  const letGo = link === null ? undefined : (link as { [releaseProxy]?: unknown })[releaseProxy];
  if (typeof letGo === 'function') (letGo as () => void).call(link);
}

/** A callback across the thread: the caller reports its own listeners' errors, so a refusal is not the run's. */
function tell(call: () => unknown): void {
  void Promise.resolve()
    .then(call)
    .catch(() => {});
}

function storeOf(link: StoreLink, listed: boolean): CheckpointStore {
  return {
    save: (text) => link.save(text),
    load: () => link.load(),
    ...(listed ? { list: () => link.list() } : {}),
  };
}

function runOptions(options: HostedOptions, events: RunEvents): Omit<RunOptions, 'store'> {
  const { onCheckpoint, onSaveError, ...rest } = options;
  return {
    ...rest,
    ...(onCheckpoint ? { onCheckpoint: (payload: CheckpointPayload) => tell(() => events.checkpoint(payload)) } : {}),
    ...(onSaveError ? { onSaveError: (reason: string) => tell(() => events.saveError(reason)) } : {}),
  };
}

interface Hosted {
  readonly run: Run;
  readonly report: () => ProgressReport;
  /** Lets go of the caller's store and listeners (the run has ended, or was never started). */
  readonly letGo: () => void;
}

/** `run`, reporting its progress to `events`. */
function host(run: Run, store: StoreLink | null, events: RunEvents): Hosted {
  let seq = 0;
  const unsubscribe = run.onProgress((progress) => {
    const at = ++seq;
    tell(() => events.progress({ seq: at, progress }));
  });
  return {
    run,
    report: () => ({ seq: ++seq, progress: run.progress() }),
    letGo: () => {
      unsubscribe();
      release(store);
      release(events);
    },
  };
}

/** The service over `env`: the runs it makes spawn their search workers here. */
export function createRunService(env: EngineEnvironment): RunServiceApi {
  const runs = new Map<number, Hosted>();
  const hosted = (id: number): Hosted => {
    const found = runs.get(id);
    // The caller names only runs it made and has not forgotten.
    if (found === undefined) throw new Error(`run service: no run ${id}`);
    return found;
  };
  return {
    createRun(id, input, options, link, listed, events) {
      const made = createRun(env, input, { ...runOptions(options, events), ...(link === null ? {} : { store: storeOf(link, listed) }) });
      if (!made.ok) {
        release(link);
        release(events);
        return made;
      }
      const entry = host(made.run, link, events);
      runs.set(id, entry);
      return { ok: true, report: entry.report() };
    },
    async restoreRunFromStore(id, link, listed, options, events) {
      const restored = await restoreRunFromStore(env, storeOf(link, listed), runOptions(options, events));
      if (!restored.ok) {
        release(link);
        release(events);
        return restored;
      }
      const { run, skipped, source, passedOver, notes } = restored;
      const entry = host(run, link, events);
      runs.set(id, entry);
      return { ok: true, spec: run.spec, report: entry.report(), skipped, source, passedOver, notes };
    },
    async start(id) {
      const entry = hosted(id);
      try {
        const result = await entry.run.start();
        return { report: entry.report(), result };
      } finally {
        entry.letGo();
      }
    },
    async pause(id) {
      const entry = hosted(id);
      await entry.run.pause();
      return entry.report();
    },
    resume(id) {
      const entry = hosted(id);
      entry.run.resume();
      return entry.report();
    },
    cancel(id) {
      const entry = hosted(id);
      entry.run.cancel();
      return entry.report();
    },
    exportCheckpoint: (id) => hosted(id).run.exportCheckpoint(),
    forget(id) {
      const entry = runs.get(id);
      if (entry === undefined) return;
      runs.delete(id);
      // A run never started holds no workers; its links go with it. A running one ends as cancelled.
      if (entry.run.status() === 'idle') entry.letGo();
      else entry.run.cancel();
    },
  };
}
