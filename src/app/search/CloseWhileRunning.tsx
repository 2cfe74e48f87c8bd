/**
 * Closing a workspace while its search runs: it asks, rather than ending the search
 * unseen. Stop and close keeps the designs found so far (as Stop does); Keep searching
 * leaves the workspace open.
 */
import { useEffect, useRef, useState } from 'react';

/** What the dialog needs of a search controller. */
export interface StoppableSearch {
  stop(): void;
  whenIdle(): Promise<void>;
}

export function CloseWhileRunning({ controller, onClose, onCancel, words, testId }: {
  controller: StoppableSearch;
  onClose: () => void;
  onCancel: () => void;
  /** What closing does, in the workspace's words. */
  words: string;
  testId: string;
}) {
  const [stopping, setStopping] = useState(false);
  const first = useRef<HTMLButtonElement>(null);
  useEffect(() => first.current?.focus(), []);
  const stopAndClose = () => {
    setStopping(true);
    controller.stop();
    void controller.whenIdle().then(onClose);
  };
  return (
    <div className="susp-confirm" role="alertdialog" aria-label="Close while the search runs?" data-testid={testId}>
      <p>{words}</p>
      <button type="button" ref={first} onClick={stopAndClose} disabled={stopping}>{stopping ? 'Stopping…' : 'Stop the search and close'}</button>
      <button type="button" onClick={onCancel} disabled={stopping}>Keep searching</button>
    </div>
  );
}
