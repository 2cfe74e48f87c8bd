/**
 * The schema of a problem file of kind "leg" (format loci-problem, the same envelope as
 * a path problem's):
 *
 *   { "format": "loci-problem", "version": 1, "kind": "leg", "name": "…",
 *     "description"?: "…",
 *     "families": ["fourbar", "watt-i", …],
 *     "ground": { "kind": "level", "yMm" } | { "kind": "line", "point": { "x", "y" }, "direction": { "x", "y" } },
 *     "stanceToleranceMm": 1, "crankDirection": 1 | -1, "walkingDirection": 1 | -1,
 *     "steps"?: 180,
 *     "targets": {
 *       "footPath"?: { "points": [[x mm, y mm], …], "weight"?, "toleranceMm"? },
 *       "strideMm"?: { "value", "weight"?, "toleranceMm"? },
 *       "stepHeightMm"?: { "value", "weight"?, "toleranceMm"? },
 *       "minDutyFactor"?: { "min", "weight"?, "tolerance"? },
 *       "maxFlatnessMm"?: { "max", "weight"?, "toleranceMm"? },
 *       "maxSpeedVariation"?: { "max", "weight"?, "tolerance"? },
 *       "minTransmissionDegInStance"?: { "min", "weight"?, "toleranceDeg"? },
 *       "sizeBoxMm"?: { "widthMm", "heightMm", "weight"?, "toleranceMm"? } },
 *     "keepOut"?: [{ "name"?, "x", "y", "r" }, …],
 *     "bounds"?: { "fourbar": { "A0.x": [lower, upper], … } } }
 *
 * The schema checks shapes and types and refuses unknown fields; the meaning (ranges,
 * families, variable names, lower < upper) is createLegProblem's.
 */
import * as z from 'zod';
import { LEG_FAMILY_IDS } from '../synthesis/legProblem';
import { expected, quoteList, strict } from './schemaMessages';

const num = (what: string) => z.number({ error: expected(what) }).refine(Number.isFinite, { error: expected(what) });
const weight = num('a weight ≥ 0').optional();
const mmTolerance = num('a tolerance in mm').optional();
const xy = (what: string) => strict(`${what} { "x", "y" } in mm`, { x: num('a number of mm'), y: num('a number of mm') });
const sense = (what: string) => z.union([z.literal(1), z.literal(-1)], { error: expected(what) });
const familyEnum = z.enum(LEG_FAMILY_IDS, { error: expected(`a leg family, one of ${quoteList(LEG_FAMILY_IDS)}`) });

export const groundSchema = z.discriminatedUnion(
  'kind',
  [
    strict('a level ground line { "kind": "level", "yMm" }', { kind: z.literal('level'), yMm: num('a height in mm') }),
    strict('a ground line { "kind": "line", "point", "direction" }', { kind: z.literal('line'), point: xy('a point of the line'), direction: xy('a direction along the line') }),
  ],
  { error: expected('a ground line, { "kind": "level", "yMm" } or { "kind": "line", "point", "direction" }') },
);
export const crankDirectionSchema = sense('1 (the crank turns counter-clockwise) or -1 (clockwise)');
export const walkingDirectionSchema = sense('1 (the body walks towards +x) or -1 (towards −x)');

export const legProblemShape = {
  kind: z.literal('leg'),
  families: z.array(familyEnum, { error: expected('an array of leg families') }),
  ground: groundSchema,
  stanceToleranceMm: num('a stance tolerance in mm'),
  crankDirection: crankDirectionSchema,
  walkingDirection: walkingDirectionSchema,
  steps: num('a whole number of foot samples per crank turn').optional(),
  targets: strict('targets', {
    footPath: strict('a foot trajectory { "points", "weight"?, "toleranceMm"? }', {
      points: z.array(z.array(num('a number of mm'), { error: expected('a point [x mm, y mm]') }), { error: expected('an array of points [x mm, y mm]') }),
      weight,
      toleranceMm: mmTolerance,
    }).optional(),
    strideMm: strict('a stride target { "value", "weight"?, "toleranceMm"? }', { value: num('a stride in mm'), weight, toleranceMm: mmTolerance }).optional(),
    stepHeightMm: strict('a step-height target { "value", "weight"?, "toleranceMm"? }', { value: num('a step height in mm'), weight, toleranceMm: mmTolerance }).optional(),
    minDutyFactor: strict('a duty-factor limit { "min", "weight"?, "tolerance"? }', { min: num('a share of the turn (0.5 for half)'), weight, tolerance: num('a share of the turn').optional() }).optional(),
    maxFlatnessMm: strict('a flatness limit { "max", "weight"?, "toleranceMm"? }', { max: num('a peak-to-peak height in mm'), weight, toleranceMm: mmTolerance }).optional(),
    maxSpeedVariation: strict('a speed-variation limit { "max", "weight"?, "tolerance"? }', { max: num('a ratio ((max − min) / mean)'), weight, tolerance: num('a ratio').optional() }).optional(),
    minTransmissionDegInStance: strict('a transmission-angle limit { "min", "weight"?, "toleranceDeg"? }', { min: num('an angle in degrees'), weight, toleranceDeg: num('an angle in degrees').optional() }).optional(),
    sizeBoxMm: strict('a size box { "widthMm", "heightMm", "weight"?, "toleranceMm"? }', { widthMm: num('a width in mm'), heightMm: num('a height in mm'), weight, toleranceMm: mmTolerance }).optional(),
  }),
  keepOut: z
    .array(strict('a keep-out circle { "name"?, "x", "y", "r" } in mm', { name: z.string({ error: expected('a name string') }).optional(), x: num('a number of mm'), y: num('a number of mm'), r: num('a radius in mm') }), {
      error: expected('an array of keep-out circles'),
    })
    .optional(),
  bounds: z
    .partialRecord(familyEnum, z.record(z.string(), z.tuple([num('a number'), num('a number')], { error: expected('[lower, upper], two numbers') }), { error: expected('an object of variable name → [lower, upper]') }), {
      error: expected('an object of family → bounds'),
    })
    .optional(),
};
