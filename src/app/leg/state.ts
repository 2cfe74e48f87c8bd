/**
 * The leg workspace's state: the set-up as typed, and the latest search run with the one
 * before it. Pure updates.
 */
import { reduceLegSetup, type LegSetup, type LegSetupAction } from './setup';
import type { LegSearchRun } from './search/results';

/** The latest run, and the one before it (kept, labelled, when a new search ends). */
export interface LegSearchRecord {
  readonly current: LegSearchRun;
  readonly previous: LegSearchRun | null;
}

export interface LegState {
  readonly setup: LegSetup;
  readonly results?: LegSearchRecord;
}

export type LegAction = { readonly type: 'setup'; readonly action: LegSetupAction } | { readonly type: 'replaceSetup'; readonly setup: LegSetup } | { readonly type: 'searchFinished'; readonly run: LegSearchRun };

export function reduceLeg(state: LegState, action: LegAction): LegState {
  switch (action.type) {
    case 'setup': {
      const setup = reduceLegSetup(state.setup, action.action);
      return setup === state.setup ? state : { ...state, setup };
    }
    case 'replaceSetup':
      return { ...state, setup: action.setup };
    case 'searchFinished':
      return { ...state, results: { current: action.run, previous: state.results?.current ?? null } };
  }
}
