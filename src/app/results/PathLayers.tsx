/**
 * The static layers of a results drawing in a view: target points, output path and
 * instant-centre path with its direction markers. The table's small drawings, the detail
 * view and the compare view all draw with these.
 */
import { memo, useMemo } from 'react';
import { centreGeometry, markerD, polylineD, type View } from './drawing';
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
