/**
 * The search set-up as the project keeps it (plain JSON, every number as typed), checked
 * when read back: known layouts, targets and variables only, texts of a sane length.
 */
import { z } from 'zod';
import { LAYOUT_KINDS, type LayoutKind } from '../../../core/suspension';
import { layoutVariableNames } from '../../../core/synthesis/suspensionProblem';
import { TARGET_KEYS, type SearchSetup } from './setup';

const text = z.string().max(10_000);
const kind = z.enum(LAYOUT_KINDS as unknown as [LayoutKind, ...LayoutKind[]]);

const target = z.object({
  on: z.boolean(),
  as: z.enum(['constraint', 'penalty']),
  form: z.enum(['shape', 'points']),
  points: text,
  start: text,
  end: text,
  exponent: text,
  min: text,
  max: text,
  cogs: text,
  weight: text,
  tolerance: text,
});

const range = z.object({ min: text, max: text });

export const storedSearchSetupSchema = z.object({
  layouts: z.array(kind).max(LAYOUT_KINDS.length).refine((l) => new Set(l).size === l.length, 'expected each layout once'),
  targets: z.object(Object.fromEntries(TARGET_KEYS.map((k) => [k, target])) as Record<(typeof TARGET_KEYS)[number], typeof target>),
  regions: z.partialRecord(kind, z.record(z.string(), range)).superRefine((regions, ctx) => {
    for (const [k, boxes] of Object.entries(regions) as [LayoutKind, Record<string, unknown>][]) {
      const names = layoutVariableNames(k);
      for (const v of Object.keys(boxes)) {
        if (!names.includes(v)) ctx.addIssue({ code: 'custom', path: [k, v], message: `"${v}" is not a variable of ${k}; expected one of ${names.join(', ')}` });
      }
    }
  }),
  keepOut: z.array(z.object({ name: z.string().max(200), x: text, y: text, r: text })).max(1000),
  budget: z.object({ seconds: text, evaluations: text }),
  seed: text,
  steps: text,
}) satisfies z.ZodType<SearchSetup>;
