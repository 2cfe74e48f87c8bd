/**
 * A suspension search that survives a reload: the running search kept in the project
 * (older projects still read, a damaged record left out), checkpoint scopes that keep the
 * path search from dropping the suspension search's, and the controller resuming a run on
 * the engine in Node worker threads from the checkpoints an interrupted run left, skipping
 * a corrupt newest one and saying so.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { SuspensionProblemInput } from '../../../src/core/synthesis';
import { decodeCheckpoint } from '../../../src/engine';
import { nodeEnvironment } from '../../../src/engine/node';
import { checkpointScope } from '../../../src/app/storage/checkpointStore';
import { SUSPENSION_RUN_SCOPE, newSuspensionRunId } from '../../../src/app/suspension/search/checkpoints';
import { SuspensionSearchController } from '../../../src/app/suspension/search/controller';
import type { RunningSearch, SearchRun } from '../../../src/app/suspension/search/results';
import { demoSuspensionState, reduceSuspension } from '../../../src/app/suspension/state';
import { stateOf, storedOf, storedSuspensionSchema } from '../../../src/app/suspension/stored';
import { memoryCheckpoints, pollUntil } from '../../support/searchCheckpoints';

const EXAMPLE = resolve(import.meta.dirname, '../../../public/examples/trail-bike-suspension-problem.json');
const { format: _f, version: _v, description: _d, ...inputJson } = JSON.parse(readFileSync(EXAMPLE, 'utf8')) as Record<string, unknown>;
const input = inputJson as unknown as SuspensionProblemInput;

/** One worker: the machine's cores are shared. */
const env = { ...nodeEnvironment(), defaultWorkerCount: () => 1 };

const running: RunningSearch = { runId: 'suspension-test-1', startedAt: '2026-01-01T00:00:00.000Z', problem: input, settings: { seed: 4, budget: { evaluations: null, seconds: 600 } } };

describe('the running search kept in the project', () => {
  it('is kept from start to end, and older projects without it still read', () => {
    const demo = demoSuspensionState();
    const started = reduceSuspension(demo, { type: 'searchStarted', running });
    const read = storedSuspensionSchema.safeParse(JSON.parse(JSON.stringify(storedOf(started))));
    expect(read.success).toBe(true);
    expect(stateOf(read.data as never).searchRunning).toEqual(running);
    // A project kept before searches resumed: no such field, and it reads as before.
    const { searchRunning: _r, ...older } = JSON.parse(JSON.stringify(storedOf(started))) as Record<string, unknown>;
    const olderRead = storedSuspensionSchema.safeParse(older);
    expect(olderRead.success).toBe(true);
    expect(stateOf(olderRead.data as never).searchRunning).toBeUndefined();
    // A damaged record is left out; the design still opens.
    const damaged = storedSuspensionSchema.safeParse({ ...older, searchRunning: { runId: 7 } });
    expect(damaged.success).toBe(true);
    expect(stateOf(damaged.data as never).searchRunning).toBeUndefined();
    // Its end clears it: with a run kept, or without one (a resume that found nothing).
    const run: SearchRun = { id: running.runId, finishedAt: running.startedAt, problem: input, seed: 4, budget: running.settings.budget, evaluations: 10, stopReason: 'cancelled', candidates: [] };
    const finished = reduceSuspension(started, { type: 'searchFinished', run });
    expect(finished.searchRunning).toBeUndefined();
    expect(finished.searchResults?.current.id).toBe(running.runId);
    expect(reduceSuspension(started, { type: 'searchEnded' }).searchRunning).toBeUndefined();
  });

  it('keeps its checkpoints in a scope of its own', () => {
    // The path search's ids (src/app/boot.ts) are run-…; a path search drops only that scope.
    expect(checkpointScope('run-lz3k-1a2b3c4d')).toBe('run');
    const id = newSuspensionRunId();
    expect(checkpointScope(id)).toBe(SUSPENSION_RUN_SCOPE);
    expect(newSuspensionRunId()).not.toBe(id);
  });
});

describe('resuming a suspension search after a reload', () => {
  /** Runs a search until its store holds two checkpoints, then stops it: what IndexedDB held at a reload. */
  async function interrupted(): Promise<string[]> {
    const checkpoints = memoryCheckpoints();
    const c = new SuspensionSearchController({ env, wallNow: () => 0, newRunId: () => running.runId, checkpoints, onFinished: () => {} });
    const done = c.start(input, running.settings);
    // Two checkpoints after the first round (the run's first is taken before any evaluation).
    const counted = (text: string | undefined) => {
      const d = text === undefined ? null : decodeCheckpoint(text);
      return d !== null && d.ok && d.payload.evaluations > 0;
    };
    await pollUntil(() => counted(checkpoints.stores.get(running.runId)?.texts[1]));
    const texts = [...(checkpoints.stores.get(running.runId)?.texts ?? [])];
    c.stop();
    await done;
    return texts;
  }

  /** One interrupted run for the tests that resume it: each reads its checkpoints, none changes them. */
  let interruptedRun: Promise<readonly string[]> | undefined;
  const interruptedOnce = (): Promise<readonly string[]> => (interruptedRun ??= interrupted());

  async function resumeFrom(texts: readonly string[], stopPast?: number): Promise<{ runs: SearchRun[]; firstMessage: string | null; firstEvaluations: number; ended: number; c: SuspensionSearchController }> {
    const runs: SearchRun[] = [];
    let ended = 0;
    const c = new SuspensionSearchController({ env, wallNow: () => 0, newRunId: () => 'unused', checkpoints: memoryCheckpoints({ [running.runId]: texts }), onFinished: (r) => runs.push(r), onEnded: () => ended++ });
    let firstMessage: string | null = null;
    let firstEvaluations = -1;
    const unsubscribe = c.session.subscribe(() => {
      const s = c.session.getState();
      if (firstMessage === null && s.message !== null && s.message.startsWith('Resumed')) {
        firstMessage = s.message;
        firstEvaluations = s.evaluations;
      }
    });
    // Stopped once it has gone on, not left to its budget: a time budget can be spent in one slice on a loaded machine.
    const resumed = c.resume(running);
    if (stopPast !== undefined) {
      await pollUntil(() => c.session.getState().evaluations > stopPast || c.session.getState().status !== 'running');
      c.stop();
    }
    await resumed;
    unsubscribe();
    return { runs, firstMessage, firstEvaluations, ended, c };
  }

  it('goes on from the newest checkpoint, and a stop then keeps the designs of every layout', async () => {
    const texts = await interruptedOnce();
    const newest = decodeCheckpoint(texts[0]);
    if (!newest.ok) throw new Error(newest.reason);
    const r = await resumeFrom(texts, newest.payload.evaluations);
    // common practice: a resumed run goes on from the counts of the checkpoint it read (decoded here, apart from the engine's restore).
    expect(r.firstEvaluations).toBe(newest.payload.evaluations);
    expect(r.firstMessage).toMatch(/^Resumed after a reload: the search goes on from its last checkpoint/);
    expect(r.firstMessage).not.toMatch(/damaged/);
    expect(r.runs).toHaveLength(1);
    expect(r.runs[0].id).toBe(running.runId);
    expect(r.runs[0].stopReason).toBe('cancelled');
    expect(r.runs[0].evaluations).toBeGreaterThan(newest.payload.evaluations);
    expect(new Set(r.runs[0].candidates.map((c) => c.family))).toEqual(new Set(input.layouts));
    expect(r.ended).toBe(1);
    expect(r.c.session.getState().status).toBe('finished');
  }, 120_000);

  it('skips a corrupt newest checkpoint for the one before it, and says so', async () => {
    const texts = await interruptedOnce();
    // A changed count under an unchanged checksum: what a torn or altered write leaves.
    const doc = JSON.parse(texts[0]) as { payload: { evaluations: number } };
    doc.payload.evaluations += 1;
    const before = decodeCheckpoint(texts[1]);
    if (!before.ok) throw new Error(before.reason);
    const r = await resumeFrom([JSON.stringify(doc), texts[1]], before.payload.evaluations);
    expect(r.firstEvaluations).toBe(before.payload.evaluations);
    expect(r.firstMessage).toMatch(/The newest checkpoint was damaged \(checkpoint is corrupt\) and skipped/);
    expect(r.runs).toHaveLength(1);
    expect(r.runs[0].candidates.length).toBeGreaterThan(0);
  }, 120_000);

  it('says so when nothing of the run can be read back, and ends it', async () => {
    const r = await resumeFrom([]);
    expect(r.runs).toHaveLength(0);
    expect(r.ended).toBe(1);
    expect(r.c.session.getState().status).toBe('failed');
    expect(r.c.session.getState().message).toMatch(/could not resume: it had saved no checkpoint before the reload/);
  });
});
