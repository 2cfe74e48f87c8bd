/**
 * The page: title, the caution that must stay visible, and the workspace: target entry
 * and search settings beside the search controls and the drawing, the results below.
 */
import { useCallback, useDeferredValue, useEffect, useMemo, useState } from 'react';
import { BatchPanel } from './batch/BatchPanel';
import { bootQueue } from './batch/bootQueue';
import { useOpenWorkspaceRuns } from './batch/useOpenWorkspaceRuns';
import { bootWorkspace, type Workspace } from './boot';
import { ResultsView } from './results';
import { RunControls } from './run/RunControls';
import { runTitle } from './run/runTitle';
import { ServicesContext, useServices } from './services';
import { SuspensionEntry, SuspensionStart, storedOf, type SuspensionState } from './suspension';
import { LegEntry, LegStart, storedLegOf, type LegState } from './leg';
import { SettingsPanel } from './settings/SettingsPanel';
import { startIssuesOf } from './run/runInput';
import { ProjectName } from './settings/ProjectName';
import { IDLE_RUN, isActive, previousResultsTarget, snapshotTarget, PROJECT_FORMAT, PROJECT_VERSION, type Project } from './state/project';
import { settingsProblem } from './state/settings';
import { StoreContext, useWorkspace } from './state/store';
import { targetProblem } from './state/target';
import { TargetDrawing } from './target/TargetDrawing';
import { TargetPanel } from './target/TargetPanel';
import { useFamilyBounds } from './settings/useFamilyBounds';
import './workspace.css';

const CAUTION_TEXT =
  'Loci computes kinematics only: no strength, stiffness or fatigue. A frame or walking machine must be checked by a qualified engineer and tested to the applicable standards (for bicycles, the ISO 4210 series) before anyone uses it.';

/**
 * The results below the workspace. It alone follows the candidates, so a new set (at a
 * checkpoint, or at the end) re-renders the table and nothing else.
 */
function ResultsSection() {
  const target = useWorkspace((s) => s.project.target);
  const candidates = useWorkspace((s) => s.project.candidates);
  const candidatesTarget = useWorkspace((s) => s.project.candidatesTarget);
  const running = useWorkspace((s) => isActive(s.project.run.status));
  const previous = useWorkspace((s) => previousResultsTarget(s.project));
  const resultsTarget = useMemo(() => candidatesTarget ?? snapshotTarget(target), [candidatesTarget, target]);
  // The table renders new candidates in React's deferred, interruptible pass: a new set
  // never holds the main thread in one long task.
  const shownCandidates = useDeferredValue(candidates);
  const shownTarget = useDeferredValue(resultsTarget);
  return (
    <div className="workspace-results">
      {previous !== null && candidates.length > 0 && (
        <p className="notice notice-stale" role="status" data-testid="results-previous-target">
          <strong>These results are for the previous target</strong> ({previous.points.length} points, {previous.closed ? 'closed loop' : 'open path'}), not the one in the drawing now.
          Their errors are measured against that target; start a search to fit this one.
        </p>
      )}
      <ResultsView target={shownTarget} candidates={shownCandidates} running={running} />
    </div>
  );
}

/**
 * Everything that keeps a search from starting, in the user's words: the target, the
 * fields that hold what they cannot take, then what the problem reader and the engine
 * would refuse (checked only when the page found nothing itself).
 */
function useStartIssues(defaultWorkers: number): readonly string[] {
  const target = useWorkspace((s) => s.project.target);
  const settings = useWorkspace((s) => s.project.settings);
  const fieldIssues = useWorkspace((s) => s.ui.fieldIssues);
  return useMemo(() => {
    // A pair's message (a reversed range) is both fields' issue: listed once.
    const own = [...new Set([targetProblem(target), settingsProblem(settings), ...Object.values(fieldIssues)])].filter((m): m is string => m !== null);
    if (own.length > 0) return own;
    const project: Project = { format: PROJECT_FORMAT, version: PROJECT_VERSION, name: 'start check', target, settings, run: IDLE_RUN, candidates: [], candidatesTarget: null };
    return startIssuesOf(project, settings.workers ?? defaultWorkers);
  }, [target, settings, fieldIssues, defaultWorkers]);
}

/** Keeps the tab's title on the search's progress, so a search in a background tab can be followed from the tab strip. */
function useRunTitle(): void {
  const run = useWorkspace((s) => s.project.run);
  const title = runTitle(run);
  useEffect(() => {
    document.title = title;
  }, [title]);
}

function WorkspaceView({ defaultWorkers }: { defaultWorkers: number }) {
  useRunTitle();
  const { familyBounds, regions } = useFamilyBounds();
  const startIssues = useStartIssues(defaultWorkers);
  const { db } = useServices();
  return (
    <>
      <ProjectName />
      <div className="workspace-grid">
        <div className="workspace-side">
          <TargetPanel />
          <SettingsPanel defaultWorkers={defaultWorkers} familyBounds={familyBounds} />
        </div>
        <div className="workspace-main">
          <RunControls startIssues={startIssues} />
          <TargetDrawing regions={regions} />
        </div>
      </div>
      <BatchPanel db={db} defaultWorkers={defaultWorkers} />
      <ResultsSection />
    </>
  );
}

export function App() {
  const [workspace, setWorkspace] = useState<Workspace | null>(null);
  const [bootError, setBootError] = useState<string | null>(null);
  // The rear-suspension workspace, when open: it keeps its own store, and the project keeps its design.
  const [suspension, setSuspension] = useState<SuspensionState | null>(null);
  const saveSuspension = useCallback((state: SuspensionState) => workspace?.store.dispatch({ type: 'project/suspension', suspension: storedOf(state) }), [workspace]);
  // The walking-leg workspace, when open: its own store too, its set-up and results kept in the project.
  const [leg, setLeg] = useState<LegState | null>(null);
  const saveLeg = useCallback((state: LegState) => workspace?.store.dispatch({ type: 'project/leg', leg: storedLegOf(state) }), [workspace]);
  // A queued rear-suspension or walking-leg job's run, opened from the queue's summary: kept in the project as that workspace's latest run.
  useOpenWorkspaceRuns({
    kept: useCallback(() => workspace?.store.getState().project, [workspace]),
    openSuspension: useCallback((state: SuspensionState) => { saveSuspension(state); setSuspension(state); }, [saveSuspension]),
    openLeg: useCallback((state: LegState) => { saveLeg(state); setLeg(state); }, [saveLeg]),
  });
  useEffect(() => {
    let cancelled = false;
    bootWorkspace().then(
      (ws) => {
        // The queue goes on after a reload whichever workspace is open.
        bootQueue(ws.db);
        if (!cancelled) setWorkspace(ws);
      },
      (error: unknown) => setBootError(error instanceof Error ? error.message : String(error)),
    );
    return () => {
      cancelled = true;
    };
  }, []);

  return (
    <div className="app">
      <header className="app-header">
        <h1 className="app-title">Loci</h1>
        <p className="app-tagline">
          Fits planar four-bar and six-bar linkages to a target path: an axle path, a foot trajectory or a coupler curve.
        </p>
      </header>
      <aside className="caution" role="note" aria-label="Caution">
        <strong className="caution-label">Caution.</strong> {CAUTION_TEXT}
      </aside>
      {suspension === null && leg === null && <SuspensionStart saved={workspace?.store.getState().project.suspension} onOpen={setSuspension} />}
      {suspension === null && leg === null && <LegStart saved={workspace?.store.getState().project.leg} onOpen={setLeg} />}
      <main className="app-main">
        {leg !== null ? (
          <LegEntry initial={leg} onClose={() => setLeg(null)} onChange={saveLeg} />
        ) : suspension !== null ? (
          <SuspensionEntry initial={suspension} onClose={() => setSuspension(null)} onChange={saveSuspension} />
        ) : workspace === null ? (
          <p className="panel-note">{bootError === null ? 'Opening the project…' : `The workspace could not start: ${bootError}`}</p>
        ) : (
          <StoreContext.Provider value={workspace.store}>
            <ServicesContext.Provider value={{ controller: workspace.controller, db: workspace.db }}>
              <WorkspaceView defaultWorkers={workspace.defaultWorkers} />
            </ServicesContext.Provider>
          </StoreContext.Provider>
        )}
      </main>
    </div>
  );
}
