/**
 * The suspension workspace with its own store: what the page mounts to open it. The
 * page hears of each change (to keep the design in the project) through `onChange`. A
 * search the project holds as running (a reload interrupted it) resumes on opening.
 */
import { useState } from 'react';
import { pageEnvironment } from '../../engine/browser';
import { newSuspensionRunId, suspensionSearchCheckpoints } from './search/checkpoints';
import { CloseWhileRunning } from '../search/CloseWhileRunning';
import { ResumeNotice } from '../search/ResumeNotice';
import { useWorkspaceSearch } from '../search/useWorkspaceSearch';
import { useWorkspaceStore } from '../search/useWorkspaceStore';
import { SuspensionSearchController } from './search/controller';
import { SearchControllerContext } from './search/controllerContext';
import { demoSuspensionState, type SuspensionState } from './state';
import { sameDesign } from './stored';
import { SuspensionStoreContext, createSuspensionStore } from './store';
import { SuspensionWorkspace } from './SuspensionWorkspace';

/** What closing the workspace while a search runs does. */
const SUSPENSION_CLOSE_WORDS = 'A search is running. Closing the rear-suspension workspace stops it; the designs it has found so far are kept with the design.';

export function SuspensionEntry({ initial, onClose, onChange }: {
  initial?: SuspensionState;
  onClose?: () => void;
  onChange?: (state: SuspensionState) => void;
}) {
  const [store] = useState(() => createSuspensionStore(initial ?? demoSuspensionState()));
  const [controller] = useState(() => new SuspensionSearchController({
    env: pageEnvironment(),
    wallNow: () => Date.now(),
    newRunId: newSuspensionRunId,
    checkpoints: suspensionSearchCheckpoints(),
    onStarted: (running) => store.dispatch({ type: 'searchStarted', running }),
    onFinished: (run) => store.dispatch({ type: 'searchFinished', run }),
    onEnded: () => store.dispatch({ type: 'searchEnded' }),
  }));
  // Moving the travel slider or an import's message is not a change of the design.
  useWorkspaceStore(store, onChange, sameDesign);
  const { asking, close, keepOpen } = useWorkspaceSearch(controller, () => store.getState().searchRunning, onClose);
  return (
    <SuspensionStoreContext.Provider value={store}>
      <SearchControllerContext.Provider value={controller}>
        <ResumeNotice controller={controller} headingId="susp-search-title" testId="search-resume-notice" />
        {asking && onClose !== undefined && <CloseWhileRunning controller={controller} onClose={onClose} onCancel={keepOpen} words={SUSPENSION_CLOSE_WORDS} testId="close-while-running" />}
        <SuspensionWorkspace onClose={close} />
      </SearchControllerContext.Provider>
    </SuspensionStoreContext.Provider>
  );
}
