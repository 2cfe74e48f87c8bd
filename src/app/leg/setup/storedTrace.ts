/**
 * The image the foot trajectory is traced over, as the project keeps it: which image
 * (its bytes in the images store), where it lies in the leg's mm (null until calibrated)
 * and whether it is hidden. Checked when read back; a damaged record is refused with the
 * reason, never half-read.
 */
import { z } from 'zod';
import type { ImagePlacement } from '../../suspension/trace/placement';
import type { KeptImageRef } from '../../suspension/trace/keptImage';
import { firstIssue, keptImageSchema, placementSchema } from '../../suspension/trace/stored';

export const LEG_TRACE_FORMAT = 'loci-leg-trace';
export const LEG_TRACE_VERSION = 1;

export interface StoredLegTrace {
  readonly format: typeof LEG_TRACE_FORMAT;
  readonly version: typeof LEG_TRACE_VERSION;
  readonly image: KeptImageRef;
  readonly placement: ImagePlacement | null;
  readonly hidden: boolean;
}

const schema = z.object({
  format: z.literal(LEG_TRACE_FORMAT),
  version: z.literal(LEG_TRACE_VERSION),
  image: keptImageSchema,
  placement: placementSchema,
  hidden: z.boolean(),
});

export function readStoredLegTrace(value: unknown): { readonly ok: true; readonly trace: StoredLegTrace } | { readonly ok: false; readonly reason: string } {
  const parsed = schema.safeParse(value);
  return parsed.success ? { ok: true, trace: parsed.data } : { ok: false, reason: firstIssue(parsed.error) };
}
