/**
 * The suspension workspace with its own store: what the page mounts to open it. The
 * page hears of each change (to keep the design in the project) through `onChange`.
 */
import { useEffect, useState } from 'react';
import { demoSuspensionState, type SuspensionState } from './state';
import { sameDesign } from './stored';
import { SuspensionStoreContext, createSuspensionStore } from './store';
import { SuspensionWorkspace } from './SuspensionWorkspace';

export function SuspensionEntry({ initial, onClose, onChange }: {
  initial?: SuspensionState;
  onClose?: () => void;
  onChange?: (state: SuspensionState) => void;
}) {
  const [store] = useState(() => createSuspensionStore(initial ?? demoSuspensionState()));
  useEffect(() => {
    if (onChange === undefined) return undefined;
    let kept = store.getState();
    return store.subscribe(() => {
      const now = store.getState();
      // Moving the travel slider or an import's message is not a change of the design.
      if (sameDesign(kept, now)) return;
      kept = now;
      onChange(now);
    });
  }, [store, onChange]);
  return (
    <SuspensionStoreContext.Provider value={store}>
      <SuspensionWorkspace onClose={onClose} />
    </SuspensionStoreContext.Provider>
  );
}
