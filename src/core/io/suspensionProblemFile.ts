/**
 * The schema of a problem file of kind "suspension" (format loci-problem, the same
 * envelope as a path problem's):
 *
 *   { "format": "loci-problem", "version": 1, "kind": "suspension", "name": "…",
 *     "description"?: "…",
 *     "bicycle": { …every field of a bicycle, as in a suspension design file… },
 *     "layouts": ["singlePivot", "fourBarSeatStayAxle", "wattSixBar", …],
 *     "steps"?: 41,
 *     "targets": {
 *       "axlePath"?: { "points": [[travel mm, axle x mm], …], "weight"?, "toleranceMm"? },
 *       "leverageRatio"?: { "points": [[travel mm, LR], …], "weight"?, "tolerance"? }
 *                       | { "start": 2.9, "end": 2.4, "exponent"?: 1, "weight"?, "tolerance"? },
 *       "antiSquatAtSag"?: { "cogs": [21, 24, 28], "minPct", "maxPct", "as"?, "weight"?, "tolerancePct"? },
 *       "antiRiseAtSag"?: { "minPct", "maxPct", "as"?, "weight"?, "tolerancePct"? },
 *       "travelMm"?: { "min", "max", "as"?, "weight"?, "toleranceMm"? },
 *       "chainGrowthMm"?: { "max", "cogs"?, "as"?, "weight"?, "toleranceMm"? },
 *       "kickbackDeg"?: { "max", "cogs"?, "as"?, "weight"?, "toleranceDeg"? } },
 *     "keepOut"?: [{ "name"?, "x", "y", "r" }, …],
 *     "bounds"?: { "singlePivot": { "mainPivot.x": [lower, upper], "shockAngle": [lo, hi], … } },
 *     "layoutBodies"?: { "wattSixBar": { "axleBody"?: "seatStay", "shock"?: { "eye": "bellCrank", "frameEye": "frontFrame" } } } }
 *
 * The schema checks shapes and types, and refuses unknown fields; the meaning (ranges,
 * cogs of the bicycle, variable names, lower < upper) is createSuspensionProblem's.
 */
import * as z from 'zod';
import { expected, strict } from './schemaMessages';
import { bicycleSchema } from './suspensionFile';
import { LAYOUT_KINDS, SHOCK_END_BODIES, SIX_BAR_BODIES } from '../suspension';

const num = (what: string) => z.number({ error: expected(what) }).refine(Number.isFinite, { error: expected(what) });
const curvePoints = (what: string) =>
  z.array(z.array(num(`a number (travel mm, ${what})`), { error: expected(`a pair [travel mm, ${what}]`) }), { error: expected(`an array of pairs [travel mm, ${what}]`) });
const mode = z.enum(['constraint', 'penalty'], { error: expected('"constraint" (ranked first) or "penalty" (added to the value)') });
const weight = num('a weight ≥ 0').optional();
const cogs = z.array(num('a cog, in teeth'), { error: expected('an array of cogs, in teeth') });

const leverageSchema = z.union(
  [
    strict('a leverage-ratio curve { "points", "weight"?, "tolerance"? }', { points: curvePoints('leverage ratio'), weight, tolerance: num('a leverage-ratio tolerance').optional() }),
    strict('a leverage-ratio shape { "start", "end", "exponent"?, "weight"?, "tolerance"? }', {
      start: num('a leverage ratio'),
      end: num('a leverage ratio'),
      exponent: num('a shape exponent (1: a straight line)').optional(),
      weight,
      tolerance: num('a leverage-ratio tolerance').optional(),
    }),
  ],
  { error: expected('a leverage-ratio target: { "points" } or { "start", "end" }') },
);

const quoted = (ids: readonly string[]) => ids.map((b) => `"${b}"`).join(', ');
const layoutEnum = z.enum(LAYOUT_KINDS, { error: expected(`a layout, one of ${LAYOUT_KINDS.map((k) => `"${k}"`).join(', ')}`) });

export const suspensionProblemShape = {
  kind: z.literal('suspension'),
  bicycle: bicycleSchema,
  layouts: z.array(layoutEnum, { error: expected('an array of layouts') }),
  steps: num('a whole number of samples over the stroke').optional(),
  targets: strict('targets', {
    axlePath: strict('an axle-path target { "points", "weight"?, "toleranceMm"? }', { points: curvePoints('axle x mm'), weight, toleranceMm: num('a tolerance in mm').optional() }).optional(),
    leverageRatio: leverageSchema.optional(),
    antiSquatAtSag: strict('an anti-squat band { "cogs", "minPct", "maxPct", "as"?, "weight"?, "tolerancePct"? }', {
      cogs,
      minPct: num('a percentage'),
      maxPct: num('a percentage'),
      as: mode.optional(),
      weight,
      tolerancePct: num('a tolerance in %').optional(),
    }).optional(),
    antiRiseAtSag: strict('an anti-rise band { "minPct", "maxPct", "as"?, "weight"?, "tolerancePct"? }', {
      minPct: num('a percentage'),
      maxPct: num('a percentage'),
      as: mode.optional(),
      weight,
      tolerancePct: num('a tolerance in %').optional(),
    }).optional(),
    travelMm: strict('a wheel-travel band { "min", "max", "as"?, "weight"?, "toleranceMm"? }', {
      min: num('a travel in mm'),
      max: num('a travel in mm'),
      as: mode.optional(),
      weight,
      toleranceMm: num('a tolerance in mm').optional(),
    }).optional(),
    chainGrowthMm: strict('a chain-growth limit { "max", "cogs"?, "as"?, "weight"?, "toleranceMm"? }', {
      max: num('a chain growth in mm'),
      cogs: cogs.optional(),
      as: mode.optional(),
      weight,
      toleranceMm: num('a tolerance in mm').optional(),
    }).optional(),
    kickbackDeg: strict('a pedal-kickback limit { "max", "cogs"?, "as"?, "weight"?, "toleranceDeg"? }', {
      max: num('a kickback in degrees'),
      cogs: cogs.optional(),
      as: mode.optional(),
      weight,
      toleranceDeg: num('a tolerance in degrees').optional(),
    }).optional(),
  }),
  keepOut: z
    .array(strict('a keep-out circle { "name"?, "x", "y", "r" } in mm', { name: z.string({ error: expected('a name string') }).optional(), x: num('a number of mm'), y: num('a number of mm'), r: num('a radius in mm') }), {
      error: expected('an array of keep-out circles'),
    })
    .optional(),
  bounds: z
    .partialRecord(layoutEnum, z.record(z.string(), z.tuple([num('a number'), num('a number')], { error: expected('[lower, upper], two numbers') }), { error: expected('an object of variable name → [lower, upper]') }), {
      error: expected('an object of layout → bounds'),
    })
    .optional(),
  layoutBodies: z
    .partialRecord(
      layoutEnum,
      strict('a six-bar\'s bodies { "axleBody"?, "shock"? }', {
        axleBody: z.enum(SIX_BAR_BODIES, { error: expected(`the body that carries the axle, one of ${quoted(SIX_BAR_BODIES)}`) }).optional(),
        shock: strict('the bodies the shock joins { "eye", "frameEye" }', {
          eye: z.enum(SIX_BAR_BODIES, { error: expected(`the moving body that carries the shock's eye, one of ${quoted(SIX_BAR_BODIES)}`) }),
          frameEye: z.enum(SHOCK_END_BODIES, { error: expected(`the body that carries the shock's other eye, one of ${quoted(SHOCK_END_BODIES)}`) }),
        }).optional(),
      }),
      { error: expected('an object of six-bar layout → its bodies') },
    )
    .optional(),
};
