/**
 * At the top of the workspace: a search a reload interrupted is going on again (or could
 * not), since the search section where it shows is far down the page.
 */
import { useSyncExternalStore } from 'react';
import type { SuspensionSearchController } from './controller';

function goToSearch(): void {
  const heading = document.getElementById('susp-search-title');
  heading?.scrollIntoView({ block: 'start' });
  heading?.focus();
}

export function ResumeNotice({ controller }: { controller: SuspensionSearchController }) {
  const session = useSyncExternalStore(controller.session.subscribe, controller.session.getState);
  if (!session.resumed) return null;
  const words = session.status === 'running' || session.status === 'stopping'
    ? 'The search a reload interrupted goes on from its last checkpoint.'
    : session.status === 'finished'
      ? 'The search a reload interrupted has ended; its designs are in the search section.'
      : 'The search a reload interrupted could not go on; the search section says why.';
  return (
    <p className="susp-note" role="status" data-testid="search-resume-notice">
      {`${words} `}
      <button type="button" onClick={goToSearch}>Go to the search</button>
    </p>
  );
}
