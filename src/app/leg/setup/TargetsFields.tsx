/**
 * The gait targets, each optional: its figure, weight (empty: 1) and tolerance (the
 * deviation that counts as 1; empty: the core's default). A target adds
 * weight × (deviation / tolerance)² to the score.
 */
import { FieldIssue, SetupField } from '../../suspension/targets/SetupField';
import { TARGET_FIELD_KEYS } from '../readSetup';
import { LEG_TARGET_KEYS, type LegTargetKey } from '../setup';
import { TARGET_SPECS } from '../targetSpecs';
import { useLeg, useSetupDispatch } from '../store';

function TargetRow({ k }: { k: LegTargetKey }) {
  const dispatch = useSetupDispatch();
  const d = useLeg((s) => s.setup.targets[k]);
  const spec = TARGET_SPECS[k];
  const names = TARGET_FIELD_KEYS[k];
  const base = `targets.${k}`;
  const text = (field: 'value' | 'value2' | 'weight' | 'tolerance') => (t: string) => dispatch({ type: 'targetText', key: k, field, text: t });
  return (
    <div className="legws-target" data-testid={`leg-target-${k}`}>
      <label className="legws-target-on">
        <input type="checkbox" checked={d.on} onChange={(e) => dispatch({ type: 'targetOn', key: k, on: e.target.checked })} /> {spec.label}
      </label>
      {d.on && (
        <div className="legws-row">
          <SetupField field={`${base}.${names.value}`} label={spec.valueLabel} unit={spec.unit} value={d.value} onChange={text('value')} />
          {names.value2 !== undefined && <SetupField field={`${base}.${names.value2}`} label={spec.value2Label ?? ''} unit={spec.unit} value={d.value2} onChange={text('value2')} />}
          <SetupField field={`${base}.weight`} label={`${spec.label}: weight`} value={d.weight} hint="empty: 1" onChange={text('weight')} />
          <SetupField field={`${base}.${names.tolerance}`} label={`${spec.label}: tolerance`} unit={spec.toleranceUnit} value={d.tolerance} hint={`empty: ${spec.toleranceDefault}`} onChange={text('tolerance')} />
        </div>
      )}
    </div>
  );
}

export function TargetsFields() {
  return (
    <fieldset className="legws-group" data-testid="leg-targets">
      <legend>Gait targets</legend>
      <p className="susp-hint">Each optional; each adds weight × (deviation / tolerance)² to the score. Without a foot trajectory, stride and step height are both needed.</p>
      <FieldIssue field="targets" />
      {LEG_TARGET_KEYS.map((k) => <TargetRow key={k} k={k} />)}
    </fieldset>
  );
}
