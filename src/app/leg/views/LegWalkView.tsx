/**
 * The leg walking over the ground, drawn in the body's frame: the hip and crank stay put
 * and the ground (its hatching) passes beneath at the mean stance speed. The ground line,
 * the stance tolerance band, the foot's trajectory with stance drawn thick, and the
 * linkage posed by the core's solver at the crank angle of a slider, or turning with
 * play (requestAnimationFrame, stopped when paused or unmounted).
 */
import { memo, useEffect, useId, useMemo, useState } from 'react';
import type { GaitFigures } from '../../../core/gait';
import type { LegDesign } from '../../../core/io/legFile';
import { num, viewBoxAttr, viewOf, type View } from '../../results/drawing';
import { FrameLayer, JointLabels } from '../../results/PathLayers';
import { figure } from '../../suspension/labels';
import { LegCaution } from './LegCaution';
import { groundHatchD, legPoseShapes, legStatic } from './legDrawing';
import { DEG_PER_RAD, groundSpeedMmPerRad, heightOf, inStanceAt, legBox, legPoser } from './legGeometry';

/** Crank speed of the animation: one turn in six seconds. */
const PLAY_DEG_PER_SECOND = 60;
/** A frame longer than this (ms, a tab in the background) advances the animation by no more. */
const MAX_FRAME_MS = 100;
const LINK_COLOUR = '#2f6b3a';

function walkArrowD(view: View, along: { x: number; y: number }): { d: string; labelX: number; labelY: number } {
  const size = Math.max(view.width, view.height);
  const length = 0.12 * size;
  const head = 0.025 * size;
  const ux = along.x;
  const uy = -along.y;
  const sx = view.x + 0.05 * view.width + (ux < 0 ? length : 0);
  const sy = view.y + 0.06 * view.height;
  const ex = sx + ux * length;
  const ey = sy + uy * length;
  const p = (x: number, y: number) => `${num(x, view.decimals)},${num(y, view.decimals)}`;
  // Head: back along the arrow and out to each side.
  const bx = ex - ux * head;
  const by = ey - uy * head;
  return {
    d: `M${p(sx, sy)}L${p(ex, ey)}M${p(bx - uy * head * 0.6, by + ux * head * 0.6)}L${p(ex, ey)}L${p(bx + uy * head * 0.6, by - ux * head * 0.6)}`,
    labelX: view.x + 0.05 * view.width,
    labelY: sy + 0.05 * size,
  };
}

/** `caution`: show the walking-leg caution under the view (a page that shows it once for all its views passes false). */
export const LegWalkView = memo(function LegWalkView({ design, figures, caution = true }: { design: LegDesign; figures: GaitFigures; caution?: boolean }) {
  const sliderId = useId();
  const poser = useMemo(() => legPoser(design.linkage, figures), [design.linkage, figures]);
  const view = useMemo(() => viewOf(legBox(figures)), [figures]);
  const still = useMemo(() => legStatic(view, figures, poser), [view, figures, poser]);
  const arrow = useMemo(() => walkArrowD(view, figures.leg.along), [view, figures]);
  // The crank angle turned since the reference pose, degrees, not wrapped: the ground keeps moving on over many turns.
  const [turnedDeg, setTurnedDeg] = useState(0);
  const [playing, setPlaying] = useState(false);

  useEffect(() => {
    if (!playing) return undefined;
    let frame = 0;
    let last: number | null = null;
    const tick = (now: number) => {
      if (last !== null) {
        const ms = Math.min(MAX_FRAME_MS, Math.max(0, now - last));
        setTurnedDeg((a) => a + (ms / 1000) * PLAY_DEG_PER_SECOND);
      }
      last = now;
      frame = requestAnimationFrame(tick);
    };
    frame = requestAnimationFrame(tick);
    return () => cancelAnimationFrame(frame);
  }, [playing]);

  const angleDeg = turnedDeg - 360 * Math.floor(turnedDeg / 360);
  const t = angleDeg / DEG_PER_RAD;
  const pose = useMemo(() => {
    if (poser === null) return null;
    const out = new Float64Array(2 * poser.plan.slotCount);
    return poser.poseAt(t, out) ? out : null;
  }, [poser, t]);
  const shapes = poser !== null && pose !== null ? legPoseShapes(view, poser, pose) : null;
  const speed = groundSpeedMmPerRad(figures);
  const hatch = groundHatchD(view, figures, speed === null ? 0 : -speed * (turnedDeg / DEG_PER_RAD));
  const size = Math.max(view.width, view.height);
  const foot = shapes?.foot ?? null;
  const footHeight = foot === null ? Number.NaN : heightOf(figures, { x: foot.x, y: -foot.y });
  const inStance = inStanceAt(figures.stance.intervals, t);
  const title = `${design.name ?? 'Leg'} walking over the ground line: foot trajectory with stance marked, linkage at ${angleDeg.toFixed(1)}° of crank`;

  return (
    <figure className="leg-walk" data-testid="leg-walk-view">
      <svg className="leg-stage" viewBox={viewBoxAttr(view)} role="img" aria-label={title}>
        <FrameLayer view={view} />
        <path d={still.bandD} className="leg-band" data-testid="leg-tolerance-band"><title>{`stance tolerance band: ±${figure(figures.stance.toleranceMm)} mm about the ground line`}</title></path>
        <path d={hatch} className="leg-hatch" vectorEffect="non-scaling-stroke" />
        <path d={still.groundD} className="leg-ground" vectorEffect="non-scaling-stroke" data-testid="leg-ground-line"><title>ground line</title></path>
        <path d={still.pathD} className="leg-swing" vectorEffect="non-scaling-stroke" data-testid="leg-foot-path"><title>foot trajectory over one crank turn (swing dashed)</title></path>
        <path d={still.stanceD} className="leg-stance" vectorEffect="non-scaling-stroke" data-testid="leg-stance-path"><title>stance: the foot within the tolerance of the ground line</title></path>
        {still.stanceEnds.map((e, i) => (
          <circle key={i} className={e.end === 'start' ? 'leg-stance-start' : 'leg-stance-end'} cx={e.x} cy={e.y} r={size * 0.007} vectorEffect="non-scaling-stroke">
            <title>{e.end === 'start' ? 'touch-down' : 'lift-off'}</title>
          </circle>
        ))}
        <path d={arrow.d} className="leg-walk-arrow" vectorEffect="non-scaling-stroke" />
        <text className="leg-walk-arrow-label" x={arrow.labelX} y={arrow.labelY} fontSize={size * 0.026}>walking direction</text>
        {shapes !== null && (
          <g data-testid="leg-linkage">
            {shapes.links.map((l) => <path key={l.bodyId} d={l.d} className="leg-link" vectorEffect="non-scaling-stroke"><title>{l.bodyId}</title></path>)}
            {shapes.joints.map((j) => j.ground
              ? <rect key={j.id} className="leg-ground-pivot" x={j.x - size * 0.008} y={j.y - size * 0.008} width={size * 0.016} height={size * 0.016} />
              : <circle key={j.id} className="leg-joint" cx={j.x} cy={j.y} r={size * 0.006} vectorEffect="non-scaling-stroke" />)}
            {shapes.foot !== null && <circle className={inStance ? 'leg-foot leg-foot-stance' : 'leg-foot'} cx={shapes.foot.x} cy={shapes.foot.y} r={size * 0.011}><title>foot</title></circle>}
            <JointLabels joints={shapes.joints} offset={size * 0.012} fontSize={size * 0.028} colour={LINK_COLOUR} />
          </g>
        )}
        {pose === null && (
          <text className="leg-stage-note" x={view.x + view.width / 2} y={view.y + size * 0.12} textAnchor="middle" fontSize={size * 0.035}>
            the linkage does not assemble at this crank angle
          </text>
        )}
      </svg>
      <div className="leg-walk-controls">
        <button type="button" aria-pressed={playing} onClick={() => setPlaying((p) => !p)} data-testid="leg-play">{playing ? 'Pause' : 'Play'}</button>
        <label htmlFor={sliderId}>Crank angle from the reference pose (°)</label>
        <input
          id={sliderId}
          type="range"
          min={0}
          max={359.5}
          step={0.5}
          value={Math.round(angleDeg * 2) / 2}
          aria-valuetext={`${angleDeg.toFixed(1)}°`}
          onChange={(e) => {
            const v = Number(e.target.value);
            setTurnedDeg((a) => 360 * Math.floor(a / 360) + v);
          }}
          data-testid="leg-angle"
        />
        <output htmlFor={sliderId}>{`${angleDeg.toFixed(1)}°`}</output>
        <span className="leg-walk-readout" data-testid="leg-foot-readout">
          {`foot ${Number.isFinite(footHeight) ? `${figure(footHeight)} mm` : '—'} above the ground line, ${inStance ? 'in stance' : 'in swing'}`}
          {speed !== null && `; body walked ${figure(speed * (turnedDeg / DEG_PER_RAD), 3)} mm over ${figure(turnedDeg / 360, 3)} turns`}
        </span>
      </div>
      <figcaption className="leg-note">
        {speed === null
          ? 'Drawn in the body’s frame: the hip and the crank stay put. The ground does not move here, because no stance pushes the body forward.'
          : `Drawn in the body’s frame: the hip and the crank stay put and the ground passes beneath at the mean stance speed, ${figure(speed)} mm per radian of crank, the speed the body walks at when other legs carry it through the swing. In stance the foot keeps pace with the ground as far as its speed is constant.`}
        {' '}Thick: stance (within ±{figure(figures.stance.toleranceMm)} mm of the ground line, the shaded band); dashed: the whole trajectory. mm, y up; the crank turns {figures.leg.crankDirection === 1 ? 'counter-clockwise' : 'clockwise'}.
      </figcaption>
      {caution && <LegCaution />}
    </figure>
  );
});
