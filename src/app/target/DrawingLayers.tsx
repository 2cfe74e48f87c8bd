/** The layers of the target drawing, drawn from scales already zoomed: grid and axes, image, regions, path and points. */
import type { ScaleLinear } from 'd3';
import type { BackgroundImage, KeepOutRegion, TargetPoint } from '../state/project';
import type { PositionRegion } from '../settings/boundRegions';

type Scale = ScaleLinear<number, number>;

export function GridLayer({ x, y, width, height }: { x: Scale; y: Scale; width: number; height: number }) {
  const xs = x.ticks(Math.max(2, Math.round(width / 90)));
  const ys = y.ticks(Math.max(2, Math.round(height / 70)));
  return (
    <g className="drawing-grid" aria-hidden="true">
      {xs.map((t) => (
        <line key={`x${t}`} x1={x(t)} x2={x(t)} y1={0} y2={height} className={Math.abs(t) < 1e-9 ? 'axis-line' : undefined} />
      ))}
      {ys.map((t) => (
        <line key={`y${t}`} y1={y(t)} y2={y(t)} x1={0} x2={width} className={Math.abs(t) < 1e-9 ? 'axis-line' : undefined} />
      ))}
      {xs.map((t) => (
        <text key={`xl${t}`} x={x(t) + 3} y={height - 4} className="tick-label">
          {t}
        </text>
      ))}
      {ys.map((t) => (
        <text key={`yl${t}`} x={4} y={y(t) - 3} className="tick-label">
          {t}
        </text>
      ))}
      <text x={width - 6} y={14} textAnchor="end" className="unit-label">
        mm
      </text>
    </g>
  );
}

export function ImageLayer({ image, url, x, y }: { image: BackgroundImage; url: string; x: Scale; y: Scale }) {
  const left = x(image.leftMm);
  const top = y(image.topMm);
  const width = x(image.leftMm + image.widthPx * image.mmPerPx) - left;
  const height = y(image.topMm - image.heightPx * image.mmPerPx) - top;
  return <image href={url} x={left} y={top} width={width} height={height} opacity={image.opacity} preserveAspectRatio="none" data-testid="background-image" />;
}

export function KeepOutLayer({ regions, draft, x, y }: { regions: readonly KeepOutRegion[]; draft: KeepOutRegion | null; x: Scale; y: Scale }) {
  const px = (r: number) => Math.abs(x(r) - x(0));
  return (
    <g className="keep-out">
      {regions.map((r, i) => (
        <g key={i} data-testid="keep-out-region">
          <circle cx={x(r.x)} cy={y(r.y)} r={px(r.r)} />
          <text x={x(r.x)} y={y(r.y)} textAnchor="middle" dominantBaseline="middle">
            keep out {i + 1}
          </text>
        </g>
      ))}
      {draft !== null && <circle className="draft" cx={x(draft.x)} cy={y(draft.y)} r={px(draft.r)} />}
    </g>
  );
}

export function BoundsLayer({ regions, x, y }: { regions: readonly PositionRegion[]; x: Scale; y: Scale }) {
  return (
    <g className="bound-regions">
      {regions.map((r) => (
        <g key={r.key} data-testid="bound-region">
          <title>{`${r.label}: x ${r.minX}…${r.maxX} mm, y ${r.minY}…${r.maxY} mm`}</title>
          <rect x={x(r.minX)} y={y(r.maxY)} width={x(r.maxX) - x(r.minX)} height={y(r.minY) - y(r.maxY)} />
          <text x={x(r.minX) + 3} y={y(r.maxY) + 12}>
            {r.label}
          </text>
        </g>
      ))}
    </g>
  );
}

export function PathLayer({ points, closed, x, y }: { points: readonly TargetPoint[]; closed: boolean; x: Scale; y: Scale }) {
  if (points.length < 2) return null;
  const d = points.map((p, i) => `${i === 0 ? 'M' : 'L'}${x(p.x).toFixed(1)},${y(p.y).toFixed(1)}`).join('') + (closed ? 'Z' : '');
  return <path className="target-path" d={d} data-testid="target-path" />;
}

export interface PointsLayerProps {
  points: readonly TargetPoint[];
  selected: number | null;
  x: Scale;
  y: Scale;
  onPointerDown: (index: number, event: React.PointerEvent<SVGCircleElement>) => void;
}

/** Below this mean spacing on screen (px) the point numbers would overlap; only every fifth is shown, or none. */
const LABEL_SPACING_PX = 14;

export function PointsLayer({ points, selected, x, y, onPointerDown }: PointsLayerProps) {
  let lengthPx = 0;
  for (let i = 1; i < points.length; i++) lengthPx += Math.hypot(x(points[i].x) - x(points[i - 1].x), y(points[i].y) - y(points[i - 1].y));
  const spacingPx = points.length > 1 ? lengthPx / (points.length - 1) : Infinity;
  const labelEvery = spacingPx >= LABEL_SPACING_PX ? 1 : spacingPx * 5 >= LABEL_SPACING_PX ? 5 : 0;
  return (
    <g className="target-points">
      {points.map((p, i) => (
        <g key={i}>
          <circle
            data-drag="point"
            data-testid="target-point"
            className={i === selected ? 'selected' : undefined}
            cx={x(p.x)}
            cy={y(p.y)}
            r={i === selected ? 6 : 4.5}
            onPointerDown={(event) => onPointerDown(i, event)}
          >
            <title>{`point ${i + 1}: x ${p.x} mm, y ${p.y} mm${p.driverDeg === null ? '' : `, crank ${p.driverDeg}°`}${p.weight === undefined ? '' : `, weight ${p.weight}`}`}</title>
          </circle>
          {labelEvery > 0 && i % labelEvery === 0 && (
            <text x={x(p.x) + 7} y={y(p.y) - 7} className="point-label">
              {i + 1}
            </text>
          )}
        </g>
      ))}
    </g>
  );
}

export function CalibrationLayer({ marks, x, y }: { marks: readonly { x: number; y: number }[]; x: Scale; y: Scale }) {
  return (
    <g className="calibration">
      {marks.length === 2 && <line x1={x(marks[0].x)} y1={y(marks[0].y)} x2={x(marks[1].x)} y2={y(marks[1].y)} />}
      {marks.map((m, i) => (
        <g key={i} transform={`translate(${x(m.x)},${y(m.y)})`}>
          <path d="M-8,0H8M0,-8V8" />
          <text x={6} y={-6}>
            {i === 0 ? 'A' : 'B'}
          </text>
        </g>
      ))}
    </g>
  );
}
