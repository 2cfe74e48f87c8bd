/**
 * Closing the leg workspace while a search runs: it asks, rather than ending the search
 * unseen. Stop and close keeps the designs found so far (as Stop does); Keep searching
 * leaves the workspace open.
 */
import { useEffect, useRef, useState } from 'react';
import type { LegSearchController } from './controller';

export function CloseWhileRunningLeg({ controller, onClose, onCancel }: { controller: LegSearchController; onClose: () => void; onCancel: () => void }) {
  const [stopping, setStopping] = useState(false);
  const first = useRef<HTMLButtonElement>(null);
  useEffect(() => first.current?.focus(), []);
  const stopAndClose = () => {
    setStopping(true);
    controller.stop();
    void controller.whenIdle().then(onClose);
  };
  return (
    <div className="susp-confirm" role="alertdialog" aria-label="Close while the search runs?" data-testid="leg-close-while-running">
      <p>A search is running. Closing the walking-leg workspace stops it; the designs it has found so far are kept in the project.</p>
      <button type="button" ref={first} onClick={stopAndClose} disabled={stopping}>{stopping ? 'Stopping…' : 'Stop the search and close'}</button>
      <button type="button" onClick={onCancel} disabled={stopping}>Keep searching</button>
    </div>
  );
}
