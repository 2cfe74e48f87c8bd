/**
 * The static layers of a results drawing in a view: target points, output path and
 * instant-centre path with its direction markers. The table's small drawings, the detail
 * view and the compare view all draw with these.
 */
import { memo, useMemo } from 'react';
import { centreGeometry, drawingFrame, markerD, polylineD, scaleLabel, type LinkageShapes, type View } from './drawing';
import type { CandidateMotion } from './motion';
import type { ResultsTarget } from './types';

export const TargetLayer = memo(function TargetLayer({ view, target, radius }: { view: View; target: ResultsTarget; radius: number }) {
  const d = useMemo(
    () => polylineD(view, target.points.map((p) => p[0]), target.points.map((p) => p[1]), target.closed),
    [view, target],
  );
  return (
    <g className="results-target">
      <path d={d} className="results-target-line" vectorEffect="non-scaling-stroke" />
      {target.points.map(([x, y], i) => (
        <circle key={i} cx={x} cy={-y} r={radius} vectorEffect="non-scaling-stroke" />
      ))}
    </g>
  );
});

export const OutputPathLayer = memo(function OutputPathLayer({ view, motion, colour, testId }: { view: View; motion: CandidateMotion; colour?: string; testId?: string }) {
  const d = useMemo(() => polylineD(view, motion.output.x, motion.output.y, motion.driver.fullTurn), [view, motion]);
  return <path d={d} className="results-output-path" style={colour ? { stroke: colour } : undefined} vectorEffect="non-scaling-stroke" data-testid={testId} />;
});

export const CentrePathLayer = memo(function CentrePathLayer({
  view,
  motion,
  markerSize,
  colour,
  dash,
  testId,
}: {
  view: View;
  motion: CandidateMotion;
  markerSize: number;
  colour?: string;
  /** A dash pattern (px) of its own, so overlaid paths that coincide stay apart. */
  dash?: string;
  testId?: string;
}) {
  const geometry = useMemo(() => centreGeometry(view, motion.centre), [view, motion]);
  return (
    <g className="results-centre" style={colour ? { stroke: colour, fill: colour } : undefined}>
      <path d={geometry.d} className="results-centre-path" style={dash ? { strokeDasharray: dash } : undefined} vectorEffect="non-scaling-stroke" data-testid={testId} />
      {geometry.markers.map((m, i) => (
        <path key={i} d={markerD(view, m, markerSize)} className="results-centre-marker" data-testid={testId ? `${testId}-direction` : undefined} />
      ))}
    </g>
  );
});

/** Axes through the origin where they cross the view, the origin, axis directions and a scale bar. */
export const FrameLayer = memo(function FrameLayer({ view }: { view: View }) {
  const frame = useMemo(() => drawingFrame(view), [view]);
  const font = frame.fontSize;
  return (
    <g className="results-frame" data-testid="drawing-frame" fontSize={font}>
      <path d={frame.axesD} className="results-axes" vectorEffect="non-scaling-stroke" data-testid="axes" />
      {frame.origin && (
        <g data-testid="origin">
          <circle cx={0} cy={0} r={font * 0.25} className="results-origin" vectorEffect="non-scaling-stroke" />
          <text x={font * 0.4} y={font * 1.1} className="results-frame-text">O</text>
        </g>
      )}
      <path d={frame.indicatorD} className="results-axes-indicator" vectorEffect="non-scaling-stroke" />
      <text x={frame.xLabel.x} y={frame.xLabel.y} className="results-frame-text">x</text>
      <text x={frame.yLabel.x} y={frame.yLabel.y} className="results-frame-text" textAnchor="middle">y</text>
      <path d={frame.scaleD} className="results-scale-bar" vectorEffect="non-scaling-stroke" data-testid="scale-bar" data-mm={frame.scaleMm} />
      <text x={frame.scaleLabelAt.x} y={frame.scaleLabelAt.y} className="results-frame-text" textAnchor="middle">{scaleLabel(frame.scaleMm)}</text>
    </g>
  );
});

/** Each joint's id beside it. */
export function JointLabels({ joints, offset, fontSize, colour }: { joints: LinkageShapes['joints']; offset: number; fontSize: number; colour?: string }) {
  return (
    <g className="results-joint-labels" fontSize={fontSize} style={colour ? { fill: colour } : undefined}>
      {joints.map((j) => (
        <text key={j.id} x={j.x + offset} y={j.y - offset} data-testid="joint-label">{j.id}</text>
      ))}
    </g>
  );
}
