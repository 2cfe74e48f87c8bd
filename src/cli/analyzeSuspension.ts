/**
 * `loci analyze DESIGN.json` for a suspension file (format "loci-suspension"): reads the
 * design, runs suspensionCurves and prints the curves, a summary, the conventions and
 * the caution as JSON on stdout. analyze.ts reads the file and hands its text here when
 * the file's `format` says so; the analysis is core's.
 */
import { MAX_SUSPENSION_FILE_CHARS, parseSuspensionFileText, type SuspensionDesign } from '../core/io/suspensionFile';
import { instantCentreKindName } from '../core/io/suspensionCsv';
import { IC_FINITE, IC_INFINITE } from '../core/linkage/analysis';
import type { Linkage } from '../core/linkage';
import { AXLE_POINT, DEFAULT_STEPS, SHOCK_EYE, SHOCK_FRAME_EYE, STEPS_RANGE, suspensionCurves, type SuspensionReport } from '../core/suspension';
import { numberOption, type ParsedArgs } from './args';
import { EXIT_OK, EXIT_USAGE, type CliIo } from './command';
import { formatJson } from './formatJson';

/** The part of `loci analyze --help` about suspension files. */
export const SUSPENSION_USAGE = `A suspension file (format "loci-suspension": a bicycle and a rear-suspension layout
drawn at full extension) is analysed over the wheel travel instead. It prints JSON:
"bodies" (the bodies that carry the rear axle and the shock's two eyes), "summary"
(wheel travel, leverage ratio at the start and end, progression, anti-squat at sag
per cog, kickback and axle rearward movement at full travel), "curves" (one value
per step, units in the key names), "conventions" and "caution".

  --steps N         samples over the travel, both ends included: ${STEPS_RANGE[0]} to ${STEPS_RANGE[1]} (default ${DEFAULT_STEPS}).
  --travel MM       sweep to this vertical wheel travel (mm) instead of the whole stroke.

A suspension file is at most ${MAX_SUSPENSION_FILE_CHARS} characters. Loci computes kinematics only.
`;

export interface AnalyzeSuspensionInput {
  /** The file's name as given, for messages. */
  readonly file: string;
  /** The file's text, already read (and held to the readers' byte limit). */
  readonly text: string;
  readonly args: ParsedArgs;
  readonly io: CliIo;
  /** Reports a bad flag: its message, then the help; returns exit 2. */
  readonly usageError: (message: string) => number;
}

/** Runs the analysis of a suspension file; returns the exit code (0 done, 2 bad input). */
export function analyzeSuspensionCommand(input: AnalyzeSuspensionInput): number {
  const { file, args, io, usageError } = input;
  for (const name of ['from', 'to']) {
    if (args.options.has(name)) return usageError(`--${name} sets a linkage's driver range; a suspension file sweeps the shock's stroke (use --travel MM to stop short)`);
  }
  const steps = numberOption(args, 'steps', `a whole number from ${STEPS_RANGE[0]} to ${STEPS_RANGE[1]}`);
  if (!steps.ok) return usageError(steps.message);
  if (steps.value !== undefined && !(Number.isInteger(steps.value) && steps.value >= STEPS_RANGE[0] && steps.value <= STEPS_RANGE[1])) {
    return usageError(`--steps: expected a whole number from ${STEPS_RANGE[0]} to ${STEPS_RANGE[1]}, got ${steps.value}`);
  }
  const travel = numberOption(args, 'travel', 'a wheel travel in mm, a positive number');
  if (!travel.ok) return usageError(travel.message);
  if (travel.value !== undefined && !(travel.value > 0)) return usageError(`--travel: expected a wheel travel in mm, a positive number, got ${travel.value}`);

  const loaded = parseSuspensionFileText(input.text);
  if (!loaded.ok) {
    const lines = loaded.issues.map((issue) => `${file}: ${issue.path === '' ? '' : `${issue.path}: `}${issue.message}`);
    io.stderr(`${lines.join('\n')}\n`);
    return EXIT_USAGE;
  }
  const { design } = loaded;
  const result = suspensionCurves(loaded.linkage, design.bicycle, {
    ...(steps.value === undefined ? {} : { steps: steps.value }),
    ...(travel.value === undefined ? {} : { travelMm: travel.value }),
    ...(design.layout.floatingBrakeBody === undefined ? {} : { floatingBrakeBody: design.layout.floatingBrakeBody }),
  });
  if (!result.ok) {
    io.stderr(`${file}: ${result.reason}\n${drawnShockNote(design)}`);
    return EXIT_USAGE;
  }
  const bodies = layoutBodies(loaded.linkage);
  io.stdout(`${formatJson({ ...(design.name === undefined ? {} : { name: design.name }), layout: design.layout.kind, bodies, ...suspensionReportJson(result.report) })}\n`);
  return EXIT_OK;
}

/** The bodies that carry the rear axle and the shock's two eyes ("frontFrame" for the ground body), by their ids in the layout. */
function layoutBodies(linkage: Linkage): { axle: string; shockEye: string; shockFrameEye: string } {
  const holding = (joint: string) => linkage.bodies.find((b) => b.joints.includes(joint))?.id ?? 'frontFrame';
  const onFrame = (joint: string) => linkage.joints.find((j) => j.id === joint)?.ground === true;
  return {
    axle: linkage.points?.find((p) => p.id === AXLE_POINT)?.body ?? 'frontFrame',
    shockEye: holding(SHOCK_EYE),
    shockFrameEye: onFrame(SHOCK_FRAME_EYE) ? 'frontFrame' : holding(SHOCK_FRAME_EYE),
  };
}

/** Drawn shock eyes further from the bicycle's eye-to-eye length than this (mm) are pointed out beside a failure. */
const DRAWN_SHOCK_NOTE_TOL_MM = 1e-6;

/** A line naming both fields when the shock is drawn at another length than the bicycle's eye-to-eye length, else ''. */
function drawnShockNote(design: SuspensionDesign): string {
  const eye = design.layout.pivots.shockEye;
  const frame = design.layout.pivots.shockFrameEye;
  const drawnMm = Math.hypot(eye.x - frame.x, eye.y - frame.y);
  const eyeToEyeMm = design.bicycle.shock.eyeToEyeMm;
  if (!(Math.abs(drawnMm - eyeToEyeMm) > DRAWN_SHOCK_NOTE_TOL_MM)) return '';
  return `note: layout.pivots.shockEye and layout.pivots.shockFrameEye are drawn ${Number(drawnMm.toPrecision(6))} mm apart; bicycle.shock.eyeToEyeMm is ${eyeToEyeMm} mm. ` +
    'The layout is drawn at full extension, so the two are expected equal.\n';
}

const list = (a: ArrayLike<number>): number[] => Array.from(a);

/**
 * The report as plain JSON with units in the key names. Every number in full; a value
 * that does not exist (no chain line, a centre at infinity in the position keys) is null.
 */
export function suspensionReportJson(report: SuspensionReport) {
  const c = report.curves;
  const last = c.steps - 1;
  const sag = report.sagPoint;
  let rearwardMax = -Infinity;
  let rearwardMin = Infinity;
  for (let k = 0; k < c.steps; k++) {
    rearwardMax = Math.max(rearwardMax, c.rearwardMm[k]);
    rearwardMin = Math.min(rearwardMin, c.rearwardMm[k]);
  }
  const ic = c.icPath;
  const where = (keep: number, values: Float64Array) => Array.from(values, (v, k) => (ic.kind[k] === keep ? v : null));
  return {
    summary: {
      wheelTravelMm: report.totalTravelMm,
      strokeWheelTravelMm: report.strokeTravelMm,
      shockTravelMm: c.shockTravelMm[last],
      leverageRatioStart: report.leverageRatioStart,
      leverageRatioEnd: report.leverageRatioEnd,
      progressionPct: report.progressionPct,
      sagWheelTravelMm: sag.travelMm,
      sagShockLengthMm: sag.shockLengthMm,
      sagLeverageRatio: sag.leverageRatio,
      sagAntiRisePct: sag.antiRisePct,
      sagAntiRiseFloatingBrakePct: sag.antiRiseFloatingPct,
      sagWheelRateNPerMm: sag.wheelRateNPerMm,
      chainringTeeth: report.chainringTeeth,
      cogTeeth: [...report.cogTeeth],
      antiSquatAtSagPct: sag.antiSquatPct,
      kickbackAtFullTravelDeg: c.kickbackDeg.map((a) => a[last]),
      chainGrowthAtFullTravelMm: c.chainGrowthMm.map((a) => a[last]),
      axleRearwardAtFullTravelMm: c.rearwardMm[last],
      axleRearwardMaxMm: rearwardMax,
      axleRearwardMinMm: rearwardMin,
    },
    curves: {
      steps: c.steps,
      travelMm: list(c.travelMm),
      shockLengthMm: list(c.shockLengthMm),
      shockTravelMm: list(c.shockTravelMm),
      axleXMm: list(c.axleXMm),
      axleYMm: list(c.axleYMm),
      axleRearwardMm: list(c.rearwardMm),
      leverageRatio: list(c.leverageRatio),
      springForceN: c.springForceN === null ? null : list(c.springForceN),
      wheelRateNPerMm: c.wheelRateNPerMm === null ? null : list(c.wheelRateNPerMm),
      antiRisePct: list(c.antiRisePct),
      antiRiseFloatingBrakePct: c.antiRiseFloatingPct === null ? null : list(c.antiRiseFloatingPct),
      instantCentre: {
        kind: Array.from(ic.kind, instantCentreKindName),
        xMm: where(IC_FINITE, ic.xMm),
        yMm: where(IC_FINITE, ic.yMm),
        directionX: where(IC_INFINITE, ic.xMm),
        directionY: where(IC_INFINITE, ic.yMm),
      },
      perCog: c.cogTeeth.map((teeth, i) => ({
        cogTeeth: teeth,
        antiSquatPct: list(c.antiSquatPct[i]),
        chainGrowthMm: list(c.chainGrowthMm[i]),
        chainGrowthTurningCogMm: list(c.chainGrowthTurningCogMm[i]),
        kickbackDeg: list(c.kickbackDeg[i]),
      })),
    },
    conventions: [...report.conventions],
    caution: report.caution,
  };
}
