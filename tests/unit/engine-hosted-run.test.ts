/**
 * A run hosted across a thread boundary (src/engine/runService.ts on one side of a
 * MessageChannel, the caller's `RunHost` of src/engine/remoteRun.ts on the other, through
 * comlink, as the page and the browser's engine worker speak) against the same run made on
 * the caller's thread, with real Node worker_threads search workers and Rosenbrock's
 * function, Σ 100 (x_{i+1} − x_i²)² + (x_i − 1)² (Jamil and Yang, 2013, "A literature
 * survey of benchmark functions for global optimization problems").
 *
 * The reference is the second, independent path: `createRun` on this thread. A
 * deterministic run under an evaluation budget ends bit for bit the same on any schedule
 * (DEVELOPERS.md, Engine), so hosting must change nothing of its result.
 */
import { expose, wrap } from 'comlink';
import { MessageChannel, type MessagePort } from 'node:worker_threads';
import { afterEach, describe, expect, it } from 'vitest';
import { createRun, decodeCheckpoint, memoryCheckpointStore, type CheckpointPayload, type RunInput, type RunProgress, type RunResult } from '../../src/engine';
import { nodeEnvironment } from '../../src/engine/node';
import { remoteRunHost, type ServiceConnection } from '../../src/engine/remoteRun';
import { createHostedRun, restoreHostedRunFromStore, type HostingEnvironment } from '../../src/engine/runHost';
import { createRunService, type RunServiceApi } from '../../src/engine/runService';

const ISLANDS = 2;
const SPEC: RunInput = {
  jobs: [{ id: 'rosenbrock', objective: { kind: 'test-function', name: 'rosenbrock', dim: 6 }, seed: 1987, islands: ISLANDS }],
  budget: { evaluations: ISLANDS * 6000 },
  deterministic: true,
  stepEvaluations: 500,
  migration: { everyRounds: 1, count: 2 },
  archive: { capacity: 6, distance: 0.01 },
};

const opened: MessagePort[] = [];
/** More than the runs any one test makes through a host. */
const MAX_TEST_RUN_ID = 16;

afterEach(() => {
  for (const port of opened.splice(0)) port.close();
});

/** A host: a service on one port of a new channel and the connection that reaches it from the other; `end` says the host ended. */
interface Host {
  readonly service: RunServiceApi;
  readonly connection: ServiceConnection;
  readonly end: (reason: string) => void;
}

function startHost(local: ReturnType<typeof nodeEnvironment>): Host {
  const { port1, port2 } = new MessageChannel();
  opened.push(port1, port2);
  const service = createRunService(local);
  expose(service, port1 as unknown as Parameters<typeof expose>[1]);
  const listeners = new Set<(reason: string) => void>();
  let lost: string | null = null;
  const connection: ServiceConnection = {
    api: wrap<RunServiceApi>(port2 as unknown as Parameters<typeof wrap>[0]),
    lostReason: () => lost,
    onLost(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
  const end = (reason: string) => {
    lost = reason;
    port1.close();
    for (const listener of listeners) listener(reason);
  };
  return { service, connection, end };
}

/** One host for every run. */
function hostedEnvironment(): { env: HostingEnvironment; service: RunServiceApi; end: (reason: string) => void } {
  const local = nodeEnvironment();
  const { service, connection, end } = startHost(local);
  return { env: { ...local, runHost: remoteRunHost(local, () => connection) }, service, end };
}

/** As hostedEnvironment, but a host that ended is replaced by a new one at the next connect, as the page starts a new engine worker. */
function replacingEnvironment(): { env: HostingEnvironment; end: (reason: string) => void; hosts: () => number } {
  const local = nodeEnvironment();
  let current: Host | null = null;
  let hosts = 0;
  const connect = (): ServiceConnection => {
    if (current !== null && current.connection.lostReason() === null) return current.connection;
    current = startHost(local);
    hosts++;
    return current.connection;
  };
  const end = (reason: string) => {
    if (current === null) return;
    current.end(reason);
    // A browser terminates the engine worker; here its service lives on in this process, so its runs are let go (ids from 1).
    for (let id = 1; id <= MAX_TEST_RUN_ID; id++) current.service.forget(id);
  };
  return { env: { ...local, runHost: remoteRunHost(local, connect) }, end, hosts: () => hosts };
}

/** Resolves at the first report `when` holds for. */
function reportWhere(run: { onProgress(listener: (p: RunProgress) => void): () => void }, when: (p: RunProgress) => boolean): Promise<RunProgress> {
  return new Promise((resolve) => {
    const off = run.onProgress((p) => {
      if (when(p)) {
        off();
        resolve(p);
      }
    });
  });
}

let uninterrupted: Promise<RunResult> | null = null;

/**
 * SPEC run on this thread, once for the file: the reference every hosted run is held to.
 * A deterministic run ends the same whenever its checkpoints fall (DEVELOPERS.md, Engine),
 * so it serves runs of SPEC with any checkpoint interval.
 */
function reference(): Promise<RunResult> {
  if (uninterrupted === null) {
    const here = createRun(nodeEnvironment(), SPEC, { workers: 2 });
    if (!here.ok) throw new Error(here.reason);
    uninterrupted = here.run.start();
  }
  return uninterrupted;
}

function fingerprint(result: RunResult) {
  if (!result.ok) throw new Error(`run failed: ${result.reason}`);
  return { evaluations: result.evaluations, rounds: result.rounds, candidates: result.candidates.map((c) => ({ x: c.x, value: c.value, violation: c.violation, rank: c.rank })) };
}

describe('a run hosted across a thread', () => {
  it('ends as the same run on this thread, with its progress, checkpoints and store on the caller\'s side', async () => {
    const { env } = hostedEnvironment();
    const store = memoryCheckpointStore(3);
    const payloads: CheckpointPayload[] = [];
    const made = createHostedRun(env, SPEC, { workers: 2, store, onCheckpoint: (payload) => payloads.push(payload) });
    if (!made.ok) throw new Error(made.reason);
    expect(made.run.status()).toBe('idle');
    const seen: RunProgress[] = [];
    made.run.onProgress((progress) => seen.push(progress));
    const result = await made.run.start();

    expect(fingerprint(result)).toEqual(fingerprint(await reference()));
    expect(made.run.status()).toBe('finished');
    // The listener saw the run's reports in order: evaluations never go back in a run without restarts.
    expect(seen.length).toBeGreaterThan(2);
    for (let k = 1; k < seen.length; k++) expect(seen[k].evaluations).toBeGreaterThanOrEqual(seen[k - 1].evaluations);
    expect(seen[seen.length - 1].status).toBe('finished');
    // The checkpoints went to the caller's store, and the final one holds the run's evaluations.
    expect(store.texts.length).toBeGreaterThanOrEqual(1);
    const last = decodeCheckpoint(store.texts[0]);
    if (!last.ok) throw new Error(last.reason);
    expect(last.payload.evaluations).toBe(result.ok ? result.evaluations : -1);
    expect(payloads.length).toBeGreaterThanOrEqual(1);
    // A finished run still exports its final checkpoint.
    const exported = decodeCheckpoint(await made.run.exportCheckpoint());
    expect(exported.ok && exported.payload.evaluations).toBe(last.payload.evaluations);
  }, 120_000);

  it('pauses (paused when the promise settles), exports, resumes, and resumes from the caller\'s store', async () => {
    const { env } = hostedEnvironment();
    const store = memoryCheckpointStore(3);
    const made = createHostedRun(env, SPEC, { workers: 2, store });
    if (!made.ok) throw new Error(made.reason);
    const ending = made.run.start();
    await new Promise<void>((resolve) => {
      const off = made.run.onProgress((p) => {
        if (p.evaluations > 0) {
          off();
          resolve();
        }
      });
    });
    await made.run.pause();
    expect(made.run.status()).toBe('paused');
    const exported = decodeCheckpoint(await made.run.exportCheckpoint());
    expect(exported.ok).toBe(true);
    made.run.cancel();
    const cancelled = await ending;
    expect(cancelled.ok && cancelled.stopReason).toBe('cancelled');

    // The store the caller kept, read through the host, goes on to the same end as an uninterrupted run.
    const restored = await restoreHostedRunFromStore(env, store, { workers: 1 });
    if (!restored.ok) throw new Error(restored.reason);
    expect(fingerprint(await restored.run.start())).toEqual(fingerprint(await reference()));
  }, 120_000);

  it('refuses bad options at once, as createRun does, and fails its runs if the host ends', async () => {
    const { env, service, end } = hostedEnvironment();
    const bad = createHostedRun(env, SPEC, { workers: 0 });
    const direct = createRun(nodeEnvironment(), SPEC, { workers: 0 });
    expect(bad).toEqual(direct);
    expect(bad.ok).toBe(false);

    const made = createHostedRun(env, { ...SPEC, budget: { evaluations: 1_000_000_000 } }, { workers: 1 });
    if (!made.ok) throw new Error(made.reason);
    const ending = made.run.start();
    await new Promise<void>((resolve) => {
      const off = made.run.onProgress((p) => {
        if (p.evaluations > 0) {
          off();
          resolve();
        }
      });
    });
    end('closed by the test');
    const result = await ending;
    expect(result.ok).toBe(false);
    expect(!result.ok && result.reason).toBe('the engine worker ended: closed by the test');
    expect(made.run.status()).toBe('failed');
    // The service lives on in this process (a browser terminates the engine worker): its run, the first it was given, is let go and ends.
    service.forget(1);
  }, 120_000);

  it('goes on in a new host from its last checkpoint when its host ends, to the end the run would have had', async () => {
    // Checkpoints every round, so there is one to go back to when the host ends.
    const spec: RunInput = { ...SPEC, checkpointEveryMs: 1 };

    const { env, end, hosts } = replacingEnvironment();
    const store = memoryCheckpointStore(3);
    const made = createHostedRun(env, spec, { workers: 2, store });
    if (!made.ok) throw new Error(made.reason);
    const ending = made.run.start();
    const budget = ISLANDS * 6000;
    await reportWhere(made.run, (p) => p.checkpointRound !== null && p.evaluations > 0 && p.evaluations < budget / 2);
    end('closed by the test');
    const result = await ending;
    // A checkpoint resumed under an evaluation budget ends as the uninterrupted run (DEVELOPERS.md, Engine: deterministic runs).
    expect(fingerprint(result)).toEqual(fingerprint(await reference()));
    expect(hosts()).toBe(2);
    expect(result.ok && result.restarts).toBe(1);
    expect(made.run.progress().restarts).toBe(1);
    expect(made.run.status()).toBe('finished');
  }, 120_000);

  it('fails when its host ends again before a new checkpoint', async () => {
    // Checkpoints an hour apart on the run's clock: only the one taken as it starts falls within the test.
    const long: RunInput = { ...SPEC, budget: { evaluations: 1_000_000_000 }, checkpointEveryMs: 3_600_000 };
    const { env, end, hosts } = replacingEnvironment();
    const made = createHostedRun(env, long, { workers: 1, store: memoryCheckpointStore(3) });
    if (!made.ok) throw new Error(made.reason);
    const ending = made.run.start();
    const first = await reportWhere(made.run, (p) => p.checkpointRound !== null && p.evaluations > 0);
    end('closed by the test');
    // The run goes on in a new host, from the checkpoint it had…
    const back = await reportWhere(made.run, (p) => p.restarts === 1 && p.status === 'running');
    expect(back.checkpointRound).toBe(first.checkpointRound);
    end('closed by the test again');
    // …whose end, before a newer checkpoint, would only send it back to the same place again.
    const result = await ending;
    expect(!result.ok && result.reason).toBe('the engine worker ended: closed by the test again, again before a new checkpoint');
    expect(made.run.status()).toBe('failed');
    expect(hosts()).toBe(2);
  }, 120_000);
});
