/**
 * The background image: load a side view, sketch or photo from a local file, calibrate
 * its scale with two clicked points and the distance between them in mm, then trace
 * over it with the point tool.
 */
import { memo, useState } from 'react';
import { useServices } from '../services';
import { useDispatch, useWorkspace } from '../state/store';
import { dropImagesExcept, putImage } from '../storage';

/** An image larger than this is refused (bytes); a photo for tracing needs far less. */
export const MAX_IMAGE_BYTES = 20_000_000;
/** A new image is first shown this wide, mm, until it is calibrated. */
const FIRST_WIDTH_MM = 200;

export function imageSize(blob: Blob): Promise<{ width: number; height: number }> {
  return createImageBitmap(blob).then((bitmap) => {
    const size = { width: bitmap.width, height: bitmap.height };
    bitmap.close();
    return size;
  });
}

export const BackgroundControls = memo(function BackgroundControls() {
  const { db } = useServices();
  const dispatch = useDispatch();
  const background = useWorkspace((s) => s.project.target.background);
  const tool = useWorkspace((s) => s.ui.tool);
  const marks = useWorkspace((s) => s.ui.calibration);
  const notice = useWorkspace((s) => s.ui.targetNotice);
  const [distance, setDistance] = useState('100');
  // What is wrong with the calibration, beside its button: the typed distance, or what the calibration itself refused.
  const typedMm = Number(distance.replace(',', '.'));
  const distanceIssue = distance.trim() === ''
    ? 'Enter the distance between A and B, in mm.'
    : !(Number.isFinite(typedMm) && typedMm > 0) ? `"${distance}" is not a distance; expected a number of mm above 0.` : null;
  const refused = notice !== null && notice.kind === 'error' && /calibrat/i.test(notice.title) ? `${notice.title}: ${notice.lines.join(' ')}` : null;
  const calibrationIssue = distanceIssue ?? refused;

  const load = async (file: File) => {
    const fail = (message: string) => dispatch({ type: 'target/notice', notice: { kind: 'error', title: `Could not load image ${file.name}`, lines: [message] } });
    if (file.size > MAX_IMAGE_BYTES) return fail(`the file is ${Math.round(file.size / 1e6)} MB; an image may be at most ${MAX_IMAGE_BYTES / 1e6} MB`);
    let size;
    try {
      size = await imageSize(file);
    } catch {
      return fail('the file is not an image this browser can read (PNG, JPEG, WebP, GIF, SVG)');
    }
    const imageId = `image-${crypto.randomUUID()}`;
    await putImage(db, imageId, file.name, file);
    await dropImagesExcept(db, imageId).catch(() => {});
    const mmPerPx = FIRST_WIDTH_MM / size.width;
    dispatch({
      type: 'background/set',
      background: { imageId, name: file.name, widthPx: size.width, heightPx: size.height, leftMm: 0, topMm: size.height * mmPerPx, mmPerPx, opacity: 0.6, calibrated: false },
    });
    dispatch({ type: 'ui/tool', tool: 'calibrate' });
  };

  return (
    <details className="background-controls" open={background !== null}>
      <summary>Background image (trace a drawing or photo)</summary>
      <div className="row-actions">
        <label className="file-button">
          {background === null ? 'Load image…' : 'Replace image…'}
          <input
            type="file"
            accept="image/*"
            onChange={(e) => {
              const file = e.target.files?.[0];
              e.target.value = '';
              if (file !== undefined) void load(file);
            }}
          />
        </label>
        {background !== null && (
          <button type="button" onClick={() => dispatch({ type: 'background/set', background: null })}>
            Remove image
          </button>
        )}
      </div>
      {background !== null && (
        <>
          <p className="panel-note">
            {background.name}: {background.widthPx} × {background.heightPx} px, {(background.widthPx * background.mmPerPx).toFixed(1)} mm wide
            {background.calibrated ? ' (calibrated)' : ' (not calibrated yet: the scale is a guess)'}.
          </p>
          <label className="field-row">
            Opacity{' '}
            <input
              type="range"
              min={0.1}
              max={1}
              step={0.05}
              value={background.opacity}
              onChange={(e) => dispatch({ type: 'background/update', patch: { opacity: Number(e.target.value) } })}
            />
          </label>
          <div className="calibrate">
            <p className="panel-note">
              {tool !== 'calibrate'
                ? 'To set the scale, choose "Calibrate image" above the drawing and click two points a known distance apart.'
                : marks.length < 2
                  ? `Click point ${marks.length === 0 ? 'A' : 'B'} on the image.`
                  : 'Both points picked: enter their distance.'}
            </p>
            <label>
              Distance A–B{' '}
              <input
                type="text"
                inputMode="decimal"
                value={distance}
                onChange={(e) => setDistance(e.target.value)}
                aria-label="Known distance between calibration points (mm)"
                aria-invalid={distanceIssue !== null}
                aria-describedby={calibrationIssue === null ? undefined : 'calibration-issue'}
              /> mm
            </label>{' '}
            <button type="button" disabled={marks.length < 2 || distanceIssue !== null} onClick={() => dispatch({ type: 'background/calibrate', distanceMm: typedMm })}>
              Set scale
            </button>
            {calibrationIssue !== null && (
              <span className="field-error" id="calibration-issue" role="alert" data-testid="calibration-issue">{calibrationIssue}</span>
            )}
          </div>
        </>
      )}
    </details>
  );
});
