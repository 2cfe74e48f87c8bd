/**
 * A workspace's store heard by the page: `onChange` is told of each change of what the
 * project keeps (`same` says when two states keep the same), so the page keeps it.
 */
import { useEffect } from 'react';
import type { ReducerStore } from '../reducerStore';

export function useWorkspaceStore<S, A>(store: ReducerStore<S, A>, onChange: ((state: S) => void) | undefined, same: (kept: S, now: S) => boolean): void {
  useEffect(() => {
    if (onChange === undefined) return undefined;
    let kept = store.getState();
    return store.subscribe(() => {
      const now = store.getState();
      if (same(kept, now)) return;
      kept = now;
      onChange(now);
    });
  }, [store, onChange, same]);
}
