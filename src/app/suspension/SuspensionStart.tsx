/** The start page's way into the rear-suspension workspace: the demo, or the design the project keeps. */
import { demoSuspensionState, type SuspensionState } from './state';
import { stateOf, type StoredSuspension } from './stored';

export function SuspensionStart({ saved, onOpen }: { saved: StoredSuspension | undefined; onOpen: (state: SuspensionState) => void }) {
  return (
    <nav className="susp-start" aria-label="Rear suspension">
      {saved !== undefined && (
        <button type="button" onClick={() => onOpen(stateOf(saved))}>{`Rear suspension: ${saved.name}`}</button>
      )}
      <button
        type="button"
        title={saved === undefined ? undefined : 'Opens the demo; a change to it replaces the rear-suspension design this project keeps (download the design file first to keep it)'}
        onClick={() => onOpen(demoSuspensionState())}
      >
        Rear suspension demo
      </button>
    </nav>
  );
}
