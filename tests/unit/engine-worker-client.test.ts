/**
 * The engine's side of a worker (src/engine/workerClient.ts) must not keep what its calls
 * answered once the caller is done with it: a long search makes hundreds of thousands of
 * calls to the same worker, and each answer kept was memory that grew for the whole run
 * (bench/memory.ts measures it). Racing every call against one long-lived "worker lost"
 * promise kept each answer reachable from that promise (Promise.race leaves a reaction on
 * every promise it is given; a promise that never settles holds them all; ECMA-262,
 * Promise.race and PerformPromiseThen).
 *
 * The worker is the real search API behind comlink, in this thread over a MessageChannel.
 * Whether an answer was freed is told by a WeakRef after a full garbage collection.
 */
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { MessageChannel } from 'node:worker_threads';
import { expose } from 'comlink';
import nodeEndpoint from 'comlink/dist/esm/node-adapter.mjs';
import { expect, it } from 'vitest';
import { WorkerClient } from '../../src/engine/workerClient';
import { createSearchWorkerApi } from '../../workers/searchWorkerApi';

setFlagsFromString('--expose-gc');
const gc = runInNewContext('gc') as () => void;

it('keeps nothing of a call\'s answer once the caller lets it go, while the worker lives on', async () => {
  const api = createSearchWorkerApi(() => 0);
  const { port1, port2 } = new MessageChannel();
  expose(api, nodeEndpoint(port2));
  const client = new WorkerClient(0, { endpoint: nodeEndpoint(port1), onFailure: () => {}, terminate: () => Promise.resolve() });
  const init = await client.call('init', 10_000, (remote) =>
    remote.init({
      islandId: 'a',
      objective: { kind: 'test-function', name: 'rosenbrock', dim: 4 },
      seed: 1,
      stream: 0,
      optimizer: { kind: 'lshade' },
      maxEvaluations: 10_000,
      archiveCapacity: 8,
      archiveDistance: 0.01,
    }),
  );
  expect(init.island.islandId).toBe('a');

  const CALLS = 20;
  const answers: WeakRef<object>[] = [];
  // In a function of its own, so no frame of this test holds an answer.
  const callMany = async () => {
    for (let k = 0; k < CALLS; k++) {
      const answer = await client.call('exportState', 10_000, (remote) => remote.exportState('a'));
      answers.push(new WeakRef(answer.state));
    }
  };
  await callMany();
  // One more call, so the last of those is no longer the one in flight anywhere; then let its jobs finish.
  await client.call('exportState', 10_000, (remote) => remote.exportState('a'));
  await new Promise((resolve) => setTimeout(resolve, 0));
  gc();
  const kept = answers.filter((ref) => ref.deref() !== undefined).length;
  // The worker is still there (no failure, no close): only a reference from the client could keep an answer.
  expect(client.failure).toBeNull();
  expect(kept).toBe(0);
  port1.close();
  port2.close();
});
