/**
 * Everything the engine needs from where it runs, squeezed into one small interface:
 * a way to start a search worker and a clock. The browser's is in browser/, Node's in
 * node/; the engine itself knows neither.
 */
import type { Endpoint } from 'comlink';

/** A started search worker (workers/searchWorker.ts) and how to stop it. */
export interface WorkerHandle {
  /** The worker's message endpoint, for comlink's `wrap`. */
  readonly endpoint: Endpoint;
  /**
   * Registers the listener called once if the worker dies (an uncaught error, an exit,
   * a message that cannot be read), with a short reason. A call in flight then never
   * answers; the engine races its calls against this.
   */
  onFailure(listener: (reason: string) => void): void;
  /** Stops the worker; it may report an exit to `onFailure` listeners afterwards. */
  terminate(): Promise<void>;
}

export interface EngineEnvironment {
  /** Starts one search worker. */
  spawnWorker(): WorkerHandle;
  /** A monotonic clock, milliseconds. */
  now(): number;
  /** A sensible number of workers for this machine (at least 1). */
  defaultWorkerCount(): number;
}
