/**
 * A leg search that survives a reload: the running search kept in the project (older
 * projects still read, a damaged record left out), checkpoints in a scope of their own
 * that neither the suspension search nor the path search drops (and that drops neither
 * of theirs), and the controller resuming a run on the engine in Node worker threads from
 * the checkpoints an interrupted run left, skipping a corrupt newest one and saying so.
 */
import { describe, expect, it } from 'vitest';
import { decodeCheckpoint } from '../../../src/engine';
import { nodeEnvironment } from '../../../src/engine/node';
import { checkpointScope } from '../../../src/app/storage/checkpointStore';
import type { LociDb } from '../../../src/app/storage';
import { LEG_RUN_SCOPE, legSearchCheckpoints, newLegRunId } from '../../../src/app/leg/search/checkpoints';
import { SUSPENSION_RUN_SCOPE, newSuspensionRunId, suspensionSearchCheckpoints } from '../../../src/app/suspension/search/checkpoints';
import { LegSearchController } from '../../../src/app/leg/search/controller';
import type { LegSearchRun, RunningLegSearch } from '../../../src/app/leg/search/results';
import { readLegSetup } from '../../../src/app/leg/readSetup';
import { emptyLegSetup, reduceLegSetup, type LegSetupAction } from '../../../src/app/leg/setup';
import { reduceLeg } from '../../../src/app/leg/state';
import { storedLegOf, storedLegSchema } from '../../../src/app/leg/stored';
import { memoryCheckpoints, pollUntil } from '../../support/searchCheckpoints';

/** An own small foot trajectory (mm) on a level ground line, a step height and a duty factor; two families. */
const ACTIONS = [
  { type: 'pointsReplace', points: [{ x: '12', y: '-30' }, { x: '0', y: '-30' }, { x: '-12', y: '-30' }, { x: '-8', y: '-24' }, { x: '0', y: '-22' }, { x: '8', y: '-24' }] },
  { type: 'groundText', field: 'yMm', text: '-30' },
  { type: 'stanceTolerance', text: '1' },
  { type: 'targetOn', key: 'stepHeightMm', on: true },
  { type: 'targetText', key: 'stepHeightMm', field: 'value', text: '8' },
  { type: 'family', family: 'watt-i', on: true },
  { type: 'budget', field: 'evaluations', text: '' },
  { type: 'budget', field: 'seconds', text: '600' },
  { type: 'seed', text: '4' },
] as LegSetupAction[];
const setup = ACTIONS.reduce(reduceLegSetup, emptyLegSetup());
const reading = readLegSetup(setup);
if (!reading.ok) throw new Error(JSON.stringify(reading.issues));
const { input, settings } = reading;

/** One worker: the machine's cores are shared. */
const env = { ...nodeEnvironment(), defaultWorkerCount: () => 1 };

const running: RunningLegSearch = { runId: 'leg-test-1', startedAt: '2026-01-01T00:00:00.000Z', problem: input, settings };

/**
 * The checkpoints object store as idb gives it, in memory: keys [runId, seq], the byRun
 * index, and the transaction calls the store makes (Node has no IndexedDB).
 */
function memoryLociDb(): { db: LociDb; runIds: () => string[] } {
  const records = new Map<string, { runId: string; seq: number; text: string; savedAt: number }>();
  const keyOf = (k: [string, number]) => JSON.stringify(k);
  const store = {
    index: () => ({ getAllKeys: (runId: string) => Promise.resolve([...records.values()].filter((r) => r.runId === runId).map((r) => [r.runId, r.seq] as [string, number])) }),
    put: (r: { runId: string; seq: number; text: string; savedAt: number }) => Promise.resolve(void records.set(keyOf([r.runId, r.seq]), r)),
    delete: (k: [string, number]) => Promise.resolve(void records.delete(keyOf(k))),
    getAllKeys: () => Promise.resolve([...records.values()].map((r) => [r.runId, r.seq] as [string, number])),
  };
  const db = {
    transaction: () => ({ store, done: Promise.resolve() }),
    getAllFromIndex: (_s: string, _i: string, runId: string) => Promise.resolve([...records.values()].filter((r) => r.runId === runId)),
  };
  return { db: db as unknown as LociDb, runIds: () => [...new Set([...records.values()].map((r) => r.runId))].sort() };
}

describe('the running leg search kept in the project', () => {
  it('is kept from start to end, and older projects without it still read', () => {
    const started = reduceLeg({ setup }, { type: 'searchStarted', running });
    const read = storedLegSchema.safeParse(JSON.parse(JSON.stringify(storedLegOf(started))));
    expect(read.success).toBe(true);
    expect(read.data?.searchRunning).toEqual(running);
    // A project kept before leg searches resumed: no such field, and it reads as before.
    const { searchRunning: _r, ...older } = JSON.parse(JSON.stringify(storedLegOf(started))) as Record<string, unknown>;
    const olderRead = storedLegSchema.safeParse(older);
    expect(olderRead.success).toBe(true);
    expect(olderRead.data?.searchRunning).toBeUndefined();
    // A damaged record is left out; the set-up still opens.
    const damaged = storedLegSchema.safeParse({ ...older, searchRunning: { runId: 7 } });
    expect(damaged.success).toBe(true);
    expect(damaged.data?.searchRunning).toBeUndefined();
    // Its end clears it: with a run kept, or without one (a resume that found nothing).
    const run: LegSearchRun = { id: running.runId, finishedAt: running.startedAt, problem: input, seed: 4, budget: settings.budget, evaluations: 10, stopReason: 'cancelled', candidates: [] };
    const finished = reduceLeg(started, { type: 'searchFinished', run });
    expect(finished.searchRunning).toBeUndefined();
    expect(finished.results?.current.id).toBe(running.runId);
    expect(reduceLeg(started, { type: 'searchEnded' }).searchRunning).toBeUndefined();
  });

  it('keeps its checkpoints in a scope of its own, which the other workspaces\' searches never drop', async () => {
    const id = newLegRunId();
    expect(checkpointScope(id)).toBe(LEG_RUN_SCOPE);
    expect(newLegRunId()).not.toBe(id);
    expect(checkpointScope(newSuspensionRunId())).toBe(SUSPENSION_RUN_SCOPE);
    const { db, runIds } = memoryLociDb();
    const open = () => Promise.resolve(db);
    const leg = legSearchCheckpoints(open);
    const suspension = suspensionSearchCheckpoints(open);
    const [legOld, legNew, suspOld, suspNew] = [newLegRunId(), newLegRunId(), newSuspensionRunId(), newSuspensionRunId()];
    // The path search's ids (src/app/boot.ts) are run-…
    const path = 'run-lz3k-1a2b3c4d';
    for (const runId of [legOld, legNew, suspOld, suspNew, path]) await leg.store(runId).save(`{"of":"${runId}"}`);
    // A suspension search starting drops its own old runs only.
    await suspension.dropExcept([suspNew]);
    expect(runIds()).toEqual([legNew, legOld, path, suspNew].sort());
    // A leg search starting drops its own old runs only.
    await leg.dropExcept([legNew]);
    expect(runIds()).toEqual([legNew, path, suspNew].sort());
    // A leg search ending drops its own, never the suspension's that may yet resume.
    await leg.dropExcept([]);
    expect(runIds()).toEqual([path, suspNew].sort());
    expect(await suspension.store(suspNew).load()).toEqual([`{"of":"${suspNew}"}`]);
  });
});

describe('resuming a leg search after a reload', () => {
  /** Runs a search until its store holds two checkpoints, then stops it: what IndexedDB held at a reload. */
  async function interrupted(): Promise<string[]> {
    const checkpoints = memoryCheckpoints();
    const started: RunningLegSearch[] = [];
    const c = new LegSearchController({ env, wallNow: () => 0, newRunId: () => running.runId, checkpoints, onStarted: (r) => started.push(r), onFinished: () => {} });
    const done = c.start(input, settings);
    // Two checkpoints after the first round (the run's first is taken before any evaluation).
    const counted = (text: string | undefined) => {
      const d = text === undefined ? null : decodeCheckpoint(text);
      return d !== null && d.ok && d.payload.evaluations > 0;
    };
    await pollUntil(() => counted(checkpoints.stores.get(running.runId)?.texts[1]));
    const texts = [...(checkpoints.stores.get(running.runId)?.texts ?? [])];
    c.stop();
    await done;
    // What the project kept of it: enough to resume it.
    expect(started).toEqual([{ ...running, startedAt: new Date(0).toISOString() }]);
    return texts;
  }

  /** One interrupted run for the tests that resume it: each reads its checkpoints, none changes them. */
  let interruptedRun: Promise<readonly string[]> | undefined;
  const interruptedOnce = (): Promise<readonly string[]> => (interruptedRun ??= interrupted());

  async function resumeFrom(texts: readonly string[], stopPast?: number): Promise<{ runs: LegSearchRun[]; firstMessage: string | null; firstEvaluations: number; ended: number; c: LegSearchController }> {
    const runs: LegSearchRun[] = [];
    let ended = 0;
    const c = new LegSearchController({ env, wallNow: () => 0, newRunId: () => 'unused', checkpoints: memoryCheckpoints({ [running.runId]: texts }), onFinished: (r) => runs.push(r), onEnded: () => ended++ });
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

  it('goes on from the newest checkpoint, and a stop then keeps the designs of every family', async () => {
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
    expect(new Set(r.runs[0].candidates.map((c) => c.family))).toEqual(new Set(input.families));
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
