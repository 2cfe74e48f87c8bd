/**
 * The suspension workspace's own small store around `reduceSuspension`: components read
 * the part they show with `useSuspension(select)` and re-render only when it changes.
 */
import { createContext, useContext, useSyncExternalStore } from 'react';
import { createReducerStore, type ReducerStore } from '../reducerStore';
import { reduceSuspension, type SuspensionAction, type SuspensionState } from './state';

export type SuspensionStore = ReducerStore<SuspensionState, SuspensionAction>;

export function createSuspensionStore(initial: SuspensionState): SuspensionStore {
  return createReducerStore(reduceSuspension, initial);
}

export const SuspensionStoreContext = createContext<SuspensionStore | null>(null);

function useSuspensionStore(): SuspensionStore {
  const store = useContext(SuspensionStoreContext);
  if (store === null) throw new Error('useSuspensionStore: no SuspensionStoreContext.Provider above this component');
  return store;
}

/** The part of the state `select` picks; `select` must return a value kept in the state. */
export function useSuspension<T>(select: (state: SuspensionState) => T): T {
  const store = useSuspensionStore();
  return useSyncExternalStore(store.subscribe, () => select(store.getState()));
}

export function useSuspensionDispatch(): (action: SuspensionAction) => void {
  return useSuspensionStore().dispatch;
}
