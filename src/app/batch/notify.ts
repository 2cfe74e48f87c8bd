/**
 * "Tell me when the queue is done": the browser's permission is asked only when the user
 * ticks the box, a refusal is said in words, and the notice says what the queue did.
 */
import { tally } from '../../engine/queue';
import type { LociDb } from '../storage';
import { loadNotifyWish } from '../storage/queueStore';
import type { AppQueueState } from './jobs';

export type NotifyPermission = 'granted' | 'denied' | 'default' | 'unsupported';

export function notifyPermission(): NotifyPermission {
  return typeof Notification === 'undefined' ? 'unsupported' : Notification.permission;
}

/** Asks the browser (it shows its own prompt the first time); resolves to what it answered. */
export async function askToNotify(): Promise<NotifyPermission> {
  if (typeof Notification === 'undefined') return 'unsupported';
  try {
    return await Notification.requestPermission();
  } catch {
    return Notification.permission;
  }
}

/** What the notice says: how many jobs ended how. */
export function doneWords(state: AppQueueState): string {
  const count = (s: string) => state.jobs.filter((j) => j.status === s).length;
  const { skipped } = tally(state);
  const parts = [`${count('done')} done`];
  if (count('failed') > 0) parts.push(`${count('failed')} failed`);
  if (count('cut') + skipped > 0) parts.push(`${count('cut') + skipped} skipped`);
  return `${state.jobs.length} job${state.jobs.length === 1 ? '' : 's'}: ${parts.join(', ')}. Open Loci for the summary.`;
}

export async function notifyQueueDone(db: LociDb, state: AppQueueState): Promise<void> {
  if (notifyPermission() !== 'granted' || !(await loadNotifyWish(db).catch(() => false))) return;
  try {
    new Notification('Loci: the batch queue is done', { body: doneWords(state), tag: 'loci-batch-queue' });
  } catch {
    // Some browsers allow notifications only from a service worker; the page's summary says the same.
  }
}
