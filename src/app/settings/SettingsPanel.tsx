/** What to search: families, placement, the measure, constraints, budget, seed, workers and the checkpoint interval. */
import { memo, useId } from 'react';
import { islandsPerFamily } from '../run/runInput';
import { FAMILY_CHOICES } from '../state/families';
import { MAX_RESULTS_PER_FAMILY, checkCheckpointEvery, checkEvaluations, checkResultsPerFamily, checkSeconds, checkSeed } from '../state/fields';
import { isLocked, type Measure } from '../state/project';
import { MAX_WORKERS } from '../state/settings';
import { useDispatch, useWorkspace } from '../state/store';
import { BoundsEditor } from './BoundsEditor';
import type { FamilyBounds } from './boundRegions';
import { ConstraintFields } from './ConstraintFields';
import { NumberInput } from './NumberInput';
import { ObjectiveTermFields } from './ObjectiveTermFields';
import { SetAsideNotice } from './SetAsideNotice';

const MEASURES: readonly { measure: Measure; label: string }[] = [
  { measure: 'rms', label: 'RMS distance (mm)' },
  { measure: 'max', label: 'largest distance (mm)' },
  { measure: 'sum-of-squares', label: 'sum of squared distances (mm²)' },
];

interface SettingsProps {
  readonly defaultWorkers: number;
  readonly familyBounds: readonly FamilyBounds[];
}

/** The panel: its fieldset locks every field while a search runs or is paused, without re-rendering them. */
export function SettingsPanel(props: SettingsProps) {
  const locked = useWorkspace((s) => isLocked(s.project.run.status));
  const id = useId();
  return (
    <section className="panel settings-panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>What to search</h2>
      <fieldset disabled={locked} className="settings-fields">
        <SettingsFields {...props} />
      </fieldset>
      {locked && <p className="panel-note">The settings are fixed while a search runs or is paused.</p>}
    </section>
  );
}

const SettingsFields = memo(function SettingsFields({ defaultWorkers, familyBounds }: SettingsProps) {
  const dispatch = useDispatch();
  const settings = useWorkspace((s) => s.project.settings);
  const id = useId();
  const { constraints, budget } = settings;
  const workers = settings.workers ?? defaultWorkers;
  // The engine asks for at least one evaluation per search island.
  const islands = settings.families.length * islandsPerFamily(settings.families.length, workers);

  return (
    <>
      <SetAsideNotice />
      <fieldset>
        <legend>Mechanism families (tick several to compare them on this target)</legend>
        {FAMILY_CHOICES.map((f) => (
          <label key={f.id} className="family" title={f.note}>
            <input type="checkbox" checked={settings.families.includes(f.id)} onChange={(e) => dispatch({ type: 'settings/family', family: f.id, on: e.target.checked })} /> {f.label}
            <span className="option-note"> — {f.note}</span>
          </label>
        ))}
      </fieldset>

      <fieldset>
        <legend>Placement</legend>
        <label>
          <input type="radio" name={`${id}-place`} checked={settings.placement === 'free'} onChange={() => dispatch({ type: 'settings/placement', placement: 'free' })} /> Free: fit
          the path's shape; position, rotation and scale follow
        </label>
        <label>
          <input type="radio" name={`${id}-place`} checked={settings.placement === 'fixed'} onChange={() => dispatch({ type: 'settings/placement', placement: 'fixed' })} /> Fixed:
          the pivots are searched in the drawing's frame
        </label>
      </fieldset>

      <label className="field-row">
        Minimise{' '}
        <select value={settings.measure} onChange={(e) => dispatch({ type: 'settings/measure', measure: e.target.value as Measure })}>
          {MEASURES.map((m) => (
            <option key={m.measure} value={m.measure}>
              {m.label}
            </option>
          ))}
        </select>
      </label>

      <ConstraintFields constraints={constraints} />

      <ObjectiveTermFields terms={settings.terms} />

      <BoundsEditor familyBounds={familyBounds} />

      <fieldset>
        <legend>Budget</legend>
        {/* Rows, not labels: a label round the field would give the radio the field's message as its name. */}
        <div className="field-row budget-row">
          <input
            type="radio"
            name={`${id}-budget`}
            aria-label="Stop after a number of evaluations"
            checked={budget.mode === 'evaluations'}
            onChange={() => dispatch({ type: 'settings/budget', patch: { mode: 'evaluations' } })}
          />{' '}
          <NumberInput
            value={budget.evaluations}
            label="Budget in evaluations"
            issueKey="budget-evaluations"
            check={(text) => checkEvaluations(text, islands)}
            onCommit={(evaluations) => dispatch({ type: 'settings/budget', patch: { evaluations } })}
          />{' '}
          evaluations
        </div>
        <div className="field-row budget-row">
          <input
            type="radio"
            name={`${id}-budget`}
            aria-label="Stop after a time"
            checked={budget.mode === 'time'}
            onChange={() => dispatch({ type: 'settings/budget', patch: { mode: 'time' } })}
          />{' '}
          <NumberInput value={budget.seconds} label="Budget in seconds" issueKey="budget-seconds" check={checkSeconds} onCommit={(seconds) => dispatch({ type: 'settings/budget', patch: { seconds } })} />{' '}
          seconds
        </div>
      </fieldset>

      <div className="field-row">
        Seed <NumberInput value={settings.seed} label="Seed" issueKey="seed" check={checkSeed} onCommit={(seed) => dispatch({ type: 'settings/seed', seed })} />{' '}
        <label>
          Workers{' '}
          <select
            value={settings.workers === null ? 'auto' : String(settings.workers)}
            onChange={(e) => dispatch({ type: 'settings/workers', workers: e.target.value === 'auto' ? null : Number(e.target.value) })}
          >
            <option value="auto">auto ({defaultWorkers})</option>
            {Array.from({ length: Math.min(MAX_WORKERS, Math.max(8, defaultWorkers + 1)) }, (_, k) => k + 1).map((n) => (
              <option key={n} value={n}>
                {n}
              </option>
            ))}
          </select>
        </label>
      </div>
      <div className="field-row">
        Checkpoint every{' '}
        <NumberInput
          value={settings.checkpointEverySeconds}
          label="Checkpoint every"
          issueKey="checkpoint-every"
          check={checkCheckpointEvery}
          onCommit={(seconds) => dispatch({ type: 'settings/checkpoint-every', seconds })}
        />{' '}
        s <span className="option-note">(a reload or a lost worker costs at most this much search; a long run's checkpoint takes about a second to save)</span>
      </div>
      <div className="field-row">
        Keep{' '}
        <NumberInput
          value={settings.resultsPerFamily}
          label="Designs kept per family"
          issueKey="results-per-family"
          check={checkResultsPerFamily}
          onCommit={(count) => dispatch({ type: 'settings/results-per-family', count })}
        />{' '}
        designs of each family <span className="option-note">(1 to {MAX_RESULTS_PER_FAMILY}, the most a search keeps)</span>
      </div>
    </>
  );
});
