/**
 * `loci analyze LEG.json` for a leg file (format "loci-leg"): reads the design, takes
 * gaitFigures over one crank turn (and phasedLegs when the file phases several legs)
 * and prints them as JSON on stdout (gaitFiguresJson: units in the key names), with the
 * conventions and the caution. analyze.ts reads the file and hands its text here when
 * the file's `format` says so; the analysis is core's.
 */
import { GAIT_STEPS_RANGE, DEFAULT_GAIT_STEPS, gaitFigures, phasedLegs } from '../core/gait';
import { MAX_LEG_FILE_CHARS, parseLegFileText } from '../core/io/legFile';
import { gaitFiguresJson } from '../core/synthesis';
import { numberOption } from './args';
import { EXIT_OK, EXIT_USAGE } from './command';
import type { AnalyzeSuspensionInput } from './analyzeSuspension';
import { formatJson } from './formatJson';

/** The part of `loci analyze --help` about leg files. */
export const LEG_USAGE = `A leg file (format "loci-leg": a linkage, its foot, the ground line, the stance
tolerance, the crank's and the walking direction, optionally legs phased on one shaft)
is analysed over one crank turn instead. It prints JSON: "dutyFactor" (with its
"toleranceMm"), "strideMm", "stepHeightMm", "lowestMm", "stanceIntervalsDeg",
"stanceFlatness" (peak-to-peak and RMS, mm), "stanceSpeed" (mm per rad of crank, and
its variation), "transmissionInStance", "size", "phased" (feet on the ground, body
height ripple), "notes", "conventions" and "caution".

  --steps N         samples over the turn: ${GAIT_STEPS_RANGE[0]} to ${GAIT_STEPS_RANGE[1]} (default ${DEFAULT_GAIT_STEPS}).

A leg file is at most ${MAX_LEG_FILE_CHARS} characters. Loci computes kinematics only.
`;

const RAD_PER_DEG = Math.PI / 180;

/** Runs the analysis of a leg file; returns the exit code (0 done, 2 bad input). */
export function analyzeLegCommand(input: AnalyzeSuspensionInput): number {
  const { file, args, io, usageError } = input;
  for (const name of ['from', 'to', 'travel']) {
    if (args.options.has(name)) return usageError(`--${name} is not for a leg file: a leg is analysed over one full crank turn from its reference pose`);
  }
  const steps = numberOption(args, 'steps', `a whole number from ${GAIT_STEPS_RANGE[0]} to ${GAIT_STEPS_RANGE[1]}`);
  if (!steps.ok) return usageError(steps.message);
  if (steps.value !== undefined && !(Number.isInteger(steps.value) && steps.value >= GAIT_STEPS_RANGE[0] && steps.value <= GAIT_STEPS_RANGE[1])) {
    return usageError(`--steps: expected a whole number from ${GAIT_STEPS_RANGE[0]} to ${GAIT_STEPS_RANGE[1]}, got ${steps.value}`);
  }
  const loaded = parseLegFileText(input.text);
  if (!loaded.ok) {
    io.stderr(`${loaded.issues.map((issue) => `${file}: ${issue.path === '' ? '' : `${issue.path}: `}${issue.message}`).join('\n')}\n`);
    return EXIT_USAGE;
  }
  const { design } = loaded;
  const result = gaitFigures(design.linkage, design.leg, steps.value === undefined ? {} : { steps: steps.value });
  if (!result.ok) {
    io.stderr(`${file}: ${result.reason}\n`);
    return EXIT_USAGE;
  }
  let phased;
  if (design.phased !== undefined) {
    const p = phasedLegs(result.figures, { legs: design.phased.legs, phasesRad: design.phased.phasesDeg.map((d) => d * RAD_PER_DEG) });
    if (!p.ok) {
      io.stderr(`${file}: phased: ${p.reason}\n`);
      return EXIT_USAGE;
    }
    phased = p.figures;
  }
  const figures = gaitFiguresJson(result.figures, phased);
  io.stdout(`${formatJson(design.name === undefined ? figures : { name: design.name, ...figures })}\n`);
  return EXIT_OK;
}
