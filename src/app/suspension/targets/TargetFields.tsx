/**
 * The targets: each optional (a tick), with its values, weight and tolerance in the
 * units the labels name, a band or limit counted as a constraint or a penalty, and the
 * cogs read in (teeth of the bicycle's cassette).
 */
import { memo } from 'react';
import type { BandMode } from '../../../core/synthesis/suspensionProblem';
import { readCogs } from '../fields';
import { useSuspension } from '../store';
import { FieldIssue, SetupField, useSetupDispatch } from './SetupField';
import { TARGET_KEYS, type TargetKey } from './setup';
import { TARGET_SPECS, fieldsOf, targetFieldLabel } from './targetSpecs';

const MODE_TEXT: Readonly<Record<BandMode, string>> = {
  constraint: 'a constraint (designs outside rank after those inside)',
  penalty: 'a penalty (added to the score, by weight)',
};

const TargetRow = memo(function TargetRow({ tkey, cassette }: { tkey: TargetKey; cassette: string }) {
  const d = useSuspension((s) => s.search.targets[tkey]);
  const dispatch = useSetupDispatch();
  const spec = TARGET_SPECS[tkey];
  const f = (name: string) => `targets.${tkey}.${name}`;
  const fields = fieldsOf(tkey, d.form);
  return (
    <fieldset className="susp-group susp-setup-target" data-target={tkey}>
      <legend>
        <label>
          <input type="checkbox" checked={d.on} onChange={(e) => dispatch({ type: 'targetOn', key: tkey, on: e.target.checked })} />{' '}
          {spec.title}
        </label>
      </legend>
      {!d.on && <span className="susp-hint susp-field-wide">off: not searched for ({spec.note})</span>}
      {d.on && (
        <>
          <span className="susp-hint susp-field-wide susp-setup-note">{spec.note}</span>
          {tkey === 'leverageRatio' && (
            <span className="susp-radios susp-field-wide">
              {(['shape', 'points'] as const).map((form) => (
                <label key={form}>
                  <input type="radio" name="susp-leverage-form" checked={d.form === form} onChange={() => dispatch({ type: 'leverageForm', form })} />
                  {form === 'shape' ? 'start and end with a shape' : 'points over travel'}
                </label>
              ))}
            </span>
          )}
          {fields.map((name) => (
            <SetupField
              key={name}
              field={f(name)}
              label={targetFieldLabel(tkey, name)}
              value={d[name]}
              onChange={(text) => dispatch({ type: 'targetText', key: tkey, field: name, text })}
              multiline={name === 'points'}
              wide={name === 'points' || name === 'cogs'}
              hint={name === 'cogs' ? `the cassette: ${cassette}` : undefined}
            />
          ))}
          <div className="susp-field-wide"><FieldIssue field={`targets.${tkey}`} /></div>
          <SetupField field={f('weight')} label={targetFieldLabel(tkey, 'weight')} value={d.weight} onChange={(text) => dispatch({ type: 'targetText', key: tkey, field: 'weight', text })} />
          <SetupField field={f('tolerance')} label={targetFieldLabel(tkey, 'tolerance')} value={d.tolerance} onChange={(text) => dispatch({ type: 'targetText', key: tkey, field: 'tolerance', text })} />
          {spec.hasMode && (
            <div className="susp-field susp-field-wide" data-field={f('as')}>
              <label>
                Counts as{' '}
                <select value={d.as} onChange={(e) => dispatch({ type: 'targetMode', key: tkey, as: e.target.value as BandMode })}>
                  {(['constraint', 'penalty'] as const).map((m) => <option key={m} value={m}>{MODE_TEXT[m]}</option>)}
                </select>
              </label>
              <FieldIssue field={f('as')} />
            </div>
          )}
        </>
      )}
    </fieldset>
  );
});

export const TargetFields = memo(function TargetFields() {
  const cogText = useSuspension((s) => s.draft.cogTeeth);
  const cogs = readCogs(cogText);
  const cassette = cogs.problems.length === 0 ? `${cogs.teeth.join(', ')} teeth` : 'see the bicycle panel';
  return (
    <div className="susp-setup-targets" data-testid="search-targets">
      <FieldIssue field="targets" />
      {TARGET_KEYS.map((k) => <TargetRow key={k} tkey={k} cassette={cassette} />)}
      <p className="susp-note">
        A curve or a penalty adds weight × (deviation / tolerance)² to the score; a constraint adds deviation / tolerance to
        the violation, and designs with less violation rank first.
      </p>
    </div>
  );
});
