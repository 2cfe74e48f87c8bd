/**
 * The target drawing: an SVG in mm (d3 scales, d3 zoom for wheel zoom and drag pan).
 * With the point tool a click places a point, a drag moves one, and Delete removes the
 * selected one; the calibrate tool picks two points on the background image; the
 * keep-out tool drags out a circle no pivot may enter.
 */
import { select, zoom, zoomIdentity, type ZoomBehavior, type ZoomTransform } from 'd3';
import { useEffect, useMemo, useRef, useState } from 'react';
import { isLocked, type KeepOutRegion } from '../state/project';
import type { Tool } from '../state/reducer';
import { useDispatch, useWorkspace } from '../state/store';
import { targetExtent } from '../state/target';
import type { PositionRegion } from '../settings/boundRegions';
import { BoundsLayer, CalibrationLayer, GridLayer, ImageLayer, KeepOutLayer, PathLayer, PointsLayer } from './DrawingLayers';
import { useImageUrl } from './useImageUrl';
import { fitFrame, mergeExtents, type Extent } from './viewFrame';

const HEIGHT_PX = 440;
const TOOLS: readonly { tool: Tool; label: string; hint: string }[] = [
  { tool: 'point', label: 'Points', hint: 'Click to place a point, drag one to move it, Delete removes the selected point. Wheel zooms, drag pans.' },
  { tool: 'calibrate', label: 'Calibrate image', hint: 'Click two points on the image whose distance you know, then enter it beside the image controls.' },
  { tool: 'keep-out', label: 'Keep-out region', hint: 'Drag from the centre out to draw a circle that no ground pivot may enter.' },
];

function keepOutExtent(regions: readonly KeepOutRegion[]): Extent | null {
  if (regions.length === 0) return null;
  return {
    minX: Math.min(...regions.map((r) => r.x - r.r)),
    maxX: Math.max(...regions.map((r) => r.x + r.r)),
    minY: Math.min(...regions.map((r) => r.y - r.r)),
    maxY: Math.max(...regions.map((r) => r.y + r.r)),
  };
}

/** The bound regions drawn (where a family's ground pivots may be), mm; infinite edges are left out. */
function regionsExtent(regions: readonly PositionRegion[]): Extent | null {
  let extent: Extent | null = null;
  for (const r of regions) {
    if (![r.minX, r.maxX, r.minY, r.maxY].every(Number.isFinite)) continue;
    extent = mergeExtents(extent, { minX: r.minX, maxX: r.maxX, minY: r.minY, maxY: r.maxY });
  }
  return extent;
}

function useWidth(ref: React.RefObject<HTMLElement | null>): number {
  const [width, setWidth] = useState(640);
  useEffect(() => {
    const el = ref.current;
    if (el === null) return;
    const observer = new ResizeObserver((entries) => setWidth(Math.max(200, Math.round(entries[0].contentRect.width))));
    observer.observe(el);
    return () => observer.disconnect();
  }, [ref]);
  return width;
}

export function TargetDrawing({ regions }: { regions: readonly PositionRegion[] }) {
  const dispatch = useDispatch();
  const target = useWorkspace((s) => s.project.target);
  const keepOut = useWorkspace((s) => s.project.settings.constraints.keepOut);
  const tool = useWorkspace((s) => s.ui.tool);
  const selected = useWorkspace((s) => s.ui.selectedPoint);
  const calibration = useWorkspace((s) => s.ui.calibration);
  const locked = useWorkspace((s) => isLocked(s.project.run.status));
  const imageUrl = useImageUrl(target.background?.imageId ?? null);

  const boxRef = useRef<HTMLDivElement>(null);
  const svgRef = useRef<SVGSVGElement>(null);
  const zoomRef = useRef<ZoomBehavior<SVGSVGElement, unknown> | null>(null);
  const toolRef = useRef(tool);
  useEffect(() => {
    toolRef.current = tool;
  }, [tool]);
  const width = useWidth(boxRef);
  const [transform, setTransform] = useState<ZoomTransform>(zoomIdentity);
  const [drag, setDrag] = useState<{ index: number; moved: boolean } | null>(null);
  const [draft, setDraft] = useState<KeepOutRegion | null>(null);

  // The frame is fitted when asked (a new target, "Fit view", a resize), not on every edit, so the view does not jump under the mouse.
  const fitRequest = useWorkspace((s) => s.ui.fitRequest);
  const fitKey = `${fitRequest}:${width}`;
  // Fit shows all that is drawn: the target and its image, the bound regions and the keep-out circles.
  const extentNow = mergeExtents(mergeExtents(targetExtent(target), keepOutExtent(keepOut)), regionsExtent(regions));
  const [fitted, setFitted] = useState({ key: fitKey, extent: extentNow });
  if (fitted.key !== fitKey) setFitted({ key: fitKey, extent: extentNow });
  useEffect(() => {
    const svg = svgRef.current;
    if (svg !== null && zoomRef.current !== null) select(svg).call(zoomRef.current.transform, zoomIdentity);
  }, [fitRequest]);
  const frame = useMemo(() => fitFrame(fitted.extent, width, HEIGHT_PX), [fitted.extent, width]);
  const zx = transform.rescaleX(frame.x);
  const zy = transform.rescaleY(frame.y);

  useEffect(() => {
    const svg = svgRef.current;
    if (svg === null) return;
    const behaviour = zoom<SVGSVGElement, unknown>()
      .scaleExtent([0.02, 500])
      // A hand moves a pixel or two between press and release: that is still a click (a calibration or a point), not a pan.
      .clickDistance(4)
      .filter((event: Event) => {
        if (event.type === 'wheel') return true;
        const e = event as MouseEvent;
        if (e.ctrlKey || e.button !== 0) return false;
        if ((e.target as Element).closest('[data-drag]') !== null) return false;
        return toolRef.current !== 'keep-out';
      })
      .on('zoom', (event: { transform: ZoomTransform }) => setTransform(event.transform));
    select(svg).call(behaviour);
    zoomRef.current = behaviour;
    return () => {
      select(svg).on('.zoom', null);
    };
  }, []);

  const fitView = () => dispatch({ type: 'ui/fit' });

  const toWorld = (clientX: number, clientY: number) => {
    const rect = (svgRef.current as SVGSVGElement).getBoundingClientRect();
    return { x: zx.invert(clientX - rect.left), y: zy.invert(clientY - rect.top) };
  };

  const onBackgroundClick = (event: React.MouseEvent) => {
    // A click that ends a point drag, or lands on a point, is not a new point.
    if (event.defaultPrevented || (event.target as Element).closest('[data-drag]') !== null) return;
    const at = toWorld(event.clientX, event.clientY);
    if (tool === 'point') {
      if (locked) return;
      dispatch({ type: 'target/add', x: at.x, y: at.y });
    } else if (tool === 'calibrate') {
      dispatch({ type: 'ui/calibration-point', x: at.x, y: at.y });
    }
  };

  const onPointPointerDown = (index: number, event: React.PointerEvent<SVGCircleElement>) => {
    if (tool !== 'point') return;
    event.stopPropagation();
    dispatch({ type: 'ui/select', index });
    if (locked) return;
    event.currentTarget.setPointerCapture(event.pointerId);
    setDrag({ index, moved: false });
  };

  const onPointerDown = (event: React.PointerEvent<SVGSVGElement>) => {
    if (tool !== 'keep-out' || event.button !== 0 || locked) return;
    const at = toWorld(event.clientX, event.clientY);
    event.currentTarget.setPointerCapture(event.pointerId);
    setDraft({ x: at.x, y: at.y, r: 0 });
  };

  const onPointerMove = (event: React.PointerEvent<SVGSVGElement>) => {
    if (drag !== null) {
      const at = toWorld(event.clientX, event.clientY);
      dispatch({ type: 'target/move', index: drag.index, x: at.x, y: at.y });
      if (!drag.moved) setDrag({ ...drag, moved: true });
    } else if (draft !== null) {
      const at = toWorld(event.clientX, event.clientY);
      setDraft({ ...draft, r: Math.hypot(at.x - draft.x, at.y - draft.y) });
    }
  };

  const onPointerUp = () => {
    if (drag !== null) setDrag(null);
    if (draft !== null) {
      if (draft.r > 0.5) dispatch({ type: 'settings/keep-out-add', region: draft });
      setDraft(null);
    }
  };

  const onKeyDown = (event: React.KeyboardEvent) => {
    if ((event.key === 'Delete' || event.key === 'Backspace') && selected !== null && !locked) {
      event.preventDefault();
      dispatch({ type: 'target/delete', index: selected });
    } else if (event.key === 'Escape') dispatch({ type: 'ui/select', index: null });
  };

  const hint = TOOLS.find((t) => t.tool === tool)?.hint ?? '';
  return (
    <section className="drawing panel" aria-label="Target drawing">
      <div className="drawing-toolbar" role="toolbar" aria-label="Drawing tools">
        {TOOLS.map((t) => (
          <button key={t.tool} type="button" aria-pressed={tool === t.tool} onClick={() => dispatch({ type: 'ui/tool', tool: t.tool })}>
            {t.label}
          </button>
        ))}
        <button type="button" onClick={fitView}>
          Fit view
        </button>
        <button type="button" disabled={selected === null || locked} onClick={() => selected !== null && dispatch({ type: 'target/delete', index: selected })}>
          Delete point{selected === null ? '' : ` ${selected + 1}`}
        </button>
      </div>
      <p className="hint">{hint}</p>
      <div ref={boxRef} className="drawing-box">
        <svg
          ref={svgRef}
          width={width}
          height={HEIGHT_PX}
          role="application"
          aria-label="Target path in mm: click to place a point"
          tabIndex={0}
          data-testid="target-drawing"
          className={`tool-${tool}`}
          onClick={onBackgroundClick}
          onPointerDown={onPointerDown}
          onPointerMove={onPointerMove}
          onPointerUp={onPointerUp}
          onKeyDown={onKeyDown}
        >
          <rect className="drawing-paper" x={0} y={0} width={width} height={HEIGHT_PX} />
          {target.background !== null && imageUrl !== null && <ImageLayer image={target.background} url={imageUrl} x={zx} y={zy} />}
          <GridLayer x={zx} y={zy} width={width} height={HEIGHT_PX} />
          <BoundsLayer regions={regions} x={zx} y={zy} />
          <KeepOutLayer regions={keepOut} draft={draft} x={zx} y={zy} />
          <PathLayer points={target.points} closed={target.closed} x={zx} y={zy} />
          <PointsLayer points={target.points} selected={selected} x={zx} y={zy} onPointerDown={onPointPointerDown} />
          <CalibrationLayer marks={calibration} x={zx} y={zy} />
        </svg>
      </div>
    </section>
  );
}
