/**
 * A small store around `reduce`: the state, `dispatch`, and listeners. Components read
 * it with `useWorkspace(select)` (React's useSyncExternalStore), so a component
 * re-renders only when what it selects changes.
 */
import { createContext, useContext, useSyncExternalStore } from 'react';
import { reduce, type Action, type WorkspaceState } from './reducer';

export interface Store {
  getState(): WorkspaceState;
  dispatch(action: Action): void;
  subscribe(listener: () => void): () => void;
}

export function createStore(initial: WorkspaceState): Store {
  let state = initial;
  const listeners = new Set<() => void>();
  return {
    getState: () => state,
    dispatch(action) {
      const next = reduce(state, action);
      if (next === state) return;
      state = next;
      for (const listener of [...listeners]) listener();
    },
    subscribe(listener) {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
  };
}

export const StoreContext = createContext<Store | null>(null);

export function useStore(): Store {
  const store = useContext(StoreContext);
  if (store === null) throw new Error('useStore: no StoreContext.Provider above this component');
  return store;
}

/** The part of the state `select` picks; `select` must return a value kept in the state (not a new object each call). */
export function useWorkspace<T>(select: (state: WorkspaceState) => T): T {
  const store = useStore();
  return useSyncExternalStore(store.subscribe, () => select(store.getState()));
}

export function useDispatch(): (action: Action) => void {
  return useStore().dispatch;
}
