/**
 * The caller's side of hosted runs (runService.ts): a `RunHost` whose runs live in the
 * service, each mirrored here by a `Run` that keeps the newest progress the service
 * reported (by sequence number: reports and answers come by different ports) and calls
 * its listeners with it. The caller's store and listeners go to the service as comlink
 * proxies. Input and options are checked here, by `createRun` itself on a run that never
 * starts, so a mistake is still a value returned at once. If the host ends (`lost`), a
 * run with a checkpoint store goes on in a new host from its newest readable checkpoint,
 * as a reload would take it (counted among its worker restarts); one with no checkpoint
 * yet, or whose host ends again before a new checkpoint, fails with the reason, as a run
 * whose workers cannot be replaced does.
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
/**
 * Sequence numbers of the nth host a run lives in start at n × this, above every report
 * of the hosts before it (a host makes far fewer reports), below FINAL_SEQ for 2^12 hosts.
 */
const HOST_SEQ_SPAN = 2 ** 40;

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

/** The listeners a run's service calls back; `run` is set once the run exists here. `host` counts the hosts the run lived in before this one. */
class EventSink {
  run: RemoteRun | null = null;
  constructor(
    private readonly options: RunOptions,
    readonly host = 0,
  ) {}

  events(): RunEvents {
    const { onCheckpoint, onSaveError } = this.options;
    return proxy({
      progress: guarded((report: ProgressReport) => this.run?.adopt(this.run.fromHost(report, this.host))),
      checkpoint: guarded((payload: CheckpointPayload) => onCheckpoint?.(payload)),
      saveError: guarded((reason: string) => onSaveError?.(reason)),
    });
  }
}

/** A run restored in a new host after the last one ended, or why it could not be. */
type Recovered = { readonly connection: ServiceConnection; readonly id: number; readonly report: ProgressReport } | Failed;

/** Restores the run, as host number `host`, from its store; given only to runs that have a store. */
type Recover = (host: number, sink: EventSink) => Promise<Recovered>;

class RemoteRun implements Run {
  readonly spec: RunSpec;
  private latest: ProgressReport;
  private readonly listeners = new Set<(progress: RunProgress) => void>();
  private connection: ServiceConnection;
  /** The service's run id once it exists there, or why it could not be made. */
  private made: Promise<{ readonly id: number } | Failed>;
  private started = false;
  private cancelled = false;
  /** Hosts that ended under this run and were replaced. */
  private hostsLost = 0;
  /** The checkpoint round the run went back to when its host last ended. */
  private recoveredAtRound: number | null = null;
  /** The round the current host took the run back to (its rounds as restored), until that host takes a checkpoint of its own. */
  private restoredRound: number | null = null;

  constructor(
    connection: ServiceConnection,
    spec: RunSpec,
    initial: ProgressReport,
    made: Promise<{ readonly id: number } | Failed>,
    private readonly recover: Recover | null,
    private readonly options: RunOptions,
  ) {
    this.connection = connection;
    this.spec = spec;
    this.latest = initial;
    this.made = made;
  }

  /**
   * A report of host number `host` as this run tells it: after the reports of the hosts
   * before, with their losses among its worker restarts, and the checkpoint it went back
   * to as its last until it takes one of its own.
   */
  fromHost(report: ProgressReport, host: number): ProgressReport {
    if (host === 0) return report;
    const { progress } = report;
    const checkpointRound = progress.checkpointRound ?? (host === this.hostsLost ? this.restoredRound : null);
    return { seq: host * HOST_SEQ_SPAN + report.seq, progress: { ...progress, restarts: progress.restarts + host, checkpointRound } };
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
    const connection = this.connection;
    const made = this.made;
    return untilLost(connection, async () => {
      const answer = await made;
      return 'failed' in answer ? answer : ask(connection.api, answer.id);
    });
  }

  /**
   * After `reason` ended the run's start: if its host ended, the run restored in a new
   * one from its newest readable checkpoint (null), else why it cannot go on. A host
   * that ends again before a newer checkpoint is not replaced again: the run would only
   * repeat the same work.
   */
  private async recoverFrom(reason: string): Promise<string | null> {
    if (this.connection.lostReason() === null || this.recover === null) return reason;
    const round = this.latest.progress.checkpointRound;
    if (round === null) return `${reason}; no checkpoint had been saved to go back to`;
    if (round === this.recoveredAtRound) return `${reason}, again before a new checkpoint`;
    this.recoveredAtRound = round;
    const host = this.hostsLost + 1;
    const sink = new EventSink(this.options, host);
    sink.run = this;
    const back = await this.recover(host, sink);
    if ('failed' in back) return `${reason}; going on from the last checkpoint failed: ${back.failed}`;
    this.hostsLost = host;
    this.restoredRound = back.report.progress.rounds;
    this.connection = back.connection;
    this.made = Promise.resolve({ id: back.id });
    this.adopt(this.fromHost(back.report, host));
    return null;
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
    for (;;) {
      const answer = this.ask((api, id) => api.start(id));
      // Stop said while a new host took the run over reaches it now (after start, in the port's order).
      if (this.cancelled) this.cancel();
      const ended = await answer;
      if (!('failed' in ended)) {
        this.adopt(this.fromHost(ended.report, this.hostsLost));
        const { result } = ended;
        return result.ok ? { ...result, restarts: result.restarts + this.hostsLost } : result;
      }
      const why = await this.recoverFrom(ended.failed);
      if (why !== null) {
        const { evaluations, rounds } = this.latest.progress;
        return { ok: false, reason: this.fail(why), evaluations, rounds };
      }
    }
  }

  async pause(): Promise<void> {
    const host = this.hostsLost;
    const answer = await this.ask((api, id) => api.pause(id));
    if (!('failed' in answer)) this.adopt(this.fromHost(answer, host));
  }

  resume(): void {
    const host = this.hostsLost;
    void this.ask((api, id) => api.resume(id)).then((answer) => {
      if (!('failed' in answer)) this.adopt(this.fromHost(answer, host));
    });
  }

  cancel(): void {
    this.cancelled = true;
    const host = this.hostsLost;
    void this.ask((api, id) => api.cancel(id)).then((answer) => {
      if (!('failed' in answer)) this.adopt(this.fromHost(answer, host));
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

  /** The run of `store`, restored in the host `connect()` reaches, reporting to `sink`. */
  async function restoreIn(store: CheckpointStore, options: Omit<RunOptions, 'store'>, sink: EventSink) {
    const connection = connect();
    const id = nextId++;
    const answer = await untilLost<HostedRestored>(connection, () =>
      connection.api.restoreRunFromStore(id, storeLink(store), store.list !== undefined, hostedOptions(options), sink.events()),
    );
    return { connection, id, answer };
  }

  /** How a run with `store` goes on in a new host when its host ends. */
  function recovery(store: CheckpointStore | undefined, options: Omit<RunOptions, 'store'>): Recover | null {
    if (store === undefined) return null;
    return async (_host, sink) => {
      const { connection, id, answer } = await restoreIn(store, options, sink);
      if ('failed' in answer) return answer;
      if (!answer.ok) return { failed: answer.reason };
      if (sink.run !== null) forgotten.register(sink.run, { connection, id });
      return { connection, id, report: answer.report };
    };
  }

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
      const { store, ...rest } = options;
      const run: RemoteRun = new RemoteRun(connection, checked.run.spec, { seq: 0, progress: checked.run.progress() }, made, recovery(store, rest), options);
      sink.run = run;
      forgotten.register(run, { connection, id });
      return { ok: true, run };
    },

    async restoreRunFromStore(store, options): Promise<RestoreFromStoreResult> {
      const sink = new EventSink(options);
      const { connection, id, answer } = await restoreIn(store, options, sink);
      if ('failed' in answer) return { ok: false, reason: answer.failed, empty: false, notes: [] };
      if (!answer.ok) return answer;
      const { spec, report, skipped, source, passedOver, notes } = answer;
      const run = new RemoteRun(connection, spec, report, Promise.resolve({ id }), recovery(store, options), options);
      sink.run = run;
      forgotten.register(run, { connection, id });
      return { ok: true, run, skipped, source, passedOver, notes };
    },
  };
}
