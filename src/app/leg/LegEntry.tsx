/**
 * The leg workspace with its own store: what the page mounts to open it. The page hears
 * of each change of the set-up or the results (to keep them in the project) through
 * `onChange`. Closing while a search runs asks first; closing stops it.
 */
import { useEffect, useState } from 'react';
import { browserEnvironment } from '../../engine/browser';
import { CloseWhileRunningLeg } from './search/CloseWhileRunningLeg';
import { LegSearchController } from './search/controller';
import type { LegState } from './state';
import { LegStoreContext, createLegStore } from './store';
import { LegWorkspace } from './LegWorkspace';

let runCounter = 0;
function newLegRunId(): string {
  return `leg-${Date.now().toString(36)}-${(runCounter++).toString(36)}`;
}

export function LegEntry({ initial, onClose, onChange }: { initial: LegState; onClose?: () => void; onChange?: (state: LegState) => void }) {
  const [store] = useState(() => createLegStore(initial));
  const [controller] = useState(() => new LegSearchController({
    env: browserEnvironment(),
    wallNow: () => Date.now(),
    newRunId: newLegRunId,
    onFinished: (run) => store.dispatch({ type: 'searchFinished', run }),
  }));
  const [asking, setAsking] = useState(false);
  useEffect(() => {
    if (onChange === undefined) return undefined;
    let kept = store.getState();
    return store.subscribe(() => {
      const now = store.getState();
      if (now === kept) return;
      kept = now;
      onChange(now);
    });
  }, [store, onChange]);
  useEffect(() => () => controller.stop(), [controller]);
  const close = onClose === undefined ? undefined : () => (controller.busy ? setAsking(true) : onClose());
  return (
    <LegStoreContext.Provider value={store}>
      {asking && onClose !== undefined && <CloseWhileRunningLeg controller={controller} onClose={onClose} onCancel={() => setAsking(false)} />}
      <LegWorkspace controller={controller} onClose={close} />
    </LegStoreContext.Provider>
  );
}
