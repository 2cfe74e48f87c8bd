/**
 * The side view: the core's sideView primitives in one pose, drawn in React (d3 for the
 * mm → pixel scales): wheels, bottom bracket, chainring, the chosen cog and the chain's
 * upper run, the shock (body and stroke left), links and labelled pivots, the
 * instant-centre path, axes from the bottom bracket and a scale bar. At 0 mm of travel
 * the layout's pivots can be dragged.
 */
import * as d3 from 'd3';
import { memo, useMemo, useRef, type PointerEvent } from 'react';
import type { Vec2 } from '../../core/geometry';
import type { Linkage } from '../../core/linkage';
import { IC_FINITE } from '../../core/linkage/analysis';
import { sideView, sideViewExtent, type Bicycle, type SideViewPrimitive, type SuspensionReport } from '../../core/suspension';
import { figure, pivotLabel } from './labels';
import { useSuspensionDispatch } from './store';
import { RegionsLayer } from './targets/RegionsLayer';
import { TraceControls, TraceLayer } from './trace';

const WIDTH = 960;
const HEIGHT = 540;
const PAD_PX = 28;
/** Room around the drawing, mm. */
const MARGIN_MM = 40;
const AXIS_MM = 60;
const SCALE_BAR_MM = 100;
/** A dragged pivot lands on this grid, mm: finer than any frame drawing needs. */
const DRAG_GRID_MM = 0.1;
/** Consecutive instant centres farther apart than this (px, the drawing's width) are not joined. */
const IC_JUMP_PX = WIDTH;

interface Frame {
  readonly x: d3.ScaleLinear<number, number>;
  readonly y: d3.ScaleLinear<number, number>;
  readonly pxPerMm: number;
}

/** The drawing's box with its margin, from the origin out: [x0, x1, y0, y1], mm. */
function boundsOf(primitives: readonly SideViewPrimitive[], extra: readonly Vec2[]): [number, number, number, number] {
  const b = sideViewExtent(primitives, { minX: 0, maxX: 0, minY: 0, maxY: 0 }, extra);
  return [b.minX - MARGIN_MM, b.maxX + MARGIN_MM, b.minY - MARGIN_MM, b.maxY + MARGIN_MM];
}

function frameOf([x0, x1, y0, y1]: [number, number, number, number]): Frame {
  const pxPerMm = Math.min((WIDTH - 2 * PAD_PX) / (x1 - x0), (HEIGHT - 2 * PAD_PX) / (y1 - y0));
  const cx = (x0 + x1) / 2;
  const cy = (y0 + y1) / 2;
  return {
    x: d3.scaleLinear().domain([cx, cx + 1]).range([WIDTH / 2, WIDTH / 2 + pxPerMm]),
    y: d3.scaleLinear().domain([cy, cy + 1]).range([HEIGHT / 2, HEIGHT / 2 - pxPerMm]),
    pxPerMm,
  };
}

function Primitive({ p, f }: { p: SideViewPrimitive; f: Frame }) {
  const cls = `susp-role-${p.role}`;
  if (p.kind === 'circle') return <circle className={cls} cx={f.x(p.cxMm)} cy={f.y(p.cyMm)} r={p.rMm * f.pxPerMm}><title>{p.label}</title></circle>;
  if (p.kind === 'segment') {
    return <line className={cls} x1={f.x(p.x1Mm)} y1={f.y(p.y1Mm)} x2={f.x(p.x2Mm)} y2={f.y(p.y2Mm)}><title>{p.label}</title></line>;
  }
  const framed = p.role === 'framePivot';
  return (
    <g className={cls} transform={`translate(${f.x(p.xMm)},${f.y(p.yMm)})`}>
      {framed ? <rect x={-4.5} y={-4.5} width={9} height={9} /> : <circle r={4.5} />}
      <text x={7} y={-7}>{p.role === 'bottomBracket' || p.role === 'axle' ? p.label : pivotLabel(p.label)}</text>
      <title>{`${p.label} (${figure(p.xMm, 5)}, ${figure(p.yMm, 5)}) mm`}</title>
    </g>
  );
}

export interface SideViewProps {
  readonly bicycle: Bicycle | null;
  readonly linkage: Linkage | null;
  readonly report: SuspensionReport | null;
  readonly travelStep: number;
  readonly cogIndex: number;
  readonly pivots: Readonly<Record<string, Vec2>>;
}

export const SideView = memo(function SideView({ bicycle, linkage, report, travelStep, cogIndex, pivots }: SideViewProps) {
  const dispatch = useSuspensionDispatch();
  const svgRef = useRef<SVGSVGElement | null>(null);
  const dragging = useRef<string | null>(null);
  const step = report === null ? 0 : Math.min(travelStep, report.curves.steps - 1);
  const view = useMemo(() => {
    if (bicycle === null || linkage === null) return null;
    const shockLengthMm = report === null ? bicycle.shock.eyeToEyeMm : report.curves.shockLengthMm[step];
    return sideView({ bicycle, linkage }, { shockLengthMm, cogIndex });
  }, [bicycle, linkage, report, step, cogIndex]);
  const primitives = view !== null && view.ok ? view.primitives : [];
  const handles = step === 0 ? Object.entries(pivots) : [];
  // The frame follows the design, not the pose, so the drawing holds still while the slider moves.
  const frame = useMemo(() => {
    if (bicycle === null || linkage === null) return frameOf(boundsOf([], Object.values(pivots)));
    const rest = sideView({ bicycle, linkage }, { shockLengthMm: bicycle.shock.eyeToEyeMm, cogIndex: 0 });
    return frameOf(boundsOf(rest.ok ? rest.primitives : [], Object.values(pivots)));
  }, [bicycle, linkage, pivots]);
  const ic = useMemo(() => {
    if (report === null) return { path: '', now: null as Vec2 | null };
    const c = report.curves.icPath;
    // A centre passing through infinity comes back from the other side: the path breaks there, not joined across the drawing.
    const pts: ([number, number] | null)[] = [];
    for (let k = 0; k < c.kind.length; k++) {
      const p: [number, number] | null = c.kind[k] === IC_FINITE ? [frame.x(c.xMm[k]), frame.y(c.yMm[k])] : null;
      const last = pts.length > 0 ? pts[pts.length - 1] : null;
      if (p !== null && last !== null && !(Math.hypot(p[0] - last[0], p[1] - last[1]) <= IC_JUMP_PX)) pts.push(null);
      pts.push(p);
    }
    const line = d3.line<[number, number] | null>().defined((p) => p !== null).x((p) => (p as [number, number])[0]).y((p) => (p as [number, number])[1]);
    const now = c.kind[step] === IC_FINITE ? { x: frame.x(c.xMm[step]), y: frame.y(c.yMm[step]) } : null;
    return { path: line(pts) ?? '', now };
  }, [report, frame, step]);

  const toMm = (e: PointerEvent): Vec2 | null => {
    const svg = svgRef.current;
    const ctm = svg?.getScreenCTM();
    if (svg === null || ctm === null || ctm === undefined) return null;
    const pt = new DOMPoint(e.clientX, e.clientY).matrixTransform(ctm.inverse());
    const snap = (v: number) => Math.round(v / DRAG_GRID_MM) * DRAG_GRID_MM;
    return { x: Number(snap(frame.x.invert(pt.x)).toFixed(1)), y: Number(snap(frame.y.invert(pt.y)).toFixed(1)) };
  };
  const move = (e: PointerEvent) => {
    const name = dragging.current;
    if (name === null) return;
    const at = toMm(e);
    if (at !== null) dispatch({ type: 'pivot', name, at });
  };

  const x0 = frame.x.invert(PAD_PX);
  const y0 = frame.y.invert(HEIGHT - PAD_PX);
  return (
    <figure className="susp-side-view" data-testid="side-view">
      <svg
        ref={svgRef}
        viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
        role="img"
        aria-label="Side view of the bicycle and the layout"
        onPointerMove={move}
        onPointerUp={() => (dragging.current = null)}
        onPointerCancel={() => (dragging.current = null)}
      >
        <TraceLayer x={frame.x} y={frame.y} widthPx={WIDTH} heightPx={HEIGHT} />
        <g className="susp-axes">
          <line x1={frame.x(0)} y1={frame.y(0)} x2={frame.x(AXIS_MM)} y2={frame.y(0)} markerEnd="url(#susp-arrow)" />
          <line x1={frame.x(0)} y1={frame.y(0)} x2={frame.x(0)} y2={frame.y(AXIS_MM)} markerEnd="url(#susp-arrow)" />
          <text x={frame.x(AXIS_MM) + 4} y={frame.y(0) + 4}>x</text>
          <text x={frame.x(0) - 4} y={frame.y(AXIS_MM) - 6} textAnchor="middle">y</text>
        </g>
        <defs>
          <marker id="susp-arrow" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto-start-reverse">
            <path d="M0,0 L10,5 L0,10 z" className="susp-arrowhead" />
          </marker>
        </defs>
        {ic.path !== '' && <path className="susp-ic-path" d={ic.path} data-testid="ic-path"><title>instant-centre path of the axle-carrying body over the travel</title></path>}
        {primitives.map((p, i) => <Primitive key={i} p={p} f={frame} />)}
        {ic.now !== null && (
          <g className="susp-ic-now" transform={`translate(${ic.now.x},${ic.now.y})`}>
            <path d="M-6,0 L6,0 M0,-6 L0,6" />
            <text x={7} y={14}>instant centre</text>
          </g>
        )}
        {handles.map(([name, p]) => (
          <circle
            key={name}
            className="susp-handle"
            cx={frame.x(p.x)}
            cy={frame.y(p.y)}
            r={9}
            data-pivot={name}
            onPointerDown={(e) => {
              dragging.current = name;
              (e.currentTarget as Element).setPointerCapture(e.pointerId);
            }}
          >
            <title>{`drag ${pivotLabel(name)}`}</title>
          </circle>
        ))}
        {primitives.length === 0 && handles.map(([name, p]) => (
          <text key={`label-${name}`} x={frame.x(p.x) + 11} y={frame.y(p.y) - 9}>{pivotLabel(name)}</text>
        ))}
        <RegionsLayer frame={frame} svgRef={svgRef} />
        <g className="susp-scale-bar" transform={`translate(${frame.x(x0 + 10)},${frame.y(y0 + 10)})`}>
          <line x2={SCALE_BAR_MM * frame.pxPerMm} />
          <line y1={-4} y2={4} />
          <line x1={SCALE_BAR_MM * frame.pxPerMm} x2={SCALE_BAR_MM * frame.pxPerMm} y1={-4} y2={4} />
          <text x={(SCALE_BAR_MM * frame.pxPerMm) / 2} y={-7} textAnchor="middle">{`${SCALE_BAR_MM} mm`}</text>
        </g>
      </svg>
      <TraceControls />
      {view !== null && !view.ok && <p className="susp-problem" role="alert">The side view cannot be drawn in this pose: {view.reason}.</p>}
      {bicycle === null && <p className="susp-problem">The side view needs every bicycle field to hold a valid value; the layout’s pivots are shown alone.</p>}
    </figure>
  );
});
