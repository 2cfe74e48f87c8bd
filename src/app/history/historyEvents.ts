/**
 * What other parts of the page tell the run history: runs were kept outside the
 * workspace's own search (a batch queue's jobs), or a kept run is to be shown in the
 * results table (the queue's summary opens a job's designs there).
 */
type Listener<T> = (value: T) => void;

const changed = new Set<Listener<void>>();
const showRequests = new Set<Listener<string>>();

export function notifyHistoryChanged(): void {
  for (const listener of changed) listener();
}

export function onHistoryChanged(listener: Listener<void>): () => void {
  changed.add(listener);
  return () => changed.delete(listener);
}

/** Asks the results view to show the kept run `runId`; false when no results view is there to show it. */
export function requestShowKeptRun(runId: string): boolean {
  for (const listener of showRequests) listener(runId);
  return showRequests.size > 0;
}

export function onShowKeptRun(listener: Listener<string>): () => void {
  showRequests.add(listener);
  return () => showRequests.delete(listener);
}
