/**
 * The set-up drawn in mm (y up): the wanted foot trajectory as a numbered closed loop,
 * the ground line with its stance band, the keep-out circles, and an image to trace over.
 * With "Click to add points" on, a click adds a trajectory point where it lands (to
 * 0.1 mm, the finest a mouse means here; the table shows the values added).
 */
import { useMemo, useRef, useState, type MouseEvent } from 'react';
import { fitPlacement, placementMatrix, toTenthMm } from '../../suspension/trace/placement';
import { useLeg, useSetupDispatch } from '../store';
import type { LegSetup } from '../setup';
import { imageCornersMm, mmToPixel } from './traceImage';
import { useLegTrace } from './traceStore';
import { TraceControls, type CalibrationStep } from './TraceControls';

const WIDTH_PX = 640;
const HEIGHT_PX = 420;
const MARGIN_PX = 24;
/** The view's extent when nothing is typed yet, mm either side of the origin. */
const EMPTY_HALF_SPAN_MM = 50;

function num(text: string): number | null {
  const v = Number(text.trim());
  return text.trim() !== '' && Number.isFinite(v) ? v : null;
}

interface Drawn {
  readonly points: { x: number; y: number }[];
  /** Pivot regions with both an x and a y range typed: a box per family and joint. */
  readonly regions: { label: string; x: [number, number]; y: [number, number] }[];
  readonly keepOut: { x: number; y: number; r: number }[];
  /** The ground line through a point along a unit direction; null when it does not read. */
  readonly ground: { px: number; py: number; dx: number; dy: number } | null;
  readonly band: number | null;
}

function drawnOf(s: LegSetup): Drawn {
  const points = s.footPath.points.flatMap((p) => { const x = num(p.x); const y = num(p.y); return x === null || y === null ? [] : [{ x, y }]; });
  const keepOut = s.keepOut.flatMap((k) => { const x = num(k.x); const y = num(k.y); const r = num(k.r); return x === null || y === null || r === null || !(r > 0) ? [] : [{ x, y, r }]; });
  let ground: Drawn['ground'] = null;
  if (s.ground.kind === 'level') {
    const y = num(s.ground.yMm);
    if (y !== null) ground = { px: 0, py: y, dx: 1, dy: 0 };
  } else {
    const [px, py, dx, dy] = [num(s.ground.px), num(s.ground.py), num(s.ground.dx), num(s.ground.dy)];
    const len = dx === null || dy === null ? 0 : Math.hypot(dx, dy);
    if (px !== null && py !== null && dx !== null && dy !== null && len > 0) ground = { px, py, dx: dx / len, dy: dy / len };
  }
  const band = num(s.stanceToleranceMm);
  const regions: Drawn['regions'] = [];
  for (const family of s.families) {
    const rows = s.regions[family] ?? [];
    const range = (variable: string): [number, number] | null => {
      const r = rows.find((row) => row.variable === variable);
      const lo = r === undefined ? null : num(r.min);
      const hi = r === undefined ? null : num(r.max);
      return lo === null || hi === null || !(lo < hi) ? null : [lo, hi];
    };
    for (const joint of new Set(rows.map((r) => r.variable.replace(/\.[xy]$/, '')))) {
      const x = range(`${joint}.x`);
      const y = range(`${joint}.y`);
      if (x !== null && y !== null) regions.push({ label: `${family} ${joint}`, x, y });
    }
  }
  return { points, regions, keepOut, ground, band: band !== null && band > 0 ? band : null };
}

export function SetupDrawing() {
  const dispatch = useSetupDispatch();
  const setup = useLeg((s) => s.setup);
  const [adding, setAdding] = useState(false);
  const image = useLegTrace((s) => s.image);
  const hidden = useLegTrace((s) => s.hidden);
  const [calibrating, setCalibrating] = useState<CalibrationStep>(null);
  const svgRef = useRef<SVGSVGElement | null>(null);
  const d = useMemo(() => drawnOf(setup), [setup]);
  const frame = useMemo(() => {
    const corners = image === null || image.placement === null ? [] : imageCornersMm(image.placement, image.widthPx, image.heightPx);
    const xs = [...d.points.map((p) => p.x), ...d.keepOut.flatMap((k) => [k.x - k.r, k.x + k.r]), ...d.regions.flatMap((r) => r.x), ...corners.map((c) => c.x)];
    const ys = [...d.points.map((p) => p.y), ...d.keepOut.flatMap((k) => [k.y - k.r, k.y + k.r]), ...d.regions.flatMap((r) => r.y), ...corners.map((c) => c.y)];
    if (d.ground !== null) { xs.push(d.ground.px); ys.push(d.ground.py); }
    if (xs.length === 0) { xs.push(-EMPTY_HALF_SPAN_MM, EMPTY_HALF_SPAN_MM); ys.push(-EMPTY_HALF_SPAN_MM, EMPTY_HALF_SPAN_MM); }
    const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
    const span = Math.max(x1 - x0, y1 - y0, 10) * 1.3;
    const scale = Math.min((WIDTH_PX - 2 * MARGIN_PX) / span, (HEIGHT_PX - 2 * MARGIN_PX) / span);
    return { cx: (x0 + x1) / 2, cy: (y0 + y1) / 2, scale };
  }, [d, image]);
  const sx = (x: number) => WIDTH_PX / 2 + (x - frame.cx) * frame.scale;
  const sy = (y: number) => HEIGHT_PX / 2 - (y - frame.cy) * frame.scale;
  const halfW = WIDTH_PX / 2 / frame.scale;
  const halfH = HEIGHT_PX / 2 / frame.scale;
  const shownPlacement = image === null ? null : (image.placement ?? fitPlacement(image.widthPx, image.heightPx, { minX: frame.cx - halfW, maxX: frame.cx + halfW, minY: frame.cy - halfH, maxY: frame.cy + halfH }));
  const onClick = (e: MouseEvent<SVGSVGElement>) => {
    const ctm = svgRef.current?.getScreenCTM();
    if (ctm === null || ctm === undefined) return;
    const p = new DOMPoint(e.clientX, e.clientY).matrixTransform(ctm.inverse());
    const mm = { x: frame.cx + (p.x - WIDTH_PX / 2) / frame.scale, y: frame.cy - (p.y - HEIGHT_PX / 2) / frame.scale };
    if (calibrating !== null && shownPlacement !== null) {
      if (calibrating.marks.length < 2) setCalibrating({ marks: [...calibrating.marks, mmToPixel(shownPlacement, mm)] });
      return;
    }
    if (adding) dispatch({ type: 'pointAdd', x: String(toTenthMm(mm.x)), y: String(toTenthMm(mm.y)) });
  };
  const far = (WIDTH_PX + HEIGHT_PX) / frame.scale;
  const g = d.ground;
  return (
    <section className="panel susp-panel" aria-labelledby="legws-drawing-title">
      <h2 id="legws-drawing-title">Set-up drawing</h2>
      <label className="legws-row">
        <input type="checkbox" checked={adding} onChange={(e) => setAdding(e.target.checked)} /> Click to add points to the foot trajectory
      </label>
      <TraceControls calibrating={calibrating} onCalibrating={setCalibrating} />
      <svg ref={svgRef} className="legws-drawing" viewBox={`0 0 ${WIDTH_PX} ${HEIGHT_PX}`} role="img" aria-label="The foot trajectory wanted, the ground line and the keep-out circles, mm" data-testid="leg-setup-drawing" onClick={onClick} style={{ cursor: adding || calibrating !== null ? 'crosshair' : 'default' }}>
        {image !== null && image.url !== null && shownPlacement !== null && !hidden && (
          <image className="legws-trace-image" href={image.url} width={image.widthPx} height={image.heightPx} preserveAspectRatio="none" transform={`matrix(${placementMatrix(shownPlacement, sx(0), sy(0), frame.scale).join(' ')})`} />
        )}
        {g !== null && (
          <>
            {d.band !== null && (
              <polygon className="legws-band" points={[[-1, 1], [1, 1], [1, -1], [-1, -1]].map(([s, h]) => `${sx(g.px + s * far * g.dx - h * (d.band ?? 0) * g.dy)},${sy(g.py + s * far * g.dy + h * (d.band ?? 0) * g.dx)}`).join(' ')} />
            )}
            <line className="legws-ground" x1={sx(g.px - far * g.dx)} y1={sy(g.py - far * g.dy)} x2={sx(g.px + far * g.dx)} y2={sy(g.py + far * g.dy)} />
          </>
        )}
        {d.keepOut.map((k, i) => <circle key={i} className="legws-keepout" cx={sx(k.x)} cy={sy(k.y)} r={k.r * frame.scale} />)}
        {d.regions.map((r) => (
          <g key={r.label} className="legws-region">
            <rect x={sx(r.x[0])} y={sy(r.y[1])} width={(r.x[1] - r.x[0]) * frame.scale} height={(r.y[1] - r.y[0]) * frame.scale} />
            <text x={sx(r.x[0]) + 3} y={sy(r.y[1]) - 3}>{r.label}</text>
          </g>
        ))}
        {d.points.length > 1 && <polygon className="legws-trajectory" points={d.points.map((p) => `${sx(p.x)},${sy(p.y)}`).join(' ')} />}
        {d.points.map((p, i) => (
          <g key={i}>
            <circle className="legws-point" cx={sx(p.x)} cy={sy(p.y)} r={4} />
            <text className="legws-point-label" x={sx(p.x) + 6} y={sy(p.y) - 6}>{i + 1}</text>
          </g>
        ))}
      </svg>
      <p className="susp-note">Green band: the stance tolerance about the ground line. Red circles: keep-out regions for the ground pivots. Dashed boxes: pivot regions given by x and y ranges. Numbers: the trajectory's points in order.</p>
    </section>
  );
}
