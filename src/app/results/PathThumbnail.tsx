/** A table row's small drawing: the output path over the target, and the instant-centre path. */
import { memo, useMemo } from 'react';
import { outputPathBox, pointsBox, unionBox, viewBoxAttr, viewOf } from './drawing';
import type { MotionResult } from './motion';
import { CentrePathLayer, OutputPathLayer, TargetLayer } from './PathLayers';
import type { ResultsTarget } from './types';

const WIDTH_PX = 96;
const HEIGHT_PX = 64;
/** Margin round the path and target, a share of the larger side. */
const THUMB_MARGIN_SHARE = 0.15;

export const PathThumbnail = memo(function PathThumbnail({ motion, target, label }: { motion: MotionResult | undefined; target: ResultsTarget; label: string }) {
  const view = useMemo(() => {
    // The path against the target is what a row must show; the linkage's own extent would
    // shrink both to a speck. Instant centres beyond the view become edge markers.
    const box = unionBox([motion?.ok ? outputPathBox(motion.motion) : null, pointsBox(target.points)]);
    return box ? viewOf(box, THUMB_MARGIN_SHARE) : null;
  }, [motion, target]);
  if (motion === undefined || view === null) {
    return <div className="results-thumb results-thumb-pending" style={{ width: WIDTH_PX, height: HEIGHT_PX }} aria-label={`${label}: drawing pending`} />;
  }
  if (!motion.ok) {
    return <div className="results-thumb results-thumb-failed" style={{ width: WIDTH_PX, height: HEIGHT_PX }} title={motion.reason}>no motion</div>;
  }
  const size = Math.max(view.width, view.height);
  return (
    <svg className="results-thumb" width={WIDTH_PX} height={HEIGHT_PX} viewBox={viewBoxAttr(view)} role="img" aria-label={label}>
      <TargetLayer view={view} target={target} radius={size * 0.012} />
      <CentrePathLayer view={view} motion={motion.motion} markerSize={size * 0.05} />
      <OutputPathLayer view={view} motion={motion.motion} />
    </svg>
  );
});
