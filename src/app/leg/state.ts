/**
 * The leg workspace's state: the set-up as typed, the latest search run with the one
 * before it, and the search running now. Pure updates.
 */
import { reduceLegSetup, type LegSetup, type LegSetupAction } from './setup';
import type { LegSearchRun, RunningLegSearch } from './search/results';

/** The latest run, and the one before it (kept, labelled, when a new search ends). */
export interface LegSearchRecord {
  readonly current: LegSearchRun;
  readonly previous: LegSearchRun | null;
}

export interface LegState {
  readonly setup: LegSetup;
  readonly results?: LegSearchRecord;
  /** The search running now, until it ends: a reload resumes it from its checkpoints. */
  readonly searchRunning?: RunningLegSearch;
}

export type LegAction =
  | { readonly type: 'setup'; readonly action: LegSetupAction }
  | { readonly type: 'replaceSetup'; readonly setup: LegSetup }
  | { readonly type: 'searchStarted'; readonly running: RunningLegSearch }
  | { readonly type: 'searchFinished'; readonly run: LegSearchRun }
  /** A search ended with no run to keep (a resume that found nothing, or a stop before any design). */
  | { readonly type: 'searchEnded' };

function withoutRunning(state: LegState): LegState {
  const { searchRunning: _ended, ...rest } = state;
  return rest;
}

export function reduceLeg(state: LegState, action: LegAction): LegState {
  switch (action.type) {
    case 'setup': {
      const setup = reduceLegSetup(state.setup, action.action);
      return setup === state.setup ? state : { ...state, setup };
    }
    case 'replaceSetup':
      return { ...state, setup: action.setup };
    case 'searchStarted':
      return { ...state, searchRunning: action.running };
    case 'searchFinished':
      return { ...withoutRunning(state), results: { current: action.run, previous: state.results?.current ?? null } };
    case 'searchEnded':
      return state.searchRunning === undefined ? state : withoutRunning(state);
  }
}
