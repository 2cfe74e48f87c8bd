/**
 * The detail view's drawing: the linkage in the pose at the current driver value over
 * the target, its output path and the instant-centre path of the output body, with the
 * current instant centre marked (an arrow on the edge when it is off the drawing or at
 * infinity).
 */
import { memo, useMemo } from 'react';
import { IC_FINITE, IC_INFINITE } from '../../core/linkage/analysis';
import { edgeMarker, errorWhiskersD, insideView, linkageShapes, markerD, pointsBox, unionBox, viewBoxAttr, viewOf, type View } from './drawing';
import type { CandidateMotion } from './motion';
import { CentrePathLayer, FrameLayer, JointLabels, OutputPathLayer, TargetLayer } from './PathLayers';
import type { ResultsTarget } from './types';

export interface SolvedPose {
  /** A solved pose, or null where the linkage does not assemble. */
  readonly pose: Float64Array | null;
  /** IC_* kind of the output body's instant centre relative to ground. */
  readonly centreKind: number;
  /** The centre (finite) or its unit direction (at infinity), world frame. */
  readonly centre: readonly [number, number];
}

export function useStageView(motion: CandidateMotion, target: ResultsTarget): View {
  return useMemo(() => viewOf(unionBox([motion.bounds, pointsBox(target.points)]) ?? motion.bounds), [motion, target]);
}

const StaticLayers = memo(function StaticLayers({ view, motion, target }: { view: View; motion: CandidateMotion; target: ResultsTarget }) {
  const size = Math.max(view.width, view.height);
  const whiskers = useMemo(() => errorWhiskersD(view, target.points, motion.matched), [view, target, motion]);
  return (
    <>
      <FrameLayer view={view} />
      <TargetLayer view={view} target={target} radius={size * 0.006} />
      <path d={whiskers} className="results-whiskers" vectorEffect="non-scaling-stroke" />
      <CentrePathLayer view={view} motion={motion} markerSize={size * 0.02} testId="ic-path" />
      <OutputPathLayer view={view} motion={motion} testId="output-path" />
    </>
  );
});

export function MotionStage({ motion, target, solved, title }: { motion: CandidateMotion; target: ResultsTarget; solved: SolvedPose; title: string }) {
  const view = useStageView(motion, target);
  const size = Math.max(view.width, view.height);
  const shapes = solved.pose ? linkageShapes(view, motion, solved.pose) : null;
  const centre = currentCentre(view, solved);
  return (
    <svg className="results-stage" viewBox={viewBoxAttr(view)} role="img" aria-label={title} data-testid="motion-stage">
      <StaticLayers view={view} motion={motion} target={target} />
      {shapes && (
        <g className="results-linkage" data-testid="linkage">
          {shapes.slides.map((d, i) => <path key={`s${i}`} d={d} className="results-slide" vectorEffect="non-scaling-stroke" />)}
          {shapes.links.map((link) => <path key={link.bodyId} d={link.d} className="results-link" vectorEffect="non-scaling-stroke" />)}
          {shapes.joints.map((j, i) => j.ground
            ? <rect key={i} className="results-ground" x={j.x - size * 0.008} y={j.y - size * 0.008} width={size * 0.016} height={size * 0.016} />
            : <circle key={i} className="results-joint" cx={j.x} cy={j.y} r={size * 0.006} vectorEffect="non-scaling-stroke" />)}
          {shapes.output && <circle className="results-output-point" cx={shapes.output.x} cy={shapes.output.y} r={size * 0.008} />}
          <JointLabels joints={shapes.joints} offset={size * 0.012} fontSize={size * 0.03} />
        </g>
      )}
      {centre?.kind === 'dot' && (
        <circle className="results-centre-now" cx={centre.x} cy={centre.y} r={size * 0.008} vectorEffect="non-scaling-stroke" data-testid="ic-now">
          <title>instant centre of the output body relative to ground</title>
        </circle>
      )}
      {centre?.kind === 'arrow' && (
        <path className="results-centre-now-arrow" d={centre.d} data-testid="ic-now-direction">
          <title>{centre.title}</title>
        </path>
      )}
      {!solved.pose && (
        <text className="results-stage-note" x={view.x + view.width / 2} y={view.y + size * 0.06} textAnchor="middle" fontSize={size * 0.035}>
          does not assemble at this driver value
        </text>
      )}
    </svg>
  );
}

type CurrentCentre = { kind: 'dot'; x: number; y: number } | { kind: 'arrow'; d: string; title: string } | null;

function currentCentre(view: View, solved: SolvedPose): CurrentCentre {
  const size = Math.max(view.width, view.height);
  const [cx, cy] = solved.centre;
  if (solved.centreKind === IC_FINITE) {
    if (insideView(view, cx, -cy)) return { kind: 'dot', x: cx, y: -cy };
    const dx = cx - (view.x + view.width / 2);
    const dy = -cy - (view.y + view.height / 2);
    const n = Math.hypot(dx, dy);
    if (!(n > 0)) return null;
    return { kind: 'arrow', d: markerD(view, edgeMarker(view, [dx / n, dy / n]), size * 0.03), title: 'instant centre off the drawing, in this direction' };
  }
  if (solved.centreKind === IC_INFINITE) {
    // A point at infinity lies both ways along its direction: an arrow at each end.
    const a = edgeMarker(view, [cx, -cy]);
    const b = edgeMarker(view, [-cx, cy]);
    return { kind: 'arrow', d: markerD(view, a, size * 0.03) + markerD(view, b, size * 0.03), title: 'instant centre at infinity (the output body translates), in this direction' };
  }
  return null;
}
