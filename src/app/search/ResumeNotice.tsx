/**
 * At the top of a workspace: a search a reload interrupted is going on again (or could
 * not), since the search section where it shows may be far down the page.
 */
import { useSyncExternalStore } from 'react';
import type { ReducerStore } from '../reducerStore';
import type { SearchSession } from './controller';

function goTo(headingId: string): void {
  const heading = document.getElementById(headingId);
  heading?.scrollIntoView({ block: 'start' });
  heading?.focus();
}

export function ResumeNotice({ controller, headingId, testId }: {
  controller: { readonly session: ReducerStore<SearchSession, Partial<SearchSession>> };
  /** The id of the search section's heading (focusable: tabIndex -1). */
  headingId: string;
  testId: string;
}) {
  const session = useSyncExternalStore(controller.session.subscribe, controller.session.getState);
  if (!session.resumed) return null;
  const words = session.status === 'running' || session.status === 'stopping'
    ? 'The search a reload interrupted goes on from its last checkpoint.'
    : session.status === 'finished'
      ? 'The search a reload interrupted has ended; its designs are in the search section.'
      : 'The search a reload interrupted could not go on; the search section says why.';
  return (
    <p className="susp-note" role="status" data-testid={testId}>
      {`${words} `}
      <button type="button" onClick={() => goTo(headingId)}>Go to the search</button>
    </p>
  );
}
