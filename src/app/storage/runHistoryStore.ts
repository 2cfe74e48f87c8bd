/**
 * Kept runs and pinned designs in IndexedDB. Records are read back with a check of
 * their shape: a record that is not a kept run (an older or damaged one) is left out
 * and counted, never shown half-read.
 */
import type { KeptRun, KeptRunSummary, PinnedDesign } from '../history/types';
import { summaryOf } from '../history/types';
import type { LociDb } from './db';

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function isKeptRun(v: unknown): v is KeptRun {
  return isObject(v) && typeof v.runId === 'string' && typeof v.name === 'string' && typeof v.keptAt === 'number' &&
    typeof v.ended === 'string' && typeof v.evaluations === 'number' && isObject(v.settings) && isObject(v.target) &&
    Array.isArray((v.target as Record<string, unknown>).points) && Array.isArray(v.candidates);
}

function isPinnedDesign(v: unknown): v is PinnedDesign {
  return isObject(v) && typeof v.pinKey === 'string' && typeof v.runId === 'string' && typeof v.runName === 'string' &&
    typeof v.rank === 'number' && typeof v.pinnedAt === 'number' && isObject(v.target) && isObject(v.candidate);
}

export interface Listing<T> {
  readonly items: T[];
  /** Records that could not be read as what they should be. */
  readonly unreadable: number;
}

export async function keepRun(db: LociDb, run: KeptRun): Promise<void> {
  await db.put('runs', run, run.runId);
}

/** Whether a run is kept already. */
export async function isKept(db: LociDb, runId: string): Promise<boolean> {
  return (await db.getKey('runs', runId)) !== undefined;
}

/** Every kept run's summary, newest first. */
export async function listKeptRuns(db: LociDb): Promise<Listing<KeptRunSummary>> {
  const values = await db.getAll('runs');
  const runs = values.filter(isKeptRun);
  return { items: runs.map(summaryOf).sort((a, b) => b.keptAt - a.keptAt), unreadable: values.length - runs.length };
}

export async function getKeptRun(db: LociDb, runId: string): Promise<KeptRun | null> {
  const value = await db.get('runs', runId);
  return isKeptRun(value) ? value : null;
}

export async function renameKeptRun(db: LociDb, runId: string, name: string): Promise<void> {
  const run = await getKeptRun(db, runId);
  if (run !== null) await db.put('runs', { ...run, name }, runId);
}

/** Deletes a kept run; its pinned designs stay (they carry their own copy). */
export async function deleteKeptRun(db: LociDb, runId: string): Promise<void> {
  await db.delete('runs', runId);
}

export async function listPins(db: LociDb): Promise<Listing<PinnedDesign>> {
  const values = await db.getAll('pins');
  const pins = values.filter(isPinnedDesign);
  return { items: pins.sort((a, b) => a.pinnedAt - b.pinnedAt), unreadable: values.length - pins.length };
}

export async function putPin(db: LociDb, pin: PinnedDesign): Promise<void> {
  await db.put('pins', pin, pin.pinKey);
}

export async function deletePin(db: LociDb, pinKey: string): Promise<void> {
  await db.delete('pins', pinKey);
}
