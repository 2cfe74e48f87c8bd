/**
 * The traced image's controls under the side view: load (PNG, JPEG, WebP), calibrate in
 * bicycle coordinates (the bottom-bracket centre, then the rear axle as the panel gives it,
 * or a second point a typed distance away), opacity, hide, remove; what went wrong is said
 * beside the calibrate button.
 */
import { memo, useEffect, useState } from 'react';
import { TRACE_IMAGE_FORMATS } from './imageFile';
import { pivotLabel } from '../labels';
import type { CalibrationMethod, PickTarget } from './traceState';
import { dispatchTrace, loadTraceFile, removeTrace, startTrace, useTrace } from './traceStore';

const METHOD_TEXT: Readonly<Record<CalibrationMethod, string>> = {
  bottomBracketAxle: 'bottom bracket + rear axle (scale and tilt)',
  distance: 'bottom bracket + a known distance (level image)',
};

function targetText(t: PickTarget): string {
  return t.kind === 'rearAxle' ? 'the rear axle centre' : t.kind === 'frontContact' ? 'the front tyre’s contact point' : `the ${pivotLabel(t.name)}`;
}

function prompt(method: CalibrationMethod, marks: number): string {
  if (marks === 0) return 'Click the bottom-bracket centre on the image.';
  if (method === 'bottomBracketAxle') return 'Now click the rear axle centre: it is placed at the rear axle x, y the bicycle panel holds.';
  return marks === 1 ? 'Now click a second point whose distance from the bottom bracket you know.' : 'Type that distance and set the scale.';
}

export const TraceControls = memo(function TraceControls() {
  const image = useTrace((s) => s.image);
  const url = useTrace((s) => s.url);
  const placement = useTrace((s) => s.placement);
  const method = useTrace((s) => s.method);
  const opacity = useTrace((s) => s.opacity);
  const hidden = useTrace((s) => s.hidden);
  const mode = useTrace((s) => s.mode);
  const notice = useTrace((s) => s.notice);
  const pickNotice = useTrace((s) => s.pickNotice);
  const [distance, setDistance] = useState('');

  useEffect(startTrace, []);
  const active = mode.kind !== 'idle';
  useEffect(() => {
    if (!active) return undefined;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') dispatchTrace({ type: 'cancel' });
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [active]);

  const marks = mode.kind === 'calibrate' ? mode.marks.length : 0;
  const usable = image !== null && url !== null && !hidden;
  return (
    <div className="trace-controls" data-testid="trace-controls">
      <div className="trace-row">
        <span className="trace-title">Trace over an image</span>
        <label className="file-button">
          {image === null ? 'Load image…' : 'Replace image…'}
          <input
            type="file"
            accept="image/png,image/jpeg,image/webp"
            aria-label={`Image to trace over (${TRACE_IMAGE_FORMATS.join(', ')})`}
            data-testid="trace-file-input"
            onChange={(e) => {
              const file = e.target.files?.[0];
              e.target.value = '';
              if (file !== undefined) void loadTraceFile(file);
            }}
          />
        </label>
        {image !== null && (
          <>
            <label>
              <input type="checkbox" checked={hidden} onChange={(e) => dispatchTrace({ type: 'hidden', hidden: e.target.checked })} /> Hide image
            </label>
            <label>
              Opacity{' '}
              <input
                type="range"
                min={0.1}
                max={1}
                step={0.05}
                value={opacity}
                aria-label="Traced image opacity"
                onChange={(e) => dispatchTrace({ type: 'opacity', opacity: Number(e.target.value) })}
              />
            </label>
            <button type="button" onClick={() => void removeTrace()}>Remove image</button>
          </>
        )}
      </div>
      {image !== null && (
        <p className="susp-note" data-testid="trace-status">
          {`${image.name}: ${image.widthPx} × ${image.heightPx} px, `}
          {placement === null ? 'not calibrated (the pick buttons appear once it is)' : `calibrated, ${placement.mmPerPx.toPrecision(4)} mm per image pixel`}.
        </p>
      )}
      {image !== null && (
        <div className="trace-row trace-calibrate">
          <label>
            Calibrate by{' '}
            <select value={method} onChange={(e) => dispatchTrace({ type: 'method', method: e.target.value as CalibrationMethod })} aria-label="Calibration method">
              {(Object.keys(METHOD_TEXT) as CalibrationMethod[]).map((m) => <option key={m} value={m}>{METHOD_TEXT[m]}</option>)}
            </select>
          </label>
          <button
            type="button"
            disabled={!usable}
            title={usable ? undefined : 'Show the image (and load it again if it is missing) to calibrate it'}
            aria-pressed={mode.kind === 'calibrate'}
            onClick={() => dispatchTrace(mode.kind === 'calibrate' ? { type: 'cancel' } : { type: 'calibrate' })}
          >
            {mode.kind === 'calibrate' ? 'Stop calibrating' : placement === null ? 'Calibrate image' : 'Calibrate again'}
          </button>
          {method === 'distance' && mode.kind === 'calibrate' && (
            <>
              <label>
                Distance{' '}
                <input type="text" inputMode="decimal" value={distance} onChange={(e) => setDistance(e.target.value)} aria-label="Distance from the bottom bracket to the second point (mm)" /> mm
              </label>
              <button type="button" disabled={marks < 2} onClick={() => dispatchTrace({ type: 'distance', text: distance })}>Set scale</button>
            </>
          )}
          {notice !== null && (
            <span className={`trace-notice trace-notice-${notice.kind}`} role={notice.kind === 'error' ? 'alert' : 'status'} data-testid="trace-notice">{notice.text}</span>
          )}
        </div>
      )}
      {image === null && notice !== null && (
        <p className={`trace-notice trace-notice-${notice.kind}`} role={notice.kind === 'error' ? 'alert' : 'status'} data-testid="trace-notice">{notice.text}</p>
      )}
      {mode.kind === 'calibrate' && <p className="trace-prompt" role="status" data-testid="trace-prompt">{prompt(method, marks)} Esc stops.</p>}
      {mode.kind === 'pick' && <p className="trace-prompt" role="status" data-testid="trace-prompt">{`Click ${targetText(mode.target)} on the image. Esc stops.`}</p>}
      {pickNotice !== null && mode.kind !== 'pick' && (
        <p className={`trace-notice trace-notice-${pickNotice.kind}`} role={pickNotice.kind === 'error' ? 'alert' : 'status'} data-testid="trace-pick-notice">{pickNotice.text}</p>
      )}
    </div>
  );
});
