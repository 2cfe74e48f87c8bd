/**
 * The layout: one of the generic kinds, its pivots (mm, at full extension) in a table,
 * the six-bars' axle body and shock bodies, an optional floating brake, and what keeps the layout
 * from working through its travel, in words.
 */
import { memo, useState } from 'react';
import { MAX_PIVOT_COORDINATE_MM } from '../../core/io/suspensionFile';
import type { Linkage } from '../../core/linkage';
import {
  DEFAULT_SHOCK_BODIES,
  LAYOUT_KINDS,
  LAYOUT_NAMES,
  LAYOUT_PIVOTS,
  SHOCK_END_BODIES,
  SIX_BAR_BODIES,
  hasBodyChoice,
  shockBodiesIssue,
  type LayoutKind,
  type ShockEndBody,
  type SixBarBody,
} from '../../core/suspension';
import { useSuspension, useSuspensionDispatch } from './store';
import { pivotLabel } from './labels';
import { PickButton } from './trace';

/** The six-bars' bodies in words. */
const BODY_WORDS: Readonly<Record<ShockEndBody, string>> = {
  chainStay: 'chain stay',
  seatStay: 'seat stay',
  rocker: 'rocker',
  link: 'link',
  bellCrank: 'bell crank',
  frontFrame: 'front frame',
};
const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/** One coordinate: kept as typed until it reads as a number within the accepted range. */
function CoordinateCell({ value, label, onCommit }: { value: number; label: string; onCommit: (v: number) => void }) {
  const [text, setText] = useState(String(value));
  const [issue, setIssue] = useState<string | null>(null);
  const [seen, setSeen] = useState(value);
  if (seen !== value) {
    // A drag on the side view moved the pivot: the cell follows, unless it already reads as that value ("12." while typing 12.5).
    setSeen(value);
    if (!(NUMBER_TEXT.test(text.trim()) && Number(text) === value)) {
      setText(String(value));
      setIssue(null);
    }
  }
  const change = (next: string) => {
    setText(next);
    const t = next.trim();
    if (!NUMBER_TEXT.test(t)) {
      setIssue(t === '' ? 'empty; expected a number of mm' : `"${t}" is not a number of mm`);
      return;
    }
    const v = Number(t);
    if (!(Math.abs(v) <= MAX_PIVOT_COORDINATE_MM)) {
      setIssue(`${t} mm is farther than ${MAX_PIVOT_COORDINATE_MM} mm from the bottom bracket`);
      return;
    }
    setIssue(null);
    onCommit(v);
  };
  return (
    <td>
      <input type="text" inputMode="decimal" aria-label={label} value={text} aria-invalid={issue !== null} onChange={(e) => change(e.target.value)} />
      {issue !== null && <span className="susp-issue" role="alert">{issue}</span>}
    </td>
  );
}

export const LayoutPanel = memo(function LayoutPanel({ linkage, problem }: { linkage: Linkage | null; problem: string | null }) {
  const dispatch = useSuspensionDispatch();
  const layout = useSuspension((s) => s.layout);
  const names = LAYOUT_PIVOTS[layout.kind];
  const movingBodies = linkage?.bodies.map((b) => b.id) ?? [];
  const shock = layout.shock ?? DEFAULT_SHOCK_BODIES;
  const shockIssue = shockBodiesIssue(shock);
  return (
    <section className="panel susp-panel" aria-labelledby="susp-layout-title" data-testid="layout-panel">
      <h2 id="susp-layout-title">Layout</h2>
      <div className="susp-field susp-field-wide">
        <label htmlFor="susp-layout-kind">Layout kind</label>
        <select id="susp-layout-kind" value={layout.kind} onChange={(e) => dispatch({ type: 'layoutKind', kind: e.target.value as LayoutKind })}>
          {LAYOUT_KINDS.map((k) => <option key={k} value={k}>{LAYOUT_NAMES[k]}</option>)}
        </select>
      </div>
      {hasBodyChoice(layout.kind) && (
        <>
          <div className="susp-field susp-field-wide">
            <label htmlFor="susp-axle-body">Axle on</label>
            <select id="susp-axle-body" value={layout.axleBody} onChange={(e) => dispatch({ type: 'axleBody', body: e.target.value as SixBarBody })}>
              {SIX_BAR_BODIES.map((b) => <option key={b} value={b}>{BODY_WORDS[b]}</option>)}
            </select>
          </div>
          <fieldset className="susp-field susp-field-wide" data-testid="shock-bodies">
            <legend>Shock between</legend>
            <label htmlFor="susp-shock-eye-body">the shock eye on</label>
            <select id="susp-shock-eye-body" value={shock.eye} onChange={(e) => dispatch({ type: 'shockBodies', shock: { ...shock, eye: e.target.value as SixBarBody } })}>
              {SIX_BAR_BODIES.map((b) => <option key={b} value={b}>{BODY_WORDS[b]}</option>)}
            </select>
            <label htmlFor="susp-shock-frame-eye-body">and the other eye on</label>
            <select
              id="susp-shock-frame-eye-body"
              value={shock.frameEye}
              onChange={(e) => dispatch({ type: 'shockBodies', shock: { ...shock, frameEye: e.target.value as ShockEndBody } })}
            >
              {SHOCK_END_BODIES.map((b) => <option key={b} value={b}>{BODY_WORDS[b]}</option>)}
            </select>
            {shockIssue !== null && <span className="susp-issue" role="alert">{shockIssue}</span>}
          </fieldset>
        </>
      )}
      <div className="susp-field susp-field-wide">
        <label htmlFor="susp-brake-body">Brake caliper on</label>
        <select
          id="susp-brake-body"
          value={layout.floatingBrakeBody ?? ''}
          onChange={(e) => dispatch({ type: 'floatingBrake', body: e.target.value === '' ? null : e.target.value })}
        >
          <option value="">the axle-carrying body only</option>
          {movingBodies.map((b) => <option key={b} value={b}>{`also a floating brake on ${b}`}</option>)}
        </select>
      </div>
      <table className="susp-pivots" data-testid="pivot-table">
        <caption>Pivots at full extension (drag them on the side view at 0 mm travel)</caption>
        <thead>
          <tr><th scope="col">pivot</th><th scope="col">x (mm)</th><th scope="col">y (mm)</th></tr>
        </thead>
        <tbody>
          {names.map((name) => {
            const p = layout.pivots[name];
            return (
              <tr key={`${layout.kind}-${name}`}>
                <th scope="row">{pivotLabel(name)} <PickButton target={{ kind: 'pivot', name }} what={`the ${pivotLabel(name)}`} /></th>
                <CoordinateCell value={p.x} label={`${pivotLabel(name)} x (mm)`} onCommit={(x) => dispatch({ type: 'pivot', name, at: { x, y: p.y } })} />
                <CoordinateCell value={p.y} label={`${pivotLabel(name)} y (mm)`} onCommit={(y) => dispatch({ type: 'pivot', name, at: { x: p.x, y } })} />
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="susp-note">The rear axle is the bicycle’s rear axle at full extension; the shock’s eyes must lie its eye-to-eye length apart.</p>
      {problem !== null && (
        <p className="susp-problem" role="alert" data-testid="layout-problem">
          <strong>The layout does not work through its travel.</strong> {problem}
        </p>
      )}
    </section>
  );
});
