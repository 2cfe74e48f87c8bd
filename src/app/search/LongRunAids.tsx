/**
 * Beside the search controls, what a long search left running needs: the storage the
 * checkpoints go to (used of allowed, in MB; whether the browser keeps it, and a button
 * to ask it to), a warning while checkpoints cannot be saved, and a screen wake lock
 * the user may ask for.
 */
import { useEffect, useRef, useState, useSyncExternalStore } from 'react';
import { formatMegabytes, storageStatus, type Persistence, type StorageStatus } from '../storage/storageStatus';
import { browserWakeLockHost, ScreenWakeLock, type WakeLockState } from './screenWakeLock';

const PERSISTENCE_WORDS: Readonly<Record<Persistence, string>> = {
  unknown: 'not yet known whether the browser keeps it',
  persistent: 'the browser keeps it until you clear it',
  'best-effort': 'the browser may clear it when space runs low',
  declined: 'the browser declined to promise to keep it (browsers decide from how the site is used; a bookmarked or installed page is more often kept)',
  unsupported: 'this browser cannot be asked to keep it',
};

const WAKE_WORDS: Readonly<Record<WakeLockState['kind'], string>> = {
  off: 'off',
  on: 'on: the screen stays on while this tab is shown',
  waiting: 'waiting: the tab is hidden; the screen is kept on again when it is shown',
  refused: 'refused by the browser',
  unsupported: 'not supported by this browser',
};

function usageWords(status: StorageStatus): string {
  if (status.usageBytes === null) return 'Storage for checkpoints: use not known';
  const quota = status.quotaBytes === null ? '' : ` of ${formatMegabytes(status.quotaBytes)} allowed`;
  return `Storage for checkpoints: ${formatMegabytes(status.usageBytes)} used${quota}`;
}

export function LongRunAids({ running }: { running: boolean }) {
  const status = useSyncExternalStore(storageStatus.subscribe, storageStatus.getSnapshot);
  const [asking, setAsking] = useState(false);
  const [wake, setWake] = useState<WakeLockState>({ kind: 'off' });
  const lock = useRef<ScreenWakeLock | null>(null);

  useEffect(() => {
    void storageStatus.refresh(true);
  }, [running]);
  useEffect(() => {
    const made = new ScreenWakeLock(browserWakeLockHost(), setWake);
    lock.current = made;
    return () => made.dispose();
  }, []);

  const ask = () => {
    setAsking(true);
    void storageStatus.askPersistence().finally(() => setAsking(false));
  };
  const wanted = wake.kind === 'on' || wake.kind === 'waiting';

  return (
    <div className="panel-note long-run-aids" data-testid="long-run-aids">
      <p data-testid="storage-status" data-persistence={status.persistence}>
        {`${usageWords(status)}; ${PERSISTENCE_WORDS[status.persistence]}.`}{' '}
        {status.persistence !== 'persistent' && status.persistence !== 'unsupported' && (
          <button type="button" onClick={ask} disabled={asking}>
            Ask the browser to keep it
          </button>
        )}
      </p>
      {status.saveFailure !== null && (
        <p className="notice notice-error" role="alert" data-testid="checkpoint-save-failure">
          {`Checkpoints are not being saved (${status.saveFailure}). The search goes on and keeps its best designs in this page, but a reload or a closed tab goes back to the last checkpoint saved. Free some disk space or clear other sites' data; saving resumes at the next checkpoint.`}
        </p>
      )}
      {status.saveFailure === null && status.savedAgain && (
        <p data-testid="checkpoint-saved-again">Checkpoints are being saved again.</p>
      )}
      <label>
        <input type="checkbox" checked={wanted} onChange={(e) => void lock.current?.want(e.target.checked)} />{' '}
        Keep the screen on
      </label>{' '}
      <span data-testid="wake-lock-state" data-state={wake.kind}>
        {`(${WAKE_WORDS[wake.kind]}${wake.kind === 'refused' ? `: ${wake.reason}` : ''})`}
      </span>
    </div>
  );
}
