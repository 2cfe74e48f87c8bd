/**
 * A small store around a pure update function: the state, `dispatch`, and listeners.
 * Components read it through React's useSyncExternalStore, so a component re-renders
 * only when what it selects changes. The workspace and the suspension view each keep one.
 */
export interface ReducerStore<S, A> {
  getState(): S;
  dispatch(action: A): void;
  subscribe(listener: () => void): () => void;
}

export function createReducerStore<S, A>(reduce: (state: S, action: A) => S, initial: S): ReducerStore<S, A> {
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
