/**
 * The leg workspace's own small store around `reduceLeg`: components read the part they
 * show with `useLeg(select)` and re-render only when it changes.
 */
import { createContext, useContext, useSyncExternalStore } from 'react';
import { createReducerStore, type ReducerStore } from '../reducerStore';
import { reduceLeg, type LegAction, type LegState } from './state';
import type { LegSetupAction } from './setup';

export type LegStore = ReducerStore<LegState, LegAction>;

export function createLegStore(initial: LegState): LegStore {
  return createReducerStore(reduceLeg, initial);
}

export const LegStoreContext = createContext<LegStore | null>(null);

function useLegStore(): LegStore {
  const store = useContext(LegStoreContext);
  if (store === null) throw new Error('useLegStore: no LegStoreContext.Provider above this component');
  return store;
}

/** The part of the state `select` picks; `select` must return a value kept in the state. */
export function useLeg<T>(select: (state: LegState) => T): T {
  const store = useLegStore();
  return useSyncExternalStore(store.subscribe, () => select(store.getState()));
}

export function useLegDispatch(): (action: LegAction) => void {
  return useLegStore().dispatch;
}

export function useSetupDispatch(): (action: LegSetupAction) => void {
  const dispatch = useLegDispatch();
  return (action) => dispatch({ type: 'setup', action });
}
