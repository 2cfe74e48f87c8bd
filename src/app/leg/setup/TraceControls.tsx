/**
 * Tracing the foot trajectory over an image: load it (PNG, JPEG or WebP, checked by its
 * first bytes), calibrate it by clicking two of its points and typing where they are in
 * mm, show or hide it. The image stays for this page only (the project keeps the points
 * traced, not the image); what went wrong is said beside the buttons.
 */
import { useState } from 'react';
import { MAX_IMAGE_BYTES, imageSize } from '../../target/BackgroundControls';
import { SIGNATURE_BYTES, TRACE_IMAGE_FORMATS, traceFileProblem } from '../../suspension/trace/imageFile';
import { placementFromPairs, type PixelPoint } from '../../suspension/trace/placement';
import type { TraceImage } from './traceImage';

export type CalibrationStep = { readonly marks: readonly PixelPoint[] } | null;

export function TraceControls({ image, onImage, calibrating, onCalibrating, hidden, onHidden }: {
  image: TraceImage | null;
  onImage: (image: TraceImage | null) => void;
  /** The calibration clicks so far, or null when not calibrating. */
  calibrating: CalibrationStep;
  onCalibrating: (step: CalibrationStep) => void;
  hidden: boolean;
  onHidden: (hidden: boolean) => void;
}) {
  const [note, setNote] = useState<string | null>(null);
  const [known, setKnown] = useState({ x1: '', y1: '', x2: '', y2: '' });
  const load = async (file: File) => {
    const head = new Uint8Array(await file.slice(0, SIGNATURE_BYTES).arrayBuffer());
    const problem = traceFileProblem(file.size, head, MAX_IMAGE_BYTES);
    if (problem !== null) return setNote(`Could not load ${file.name}: ${problem}.`);
    let size: { width: number; height: number };
    try {
      size = await imageSize(file);
    } catch {
      return setNote(`Could not load ${file.name}: this browser could not decode it (a damaged or cut-short file?).`);
    }
    if (image !== null) URL.revokeObjectURL(image.url);
    onImage({ url: URL.createObjectURL(file), name: file.name, widthPx: size.width, heightPx: size.height, placement: null });
    onCalibrating(null);
    setNote(`${file.name} is shown for this page only; calibrate it before tracing so the points are in mm.`);
  };
  const marks = calibrating?.marks ?? [];
  const setScale = () => {
    if (image === null || marks.length < 2) return;
    const v = [known.x1, known.y1, known.x2, known.y2].map((t) => (t.trim() === '' ? NaN : Number(t)));
    if (!v.every(Number.isFinite)) return setNote('Type both points\u2019 x and y in mm before setting the scale.');
    const placed = placementFromPairs(marks[0], { x: v[0], y: v[1] }, marks[1], { x: v[2], y: v[3] });
    if (!placed.ok) return setNote(`Not calibrated: ${placed.reason}.`);
    onImage({ ...image, placement: placed.placement });
    onCalibrating(null);
    setNote(`Calibrated: ${(1 / placed.placement.mmPerPx).toPrecision(4)} px per mm. Tick "Click to add points" and click along the foot path.`);
  };
  return (
    <div className="legws-trace" data-testid="leg-trace">
      <label>
        Trace over an image ({TRACE_IMAGE_FORMATS.join(', ')}){' '}
        <input type="file" accept="image/png,image/jpeg,image/webp" onChange={(e) => { const f = e.target.files?.[0]; if (f !== undefined) void load(f); e.target.value = ''; }} />
      </label>
      {image !== null && (
        <div className="legws-row">
          <button type="button" onClick={() => onCalibrating(calibrating === null ? { marks: [] } : null)}>{calibrating === null ? 'Calibrate: click two points of the image' : 'Cancel calibration'}</button>
          <label><input type="checkbox" checked={hidden} onChange={(e) => onHidden(e.target.checked)} /> Hide the image</label>
          <button type="button" onClick={() => { URL.revokeObjectURL(image.url); onImage(null); onCalibrating(null); setNote(null); }}>Remove the image</button>
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
      {note !== null && <p className="susp-note" role="status">{note}</p>}
    </div>
  );
}
