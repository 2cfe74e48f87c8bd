/**
 * The foot's height above the ground line and its backward speed along the ground over
 * the crank's turn, stance shaded, the stance tolerance band on the height plot: for one
 * leg, or several on shared axes.
 */
import { memo, useMemo } from 'react';
import type { GaitFigures } from '../../../core/gait';
import { figure } from '../../suspension/labels';
import { LegCaution } from './LegCaution';
import { DEG_PER_RAD, stanceRangesDeg } from './legGeometry';
import { TurnPlot, type TurnBand, type TurnSeries } from './TurnPlot';

export interface PlottedLeg {
  readonly label: string;
  readonly figures: GaitFigures;
  readonly colour: string;
  readonly dash?: string;
}

/** The colour of a single leg's curves (legViews.css names the same ink for its stance). */
export const SINGLE_LEG_COLOUR = '#1f5fa8';

function seriesOf(legs: readonly PlottedLeg[], values: (f: GaitFigures) => ArrayLike<number>): TurnSeries[] {
  return legs.map((l) => ({
    label: l.label,
    angleDeg: Float64Array.from(l.figures.path.turnRad, (t) => t * DEG_PER_RAD),
    values: values(l.figures),
    colour: l.colour,
    ...(l.dash === undefined ? {} : { dash: l.dash }),
    stance: stanceRangesDeg(l.figures),
  }));
}

/**
 * Both plots for one or more legs; the tolerance band is drawn when every leg has the same
 * tolerance. `caution`: show the walking-leg caution under them (a page that shows it once
 * for all its views passes false).
 */
export const GaitPlotsOf = memo(function GaitPlotsOf({ legs, caution = true }: { legs: readonly PlottedLeg[]; caution?: boolean }) {
  const { height, speed, bands } = useMemo(() => {
    const tols = [...new Set(legs.map((l) => l.figures.stance.toleranceMm))];
    const band: TurnBand[] = tols.length === 1 ? [{ lo: -tols[0], hi: tols[0], label: `stance tolerance ±${figure(tols[0])} mm of the ground line` }] : [];
    return {
      height: seriesOf(legs, (f) => f.path.heightMm),
      speed: seriesOf(legs, (f) => Float64Array.from(f.path.alongRateMmPerRad, (v) => -v)),
      bands: band,
    };
  }, [legs]);
  const sameTolerance = bands.length > 0;
  return (
    <div className="leg-plots">
      <TurnPlot title="Foot height above the ground line" yLabel="foot height (mm)" series={height} bands={bands} zeroLine testId="leg-height-plot" />
      <TurnPlot title="Backward foot speed along the ground" yLabel="backward speed (mm/rad of crank)" series={speed} zeroLine testId="leg-speed-plot" />
      {!sameTolerance && <p className="leg-note">The legs have different stance tolerances, so no common tolerance band is drawn; each leg’s stance strip uses its own.</p>}
      <p className="leg-note">
        Backward speed: the foot’s speed relative to the body along the ground line, positive when it pushes the body forward, in mm per radian of crank (mm/s at 1 rad/s).
      </p>
      {caution && <LegCaution />}
    </div>
  );
});

/** The plots of one leg; `caution` as for GaitPlotsOf. */
export const GaitPlots = memo(function GaitPlots({ figures, caution = true }: { figures: GaitFigures; caution?: boolean }) {
  const legs = useMemo(() => [{ label: 'foot', figures, colour: SINGLE_LEG_COLOUR }], [figures]);
  return <GaitPlotsOf legs={legs} caution={caution} />;
});
