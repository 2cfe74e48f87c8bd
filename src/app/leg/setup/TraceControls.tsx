/**
 * Tracing the foot trajectory over an image: load it (PNG, JPEG or WebP, checked by its
 * first bytes), calibrate it by clicking two of its points and typing where they are in
 * mm, show or hide it. The image and its calibration are kept with the project
 * (traceStore.ts); what went wrong is said beside the buttons.
 */
import { useEffect, useState } from 'react';
import { TRACE_IMAGE_FORMATS } from '../../suspension/trace/imageFile';
import { placementFromPairs, type PixelPoint } from '../../suspension/trace/placement';
import { hideLegTrace, loadLegTraceFile, placeLegTrace, removeLegTrace, startLegTrace, useLegTrace } from './traceStore';

export type CalibrationStep = { readonly marks: readonly PixelPoint[] } | null;

export function TraceControls({ calibrating, onCalibrating }: {
  /** The calibration clicks so far, or null when not calibrating. */
  calibrating: CalibrationStep;
  onCalibrating: (step: CalibrationStep) => void;
}) {
  useEffect(startLegTrace, []);
  const image = useLegTrace((s) => s.image);
  const hidden = useLegTrace((s) => s.hidden);
  const notice = useLegTrace((s) => s.notice);
  const [note, setNote] = useState<string | null>(null);
  const [known, setKnown] = useState({ x1: '', y1: '', x2: '', y2: '' });
  const marks = calibrating?.marks ?? [];
  const setScale = () => {
    if (image === null || marks.length < 2) return;
    const v = [known.x1, known.y1, known.x2, known.y2].map((t) => (t.trim() === '' ? NaN : Number(t)));
    if (!v.every(Number.isFinite)) return setNote('Type both points\u2019 x and y in mm before setting the scale.');
    const placed = placementFromPairs(marks[0], { x: v[0], y: v[1] }, marks[1], { x: v[2], y: v[3] });
    if (!placed.ok) return setNote(`Not calibrated: ${placed.reason}.`);
    onCalibrating(null);
    setNote(null);
    placeLegTrace(placed.placement, `Calibrated: ${(1 / placed.placement.mmPerPx).toPrecision(4)} px per mm. Tick "Click to add points" and click along the foot path.`);
  };
  const shown = note ?? notice;
  return (
    <div className="legws-trace" data-testid="leg-trace">
      <label>
        Trace over an image ({TRACE_IMAGE_FORMATS.join(', ')}){' '}
        <input type="file" accept="image/png,image/jpeg,image/webp" onChange={(e) => { const f = e.target.files?.[0]; if (f !== undefined) { setNote(null); onCalibrating(null); void loadLegTraceFile(f); } e.target.value = ''; }} />
      </label>
      {image !== null && (
        <div className="legws-row">
          <button type="button" onClick={() => onCalibrating(calibrating === null ? { marks: [] } : null)} disabled={image.url === null}>{calibrating === null ? 'Calibrate: click two points of the image' : 'Cancel calibration'}</button>
          <label><input type="checkbox" checked={hidden} onChange={(e) => hideLegTrace(e.target.checked)} /> Hide the image</label>
          <button type="button" onClick={() => { onCalibrating(null); setNote(null); void removeLegTrace(); }}>Remove the image</button>
        </div>
      )}
      {calibrating !== null && (
        <div className="legws-row" data-testid="leg-trace-calibration">
          <span className="susp-hint">{marks.length < 2 ? `Click point ${marks.length + 1} of 2 on the image.` : 'Type where the two points are, in mm, then set the scale.'}</span>
          {marks.length >= 2 && (
            <>
              {(['x1', 'y1', 'x2', 'y2'] as const).map((k) => (
                <label key={k}>{`Image point ${k[1]} ${k[0]} (mm) `}<input type="text" inputMode="decimal" size={6} value={known[k]} onChange={(e) => setKnown({ ...known, [k]: e.target.value })} /></label>
              ))}
              <button type="button" onClick={setScale}>Set the scale</button>
            </>
          )}
        </div>
      )}
      {shown !== null && <p className="susp-note" role="status" data-testid="leg-trace-notice">{shown}</p>}
    </div>
  );
}
