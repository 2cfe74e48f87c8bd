/**
 * The "Search" section of the suspension workspace: Start (disabled, with the reason,
 * while the set-up does not read), Stop, progress at most a few times a second, the
 * ranked layouts table of the latest run (and of the run before it, kept and labelled),
 * opening a design in the workspace, and the compare view of 2–4 ticked designs.
 */
import { useMemo, useState, useSyncExternalStore } from 'react';
import { SUSPENSION_CAUTION, LAYOUT_NAMES, type LayoutKind } from '../../../core/suspension';
import { useSuspension, useSuspensionDispatch } from '../store';
import { readSearchProblem } from '../targets/searchProblem';
import { MAX_COMPARED, comparedDesigns, runLayoutBodies } from './compare';
import { CompareView } from './CompareView';
import { DropOlderRunConfirm, RunShownSelect, SearchMessage, runEndWords } from '../../search/SearchParts';
import { SearchProgress } from '../../search/SearchProgress';
import { useSearchController } from './controllerContext';
import type { SearchRun } from './results';
import { ResultsTable } from './ResultsTable';
import type { TableRow } from './rows';
import { AddToQueue } from '../../batch/AddToQueue';

/** The fields' first values while the set-up does not read (Add to queue is not offered then). */
const NO_BUDGET = { evaluations: null, seconds: null };

function runSummary(run: SearchRun): string {
  return `${run.problem.layouts.length} layouts, ${runEndWords(run)}`;
}

export function SearchPanel() {
  const dispatch = useSuspensionDispatch();
  const state = useSuspension((s) => s);
  const record = state.searchResults;
  const reading = useMemo(() => readSearchProblem(state), [state]);

  const controller = useSearchController();
  const session = useSyncExternalStore(controller.session.subscribe, controller.session.getState);
  const running = session.status === 'running' || session.status === 'stopping';

  const [confirming, setConfirming] = useState(false);
  const [showPrevious, setShowPrevious] = useState(false);
  // Ticks and the opened row belong to the run they were made in; another run shown starts without them.
  const [ticks, setTicks] = useState<{ runId: string | null; ranks: number[]; opened: number | null }>({ runId: null, ranks: [], opened: null });
  const [openMessage, setOpenMessage] = useState<string | null>(null);
  const shownRun = record === undefined ? null : showPrevious && record.previous !== null ? record.previous : record.current;
  const cogCount = shownRun?.problem.bicycle.cogTeeth.length ?? 0;
  const [cogChoice, setCogChoice] = useState<number | null>(null);
  const cogIndex = Math.min(cogChoice ?? Math.floor(cogCount / 2), Math.max(0, cogCount - 1));
  const shownId = shownRun?.id ?? null;
  const compared = useMemo(() => (ticks.runId === shownId ? ticks.ranks : []), [ticks, shownId]);
  const opened = ticks.runId === shownId ? ticks.opened : null;

  const start = () => {
    setConfirming(false);
    if (!reading.ok) return;
    setShowPrevious(false);
    void controller.start(reading.input, reading.run);
  };
  const onStart = () => {
    if (record !== undefined && record.previous !== null) setConfirming(true);
    else start();
  };
  const onOpen = (row: TableRow) => {
    const c = row.candidate;
    if (shownRun === null) return;
    // With the bodies the run searched it with, so the side view and curves are the row's design.
    const bodies = runLayoutBodies(shownRun.problem, c.family);
    dispatch({ type: 'openLayout', kind: c.family, pivots: c.pivots, axleBody: bodies.axleBody, shock: bodies.shock });
    setTicks({ runId: shownId, ranks: compared, opened: c.rank });
    setOpenMessage(`Opened #${c.rank} (${row.layoutName}) in the side view and the curves above.`);
    // Focus follows the design: to the side view's heading, which the reader lands on.
    requestAnimationFrame(() => {
      const heading = document.getElementById('susp-view-title');
      heading?.focus();
      heading?.scrollIntoView({ block: 'start' });
    });
  };
  const toggleCompare = (rank: number) => {
    const ranks = compared.includes(rank) ? compared.filter((r) => r !== rank) : compared.length >= MAX_COMPARED ? compared : [...compared, rank];
    setTicks({ runId: shownId, ranks, opened });
  };
  const designs = useMemo(() => {
    if (shownRun === null || compared.length < 2) return [];
    const byRank = new Map(shownRun.candidates.map((c) => [c.rank, c]));
    return comparedDesigns(shownRun.problem, compared.flatMap((r) => { const c = byRank.get(r); return c === undefined ? [] : [c]; }));
  }, [shownRun, compared]);

  const why = reading.ok ? null : reading.issues.length === 0 ? 'the set-up is not complete' : `${reading.issues[0].message}${reading.issues.length > 1 ? ` (and ${reading.issues.length - 1} more: see the set-up)` : ''}`;
  const bicycleChanged = shownRun !== null && reading.ok && JSON.stringify(reading.input.bicycle) !== JSON.stringify(shownRun.problem.bicycle);
  const targetsChanged = shownRun !== null && reading.ok && JSON.stringify(reading.input.targets) !== JSON.stringify(shownRun.problem.targets);

  return (
    <section className="panel susp-panel susp-search" aria-labelledby="susp-search-title" data-testid="suspension-search">
      <h2 id="susp-search-title" tabIndex={-1}>Search</h2>
      <p className="susp-caution" role="note"><strong>Caution.</strong> {SUSPENSION_CAUTION}</p>
      <div className="susp-search-controls">
        <button type="button" onClick={onStart} disabled={!reading.ok || running} aria-describedby={why === null ? undefined : 'susp-search-why'}>Start search</button>
        <button type="button" onClick={() => controller.stop()} disabled={!running}>Stop</button>
        <AddToQueue
          problem={reading.ok ? { kind: 'suspension', projectName: state.name, input: reading.input } : null}
          why={why}
          seed={reading.ok ? reading.run.seed : 0}
          budget={reading.ok ? reading.run.budget : NO_BUDGET}
          workers={controller.workers}
        />
        {why !== null && <span id="susp-search-why" className="susp-problem" data-testid="search-not-ready">{`Not ready: ${why}`}</span>}
      </div>
      {confirming && record !== undefined && record.previous !== null && (
        <DropOlderRunConfirm olderSummary={runSummary(record.previous)} onStart={start} onCancel={() => setConfirming(false)} />
      )}
      <SearchProgress session={session} jobName={(job) => LAYOUT_NAMES[job as LayoutKind]} className="susp-search-progress" testId="search-progress" />
      <SearchMessage session={session} testId="search-message" />
      {record !== undefined && shownRun !== null && (
        <>
          <div className="susp-search-runs">
            <RunShownSelect hasPrevious={record.previous !== null} showPrevious={showPrevious} onShowPrevious={setShowPrevious} />
            <label>
              Gear for the per-gear columns{' '}
              <select value={cogIndex} onChange={(e) => setCogChoice(Number(e.target.value))}>
                {shownRun.problem.bicycle.cogTeeth.map((z, i) => <option key={i} value={i}>{`${shownRun.problem.bicycle.chainringTeeth} × ${z} T (cog ${i + 1})`}</option>)}
              </select>
            </label>
          </div>
          <p id="susp-results-summary" className="susp-note" data-testid="search-run-summary">{`${showPrevious && record.previous !== null ? 'Previous run' : 'Latest run'}: ${runSummary(shownRun)}.`}</p>
          {(bicycleChanged || targetsChanged) && (
            <p className="susp-note" data-testid="search-stale">
              {`This run searched ${bicycleChanged ? 'another bicycle' : ''}${bicycleChanged && targetsChanged ? ' and ' : ''}${targetsChanged ? 'other targets' : ''} than the set-up now holds: its figures and ranks are for what it ran with${bicycleChanged ? '; a design opened from it is drawn on the bicycle now in the panel' : ''}.`}
            </p>
          )}
          <ResultsTable
            run={shownRun}
            cogIndex={cogIndex}
            compared={compared}
            onToggleCompare={toggleCompare}
            onOpen={onOpen}
            compareFull={compared.length >= MAX_COMPARED}
            caption={`Ranked designs of the ${showPrevious && record.previous !== null ? 'previous' : 'latest'} run`}
            opened={opened}
          />
          {openMessage !== null && <p className="susp-note" role="status">{openMessage}</p>}
          <p className="susp-note">{compared.length < 2 ? 'Tick 2 to 4 designs to compare them.' : `${compared.length} designs ticked.`}</p>
          {designs.length >= 2 && <CompareView designs={designs} problem={shownRun.problem} cogIndex={cogIndex} />}
        </>
      )}
    </section>
  );
}
