/**
 * Two to four candidates side by side: their output and instant-centre paths and their
 * linkages in a chosen pose, overlaid in one drawing framed on the target and the output
 * paths (zoom and pan to look closer), and a table of their figures. The designs may
 * come from different runs.
 */
import { useMemo, useRef, useState, type Dispatch } from 'react';
import { linkageShapes, outputPathBox, pointsBox, unionBox, viewBoxAttr, viewOf, zoomedView } from './drawing';
import { defectsLabel, grashofLabel, sizeOverMotionMm, transmissionRangeDeg } from './figures';
import { familyName, formatDegRange, formatMm, formatMmValue, formatSize } from './format';
import { DETAIL_STEPS, type CandidateMotion, type MotionResult } from './motion';
import { motionNow } from './motionStore';
import { CentrePathLayer, FrameLayer, JointLabels, OutputPathLayer, TargetLayer } from './PathLayers';
import type { CandidateRow, ResultsAction } from './state';
import type { ResultsTarget } from './types';

/** One colour per compared candidate, ours; chosen to stay apart for common colour-vision deficiencies. */
export const COMPARE_COLOURS = ['#0b6e99', '#d55e00', '#6a3d9a', '#2e7d32'] as const;
/** Dash patterns (px) of the compared instant-centre paths: designs sharing a linkage share that path. */
const COMPARE_DASHES = ['7 4', '2 4', '10 3 2 3', '4 6'] as const;

/** Zoom limits of the compare drawing, and the factor of one zoom step. */
const MIN_ZOOM = 1;
const MAX_ZOOM = 64;
const ZOOM_STEP = 1.5;
/** Steps of the pose slider (shares of each design's motion). */
const POSE_STEPS = 100;

/** The view frames the target and the output paths (instant centres may lie far off; they are clipped). */
export function compareFrameBox(target: ResultsTarget, motions: readonly MotionResult[]) {
  return unionBox([pointsBox(target.points), ...motions.map((m) => (m.ok ? outputPathBox(m.motion) : null))]);
}

/** The pose nearest a share of the motion, or null where the design does not assemble there. */
function poseAt(motion: CandidateMotion, share: number): Float64Array | null {
  const k = Math.min(motion.steps - 1, Math.max(0, Math.round(share * (motion.steps - 1))));
  if (motion.assembled[k] !== 1) return null;
  return motion.poses.subarray(k * motion.stride, (k + 1) * motion.stride);
}

export function CompareView({ rows, target, dispatch }: { rows: readonly CandidateRow[]; target: ResultsTarget; dispatch: Dispatch<ResultsAction> }) {
  const motions = useMemo(() => rows.map((row) => motionNow(row.candidate, DETAIL_STEPS)), [rows]);
  const [wholeLinkages, setWholeLinkages] = useState(false);
  const home = useMemo(() => {
    const paths = compareFrameBox(target, motions);
    const box = wholeLinkages ? unionBox([paths, ...motions.map((m) => (m.ok ? m.motion.bounds : null))]) : paths;
    return box ? viewOf(box) : null;
  }, [motions, target, wholeLinkages]);
  const [zoom, setZoom] = useState(1);
  const [pan, setPan] = useState<readonly [number, number]>([0, 0]);
  const [poseStep, setPoseStep] = useState(0);
  const drag = useRef<{ x: number; y: number; pan: readonly [number, number] } | null>(null);
  const svg = useRef<SVGSVGElement>(null);
  const view = home ? zoomedView(home, zoom, pan[0], pan[1]) : null;
  const size = view ? Math.max(view.width, view.height) : 0;
  const labelOf = (row: CandidateRow) => `${row.runName ? `${row.runName}: ` : ''}Rank ${row.rank}, ${familyName(row.candidate.family)}`;
  const zoomBy = (factor: number) => setZoom((z) => Math.min(MAX_ZOOM, Math.max(MIN_ZOOM, z * factor)));
  const reset = (whole: boolean) => {
    setWholeLinkages(whole);
    setZoom(1);
    setPan([0, 0]);
  };
  // SVG units per screen pixel, for dragging.
  const unitsPerPx = () => {
    const rect = svg.current?.getBoundingClientRect();
    return view && rect && rect.width > 0 ? Math.max(view.width / rect.width, view.height / rect.height) : 0;
  };
  const share = poseStep / POSE_STEPS;
  return (
    <section className="results-compare" aria-label="Compare designs" data-testid="compare-view">
      <div className="results-compare-head">
        <h3 className="results-heading">Compare {rows.length} designs</h3>
        <button type="button" onClick={() => dispatch({ type: 'clear-compare' })}>Clear comparison</button>
      </div>
      <div className="results-compare-tools" role="group" aria-label="Compare drawing">
        <button type="button" onClick={() => zoomBy(ZOOM_STEP)} aria-label="Zoom in">+</button>
        <button type="button" onClick={() => zoomBy(1 / ZOOM_STEP)} aria-label="Zoom out">−</button>
        <button type="button" onClick={() => reset(false)} aria-pressed={!wholeLinkages}>Frame target and paths</button>
        <button type="button" onClick={() => reset(true)} aria-pressed={wholeLinkages}>Frame whole linkages</button>
        <span className="results-count" data-testid="compare-zoom">zoom × {zoom.toFixed(zoom < 10 ? 1 : 0)}</span>
        <label className="results-scrubber">
          <span>Pose (share of each motion)</span>
          <input type="range" min={0} max={POSE_STEPS} step={1} value={poseStep} onChange={(e) => setPoseStep(Number(e.target.value))} />
          <output>{poseStep} %</output>
        </label>
      </div>
      <div className="results-compare-body">
        {view && (
          <svg
            ref={svg}
            className="results-stage results-compare-stage"
            viewBox={viewBoxAttr(view)}
            role="img"
            data-testid="compare-stage"
            aria-label={`Target, output paths, instant-centre paths and linkages of ${rows.map(labelOf).join('; ')}; drag to pan, wheel to zoom`}
            onWheel={(event) => zoomBy(event.deltaY < 0 ? ZOOM_STEP : 1 / ZOOM_STEP)}
            onPointerDown={(event) => {
              drag.current = { x: event.clientX, y: event.clientY, pan };
              event.currentTarget.setPointerCapture(event.pointerId);
            }}
            onPointerMove={(event) => {
              const from = drag.current;
              if (from === null) return;
              const k = unitsPerPx();
              setPan([from.pan[0] - (event.clientX - from.x) * k, from.pan[1] - (event.clientY - from.y) * k]);
            }}
            onPointerUp={() => {
              drag.current = null;
            }}
          >
            <defs>
              <clipPath id="compare-clip"><rect x={view.x} y={view.y} width={view.width} height={view.height} /></clipPath>
            </defs>
            <FrameLayer view={view} />
            <TargetLayer view={view} target={target} radius={size * 0.006} />
            {motions.map((m, i) => {
              if (!m.ok) return null;
              const pose = poseAt(m.motion, share);
              const shapes = pose ? linkageShapes(view, m.motion, pose) : null;
              return (
                <g key={rows[i].key} data-testid="compare-drawing" data-rank={rows[i].rank} style={{ stroke: COMPARE_COLOURS[i] }}>
                  <g clipPath="url(#compare-clip)">
                    <CentrePathLayer view={view} motion={m.motion} markerSize={size * 0.02} colour={COMPARE_COLOURS[i]} dash={COMPARE_DASHES[i]} testId="compare-ic-path" />
                  </g>
                  <OutputPathLayer view={view} motion={m.motion} colour={COMPARE_COLOURS[i]} testId="compare-output-path" />
                  {shapes && (
                    <g className="results-linkage" data-testid="compare-linkage">
                      {shapes.links.map((link) => <path key={link.bodyId} d={link.d} className="results-link" style={{ stroke: COMPARE_COLOURS[i] }} vectorEffect="non-scaling-stroke" />)}
                      {shapes.joints.map((j) => j.ground
                        ? <rect key={j.id} className="results-ground" x={j.x - size * 0.007} y={j.y - size * 0.007} width={size * 0.014} height={size * 0.014} style={{ fill: COMPARE_COLOURS[i] }} />
                        : <circle key={j.id} className="results-joint" cx={j.x} cy={j.y} r={size * 0.005} vectorEffect="non-scaling-stroke" />)}
                      <JointLabels joints={shapes.joints} offset={size * 0.01} fontSize={size * 0.024} colour={COMPARE_COLOURS[i]} />
                    </g>
                  )}
                </g>
              );
            })}
          </svg>
        )}
        <ul className="results-legend results-compare-legend">
          <li><span className="results-swatch results-swatch-target" />target points</li>
          {rows.map((row, i) => (
            <li key={row.key}>
              <span className="results-swatch" style={{ background: COMPARE_COLOURS[i] }} />
              {labelOf(row)}: output path (solid), instant-centre path (dashed), linkage at {poseStep} % of its motion
              {!motions[i].ok && ' (cannot be drawn)'}
              {motions[i].ok && poseAt((motions[i] as Extract<MotionResult, { ok: true }>).motion, share) === null && ' (does not assemble there)'}
            </li>
          ))}
        </ul>
      </div>
      <table className="results-table results-compare-table">
        <thead>
          <tr>
            <th scope="col">Figure</th>
            {rows.map((row, i) => (
              <th key={row.key} scope="col">
                <span className="results-swatch" style={{ background: COMPARE_COLOURS[i] }} />
                {labelOf(row)}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {FIGURE_ROWS.map(([label, value]) => (
            <tr key={label}>
              <th scope="row">{label}</th>
              {rows.map((row, i) => <td key={row.key} className="results-num">{value(row, motions[i])}</td>)}
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}

const FIGURE_ROWS: readonly (readonly [string, (row: CandidateRow, motion: MotionResult) => string])[] = [
  ['Family', (r) => familyName(r.candidate.family)],
  ['RMS error', (r) => formatMm(r.candidate.error.rmsMm)],
  ['Max. error', (r) => formatMm(r.candidate.error.maxMm)],
  ['Sum of squared errors', (r) => `${formatMmValue(r.candidate.error.sumSquares)} mm²`],
  ['Grashof class', (r, m) => grashofLabel(r.candidate, m)],
  ['Transmission angle', (r, m) => formatDegRange(transmissionRangeDeg(r.candidate, m))],
  ['Size over the motion', (r, m) => {
    const size = sizeOverMotionMm(r.candidate, m);
    return size === undefined ? '—' : formatSize(size);
  }],
  ['Constraints', (r) => (r.candidate.feasible ? 'all met' : `not met (violation ${r.candidate.violation.toPrecision(3)})`)],
  ['Defects', (r) => defectsLabel(r.candidate)],
];
