/**
 * The leg workspace with its own store: what the page mounts to open it. The page hears
 * of each change of the set-up, the results or the running search (to keep them in the
 * project) through `onChange`. A search the project holds as running (a reload
 * interrupted it) resumes on opening. Closing while a search runs asks first; closing
 * stops it.
 */
import { useState } from 'react';
import { pageEnvironment } from '../../engine/browser';
import { CloseWhileRunning } from '../search/CloseWhileRunning';
import { ResumeNotice } from '../search/ResumeNotice';
import { useWorkspaceSearch } from '../search/useWorkspaceSearch';
import { useWorkspaceStore } from '../search/useWorkspaceStore';
import { legSearchCheckpoints, newLegRunId } from './search/checkpoints';
import { LegSearchController } from './search/controller';
import type { LegState } from './state';
import { LegStoreContext, createLegStore } from './store';
import { LegWorkspace } from './LegWorkspace';

/** What closing the workspace while a search runs does. */
const LEG_CLOSE_WORDS = 'A search is running. Closing the walking-leg workspace stops it; the designs it has found so far are kept in the project.';

/** Every change of the leg state is one the project keeps. */
const sameState = (a: LegState, b: LegState) => a === b;

export function LegEntry({ initial, onClose, onChange }: { initial: LegState; onClose?: () => void; onChange?: (state: LegState) => void }) {
  const [store] = useState(() => createLegStore(initial));
  const [controller] = useState(() => new LegSearchController({
    env: pageEnvironment(),
    wallNow: () => Date.now(),
    newRunId: newLegRunId,
    checkpoints: legSearchCheckpoints(),
    onStarted: (running) => store.dispatch({ type: 'searchStarted', running }),
    onFinished: (run) => store.dispatch({ type: 'searchFinished', run }),
    onEnded: () => store.dispatch({ type: 'searchEnded' }),
  }));
  useWorkspaceStore(store, onChange, sameState);
  const { asking, close, keepOpen } = useWorkspaceSearch(controller, () => store.getState().searchRunning, onClose);
  return (
    <LegStoreContext.Provider value={store}>
      <ResumeNotice controller={controller} headingId="legws-search-title" testId="leg-search-resume-notice" />
      {asking && onClose !== undefined && <CloseWhileRunning controller={controller} onClose={onClose} onCancel={keepOpen} words={LEG_CLOSE_WORDS} testId="leg-close-while-running" />}
      <LegWorkspace controller={controller} onClose={close} />
    </LegStoreContext.Provider>
  );
}
