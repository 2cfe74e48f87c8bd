/**
 * A small store around `reduce`: the state, `dispatch`, and listeners. Components read
 * it with `useWorkspace(select)` (React's useSyncExternalStore), so a component
 * re-renders only when what it selects changes.
 */
import { createContext, useContext, useSyncExternalStore } from 'react';
import { createReducerStore, type ReducerStore } from '../reducerStore';
import { reduce, type Action, type WorkspaceState } from './reducer';

export type Store = ReducerStore<WorkspaceState, Action>;

export function createStore(initial: WorkspaceState): Store {
  return createReducerStore(reduce, initial);
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
