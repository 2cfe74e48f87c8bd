/**
 * The search set-up on the side view: each pivot's region (a rectangle) for the layout
 * shown and each keep-out circle, labelled. With a tool chosen in the set-up panel, a
 * drag draws a pivot's region or places a new keep-out; a keep-out's centre handle moves
 * it and its rim handle resizes it (by mouse, or by the arrow keys: 1 mm, 10 mm with
 * Shift). What a drag gives lands on the DRAWN_STEP_MM grid (the reducer rounds it), so
 * the typed fields and the drawing hold the same numbers.
 */
import type { ScaleLinear } from 'd3';
import { memo, useEffect, useRef, useState, type KeyboardEvent, type PointerEvent, type RefObject } from 'react';
import type { Vec2 } from '../../../core/geometry';
import { NUMBER_TEXT } from '../fields';
import { pivotLabel } from '../labels';
import { useSuspension, useSuspensionDispatch } from '../store';
import { DRAWN_STEP_MM, rangeText, searchedPivots, type KeepOutDraft } from './setup';

/** Arrow-key steps, mm. */
const KEY_STEP_MM = 1;
const KEY_STEP_SHIFT_MM = 10;

function numberOf(text: string): number | null {
  const t = text.trim();
  return NUMBER_TEXT.test(t) ? Number(t) : null;
}

/** A typed circle that reads, or null (its fields say what is wrong). */
function circleOf(k: KeepOutDraft): { x: number; y: number; r: number } | null {
  const x = numberOf(k.x);
  const y = numberOf(k.y);
  const r = numberOf(k.r);
  return x === null || y === null || r === null || !(r > 0) ? null : { x, y, r };
}

/** The side view's mm → SVG scales (its frame). */
export interface SideViewScales {
  readonly x: ScaleLinear<number, number>;
  readonly y: ScaleLinear<number, number>;
  readonly pxPerMm: number;
}

type Drag =
  | { readonly kind: 'region'; readonly from: Vec2; readonly to: Vec2 }
  | { readonly kind: 'newKeepOut'; readonly from: Vec2; readonly to: Vec2 }
  | { readonly kind: 'move'; readonly index: number }
  | { readonly kind: 'resize'; readonly index: number };

export const RegionsLayer = memo(function RegionsLayer({ frame, svgRef }: { frame: SideViewScales; svgRef: RefObject<SVGSVGElement | null> }) {
  const dispatch = useSuspensionDispatch();
  const kind = useSuspension((s) => s.layout.kind);
  const search = useSuspension((s) => s.search);
  const tool = useSuspension((s) => s.setupTool);
  const [drag, setDrag] = useState<Drag | null>(null);
  const dragRef = useRef<Drag | null>(null);
  const regionTool = tool?.kind === 'region' && tool.layout === kind ? tool : null;
  const searched = search.layouts.includes(kind);

  useEffect(() => {
    if (tool === null) return undefined;
    const cancel = (e: globalThis.KeyboardEvent) => {
      if (e.key === 'Escape') dispatch({ type: 'setupTool', tool: null });
    };
    window.addEventListener('keydown', cancel);
    return () => window.removeEventListener('keydown', cancel);
  }, [tool, dispatch]);

  const toMm = (e: PointerEvent): Vec2 | null => {
    const ctm = svgRef.current?.getScreenCTM();
    if (ctm === null || ctm === undefined) return null;
    const pt = new DOMPoint(e.clientX, e.clientY).matrixTransform(ctm.inverse());
    return { x: frame.x.invert(pt.x), y: frame.y.invert(pt.y) };
  };
  const begin = (e: PointerEvent, d: Drag) => {
    (e.currentTarget as Element).setPointerCapture(e.pointerId);
    dragRef.current = d;
    setDrag(d);
  };
  const update = (d: Drag | null) => {
    dragRef.current = d;
    setDrag(d);
  };
  const move = (e: PointerEvent) => {
    const d = dragRef.current;
    const at = d === null ? null : toMm(e);
    if (d === null || at === null) return;
    if (d.kind === 'region' || d.kind === 'newKeepOut') update({ ...d, to: at });
    else if (d.kind === 'move') dispatch({ type: 'search', action: { type: 'keepOutDrawn', index: d.index, centre: at } });
    else {
      const c = circleOf(search.keepOut[d.index]);
      if (c !== null) dispatch({ type: 'search', action: { type: 'keepOutDrawn', index: d.index, r: Math.max(DRAWN_STEP_MM, Math.hypot(at.x - c.x, at.y - c.y)) } });
    }
  };
  const end = () => {
    const d = dragRef.current;
    update(null);
    if (d === null) return;
    if (d.kind === 'region' && regionTool !== null) {
      // A click without a drag draws nothing: no region narrower than the grid.
      if (Math.abs(d.to.x - d.from.x) >= DRAWN_STEP_MM && Math.abs(d.to.y - d.from.y) >= DRAWN_STEP_MM) {
        dispatch({ type: 'search', action: { type: 'regionDrawn', layout: kind, pivot: regionTool.pivot, x: [d.from.x, d.to.x], y: [d.from.y, d.to.y] } });
      }
      dispatch({ type: 'setupTool', tool: null });
    } else if (d.kind === 'newKeepOut') {
      const r = Math.hypot(d.to.x - d.from.x, d.to.y - d.from.y);
      if (r >= DRAWN_STEP_MM) dispatch({ type: 'search', action: { type: 'keepOutAdd', circle: { x: d.from.x, y: d.from.y, r } } });
      dispatch({ type: 'setupTool', tool: null });
    }
  };
  const keys = (index: number, what: 'move' | 'resize') => (e: KeyboardEvent) => {
    const c = circleOf(search.keepOut[index]);
    const step = e.shiftKey ? KEY_STEP_SHIFT_MM : KEY_STEP_MM;
    const dx = e.key === 'ArrowRight' ? step : e.key === 'ArrowLeft' ? -step : 0;
    const dy = e.key === 'ArrowUp' ? step : e.key === 'ArrowDown' ? -step : 0;
    if (c === null || (dx === 0 && dy === 0)) return;
    e.preventDefault();
    const action = what === 'move'
      ? { type: 'keepOutDrawn' as const, index, centre: { x: c.x + dx, y: c.y + dy } }
      : { type: 'keepOutDrawn' as const, index, r: Math.max(DRAWN_STEP_MM, c.r + dx + dy) };
    dispatch({ type: 'search', action });
  };

  const rect = (x0: number, x1: number, y0: number, y1: number) => ({
    x: frame.x(Math.min(x0, x1)),
    y: frame.y(Math.max(y0, y1)),
    width: Math.abs(x1 - x0) * frame.pxPerMm,
    height: Math.abs(y1 - y0) * frame.pxPerMm,
  });

  return (
    <g className="susp-setup-layer" data-testid="setup-layer" onPointerMove={move} onPointerUp={end} onPointerCancel={end}>
      {searchedPivots(kind).map((pivot) => {
        const x = rangeText(search, kind, `${pivot}.x`);
        const y = rangeText(search, kind, `${pivot}.y`);
        const [x0, x1, y0, y1] = [x.range.min, x.range.max, y.range.min, y.range.max].map(numberOf);
        if (x0 === null || x1 === null || y0 === null || y1 === null) return null;
        const r = rect(x0, x1, y0, y1);
        const active = regionTool?.pivot === pivot;
        const cls = `susp-region${x.changed || y.changed ? ' susp-region-changed' : ''}${searched ? '' : ' susp-region-unsearched'}${active ? ' susp-region-active' : ''}`;
        return (
          <g key={pivot} className={cls} data-region={pivot}>
            <rect {...r} />
            <text x={r.x + 3} y={r.y + 11}>{`${pivotLabel(pivot)} region`}</text>
            <title>{`${pivotLabel(pivot)} region: x ${x0} to ${x1} mm, y ${y0} to ${y1} mm${searched ? '' : ' (layout not searched)'}`}</title>
          </g>
        );
      })}
      {search.keepOut.map((k, index) => {
        const c = circleOf(k);
        if (c === null) return null;
        const cx = frame.x(c.x);
        const cy = frame.y(c.y);
        const rPx = c.r * frame.pxPerMm;
        return (
          <g key={index} className="susp-keep-out" data-keep-out={index}>
            <circle className="susp-keep-out-area" cx={cx} cy={cy} r={rPx} />
            <text x={cx} y={cy - rPx - 4} textAnchor="middle">{k.name.trim() === '' ? `keep-out ${index + 1}` : k.name}</text>
            <circle
              className="susp-keep-out-handle"
              cx={cx}
              cy={cy}
              r={6}
              tabIndex={0}
              role="button"
              aria-label={`Move keep-out ${index + 1} (${k.name}): drag, or arrow keys`}
              data-keep-out-centre={index}
              onPointerDown={(e) => begin(e, { kind: 'move', index })}
              onKeyDown={keys(index, 'move')}
            />
            <circle
              className="susp-keep-out-handle susp-keep-out-rim"
              cx={cx + rPx}
              cy={cy}
              r={5}
              tabIndex={0}
              role="button"
              aria-label={`Resize keep-out ${index + 1} (${k.name}): drag, or arrow keys`}
              data-keep-out-rim={index}
              onPointerDown={(e) => begin(e, { kind: 'resize', index })}
              onKeyDown={keys(index, 'resize')}
            />
          </g>
        );
      })}
      {drag?.kind === 'region' && <rect className="susp-region-preview" {...rect(drag.from.x, drag.to.x, drag.from.y, drag.to.y)} />}
      {drag?.kind === 'newKeepOut' && (
        <circle className="susp-region-preview" cx={frame.x(drag.from.x)} cy={frame.y(drag.from.y)} r={Math.hypot(drag.to.x - drag.from.x, drag.to.y - drag.from.y) * frame.pxPerMm} />
      )}
      {(regionTool !== null || tool?.kind === 'keepOut') && (
        <>
          <rect
            className="susp-setup-capture"
            data-testid="setup-capture"
            x={0}
            y={0}
            width="100%"
            height="100%"
            onPointerDown={(e) => {
              const at = toMm(e);
              if (at !== null) begin(e, { kind: regionTool !== null ? 'region' : 'newKeepOut', from: at, to: at });
            }}
          />
          <text className="susp-setup-instruction" x={10} y={18}>
            {regionTool !== null
              ? `Drag a rectangle for the ${pivotLabel(regionTool.pivot)} region (Esc cancels)`
              : 'Drag from a keep-out’s centre to its rim (Esc cancels)'}
          </text>
        </>
      )}
    </g>
  );
});
