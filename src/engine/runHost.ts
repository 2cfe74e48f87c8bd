/**
 * Where a run is orchestrated. Without a host, on the caller's thread (`createRun` over
 * the environment: Node, tests). A browser page hands its runs to a host instead, the
 * engine worker (browser/pageEnvironment.ts, browser/engineWorkerEntry.ts), and gets back a `Run` that mirrors the one in
 * the worker, so a hidden tab, whose main thread the browser slows, searches at full speed.
 */
import type { CheckpointStore } from './checkpointStore';
import type { EngineEnvironment } from './environment';
import { restoreRunFromStore } from './restoreFromStore';
import { createRun } from './run';
import type { MakeRunResult, RestoreFromStoreResult, RunOptions } from './runTypes';
import type { RunInput } from './runSpec';

/** Makes runs somewhere else than the caller's thread, with `createRun`'s and `restoreRunFromStore`'s contracts. */
export interface RunHost {
  createRun(input: RunInput, options: RunOptions): MakeRunResult;
  restoreRunFromStore(store: CheckpointStore, options: Omit<RunOptions, 'store'>): Promise<RestoreFromStoreResult>;
}

/** An environment, and the host its runs go to (none: they run on the caller's thread). */
export interface HostingEnvironment extends EngineEnvironment {
  readonly runHost?: RunHost;
}

/** `createRun`, on the environment's host if it has one. */
export function createHostedRun(env: HostingEnvironment, input: RunInput, options: RunOptions = {}): MakeRunResult {
  return env.runHost === undefined ? createRun(env, input, options) : env.runHost.createRun(input, options);
}

/** `restoreRunFromStore`, on the environment's host if it has one. */
export function restoreHostedRunFromStore(env: HostingEnvironment, store: CheckpointStore, options: Omit<RunOptions, 'store'> = {}): Promise<RestoreFromStoreResult> {
  return env.runHost === undefined ? restoreRunFromStore(env, store, options) : env.runHost.restoreRunFromStore(store, options);
}
