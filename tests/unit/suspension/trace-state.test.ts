/**
 * Tracing over an image: the calibration's clicks (the first is never lost), its errors,
 * the picks put into the panels (to 0.1 mm, the number the analysis then reads), the image
 * files accepted, and the kept record read back or refused.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_TRAIL_BIKE } from '../../../src/core/suspension';
import { draftOf, readDraft } from '../../../src/app/suspension/fields';
import { demoSuspensionState, reduceSuspension } from '../../../src/app/suspension/state';
import { imageFormatOf, traceFileProblem } from '../../../src/app/suspension/trace/imageFile';
import { axleReading, pickResult } from '../../../src/app/suspension/trace/pick';
import { pixelToBicycleMm } from '../../../src/app/suspension/trace/placement';
import { readStoredTrace, storedTraceOf } from '../../../src/app/suspension/trace/stored';
import { INITIAL_TRACE, reduceTrace, type TraceAction, type TraceState } from '../../../src/app/suspension/trace/traceState';

const IMAGE = { imageId: 'suspension-trace-test', name: 'side.png', widthPx: 800, heightPx: 600 };
const run = (state: TraceState, ...actions: TraceAction[]) => actions.reduce(reduceTrace, state);
const loaded = run(INITIAL_TRACE, { type: 'image', image: IMAGE, url: 'blob:x' });
const NO_AXLE = { ok: false, reason: 'unused' } as const;

describe('calibrating', () => {
  it('takes the very first click after loading, and after pressing calibrate', () => {
    expect(loaded.mode).toEqual({ kind: 'calibrate', marks: [] });
    const one = run(loaded, { type: 'mark', at: { u: 500, v: 400 }, axle: NO_AXLE });
    expect(one.mode).toEqual({ kind: 'calibrate', marks: [{ u: 500, v: 400 }] });
    const again = run(one, { type: 'cancel' }, { type: 'calibrate' }, { type: 'mark', at: { u: 1, v: 2 }, axle: NO_AXLE });
    expect(again.mode).toEqual({ kind: 'calibrate', marks: [{ u: 1, v: 2 }] });
  });

  it('places the image from the bottom bracket and a typed distance', () => {
    const s = run(
      loaded,
      { type: 'method', method: 'distance' },
      { type: 'mark', at: { u: 500, v: 400 }, axle: NO_AXLE },
      { type: 'mark', at: { u: 20, v: 260 }, axle: NO_AXLE },
      { type: 'distance', text: ' 450 ' },
    );
    expect(s.mode.kind).toBe('idle');
    expect(s.notice?.kind).toBe('info');
    if (s.placement === null) throw new Error('not calibrated');
    // worked by hand (see trace-placement.test.ts): 0.9 mm/px; pixel (23, 413) is at (−429.3, −11.7) mm.
    const axle = pixelToBicycleMm(s.placement, { u: 23, v: 413 });
    expect(axle.x).toBeCloseTo(-429.3, 9);
    expect(axle.y).toBeCloseTo(-11.7, 9);
  });

  it('says beside the button what was wrong with the distance, and keeps the clicks', () => {
    const two = run(loaded, { type: 'method', method: 'distance' }, { type: 'mark', at: { u: 500, v: 400 }, axle: NO_AXLE }, { type: 'mark', at: { u: 20, v: 260 }, axle: NO_AXLE });
    const bad = run(two, { type: 'distance', text: '45o' });
    expect(bad.notice).toEqual({ kind: 'error', text: 'Could not calibrate: the distance "45o" is not a number; expected a length in mm (a point for decimals).' });
    expect(bad.placement).toBeNull();
    expect(bad.mode).toEqual(two.mode);
    const zero = run(two, { type: 'distance', text: '0' });
    expect(zero.notice?.text).toContain('expected a length greater than 0 mm');
  });

  it('uses the rear axle as the panel gives it, or says why it cannot', () => {
    const demo = draftOf(DEMO_TRAIL_BIKE);
    const axle = axleReading(demo);
    expect(axle).toEqual({ ok: true, mm: DEMO_TRAIL_BIKE.rearAxleMm });
    // worked by hand: BB at pixel (500, 400), the demo axle (−435, −12) mm at 1 mm/px on a level image is pixel (65, 412).
    const s = run(loaded, { type: 'mark', at: { u: 500, v: 400 }, axle }, { type: 'mark', at: { u: 65, v: 412 }, axle });
    if (s.placement === null) throw new Error(s.notice?.text ?? 'not calibrated');
    expect(s.placement.mmPerPx).toBeCloseTo(1, 12);
    expect(s.placement.rotationRad).toBeCloseTo(0, 12);

    const blank = axleReading({ ...demo, rearAxleX: '' });
    expect(blank.ok).toBe(false);
    const failed = run(loaded, { type: 'mark', at: { u: 500, v: 400 }, axle: blank }, { type: 'mark', at: { u: 65, v: 412 }, axle: blank });
    expect(failed.placement).toBeNull();
    expect(failed.notice?.kind).toBe('error');
    expect(failed.notice?.text).toContain('rear axle x: empty; expected a number of mm');
    // Ready for the bottom bracket again.
    expect(failed.mode).toEqual({ kind: 'calibrate', marks: [] });
  });
});

describe('picking on the image', () => {
  const demo = draftOf(DEMO_TRAIL_BIKE);

  it('sets the rear axle fields to 0.1 mm, the number the analysis then reads', () => {
    const picked = pickResult({ kind: 'rearAxle' }, { x: -429.2571, y: -11.6502 }, demo);
    expect(picked.actions).toEqual([{ type: 'field', field: 'rearAxleX', text: '-429.3' }, { type: 'field', field: 'rearAxleY', text: '-11.7' }]);
    const state = picked.actions.reduce(reduceSuspension, demoSuspensionState());
    // common practice: the figure shown is the figure used; nothing is rewritten after the pick.
    expect(readDraft(state.draft).bicycle?.rearAxleMm).toEqual({ x: -429.3, y: -11.7 });
  });

  it('sets the wheelbase from the picked contact point when the panel gives the wheelbase', () => {
    expect(demo.frontMode).toBe('wheelbase');
    // worked by hand: contact at x = 800 mm (799.96 to 0.1 mm), rear axle at −435 mm: wheelbase 1235 mm.
    const picked = pickResult({ kind: 'frontContact' }, { x: 799.96, y: -350 }, demo);
    expect(picked.actions).toEqual([{ type: 'field', field: 'front', text: '1235' }]);
    const contact = pickResult({ kind: 'frontContact' }, { x: 799.96, y: -350 }, { ...demo, frontMode: 'frontContact' });
    expect(contact.actions).toEqual([{ type: 'field', field: 'front', text: '800' }]);
    const noAxle = pickResult({ kind: 'frontContact' }, { x: 799.96, y: -350 }, { ...demo, rearAxleX: 'x' });
    expect(noAxle.actions).toEqual([]);
    expect(noAxle.notice.kind).toBe('error');
  });

  it('moves a pivot to the picked point', () => {
    const picked = pickResult({ kind: 'pivot', name: 'rockerPivot' }, { x: 12.34, y: 480.06 }, demo);
    const state = picked.actions.reduce(reduceSuspension, demoSuspensionState());
    expect(state.layout.pivots.rockerPivot).toEqual({ x: 12.3, y: 480.1 });
    expect(picked.notice.text).toBe('rocker pivot set to (12.3, 480.1) mm from the image.');
  });

  it('is refused until the image is calibrated', () => {
    expect(run(loaded, { type: 'pick', target: { kind: 'rearAxle' } }).mode.kind).toBe('calibrate');
  });
});

describe('image files', () => {
  const bytes = (...b: number[]) => new Uint8Array([...b, ...new Array(12).fill(0)]).slice(0, 12);
  const text = (s: string) => new TextEncoder().encode(s.padEnd(12, ' '));

  it('tells PNG, JPEG and WebP by their signatures', () => {
    // Source: ISO/IEC 15948:2004 (PNG), §5.2 signature 137 80 78 71 13 10 26 10.
    expect(imageFormatOf(bytes(137, 80, 78, 71, 13, 10, 26, 10))).toEqual({ ok: true, format: 'PNG' });
    // Source: ITU-T T.81 (JPEG), Annex B: SOI marker FF D8, then a marker FF.
    expect(imageFormatOf(bytes(0xff, 0xd8, 0xff, 0xe0))).toEqual({ ok: true, format: 'JPEG' });
    // from memory: WebP is a RIFF container whose form type at byte 8 is "WEBP".
    expect(imageFormatOf(text('RIFF\u0001\u0000\u0000\u0000WEBP'))).toEqual({ ok: true, format: 'WebP' });
  });

  it('refuses other files and large ones with the reason', () => {
    expect(traceFileProblem(100, text('GIF89a'), 1e6)).toBe('the file is a GIF image; expected PNG, JPEG or WebP');
    expect(traceFileProblem(100, text('<svg xmlns='), 1e6)).toBe('the file is an SVG or XML file; expected PNG, JPEG or WebP');
    expect(traceFileProblem(100, text('hello world'), 1e6)).toBe('the file is not an image Loci can read; expected PNG, JPEG or WebP');
    expect(traceFileProblem(25_000_000, bytes(137, 80, 78, 71, 13, 10, 26, 10), 20_000_000)).toBe('the file is 25.0 MB; an image may be at most 20 MB');
    expect(traceFileProblem(100, bytes(137, 80, 78, 71, 13, 10, 26, 10), 20_000_000)).toBeNull();
  });
});

describe('the kept record', () => {
  it('reads back what was kept, and refuses a damaged one with the reason', () => {
    const s = run(loaded, { type: 'method', method: 'distance' }, { type: 'mark', at: { u: 500, v: 400 }, axle: NO_AXLE }, { type: 'mark', at: { u: 20, v: 260 }, axle: NO_AXLE }, { type: 'distance', text: '450' }, { type: 'opacity', opacity: 0.35 });
    const kept = storedTraceOf(s);
    const read = readStoredTrace(JSON.parse(JSON.stringify(kept)));
    expect(read).toEqual({ ok: true, trace: kept });
    expect(readStoredTrace({ ...kept, placement: { ...kept?.placement, mmPerPx: -1 } })).toEqual({ ok: false, reason: 'placement.mmPerPx: Too small: expected number to be >0' });
    expect(readStoredTrace('garbage').ok).toBe(false);
    expect(storedTraceOf(INITIAL_TRACE)).toBeNull();
  });
});
