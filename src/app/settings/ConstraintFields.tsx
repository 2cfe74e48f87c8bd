/** The constraints: a full-turn crank, the minimum transmission angle, the size limit, link length limits and keep-out circles. */
import { useState } from 'react';
import { targetSpanMm } from '../run/runInput';
import { checkKeepOut, checkLinkLengths, checkMaxSizeSpans, checkMinTransmission, formatValue } from '../state/fields';
import type { SearchSettings } from '../state/project';
import { useDispatch, useWorkspace } from '../state/store';
import { FieldInput, NumberInput, useDraft, useFieldIssue } from './NumberInput';

function LinkLengthFields({ range }: { range: SearchSettings['constraints']['linkLengthMm'] }) {
  const dispatch = useDispatch();
  const [from, setFrom] = useDraft(range === null ? '' : formatValue(range[0]));
  const [to, setTo] = useDraft(range === null ? '' : formatValue(range[1]));
  const checked = checkLinkLengths(from, to);
  // Each field is its own: typing one never fills in or changes the other.
  const commit = () => {
    if (!checked.ok) return;
    const v = checked.value;
    const same = v === null ? range === null : range !== null && v[0] === range[0] && v[1] === range[1];
    if (!same) dispatch({ type: 'settings/link-lengths', range: v });
  };
  return (
    <div className="field-row">
      Link lengths from{' '}
      <FieldInput text={from} label="Shortest link length (mm)" issueKey="link-lengths-from" message={checked.ok ? null : checked.lower} onText={setFrom} onDone={commit} /> to{' '}
      <FieldInput text={to} label="Longest link length (mm)" issueKey="link-lengths-to" message={checked.ok ? null : checked.upper} onText={setTo} onDone={commit} /> mm
      <span className="option-note">(both empty: no limit)</span>
    </div>
  );
}

/** The size limit, a multiple of the target's span, with what it is in mm for this target. */
function MaxSizeField({ spans }: { spans: number | null }) {
  const dispatch = useDispatch();
  const spanMm = useWorkspace((s) => (s.project.target.points.length === 0 ? null : targetSpanMm(s.project.target.points)));
  return (
    <div className="field-row">
      Largest size of the motion{' '}
      <NumberInput
        value={spans}
        label="Largest size of the motion (multiple of the target's span)"
        issueKey="max-size"
        check={checkMaxSizeSpans}
        format={formatValue}
        onCommit={(value) => dispatch({ type: 'settings/max-size', spans: value })}
      />{' '}
      × the target's span
      <span className="option-note">
        {' '}
        ({spans !== null && spanMm !== null ? `${formatValue(Number((spans * spanMm).toPrecision(4)))} mm for this target's ${formatValue(Number(spanMm.toPrecision(4)))} mm; ` : ''}the larger side of
        the box every joint sweeps; empty: no limit)
      </span>
    </div>
  );
}

/** A keep-out circle typed in: x, y and radius, added with the button; all three empty is no entry. */
function NewKeepOut() {
  const dispatch = useDispatch();
  const [x, setX] = useState('');
  const [y, setY] = useState('');
  const [r, setR] = useState('');
  const empty = x.trim() === '' && y.trim() === '' && r.trim() === '';
  const checked = checkKeepOut(x, y, r);
  const message = empty || checked.ok ? null : `${checked.message} Add it, or empty the three fields.`;
  useFieldIssue('keep-out-new', message);
  const add = () => {
    if (!checked.ok) return;
    dispatch({ type: 'settings/keep-out-typed', region: checked.value });
    setX('');
    setY('');
    setR('');
  };
  const field = (label: string, text: string, set: (t: string) => void) => (
    <input className={`number${message === null ? '' : ' invalid'}`} aria-label={label} inputMode="decimal" value={text} onChange={(e) => set(e.target.value)} onKeyDown={(e) => e.key === 'Enter' && add()} />
  );
  return (
    <div className="keep-out-new">
      <div className="field-row">
        Add a circle: x {field('Keep-out circle, centre x (mm)', x, setX)} y {field('Keep-out circle, centre y (mm)', y, setY)} r {field('Keep-out circle, radius (mm)', r, setR)} mm
        <button type="button" disabled={!checked.ok} onClick={add}>
          Add keep-out circle
        </button>
      </div>
      {message !== null && (
        <span className="field-error" data-testid="field-error">
          {message}
        </span>
      )}
    </div>
  );
}

export function ConstraintFields({ constraints }: { constraints: SearchSettings['constraints'] }) {
  const dispatch = useDispatch();
  return (
    <fieldset>
      <legend>Constraints</legend>
      <label>
        <input type="checkbox" checked={constraints.fullTurnCrank} onChange={(e) => dispatch({ type: 'settings/full-turn', on: e.target.checked })} /> The crank turns fully
        (Grashof crank)
      </label>
      <div className="field-row">
        Minimum transmission angle{' '}
        <NumberInput
          value={constraints.minTransmissionDeg}
          label="Minimum transmission angle (degrees)"
          issueKey="min-transmission"
          check={checkMinTransmission}
          onCommit={(deg) => dispatch({ type: 'settings/min-transmission', deg })}
        />{' '}
        ° <span className="option-note">(empty: none)</span>
      </div>
      <MaxSizeField spans={constraints.maxSizeSpans} />
      <LinkLengthFields range={constraints.linkLengthMm} />
      <div className="keep-out-list">
        <p className="panel-note">Keep-out regions (no ground pivot inside): type a circle below, or draw one with the "Keep-out region" tool.</p>
        {constraints.keepOut.length > 0 && (
          <ul>
            {constraints.keepOut.map((k, i) => (
              <li key={i}>
                {i + 1}: centre ({formatValue(k.x)}, {formatValue(k.y)}) mm, radius {formatValue(k.r)} mm{' '}
                <button type="button" className="icon" aria-label={`Remove keep-out region ${i + 1}`} onClick={() => dispatch({ type: 'settings/keep-out-remove', index: i })}>
                  ×
                </button>
              </li>
            ))}
          </ul>
        )}
        <NewKeepOut />
      </div>
    </fieldset>
  );
}
