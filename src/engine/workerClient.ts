/**
 * The engine's side of one search worker: comlink's proxy of the worker API, with every
 * call raced against the worker's death and a time limit, so a crashed or hung worker
 * turns into a `WorkerLost` the engine recovers from instead of a call that never answers.
 */
import { wrap, type Remote } from 'comlink';
import type { Outcome, SearchWorkerApi } from '../../workers/api';
import type { WorkerHandle } from './environment';

/** The worker died or stopped answering; the engine restarts it from the last checkpoint. */
export class WorkerLost extends Error {
  override readonly name = 'WorkerLost';
}

/** The worker answered `{ ok: false }` where the engine's own input should have been valid. */
export class WorkerRefused extends Error {
  override readonly name = 'WorkerRefused';
}

export class WorkerClient {
  readonly index: number;
  private readonly handle: WorkerHandle;
  private readonly api: Remote<SearchWorkerApi>;
  private lost: string | null = null;
  /**
   * The calls in flight, each rejected if the worker dies. One entry per call, removed
   * when it settles: racing every call against one long-lived "lost" promise instead
   * would keep each call's answer reachable from that promise for the worker's life.
   */
  private readonly pending = new Set<(error: WorkerLost) => void>();
  private closing = false;

  constructor(index: number, handle: WorkerHandle) {
    this.index = index;
    this.handle = handle;
    this.api = wrap<SearchWorkerApi>(handle.endpoint);
    handle.onFailure((reason) => {
      if (this.closing || this.lost !== null) return;
      this.lost = reason;
      const error = new WorkerLost(`worker ${index} failed: ${reason}`);
      for (const reject of this.pending) reject(error);
      this.pending.clear();
    });
  }

  get failure(): string | null {
    return this.lost;
  }

  /**
   * One call: its answer if ok; `WorkerRefused` if the worker says no; `WorkerLost` if it
   * dies or takes longer than `timeoutMs`.
   */
  async call<T>(what: string, timeoutMs: number, run: (api: Remote<SearchWorkerApi>) => Promise<Outcome<T>>): Promise<T> {
    if (this.lost !== null) throw new WorkerLost(`worker ${this.index} failed: ${this.lost}`);
    let timer: ReturnType<typeof setTimeout> | undefined;
    let onLost: ((error: WorkerLost) => void) | undefined;
    const stopped = new Promise<never>((_, reject) => {
      onLost = reject;
      this.pending.add(reject);
      timer = setTimeout(() => {
        // A worker that stops answering is as good as dead: mark it so the engine replaces it.
        if (this.lost === null) this.lost = `no answer to ${what} within ${Math.round(timeoutMs)} ms`;
        reject(new WorkerLost(`worker ${this.index} failed: ${this.lost}`));
      }, timeoutMs);
    });
    try {
      const outcome = await Promise.race([run(this.api), stopped]);
      if (!outcome.ok) throw new WorkerRefused(`worker ${this.index} refused ${what}: ${outcome.reason}`);
      return outcome;
    } finally {
      clearTimeout(timer);
      if (onLost !== undefined) this.pending.delete(onLost);
    }
  }

  /** Stops the worker; a failure it reports afterwards is expected and ignored. */
  async close(): Promise<void> {
    this.closing = true;
    await this.handle.terminate();
  }
}
