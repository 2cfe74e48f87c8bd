/**
 * The "Search" section of the leg workspace: the budget and seed, Start (disabled while
 * the set-up does not read, with every issue listed), Stop, progress at most a few times
 * a second, the ranked table of the latest run (and of the run before it, kept and
 * labelled), a design opened in full, and the compare view of 2–4 ticked designs.
 */
import { useMemo, useState, useSyncExternalStore } from 'react';
import { GAIT_CAUTION } from '../../../core/gait';
import { parseLegFile, type LegDesign, type LegPhasing } from '../../../core/io/legFile';
import { FAMILY_NAMES } from '../../../core/synthesis/problem';
import { SetupField } from '../../suspension/targets/SetupField';
import { issueLine } from '../issues';
import type { SetupIssue } from '../readSetup';
import { useLeg, useSetupDispatch } from '../store';
import { LegCompareView, LegDesignView, MAX_COMPARED_LEGS } from '../views';
import { DropOlderRunConfirm, RunShownSelect, SearchMessage, runEndWords } from '../../search/SearchParts';
import { SearchProgress } from '../../search/SearchProgress';
import type { LegSearchController } from './controller';
import type { LegCandidate, LegSearchRun } from './results';
import { LegResultsTable } from './ResultsTable';
import { AddToQueue } from '../../batch/AddToQueue';
import type { LegProblemInput } from '../../../core/synthesis/legProblem';
import type { PoseFamilyId } from '../../../core/synthesis/poseFamilies';
import type { LegSearchSettings } from '../readSetup';

/** The fields' first values while the set-up does not read (Add to queue is not offered then). */
const NO_BUDGET = { evaluations: null, seconds: null };

function runSummary(run: LegSearchRun): string {
  return `${run.problem.families.length} famil${run.problem.families.length === 1 ? 'y' : 'ies'}, ${runEndWords(run)}`;
}

/** The design of a kept candidate, read again from its leg file; null with the reason when it does not read. */
function designOf(c: LegCandidate): { design: LegDesign } | { reason: string } {
  const read = parseLegFile(c.legFile);
  return read.ok ? { design: read.design } : { reason: read.issues.map(issueLine).join('; ') };
}

export function LegSearchPanel({ controller, ready, issues, phasing }: {
  controller: LegSearchController;
  /** The problem and settings to search, when the set-up reads whole. */
  ready: { input: LegProblemInput; settings: LegSearchSettings } | null;
  issues: readonly SetupIssue[];
  /** The legs on one shaft for an opened design's contact figures, when the set-up gives them. */
  phasing: LegPhasing | undefined;
}) {
  const dispatch = useSetupDispatch();
  const budget = useLeg((s) => s.setup.budget);
  const seed = useLeg((s) => s.setup.seed);
  const record = useLeg((s) => s.results);
  const session = useSyncExternalStore(controller.session.subscribe, controller.session.getState);
  const running = session.status === 'running' || session.status === 'stopping';
  const [showPrevious, setShowPrevious] = useState(false);
  const [confirming, setConfirming] = useState(false);
  // Ticks and the opened row belong to the run they were made in.
  const [ticks, setTicks] = useState<{ runId: string | null; ranks: number[]; opened: number | null }>({ runId: null, ranks: [], opened: null });
  const shownRun = record === undefined ? null : showPrevious && record.previous !== null ? record.previous : record.current;
  const shownId = shownRun?.id ?? null;
  const compared = useMemo(() => (ticks.runId === shownId ? ticks.ranks : []), [ticks, shownId]);
  const opened = ticks.runId === shownId ? ticks.opened : null;
  const openedCandidate = shownRun?.candidates.find((c) => c.rank === opened) ?? null;
  const openedDesign = useMemo(() => (openedCandidate === null ? null : designOf(openedCandidate)), [openedCandidate]);
  const comparedLegs = useMemo(() => {
    if (shownRun === null || compared.length < 2) return [];
    return compared.flatMap((rank) => {
      const c = shownRun.candidates.find((k) => k.rank === rank);
      const read = c === undefined ? null : designOf(c);
      return c === undefined || read === null || !('design' in read) ? [] : [{ label: `#${c.rank} ${FAMILY_NAMES[c.family]}`, design: read.design }];
    });
  }, [shownRun, compared]);

  const start = () => {
    setConfirming(false);
    if (ready === null) return;
    setShowPrevious(false);
    void controller.start(ready.input, ready.settings);
  };
  // A new run makes the latest the previous one: the older previous run would be dropped, so ask first.
  const onStart = () => (record !== undefined && record.previous !== null ? setConfirming(true) : start());
  const toggleCompare = (rank: number) => {
    const ranks = compared.includes(rank) ? compared.filter((r) => r !== rank) : compared.length >= MAX_COMPARED_LEGS ? compared : [...compared, rank];
    setTicks({ runId: shownId, ranks, opened });
  };
  const onOpen = (c: LegCandidate) => {
    setTicks({ runId: shownId, ranks: compared, opened: c.rank });
    requestAnimationFrame(() => document.getElementById('legws-opened-title')?.scrollIntoView({ block: 'start' }));
  };
  const problemChanged = shownRun !== null && ready !== null && JSON.stringify(ready.input) !== JSON.stringify(shownRun.problem);

  return (
    <section className="panel susp-panel legws-search" aria-labelledby="legws-search-title" data-testid="leg-search">
      <h2 id="legws-search-title" tabIndex={-1}>Search</h2>
      <p className="caution leg-caution" role="note"><strong className="caution-label">Caution:</strong> {GAIT_CAUTION}</p>
      <div className="legws-row">
        <SetupField field="budget.evaluations" label="Budget in evaluations" value={budget.evaluations} hint="all families together; alone, the search is repeatable" onChange={(text) => dispatch({ type: 'budget', field: 'evaluations', text })} />
        <SetupField field="budget.seconds" label="Budget in seconds" unit="s" value={budget.seconds} hint="empty: no time limit" onChange={(text) => dispatch({ type: 'budget', field: 'seconds', text })} />
        <SetupField field="seed" label="Seed" value={seed} onChange={(text) => dispatch({ type: 'seed', text })} />
      </div>
      <div className="legws-controls">
        <button type="button" onClick={onStart} disabled={ready === null || running} aria-describedby={issues.length === 0 ? undefined : 'legws-start-issues'}>Start search</button>
        <button type="button" onClick={() => controller.stop()} disabled={!running}>Stop</button>
        <AddToQueue
          problem={ready === null ? null : { kind: 'leg', projectName: ready.input.name, input: ready.input }}
          why={issues.length === 0 ? null : `${issues.length} issue${issues.length === 1 ? '' : 's'} to correct in the set-up`}
          seed={ready?.settings.seed ?? 0}
          budget={ready?.settings.budget ?? NO_BUDGET}
          workers={controller.workers}
        />
      </div>
      {confirming && record !== undefined && record.previous !== null && (
        <DropOlderRunConfirm olderSummary={runSummary(record.previous)} onStart={start} onCancel={() => setConfirming(false)} />
      )}
      {issues.length > 0 && (
        <div id="legws-start-issues" className="susp-problem" data-testid="leg-start-issues">
          <p>{`Not ready: ${issues.length} issue${issues.length === 1 ? '' : 's'} to correct (each is said beside its field too):`}</p>
          <ul>{issues.map((i, k) => <li key={k}>{issueLine(i)}</li>)}</ul>
        </div>
      )}
      <SearchProgress session={session} jobName={(job) => FAMILY_NAMES[job as PoseFamilyId]} className="legws-progress" testId="leg-search-progress" />
      <SearchMessage session={session} testId="leg-search-message" />
      {record !== undefined && shownRun !== null && (
        <>
          <div className="legws-row">
            <RunShownSelect hasPrevious={record.previous !== null} showPrevious={showPrevious} onShowPrevious={setShowPrevious} />
          </div>
          <p className="susp-note" data-testid="leg-run-summary">{`${showPrevious && record.previous !== null ? 'Previous run' : 'Latest run'}: ${runSummary(shownRun)}.`}</p>
          {problemChanged && <p className="susp-note" data-testid="leg-results-stale">This run searched another problem than the set-up now holds: its figures and ranks are for what it ran with.</p>}
          <LegResultsTable run={shownRun} compared={compared} onToggleCompare={toggleCompare} onOpen={onOpen} compareFull={compared.length >= MAX_COMPARED_LEGS} opened={opened} />
          <p className="susp-note">{compared.length < 2 ? `Tick 2 to ${MAX_COMPARED_LEGS} designs to compare them.` : `${compared.length} designs ticked.`}</p>
          {openedCandidate !== null && openedDesign !== null && (
            <section className="legws-opened" aria-labelledby="legws-opened-title" data-testid="leg-opened">
              <h3 id="legws-opened-title" tabIndex={-1}>{`Opened: #${openedCandidate.rank} ${FAMILY_NAMES[openedCandidate.family]}`}</h3>
              {'design' in openedDesign
                ? <LegDesignView design={openedDesign.design} {...(phasing === undefined ? {} : { phasing })} />
                : <p className="susp-problem" role="alert">{`The kept leg file does not read: ${openedDesign.reason}`}</p>}
            </section>
          )}
          {comparedLegs.length >= 2 && (
            <section className="legws-compare" aria-label="Compare the ticked legs" data-testid="leg-compare">
              <LegCompareView legs={comparedLegs} />
            </section>
          )}
        </>
      )}
    </section>
  );
}
