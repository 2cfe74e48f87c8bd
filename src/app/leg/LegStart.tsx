/** The start page's way into the walking-leg workspace: the toy walker demo, or the set-up the project keeps. */
import { demoLegSetup } from './demo';
import type { LegState } from './state';
import type { StoredLeg } from './stored';

export function LegStart({ saved, onOpen }: { saved: StoredLeg | undefined; onOpen: (state: LegState) => void }) {
  return (
    <nav className="susp-start" aria-label="Walking leg">
      {saved !== undefined && <button type="button" onClick={() => onOpen(saved)}>{`Walking leg: ${saved.setup.name}`}</button>}
      <button
        type="button"
        title={saved === undefined ? undefined : 'Opens the demo; a change to it replaces the walking-leg set-up this project keeps (its runs, and a search a reload interrupted, go on with it)'}
        onClick={() => onOpen({ setup: demoLegSetup(), ...(saved?.results === undefined ? {} : { results: saved.results }), ...(saved?.searchRunning === undefined ? {} : { searchRunning: saved.searchRunning }) })}
      >
        Walking leg demo (toy walker)
      </button>
    </nav>
  );
}
