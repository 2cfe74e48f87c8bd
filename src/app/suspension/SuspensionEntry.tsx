/**
 * The suspension workspace with its own store: what the page mounts to open it. The
 * page hears of each change (to keep the design in the project) through `onChange`. A
 * search the project holds as running (a reload interrupted it) resumes on opening.
 */
import { useEffect, useState } from 'react';
import { browserEnvironment } from '../../engine/browser';
import { browserSearchCheckpoints, newSuspensionRunId } from './search/checkpoints';
import { CloseWhileRunning } from './search/CloseWhileRunning';
import { SuspensionSearchController } from './search/controller';
import { SearchControllerContext } from './search/controllerContext';
import { ResumeNotice } from './search/ResumeNotice';
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
  const [controller] = useState(() => new SuspensionSearchController({
    env: browserEnvironment(),
    wallNow: () => Date.now(),
    newRunId: newSuspensionRunId,
    checkpoints: browserSearchCheckpoints(),
    onStarted: (running) => store.dispatch({ type: 'searchStarted', running }),
    onFinished: (run) => store.dispatch({ type: 'searchFinished', run }),
    onEnded: () => store.dispatch({ type: 'searchEnded' }),
  }));
  const [asking, setAsking] = useState(false);
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
  useEffect(() => {
    const running = store.getState().searchRunning;
    if (running !== undefined) void controller.resume(running);
    return () => controller.stop();
  }, [store, controller]);
  const close = onClose === undefined ? undefined : () => (controller.busy ? setAsking(true) : onClose());
  return (
    <SuspensionStoreContext.Provider value={store}>
      <SearchControllerContext.Provider value={controller}>
        <ResumeNotice controller={controller} />
        {asking && onClose !== undefined && <CloseWhileRunning controller={controller} onClose={onClose} onCancel={() => setAsking(false)} />}
        <SuspensionWorkspace onClose={close} />
      </SearchControllerContext.Provider>
    </SuspensionStoreContext.Provider>
  );
}
