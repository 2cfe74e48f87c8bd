/**
 * The selected design: its figures, the linkage animated through its motion (play,
 * pause, a scrubber for the driver value), the error and transmission-angle plots, the
 * exports, and the line on what Loci does not check.
 */
import { useEffect, useMemo, useState } from 'react';
import type { CandidateReport } from '../../core/synthesis';
import { KINEMATICS_ONLY_CAUTION } from './export';
import { ExportPanel } from './ExportPanel';
import { defectsLabel, grashofLabel, outsideGuidelineLabel, referencePoseLabel, sizeOverMotionMm, transmissionRangeDeg } from './figures';
import { familyName, formatDegRange, formatDriver, formatMm, formatMmValue, formatSize } from './format';
import { DETAIL_STEPS, createSolveScratch, driverDisplayValue, driverFromDisplayValue, solveAt, type CandidateMotion } from './motion';
import { useMotionNow } from './motionStore';
import { MotionStage, type SolvedPose } from './MotionStage';
import { ErrorPlot, TransmissionPlot } from './plots';
import type { ResultsTarget } from './types';

/** Seconds for one pass through the motion (a full turn, or there and back). */
const CYCLE_S = 6;

export function DetailView({ candidate, rank, target }: { candidate: CandidateReport; rank: number; target: ResultsTarget }) {
  const result = useMotionNow(candidate, DETAIL_STEPS);
  const family = familyName(candidate.family);
  return (
    <section className="results-detail" aria-label="Selected design" data-testid="detail-view">
      <h3 className="results-heading">Rank {rank}: {family}</h3>
      <p className="results-caution" role="note">{KINEMATICS_ONLY_CAUTION}</p>
      {result.ok
        ? <DetailBody candidate={candidate} rank={rank} target={target} motion={result.motion} />
        : <p className="results-note">This design cannot be drawn: {result.reason}.</p>}
    </section>
  );
}

function DetailBody({ candidate, rank, target, motion }: { candidate: CandidateReport; rank: number; target: ResultsTarget; motion: CandidateMotion }) {
  const [phase, setPhase] = useState(0);
  const [playing, setPlaying] = useState(() => !prefersReducedMotion());
  useEffect(() => {
    if (!playing) return;
    let frame = 0;
    let last: number | null = null;
    const tick = (now: number) => {
      const dt = last === null ? 0 : (now - last) / 1000;
      last = now;
      setPhase((p) => (p + dt / CYCLE_S) % 1);
      frame = requestAnimationFrame(tick);
    };
    frame = requestAnimationFrame(tick);
    return () => cancelAnimationFrame(frame);
  }, [playing]);

  const value = valueAtPhase(motion, phase);
  const solved = useMemo((): SolvedPose => {
    const scratch = createSolveScratch(motion);
    const kind = solveAt(motion, value, scratch);
    return kind === 0
      ? { pose: null, centreKind: 0, centre: [Number.NaN, Number.NaN] }
      : { pose: scratch.pose, centreKind: kind, centre: [scratch.centre[0], scratch.centre[1]] };
  }, [motion, value]);

  const unit = motion.driver.unit;
  const from = driverDisplayValue(motion, motion.driver.from);
  const to = driverDisplayValue(motion, motion.driver.to);
  const shown = driverDisplayValue(motion, value);
  const scrubStep = Math.abs(to - from) / ((motion.steps - 1) * 4);
  const driverLabel = unit === 'deg' ? 'Driver angle' : 'Driver length';
  const family = familyName(candidate.family);

  return (
    <div className="results-detail-body">
      <div className="results-stage-column">
        <MotionStage motion={motion} target={target} solved={solved} title={`Rank ${rank}, ${family}: linkage, target, output path and instant-centre path`} />
        <ul className="results-legend">
          <li><span className="results-swatch results-swatch-target" />target points, with lines to the matched output points</li>
          <li><span className="results-swatch results-swatch-output" />output path of point {motion.output.pointId}</li>
          <li><span className="results-swatch results-swatch-centre" />instant-centre path of {motion.output.bodyId} relative to ground (dashed); arrows point to centres off the drawing or at infinity</li>
        </ul>
        <div className="results-player">
          <button type="button" onClick={() => setPlaying((p) => !p)} aria-pressed={playing}>
            {playing ? 'Pause' : 'Play'}
          </button>
          <label className="results-scrubber">
            <span>{driverLabel} ({unit})</span>
            <input
              type="range"
              min={Math.min(from, to)}
              max={Math.max(from, to)}
              step={scrubStep > 0 ? scrubStep : 'any'}
              value={shown}
              onChange={(event) => {
                setPlaying(false);
                setPhase(phaseAtValue(motion, driverFromDisplayValue(motion, Number(event.target.value))));
              }}
            />
            <output data-testid="driver-value">{formatDriver(shown, unit)}</output>
          </label>
        </div>
      </div>
      <div className="results-figures-column">
        <Figures candidate={candidate} motion={motion} />
        <ExportPanel candidate={candidate} rank={rank} target={target} motion={motion} pose={solved.pose} />
      </div>
      <div className="results-plots">
        <ErrorPlot perPointMm={candidate.error.perPointMm} rmsMm={candidate.error.rmsMm} />
        <TransmissionPlot motion={motion} cursor={value} />
      </div>
    </div>
  );
}

function Figures({ candidate, motion }: { candidate: CandidateReport; motion: CandidateMotion }) {
  const result = { ok: true as const, motion };
  const unit = motion.driver.unit;
  const transmission = transmissionRangeDeg(candidate, result);
  const outside = outsideGuidelineLabel(transmission);
  return (
    <>
      <dl className="results-figures">
        <dt>RMS error</dt><dd>{formatMm(candidate.error.rmsMm)}</dd>
        <dt>Max. error</dt><dd>{formatMm(candidate.error.maxMm)}</dd>
        <dt>Sum of squared errors</dt><dd>{formatMmValue(candidate.error.sumSquares)} mm²</dd>
        <dt>Grashof class</dt><dd>{grashofLabel(candidate, result)}</dd>
        <dt>Transmission angle</dt>
        <dd>
          {formatDegRange(transmission)}
          {outside !== null && ` (${outside}, the common guideline)`}
        </dd>
        <dt>Size over the motion</dt><dd>{formatSize(sizeOverMotionMm(candidate, result) ?? motion.sizeMm)}</dd>
        <dt>Motion</dt>
        <dd>
          {formatDriver(driverDisplayValue(motion, motion.driver.from), unit)} to {formatDriver(driverDisplayValue(motion, motion.driver.to), unit)}
          {motion.driver.fullTurn ? ' (a full turn)' : ''}
          {motion.unassembledSteps > 0 ? `; does not assemble at ${motion.unassembledSteps} of ${motion.steps} steps` : ''}
        </dd>
        <dt>Constraints</dt><dd>{candidate.feasible ? 'all met' : `not met (violation ${candidate.violation.toPrecision(3)})`}</dd>
        <dt>Defects</dt><dd>{defectsLabel(candidate)}</dd>
      </dl>
      <details className="results-joints">
        <summary>{referencePoseLabel(candidate)}</summary>
        <table>
          <thead><tr><th scope="col">joint</th><th scope="col">x (mm)</th><th scope="col">y (mm)</th><th scope="col">kind</th></tr></thead>
          <tbody>
            {candidate.linkage.joints.map((j) => (
              <tr key={j.id}><td>{j.id}</td><td className="results-num">{formatMmValue(j.x)}</td><td className="results-num">{formatMmValue(j.y)}</td><td>{j.ground ? 'ground pivot' : 'moving'}</td></tr>
            ))}
            {(candidate.linkage.points ?? []).map((p) => (
              <tr key={`p-${p.id}`}><td>{p.id}</td><td className="results-num">{formatMmValue(p.x)}</td><td className="results-num">{formatMmValue(p.y)}</td><td>point on {p.body}</td></tr>
            ))}
          </tbody>
        </table>
      </details>
    </>
  );
}

/** Phase in [0, 1) → driver value: once through a full turn, or there and back over a partial range. */
function valueAtPhase(motion: CandidateMotion, phase: number): number {
  const { from, to, fullTurn } = motion.driver;
  const share = fullTurn ? phase : 1 - Math.abs(1 - 2 * phase);
  return from + (to - from) * share;
}

function phaseAtValue(motion: CandidateMotion, value: number): number {
  const { from, to, fullTurn } = motion.driver;
  const span = to - from;
  const share = Math.abs(span) > 0 ? Math.min(1, Math.max(0, (value - from) / span)) : 0;
  return fullTurn ? share : share / 2;
}

function prefersReducedMotion(): boolean {
  return typeof window.matchMedia === 'function' && window.matchMedia('(prefers-reduced-motion: reduce)').matches;
}
