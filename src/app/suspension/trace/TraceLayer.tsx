/**
 * The traced image under the side view, placed in bicycle mm by its calibration (before
 * it, fitted into the view, only to click on). While calibrating or picking, a click on
 * the image is read in the image's own pixels (its screen matrix inverted), so the
 * drawing's frame cannot shift what a click means.
 */
import type { ScaleLinear } from 'd3';
import { memo, useRef, type MouseEvent } from 'react';
import { useSuspension, useSuspensionDispatch } from '../store';
import { axleReading, pickResult } from './pick';
import { fitPlacement, pixelToBicycleMm, placementMatrix, type PixelPoint } from './placement';
import { dispatchTrace, useTrace } from './traceStore';

type Scale = ScaleLinear<number, number>;

export const TraceLayer = memo(function TraceLayer({ x, y, widthPx, heightPx }: { x: Scale; y: Scale; widthPx: number; heightPx: number }) {
  const image = useTrace((s) => s.image);
  const url = useTrace((s) => s.url);
  const placement = useTrace((s) => s.placement);
  const opacity = useTrace((s) => s.opacity);
  const hidden = useTrace((s) => s.hidden);
  const mode = useTrace((s) => s.mode);
  const draft = useSuspension((s) => s.draft);
  const dispatch = useSuspensionDispatch();
  const imageRef = useRef<SVGImageElement | null>(null);
  if (image === null || url === null || hidden) return null;

  const shown = placement ?? fitPlacement(image.widthPx, image.heightPx, { minX: x.invert(0), maxX: x.invert(widthPx), minY: y.invert(heightPx), maxY: y.invert(0) });
  const m = placementMatrix(shown, x(0), y(0), x(1) - x(0));
  const toScreen = (p: PixelPoint) => ({ sx: m[0] * p.u + m[2] * p.v + m[4], sy: m[1] * p.u + m[3] * p.v + m[5] });

  const onClick = (event: MouseEvent<SVGImageElement>) => {
    if (mode.kind === 'idle') return;
    const ctm = imageRef.current?.getScreenCTM();
    if (ctm === null || ctm === undefined) return;
    const local = new DOMPoint(event.clientX, event.clientY).matrixTransform(ctm.inverse());
    const at: PixelPoint = { u: local.x, v: local.y };
    if (mode.kind === 'calibrate') {
      dispatchTrace({ type: 'mark', at, axle: axleReading(draft) });
      return;
    }
    if (placement === null) return;
    const screenPxPerImagePx = Math.hypot(ctm.a, ctm.b);
    const picked = pickResult(mode.target, pixelToBicycleMm(placement, at), draft, placement.mmPerPx / screenPxPerImagePx);
    for (const action of picked.actions) dispatch(action);
    dispatchTrace({ type: 'picked', notice: picked.notice });
  };

  const marks = mode.kind === 'calibrate' ? mode.marks : [];
  return (
    <g className="trace-layer" data-trace-mode={mode.kind}>
      <image
        ref={imageRef}
        href={url}
        x={0}
        y={0}
        width={image.widthPx}
        height={image.heightPx}
        transform={`matrix(${m.join(' ')})`}
        opacity={opacity}
        preserveAspectRatio="none"
        data-testid="trace-image"
        onClick={onClick}
      />
      {marks.map((p, i) => {
        const { sx, sy } = toScreen(p);
        return (
          <g key={i} className="trace-mark" transform={`translate(${sx},${sy})`} data-testid="trace-mark">
            <path d="M-9,0H9M0,-9V9" />
            <text x={7} y={-7}>{i === 0 ? 'bottom bracket' : 'second point'}</text>
          </g>
        );
      })}
    </g>
  );
});
