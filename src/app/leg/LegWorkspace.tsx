/**
 * The walking-leg workspace: the set-up on the left (the foot trajectory, the ground and
 * directions, the targets, the families with their pivot regions and keep-outs), the
 * set-up drawing and the search on the right. The walking-machine caution stays at the
 * top. Every issue of the set-up is said beside its field and listed beside Start.
 */
import { useDeferredValue, useMemo } from 'react';
import { GAIT_CAUTION } from '../../core/gait';
import { FieldIssue, SetupIssuesContext } from '../suspension/targets/SetupField';
import { issuesByField } from './issues';
import { readLegSetup, type SetupIssue } from './readSetup';
import type { LegSearchController } from './search/controller';
import { LegSearchPanel } from './search/LegSearchPanel';
import { legRunIssues } from './search/runInput';
import { FamiliesFields } from './setup/FamiliesFields';
import { GaitFields } from './setup/GaitFields';
import { SetupDrawing } from './setup/SetupDrawing';
import { TargetsFields } from './setup/TargetsFields';
import { TrajectoryTable } from './setup/TrajectoryTable';
import { useLeg, useSetupDispatch } from './store';
import '../suspension/suspension.css';
import './leg.css';

/** Kinematics only: shown at the top of the workspace. */
export function LegWorkspaceCaution() {
  return (
    <aside className="susp-caution" role="note" aria-label="Walking-machine caution" data-testid="leg-workspace-caution">
      <strong>Caution.</strong> {GAIT_CAUTION}
    </aside>
  );
}

export function LegWorkspace({ controller, onClose }: { controller: LegSearchController; onClose?: () => void }) {
  const dispatch = useSetupDispatch();
  const setup = useLeg((s) => s.setup);
  // The fields follow each keystroke; reading the set-up (createLegProblem) follows in React's deferred pass.
  const deferred = useDeferredValue(setup);
  const workers = controller.workers;
  const reading = useMemo(() => readLegSetup(deferred), [deferred]);
  const issues: readonly SetupIssue[] = useMemo(
    () => (reading.ok ? legRunIssues(reading.input, reading.settings, workers) : reading.issues),
    [reading, workers],
  );
  const byField = useMemo(() => issuesByField(issues), [issues]);
  const ready = reading.ok && issues.length === 0 && deferred === setup ? { input: reading.input, settings: reading.settings } : null;
  const phasing = reading.ok && reading.phasing.legs > 1 ? { legs: reading.phasing.legs, phasesDeg: reading.phasing.phasesDeg } : undefined;
  return (
    <SetupIssuesContext.Provider value={byField}>
      <div className="susp-workspace legws" data-testid="leg-workspace">
        <div className="susp-title-row">
          <h2 className="susp-title">Walking leg</h2>
          <label className="susp-name">
            Problem name{' '}
            <input type="text" value={setup.name} aria-invalid={byField.has('name')} onChange={(e) => dispatch({ type: 'name', text: e.target.value })} />
          </label>
          <FieldIssue field="name" />
          {onClose !== undefined && <button type="button" onClick={onClose}>Back to path synthesis</button>}
        </div>
        <LegWorkspaceCaution />
        <div className="susp-grid">
          <div className="susp-side">
            <section className="panel susp-panel" aria-labelledby="legws-setup-title">
              <h2 id="legws-setup-title">Problem set-up</h2>
              <TrajectoryTable />
              <GaitFields />
              <TargetsFields />
              <FamiliesFields />
            </section>
          </div>
          <div className="susp-main">
            <SetupDrawing />
            <LegSearchPanel controller={controller} ready={ready} issues={deferred === setup ? issues : []} phasing={phasing} />
          </div>
        </div>
      </div>
    </SetupIssuesContext.Provider>
  );
}
