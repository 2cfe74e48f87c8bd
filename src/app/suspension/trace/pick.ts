/**
 * What a click on the calibrated image sets in the panels: the rear axle's x and y, the
 * front contact x (or the wheelbase, when the panel gives that), or a pivot. Each value is
 * rounded to 0.1 mm once, here; the text put in the field is that number, so the field
 * shows what the analysis reads. Pure.
 */
import type { Vec2 } from '../../../core/geometry';
import { readDraft, type BicycleDraft } from '../fields';
import { pivotLabel } from '../labels';
import type { SuspensionAction } from '../state';
import { toTenthMm } from './placement';
import type { AxleReading, PickTarget, TraceNotice } from './traceState';

export interface PickResult {
  readonly actions: readonly SuspensionAction[];
  readonly notice: TraceNotice;
}

const mmText = (v: number) => String(toTenthMm(v));

/** The rear axle the panel holds, or what keeps it from being read. */
export function axleReading(draft: BicycleDraft): AxleReading {
  const issues = readDraft(draft).issues;
  const problems = [...(issues.rearAxleX ?? []).map((m) => `rear axle x: ${m}`), ...(issues.rearAxleY ?? []).map((m) => `rear axle y: ${m}`)];
  if (problems.length > 0) return { ok: false, reason: `this calibration uses the rear axle from the bicycle panel, and ${problems.join('; ')}. Enter it, or calibrate with a known distance instead` };
  return { ok: true, mm: { x: Number(draft.rearAxleX.trim()), y: Number(draft.rearAxleY.trim()) } };
}

/** How finely a click can be placed: one screen pixel over the image, in mm (said with every pick, as the field shows 0.1 mm). */
function grain(mmPerScreenPx: number | null): string {
  if (mmPerScreenPx === null || !(mmPerScreenPx > 0)) return '';
  const shown = mmPerScreenPx.toPrecision(2);
  return mmPerScreenPx > 0.5
    ? ` A screen pixel here is ${shown} mm: the pick is good to about that (a larger window or the page zoomed in gives a finer one).`
    : ` A screen pixel here is ${shown} mm.`;
}

export function pickResult(target: PickTarget, at: Vec2, draft: BicycleDraft, mmPerScreenPx: number | null = null): PickResult {
  const x = mmText(at.x);
  const y = mmText(at.y);
  const fine = grain(mmPerScreenPx);
  if (target.kind === 'rearAxle') {
    return {
      actions: [{ type: 'field', field: 'rearAxleX', text: x }, { type: 'field', field: 'rearAxleY', text: y }],
      notice: { kind: 'info', text: `Rear axle set to (${x}, ${y}) mm from the image.${fine}` },
    };
  }
  if (target.kind === 'pivot') {
    return {
      actions: [{ type: 'pivot', name: target.name, at: { x: Number(x), y: Number(y) } }],
      notice: { kind: 'info', text: `${pivotLabel(target.name)} set to (${x}, ${y}) mm from the image.${fine}` },
    };
  }
  if (draft.frontMode === 'frontContact') {
    return { actions: [{ type: 'field', field: 'front', text: x }], notice: { kind: 'info', text: `Front contact x set to ${x} mm from the image.${fine}` } };
  }
  // The panel gives the wheelbase: it is the picked contact x less the rear axle x as the panel holds it.
  const axle = axleReading(draft);
  if (!axle.ok) {
    return { actions: [], notice: { kind: 'error', text: 'The front contact point was not set: the panel gives the wheelbase, which needs a rear axle x that reads as a number. Pick or enter the rear axle first, or choose "front contact x".' } };
  }
  const wheelbase = mmText(Number(x) - axle.mm.x);
  return {
    actions: [{ type: 'field', field: 'front', text: wheelbase }],
    notice: { kind: 'info', text: `Wheelbase set to ${wheelbase} mm: the front contact picked at x = ${x} mm, the rear axle at x = ${axle.mm.x} mm.${fine}` },
  };
}
