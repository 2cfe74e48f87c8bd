/**
 * The page: title, the caution that must stay visible, and the workspace: target entry
 * and search settings beside the search controls and the drawing, the results below.
 */
import { useDeferredValue, useEffect, useMemo, useState } from 'react';
import { bootWorkspace, type Workspace } from './boot';
import { ResultsView } from './results';
import { RunControls } from './run/RunControls';
import { ServicesContext } from './services';
import { SettingsPanel } from './settings/SettingsPanel';
import { isActive, snapshotTarget } from './state/project';
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
  const resultsTarget = useMemo(() => candidatesTarget ?? snapshotTarget(target), [candidatesTarget, target]);
  // The table renders new candidates in React's deferred, interruptible pass: a new set
  // never holds the main thread in one long task.
  const shownCandidates = useDeferredValue(candidates);
  const shownTarget = useDeferredValue(resultsTarget);
  return (
    <div className="workspace-results">
      <ResultsView target={shownTarget} candidates={shownCandidates} running={running} />
    </div>
  );
}

function WorkspaceView({ defaultWorkers }: { defaultWorkers: number }) {
  const name = useWorkspace((s) => s.project.name);
  const target = useWorkspace((s) => s.project.target);
  const settings = useWorkspace((s) => s.project.settings);
  const { familyBounds, regions } = useFamilyBounds();
  const startProblem = targetProblem(target) ?? settingsProblem(settings);
  return (
    <>
      <p className="project-name" data-testid="project-name">
        {name}
      </p>
      <div className="workspace-grid">
        <div className="workspace-side">
          <TargetPanel />
          <SettingsPanel defaultWorkers={defaultWorkers} familyBounds={familyBounds} />
        </div>
        <div className="workspace-main">
          <RunControls canStartProblem={startProblem} />
          <TargetDrawing regions={regions} />
        </div>
      </div>
      <ResultsSection />
    </>
  );
}

export function App() {
  const [workspace, setWorkspace] = useState<Workspace | null>(null);
  const [bootError, setBootError] = useState<string | null>(null);
  useEffect(() => {
    let cancelled = false;
    bootWorkspace().then(
      (ws) => {
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
      <main className="app-main">
        {workspace === null ? (
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
