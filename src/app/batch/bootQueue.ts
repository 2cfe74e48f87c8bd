/**
 * The page's one queue runner, started with the workspace: it asks for the queue, and in
 * the tab that gets it goes on where the queue was (a reload between jobs or mid-job).
 */
import { pageEnvironment } from '../../engine/browser';
import type { LociDb } from '../storage';
import { notifyQueueDone } from './notify';
import { claimQueue } from './ownership';
import { QueueRunner } from './queueRunner';

let runner: QueueRunner | null = null;

function newRunId(): string {
  return `${Date.now().toString(36)}-${crypto.randomUUID().slice(0, 8)}`;
}

/** The runner (made on the first call); `db` null when the browser keeps no storage, and then the queue is unavailable. */
export function bootQueue(db: LociDb | null): QueueRunner | null {
  if (runner !== null || db === null) return runner;
  const made = new QueueRunner({ db, env: pageEnvironment(), newRunId, onQueueDone: (state) => void notifyQueueDone(db, state) });
  runner = made;
  claimQueue(db, crypto.randomUUID(), (owned) => void made.setOwned(owned));
  return made;
}

/** The runner, once booted. */
export function queueRunner(): QueueRunner | null {
  return runner;
}

let nextJobId = 0;

/** A queue entry's key: unique in this tab, and across tabs by its random part. */
export function newJobId(): string {
  nextJobId++;
  return `${Date.now().toString(36)}-${nextJobId}-${crypto.randomUUID().slice(0, 4)}`;
}
