/**
 * `loci analyze DESIGN.json [--from A --to B] [--steps N]`: reads a linkage file and
 * prints its kinematic report (src/core/linkage/report.ts) as JSON on stdout. Only the
 * arguments and the file are handled here; the analysis is core's.
 */
import { MAX_LINKAGE_FILE_CHARS, readLinkageFileText } from '../core/io/linkageFile';
import { MAX_LISTED_ISSUES } from '../core/io/schemaMessages';
import {
  MAX_BODIES,
  MAX_COORDINATE_MM,
  MAX_ID_LENGTH,
  MAX_JOINTS,
  MAX_POINTS,
  MAX_REACH_OVER_SHORTEST_LINK,
  MAX_SLIDERS,
} from '../core/linkage/model';
import {
  DEFAULT_REPORT_STEPS,
  LENGTH_DRIVER_DEFAULT_SHARE,
  MAX_REPORT_STEPS,
  analyzeLinkage,
} from '../core/linkage/report';
import { numberOption, singleFile, type OptionSpec } from './args';
import { EXIT_OK, EXIT_USAGE, startCommand, type CliIo } from './command';
import { SUSPENSION_FILE_FORMAT, fileFormatOf } from '../core/io/suspensionFile';
import { SUSPENSION_USAGE, analyzeSuspensionCommand } from './analyzeSuspension';
import { LEG_USAGE, analyzeLegCommand } from './analyzeLeg';
import { LEG_FILE_FORMAT } from '../core/io/legFile';
import { formatJson } from './formatJson';
import { MAX_INPUT_FILE_BYTES } from './nodeIo';

/** A rotation driver's --from and --to: ten turns either way; more repeat the same positions. */
const MAX_DRIVER_ANGLE_DEG = 3600;
/** A length driver's: the farthest two joints can be apart within ±MAX_COORDINATE_MM (2√2 × 1e6 mm), rounded up. */
const MAX_DRIVER_LENGTH_MM = 3 * MAX_COORDINATE_MM;

export const usage = `usage: loci analyze DESIGN.json [--from A --to B] [--steps N] [--travel MM]

Reads a linkage file (format "loci-linkage") and prints a JSON report: the driver range
used, joint and point paths, mobility, the Grashof class (Barker type and name) and the
transmission-angle range of every four-bar loop, the instant centre of every body
relative to ground, defects (locks, dead-centres) and the closure residual.

  --from A, --to B  driver range. A rotation driver in degrees: the absolute angle of
                    its pivot-to-tip line, counter-clockwise from +x (--from -90 works),
                    within ±${MAX_DRIVER_ANGLE_DEG}°. A length driver in mm, above 0 and at most
                    ${MAX_DRIVER_LENGTH_MM}. Give both or neither. Default: a full turn
                    from the reference angle when the driven link turns fully, else the
                    range the linkage assembles in around its reference pose; a length
                    driver its reference length ± ${LENGTH_DRIVER_DEFAULT_SHARE * 100} %.
  --steps N         driver values, both ends included: 2 to ${MAX_REPORT_STEPS} (default ${DEFAULT_REPORT_STEPS}).
  --help, -h        this text.

Limits (more is refused, exit 2): a file of ${MAX_INPUT_FILE_BYTES / 1048576} MiB, a linkage file of ${MAX_LINKAGE_FILE_CHARS}
characters; ${MAX_JOINTS} joints, ${MAX_BODIES} bodies, ${MAX_POINTS} points, ${MAX_SLIDERS} sliders; coordinates within
±${MAX_COORDINATE_MM} mm; the largest |coordinate| at most ${MAX_REACH_OVER_SHORTEST_LINK} × the shortest link; ids of at
most ${MAX_ID_LENGTH} printable characters. At most ${MAX_LISTED_ISSUES} problems are listed, then a count of the rest.

Exit codes: 0 done, 2 bad input (unreadable or too large file, not JSON, schema or
compile errors, a limit above, bad flags), 1 an unexpected failure (a bug).

${SUSPENSION_USAGE}
${LEG_USAGE}`;

const OPTIONS: readonly OptionSpec[] = [
  { name: 'from', kind: 'value' },
  { name: 'to', kind: 'value' },
  { name: 'steps', kind: 'value' },
  { name: 'travel', kind: 'value' },
  { name: 'help', kind: 'flag' },
];

const RAD_PER_DEG = Math.PI / 180;

export async function run(args: readonly string[], io: CliIo): Promise<number> {
  const start = startCommand('analyze', usage, args, OPTIONS, io);
  if (typeof start === 'number') return start;
  const { usageError } = start;
  const one = singleFile(start.args, 'linkage file');
  if (!one.ok) return usageError(one.message);
  const file = one.file;

  const from = numberOption(start.args, 'from', 'a number (degrees for a rotation driver, mm for a length driver)');
  if (!from.ok) return usageError(from.message);
  const to = numberOption(start.args, 'to', 'a number (degrees for a rotation driver, mm for a length driver)');
  if (!to.ok) return usageError(to.message);
  const steps = numberOption(start.args, 'steps', `a whole number from 2 to ${MAX_REPORT_STEPS}`);
  if (!steps.ok) return usageError(steps.message);
  if ((from.value === undefined) !== (to.value === undefined)) {
    return usageError(`--from and --to go together; got only --${from.value === undefined ? 'to' : 'from'}`);
  }

  const read = await io.readTextFile(file);
  if (!read.ok) {
    io.stderr(`loci analyze: ${read.message}\n`);
    return EXIT_USAGE;
  }
  const format = fileFormatOf(read.text);
  if (format === SUSPENSION_FILE_FORMAT) {
    return analyzeSuspensionCommand({ file, text: read.text, args: start.args, io, usageError });
  }
  if (format === LEG_FILE_FORMAT) return analyzeLegCommand({ file, text: read.text, args: start.args, io, usageError });
  if (start.args.options.has('travel')) {
    return usageError('--travel is for a suspension file (format "loci-suspension"); a linkage file takes --from and --to');
  }
  const loaded = readLinkageFileText(read.text);
  if (!loaded.ok) {
    const lines = loaded.issues.map((issue) => `${file}: ${issue.path === '' ? '' : `${issue.path}: `}${issue.message}`);
    io.stderr(`${lines.join('\n')}\n`);
    return EXIT_USAGE;
  }
  const rotation = loaded.linkage.driver.kind === 'rotation';
  for (const [name, option] of [['from', from], ['to', to]] as const) {
    const v = option.value;
    if (v === undefined) continue;
    const problem = rotation
      ? (Math.abs(v) <= MAX_DRIVER_ANGLE_DEG ? null : `expected a driver angle within ±${MAX_DRIVER_ANGLE_DEG}° (ten turns either way), got ${v}`)
      : (v > 0 && v <= MAX_DRIVER_LENGTH_MM ? null : `expected a driver length above 0 and at most ${MAX_DRIVER_LENGTH_MM} mm (no two joints within the coordinate limit are further apart), got ${v}`);
    if (problem !== null) {
      io.stderr(`loci analyze: --${name}: ${problem}\n`);
      return EXIT_USAGE;
    }
  }
  const scale = rotation ? RAD_PER_DEG : 1;
  const result = analyzeLinkage(loaded.plan, {
    ...(from.value !== undefined && to.value !== undefined ? { range: { from: from.value * scale, to: to.value * scale } } : {}),
    ...(steps.value !== undefined ? { steps: steps.value } : {}),
  });
  if (!result.ok) {
    const lines = result.issues.map((issue) =>
      issue.path === 'driver' ? `${file}: driver: ${issue.message}` : `loci analyze: --${issue.path}: ${issue.message}`);
    io.stderr(`${lines.join('\n')}\n`);
    return EXIT_USAGE;
  }
  const output = loaded.name === undefined ? result.report : { name: loaded.name, ...result.report };
  io.stdout(`${formatJson(output)}\n`);
  return EXIT_OK;
}
