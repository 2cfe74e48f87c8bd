/**
 * The traced image as the project keeps it: which image, where it lies in bicycle mm
 * (null until calibrated) and how it is shown. Checked when read back; a damaged record
 * is refused with the reason, never half-read.
 */
import { z } from 'zod';
import type { ImagePlacement } from './placement';
import type { TraceImage, TraceState } from './traceState';

export const TRACE_FORMAT = 'loci-suspension-trace';
export const TRACE_VERSION = 1;

export interface StoredTrace {
  readonly format: typeof TRACE_FORMAT;
  readonly version: typeof TRACE_VERSION;
  readonly image: TraceImage;
  readonly placement: ImagePlacement | null;
  readonly opacity: number;
  readonly hidden: boolean;
}

const finite = z.number().refine(Number.isFinite, 'expected a finite number');
/** Which image (its id in the images store, name and size): the same in every workspace's trace record. */
export const keptImageSchema = z.object({ imageId: z.string().max(200), name: z.string().max(1000), widthPx: z.number().int().positive(), heightPx: z.number().int().positive() });
/** Where the image lies in the workspace's mm; null until calibrated. */
export const placementSchema = z.object({ originXMm: finite, originYMm: finite, mmPerPx: z.number().positive().refine(Number.isFinite, 'expected a finite number'), rotationRad: finite }).nullable();

const schema = z.object({
  format: z.literal(TRACE_FORMAT),
  version: z.literal(TRACE_VERSION),
  image: keptImageSchema,
  placement: placementSchema,
  opacity: z.number().min(0).max(1),
  hidden: z.boolean(),
});

/** The first thing wrong with a record that did not read, at its field. */
export function firstIssue(error: z.ZodError): string {
  const first = error.issues[0];
  return `${first.path.length > 0 ? first.path.join('.') : 'the record'}: ${first.message}`;
}

export function storedTraceOf(state: TraceState): StoredTrace | null {
  if (state.image === null) return null;
  return { format: TRACE_FORMAT, version: TRACE_VERSION, image: state.image, placement: state.placement, opacity: state.opacity, hidden: state.hidden };
}

export function readStoredTrace(value: unknown): { readonly ok: true; readonly trace: StoredTrace } | { readonly ok: false; readonly reason: string } {
  const parsed = schema.safeParse(value);
  return parsed.success ? { ok: true, trace: parsed.data } : { ok: false, reason: firstIssue(parsed.error) };
}
