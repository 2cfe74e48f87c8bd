/**
 * The results test page (built only by tests/browser/results.test.ts): ResultsView fed
 * with reports from synthesis `describe` of known linkages (candidates.ts).
 *
 * `?running=1` plays a running search: the same designs arrive again as fresh report
 * objects every REFRESH_MS, as the workspace's store hands them over, a few times, from
 * when the test presses "Start the refreshes" (so the test can look at the page before
 * any refresh, however slowly it gets there).
 */
import { StrictMode, useEffect, useState } from 'react';
import { createRoot } from 'react-dom/client';
import { ResultsView } from '../../../src/app/results';
import '../../../src/app/styles.css';
import { resultsFixture } from './candidates';

const REFRESH_MS = 300;
const REFRESHES = 8;

const fixture = resultsFixture();
const running = new URLSearchParams(window.location.search).get('running') === '1';

function Page() {
  const [round, setRound] = useState(0);
  const [refreshing, setRefreshing] = useState(false);
  const [candidates, setCandidates] = useState(fixture.candidates);
  useEffect(() => {
    if (!running || !refreshing || round >= REFRESHES) return;
    const timer = setTimeout(() => {
      setCandidates(resultsFixture().candidates);
      setRound((r) => r + 1);
    }, REFRESH_MS);
    return () => clearTimeout(timer);
  }, [round, refreshing]);
  return (
    <main className="app">
      <h1>Results test page</h1>
      <p data-testid="refreshes">{round}</p>
      {running && (
        <button type="button" onClick={() => setRefreshing(true)} disabled={refreshing}>
          Start the refreshes
        </button>
      )}
      <ResultsView target={fixture.target} candidates={candidates} running={running && round < REFRESHES} />
    </main>
  );
}

const root = document.getElementById('root');
if (!root) throw new Error('the test page has no #root');
createRoot(root).render(
  <StrictMode>
    <Page />
  </StrictMode>,
);
