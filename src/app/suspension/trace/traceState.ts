/**
 * The traced image's state and its pure update function: the image (its bytes live in
 * IndexedDB), where it lies in bicycle coordinates, how it is shown, the calibration or
 * pick in progress, and the last message. Calibration and picks are kept in image pixels,
 * so a change of the drawing's frame between two clicks moves nothing.
 */
import type { Vec2 } from '../../../core/geometry';
import { placementFromDistance, placementFromPairs, type Calibrated, type ImagePlacement, type PixelPoint } from './placement';

export interface TraceImage {
  readonly imageId: string;
  readonly name: string;
  readonly widthPx: number;
  readonly heightPx: number;
}

/** bottomBracketAxle: the bottom bracket, then the rear axle as the panel gives it (scale and turn); distance: the bottom bracket, then any point a typed distance away (a level image). */
export type CalibrationMethod = 'bottomBracketAxle' | 'distance';

/** What a pick on the image sets: the bicycle's rear axle or front contact point, or a layout pivot by name. */
export type PickTarget = { readonly kind: 'rearAxle' } | { readonly kind: 'frontContact' } | { readonly kind: 'pivot'; readonly name: string };

export type TraceMode = { readonly kind: 'idle' } | { readonly kind: 'calibrate'; readonly marks: readonly PixelPoint[] } | { readonly kind: 'pick'; readonly target: PickTarget };

export interface TraceNotice {
  readonly kind: 'error' | 'info';
  readonly text: string;
}

export interface TraceState {
  readonly image: TraceImage | null;
  /** A blob: URL of the image for this page; null while it is read back, or when it could not be. */
  readonly url: string | null;
  /** Null until the image is calibrated. */
  readonly placement: ImagePlacement | null;
  readonly method: CalibrationMethod;
  readonly opacity: number;
  readonly hidden: boolean;
  readonly mode: TraceMode;
  /** About the image or the calibration (shown beside the calibrate button). */
  readonly notice: TraceNotice | null;
  /** About the last pick (shown beside the pick buttons' panel). */
  readonly pickNotice: TraceNotice | null;
}

/** The rear axle as the panel reads it, or why it cannot be used. */
export type AxleReading = { readonly ok: true; readonly mm: Vec2 } | { readonly ok: false; readonly reason: string };

export type TraceAction =
  | { readonly type: 'image'; readonly image: TraceImage; readonly url: string }
  | { readonly type: 'restored'; readonly image: TraceImage; readonly url: string | null; readonly placement: ImagePlacement | null; readonly opacity: number; readonly hidden: boolean; readonly notice: TraceNotice | null }
  | { readonly type: 'remove' }
  | { readonly type: 'notice'; readonly notice: TraceNotice | null }
  | { readonly type: 'method'; readonly method: CalibrationMethod }
  | { readonly type: 'opacity'; readonly opacity: number }
  | { readonly type: 'hidden'; readonly hidden: boolean }
  | { readonly type: 'calibrate' }
  | { readonly type: 'pick'; readonly target: PickTarget }
  | { readonly type: 'cancel' }
  | { readonly type: 'mark'; readonly at: PixelPoint; readonly axle: AxleReading }
  | { readonly type: 'distance'; readonly text: string }
  | { readonly type: 'picked'; readonly notice: TraceNotice };

export const DEFAULT_OPACITY = 0.6;
const IDLE: TraceMode = { kind: 'idle' };

export const INITIAL_TRACE: TraceState = {
  image: null,
  url: null,
  placement: null,
  method: 'bottomBracketAxle',
  opacity: DEFAULT_OPACITY,
  hidden: false,
  mode: IDLE,
  notice: null,
  pickNotice: null,
};

const NUMBER_TEXT = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

function describe(p: ImagePlacement): string {
  const deg = (p.rotationRad * 180) / Math.PI;
  const turned = Math.abs(deg) < 0.05 ? '' : `, turned ${deg.toFixed(1)}°`;
  return `${p.mmPerPx.toPrecision(4)} mm per image pixel${turned}`;
}

function calibrated(state: TraceState, done: Calibrated, how: string): TraceState {
  if (!done.ok) return { ...state, mode: { kind: 'calibrate', marks: [] }, notice: { kind: 'error', text: `Could not calibrate: ${done.reason}. Click the bottom bracket again.` } };
  return { ...state, placement: done.placement, mode: IDLE, notice: { kind: 'info', text: `Calibrated from ${how}: ${describe(done.placement)}.` } };
}

/** Turns an angle into (-π, π], so a turn reads as the smaller one. */
function wrapRad(a: number): number {
  return Math.atan2(Math.sin(a), Math.cos(a));
}

export function reduceTrace(state: TraceState, action: TraceAction): TraceState {
  switch (action.type) {
    case 'image':
      return { ...INITIAL_TRACE, method: state.method, image: action.image, url: action.url, mode: { kind: 'calibrate', marks: [] }, notice: { kind: 'info', text: `Loaded ${action.image.name}: now click the bottom-bracket centre on it.` } };
    case 'restored':
      return { ...state, image: action.image, url: action.url, placement: action.placement, opacity: action.opacity, hidden: action.hidden, mode: IDLE, notice: action.notice };
    case 'remove':
      return { ...INITIAL_TRACE, method: state.method };
    case 'notice':
      return { ...state, notice: action.notice };
    case 'method':
      return { ...state, method: action.method, mode: state.mode.kind === 'calibrate' ? { kind: 'calibrate', marks: [] } : state.mode };
    case 'opacity':
      return Number.isFinite(action.opacity) ? { ...state, opacity: Math.min(1, Math.max(0, action.opacity)) } : state;
    case 'hidden':
      return { ...state, hidden: action.hidden, mode: action.hidden ? IDLE : state.mode };
    case 'calibrate':
      if (state.image === null || state.hidden) return state;
      return { ...state, mode: { kind: 'calibrate', marks: [] }, notice: null };
    case 'pick':
      if (state.placement === null || state.hidden || state.url === null) return state;
      return { ...state, mode: { kind: 'pick', target: action.target }, pickNotice: null };
    case 'cancel':
      return { ...state, mode: IDLE };
    case 'mark': {
      if (state.mode.kind !== 'calibrate') return state;
      // A third click starts again from the bottom bracket.
      const marks = state.mode.marks.length >= 2 ? [action.at] : [...state.mode.marks, action.at];
      if (marks.length < 2 || state.method === 'distance') return { ...state, mode: { kind: 'calibrate', marks }, notice: null };
      if (!action.axle.ok) return { ...state, mode: { kind: 'calibrate', marks: [] }, notice: { kind: 'error', text: `Could not calibrate: ${action.axle.reason}.` } };
      const done = placementFromPairs(marks[0], { x: 0, y: 0 }, marks[1], action.axle.mm);
      const wrapped: Calibrated = done.ok ? { ok: true, placement: { ...done.placement, rotationRad: wrapRad(done.placement.rotationRad) } } : done;
      return calibrated(state, wrapped, `the bottom bracket and the rear axle at (${action.axle.mm.x}, ${action.axle.mm.y}) mm`);
    }
    case 'distance': {
      if (state.mode.kind !== 'calibrate' || state.mode.marks.length < 2) {
        return { ...state, notice: { kind: 'error', text: 'Could not calibrate: click the bottom bracket and a second point on the image first.' } };
      }
      const t = action.text.trim();
      if (!NUMBER_TEXT.test(t)) {
        return { ...state, notice: { kind: 'error', text: `Could not calibrate: the distance "${t}" is not a number; expected a length in mm (a point for decimals).` } };
      }
      const [a, b] = state.mode.marks;
      return calibrated(state, placementFromDistance(a, b, Number(t)), `${Number(t)} mm between the two points, the image taken as level`);
    }
    case 'picked':
      return { ...state, mode: IDLE, pickNotice: action.notice };
  }
}
