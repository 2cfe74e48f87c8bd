/**
 * What every workspace's search says and does for a long run: ask the browser to keep
 * the storage its checkpoints go to when a search starts, and say when a search worker
 * was lost and replaced.
 */
import type { RunProgress } from '../../engine';
import { storageStatus } from '../storage/storageStatus';

/**
 * Asks the browser to keep Loci's storage when a search starts, unless it already does
 * or has said no in this page (asking again would only repeat a prompt where the browser
 * shows one).
 */
export function askPersistenceOnStart(): void {
  const { persistence } = storageStatus.getSnapshot();
  if (persistence === 'unknown' || persistence === 'best-effort') void storageStatus.askPersistence();
}

/** The message of a run whose worker died and was replaced: where it went back to, and what is kept. */
export function workerRestartMessage(progress: Pick<RunProgress, 'restarts' | 'checkpointRound' | 'evaluations'>): string {
  const at = progress.checkpointRound === null ? 'its last checkpoint' : `its last checkpoint (round ${progress.checkpointRound}, ${progress.evaluations.toLocaleString('en-GB')} evaluations)`;
  const times = progress.restarts === 1 ? 'once' : `${progress.restarts} times so far`;
  return `A worker of the search stopped unexpectedly (${times}). Loci started a new one and took the search back to ${at}: the best designs up to there are kept, and the work since is searched again.`;
}
