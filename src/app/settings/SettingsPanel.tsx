/** What to search: families, placement, the measure, constraints, budget, seed and workers. */
import { memo, useId } from 'react';
import { FAMILY_CHOICES } from '../state/families';
import { isLocked, type Measure } from '../state/project';
import { MAX_WORKERS } from '../state/settings';
import { useDispatch, useWorkspace } from '../state/store';
import { BoundsEditor } from './BoundsEditor';
import type { FamilyBounds } from './boundRegions';
import { NumberInput } from './NumberInput';

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

  return (
    <>
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

      <fieldset>
        <legend>Constraints</legend>
        <label>
          <input type="checkbox" checked={constraints.fullTurnCrank} onChange={(e) => dispatch({ type: 'settings/full-turn', on: e.target.checked })} /> The crank turns
          fully (Grashof crank)
        </label>
        <label className="field-row">
          Minimum transmission angle{' '}
          <NumberInput
            value={constraints.minTransmissionDeg}
            allowEmpty
            label="Minimum transmission angle (degrees)"
            onCommit={(v) => dispatch({ type: 'settings/min-transmission', deg: v })}
          />{' '}
          ° (empty: none)
        </label>
        <label className="field-row">
          Link lengths from{' '}
          <NumberInput
            value={constraints.linkLengthMm?.[0] ?? null}
            allowEmpty
            label="Shortest link length (mm)"
            onCommit={(v) => dispatch({ type: 'settings/link-lengths', range: v === null ? null : [v, constraints.linkLengthMm?.[1] ?? Math.max(v + 1, 500)] })}
          />{' '}
          to{' '}
          <NumberInput
            value={constraints.linkLengthMm?.[1] ?? null}
            allowEmpty
            label="Longest link length (mm)"
            onCommit={(v) => dispatch({ type: 'settings/link-lengths', range: v === null ? null : [constraints.linkLengthMm?.[0] ?? 0, v] })}
          />{' '}
          mm
        </label>
        <div className="keep-out-list">
          <p className="panel-note">Keep-out regions (no ground pivot inside): draw them with the "Keep-out region" tool.</p>
          {constraints.keepOut.length > 0 && (
            <ul>
              {constraints.keepOut.map((r, i) => (
                <li key={i}>
                  {i + 1}: centre ({r.x}, {r.y}) mm, radius {r.r} mm{' '}
                  <button type="button" className="icon" aria-label={`Remove keep-out region ${i + 1}`} onClick={() => dispatch({ type: 'settings/keep-out-remove', index: i })}>
                    ×
                  </button>
                </li>
              ))}
            </ul>
          )}
        </div>
      </fieldset>

      <BoundsEditor familyBounds={familyBounds} />

      <fieldset>
        <legend>Budget</legend>
        <label>
          <input type="radio" name={`${id}-budget`} checked={budget.mode === 'evaluations'} onChange={() => dispatch({ type: 'settings/budget', patch: { mode: 'evaluations' } })} />{' '}
          <NumberInput value={budget.evaluations} label="Budget in evaluations" onCommit={(v) => v !== null && dispatch({ type: 'settings/budget', patch: { evaluations: v } })} />{' '}
          evaluations
        </label>
        <label>
          <input type="radio" name={`${id}-budget`} checked={budget.mode === 'time'} onChange={() => dispatch({ type: 'settings/budget', patch: { mode: 'time' } })} />{' '}
          <NumberInput value={budget.seconds} label="Budget in seconds" onCommit={(v) => v !== null && dispatch({ type: 'settings/budget', patch: { seconds: v } })} /> seconds
        </label>
      </fieldset>

      <div className="field-row">
        <label>
          Seed <NumberInput value={settings.seed} label="Seed" onCommit={(v) => v !== null && dispatch({ type: 'settings/seed', seed: v })} />
        </label>{' '}
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
    </>
  );
});
