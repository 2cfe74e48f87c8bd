/**
 * The caller's side of hosted runs (runService.ts): a `RunHost` whose runs live in the
 * service, each mirrored here by a `Run` that keeps the newest progress the service
 * reported (by sequence number: reports and answers come by different ports) and calls
 * its listeners with it. The caller's store and listeners go to the service as comlink
 * proxies. Input and options are checked here, by `createRun` itself on a run that never
 * starts, so a mistake is still a value returned at once. If the host ends (`lost`),
 * every run of it fails with the reason, as a run whose workers cannot be replaced does.
 */
import { proxy, type Remote } from 'comlink';
import type { CheckpointPayload } from './checkpoint';
import type { CheckpointStore } from './checkpointStore';
import type { EngineEnvironment } from './environment';
import { createRun } from './run';
import type { MakeRunResult, RestoreFromStoreResult, Run, RunOptions, RunProgress, RunResult, RunStatus } from './runTypes';
import type { RunHost } from './runHost';
import type { RunSpec } from './runSpec';
import type { HostedOptions, HostedRestored, ProgressReport, RunEvents, RunServiceApi, StoreLink } from './runService';

/** A connection to the service: its API, and word if the host ends. */
export interface ServiceConnection {
  readonly api: Remote<RunServiceApi>;
  /** Why the host ended, or null while it lives. */
  lostReason(): string | null;
  /** Calls `listener` once if the host ends; returns the unsubscribe function. */
  onLost(listener: (reason: string) => void): () => void;
}

type Failed = { readonly failed: string };

/**
 * `answer`, or the reason the host ended first. A listener per call, removed when it
 * settles: a reaction on one long-lived promise per call would keep every run reachable.
 */
function untilLost<T>(connection: ServiceConnection, answer: () => Promise<T>): Promise<T | Failed> {
  const gone = connection.lostReason();
  if (gone !== null) return Promise.resolve({ failed: `the engine worker ended: ${gone}` });
  return new Promise<T | Failed>((resolve, reject) => {
    const off = connection.onLost((reason) => resolve({ failed: `the engine worker ended: ${reason}` }));
    answer().then(resolve, reject).finally(off);
  });
}

/** Ranks above every report: a run that failed here stays failed. */
const FINAL_SEQ = Number.MAX_SAFE_INTEGER;

/** A listener's error is the caller's: thrown in a task of its own, not sent back to the service. */
function guarded<A extends unknown[]>(call: (...args: A) => void): (...args: A) => void {
  return (...args) => {
    try {
      call(...args);
    } catch (error) {
      queueMicrotask(() => {
        throw error;
      });
    }
  };
}

function hostedOptions(options: RunOptions): HostedOptions {
  const { store: _store, onCheckpoint, onSaveError, ...rest } = options;
  return { ...rest, onCheckpoint: onCheckpoint !== undefined, onSaveError: onSaveError !== undefined };
}

function storeLink(store: CheckpointStore): StoreLink {
  return proxy({
    save: (text: string) => store.save(text),
    load: () => store.load(),
    list: () => (store.list === undefined ? Promise.reject(new Error('the store cannot list')) : store.list()),
  });
}

/** The listeners a run's service calls back; `run` is set once the run exists here. */
class EventSink {
  run: RemoteRun | null = null;
  constructor(private readonly options: RunOptions) {}

  events(): RunEvents {
    const { onCheckpoint, onSaveError } = this.options;
    return proxy({
      progress: guarded((report: ProgressReport) => this.run?.adopt(report)),
      checkpoint: guarded((payload: CheckpointPayload) => onCheckpoint?.(payload)),
      saveError: guarded((reason: string) => onSaveError?.(reason)),
    });
  }
}

class RemoteRun implements Run {
  readonly spec: RunSpec;
  private latest: ProgressReport;
  private readonly listeners = new Set<(progress: RunProgress) => void>();
  /** The service's run id once it exists there, or why it could not be made. */
  private readonly made: Promise<{ readonly id: number } | Failed>;
  private started = false;

  constructor(
    private readonly connection: ServiceConnection,
    spec: RunSpec,
    initial: ProgressReport,
    made: Promise<{ readonly id: number } | Failed>,
  ) {
    this.spec = spec;
    this.latest = initial;
    this.made = made;
  }

  /** Takes a report newer than the last, and tells the listeners. */
  adopt(report: ProgressReport): void {
    if (!(report.seq > this.latest.seq)) return;
    this.latest = report;
    for (const listener of [...this.listeners]) listener(report.progress);
  }

  private fail(reason: string): string {
    const { status } = this.latest.progress;
    if (status !== 'finished' && status !== 'failed') this.adopt({ seq: FINAL_SEQ, progress: { ...this.latest.progress, status: 'failed' } });
    return reason;
  }

  /** `ask` of the run in the service, or the reason it is gone. */
  private ask<T>(ask: (api: Remote<RunServiceApi>, id: number) => Promise<T>): Promise<T | Failed> {
    return untilLost(this.connection, async () => {
      const made = await this.made;
      return 'failed' in made ? made : ask(this.connection.api, made.id);
    });
  }

  status(): RunStatus {
    return this.latest.progress.status;
  }

  progress(): RunProgress {
    return this.latest.progress;
  }

  onProgress(listener: (progress: RunProgress) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  async start(): Promise<RunResult> {
    if (this.started) throw new Error('start(): a run starts once');
    this.started = true;
    // As the engine's own run: running from the call on.
    if (this.latest.progress.status === 'idle') this.latest = { seq: this.latest.seq, progress: { ...this.latest.progress, status: 'running' } };
    const answer = await this.ask((api, id) => api.start(id));
    if ('failed' in answer) {
      const { evaluations, rounds } = this.latest.progress;
      return { ok: false, reason: this.fail(answer.failed), evaluations, rounds };
    }
    this.adopt(answer.report);
    return answer.result;
  }

  async pause(): Promise<void> {
    const answer = await this.ask((api, id) => api.pause(id));
    if (!('failed' in answer)) this.adopt(answer);
  }

  resume(): void {
    void this.ask((api, id) => api.resume(id)).then((answer) => {
      if (!('failed' in answer)) this.adopt(answer);
    });
  }

  cancel(): void {
    void this.ask((api, id) => api.cancel(id)).then((answer) => {
      if (!('failed' in answer)) this.adopt(answer);
    });
  }

  async exportCheckpoint(): Promise<string> {
    const answer = await this.ask((api, id) => api.exportCheckpoint(id));
    if (typeof answer !== 'string') throw new Error(`exportCheckpoint: ${answer.failed}`);
    return answer;
  }
}

/**
 * Runs hosted by the service `connect()` reaches (called at each run, so a host that
 * ended is replaced for the next). `local` checks input and options as `createRun` does.
 */
export function remoteRunHost(local: EngineEnvironment, connect: () => ServiceConnection): RunHost {
  let nextId = 1;
  const forgotten = new FinalizationRegistry<{ readonly connection: ServiceConnection; readonly id: number }>(({ connection, id }) => {
    void connection.api.forget(id).catch(() => {});
  });

  return {
    createRun(input, options): MakeRunResult {
      const checked = createRun(local, input, options);
      if (!checked.ok) return checked;
      const connection = connect();
      const id = nextId++;
      const sink = new EventSink(options);
      const link = options.store === undefined ? null : storeLink(options.store);
      const made = connection.api
        .createRun(id, input, hostedOptions(options), link, options.store?.list !== undefined, sink.events())
        .then(
          (answer) => {
            if (!answer.ok) return { failed: answer.reason };
            run.adopt(answer.report);
            return { id };
          },
          (error: unknown) => ({ failed: error instanceof Error ? error.message : String(error) }),
        );
      const run: RemoteRun = new RemoteRun(connection, checked.run.spec, { seq: 0, progress: checked.run.progress() }, made);
      sink.run = run;
      forgotten.register(run, { connection, id });
      return { ok: true, run };
    },

    async restoreRunFromStore(store, options): Promise<RestoreFromStoreResult> {
      const connection = connect();
      const id = nextId++;
      const sink = new EventSink(options);
      const answer = await untilLost<HostedRestored>(connection, () =>
        connection.api.restoreRunFromStore(id, storeLink(store), store.list !== undefined, hostedOptions(options), sink.events()),
      );
      if ('failed' in answer) return { ok: false, reason: answer.failed, empty: false, notes: [] };
      if (!answer.ok) return answer;
      const { spec, report, skipped, source, passedOver, notes } = answer;
      const run = new RemoteRun(connection, spec, report, Promise.resolve({ id }));
      sink.run = run;
      forgotten.register(run, { connection, id });
      return { ok: true, run, skipped, source, passedOver, notes };
    },
  };
}
