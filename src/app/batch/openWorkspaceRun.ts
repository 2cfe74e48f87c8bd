/**
 * Opening a rear-suspension or walking-leg job's run (kept in the queue's summary) in its
 * workspace: the page that can open the workspace listens; the summary asks.
 */
import type { WorkspaceJobRun } from './workspaceJobs';

export interface OpenWorkspaceRun {
  readonly kind: 'suspension' | 'leg';
  readonly run: WorkspaceJobRun;
}

/** Opens the run, or says why it cannot (null: opened). */
type Handler = (request: OpenWorkspaceRun) => string | null;

let listener: Handler | null = null;

/** The page's handler; returns the function that removes it. */
export function onOpenWorkspaceRun(handler: Handler): () => void {
  listener = handler;
  return () => {
    if (listener === handler) listener = null;
  };
}

/** Null when the workspace opened on the run, else why not. */
export function requestOpenWorkspaceRun(request: OpenWorkspaceRun): string | null {
  return listener === null ? 'this page cannot open workspaces from the queue' : listener(request);
}
