/**
 * The image the foot trajectory is traced over, for the page (it stays while the leg
 * workspace is closed and opened again), and its keeping: the bytes in the images store,
 * the record beside the project, both in IndexedDB, read back once per page; a missing or
 * damaged record or image is said, never shown half-read.
 */
import { useSyncExternalStore } from 'react';
import { createReducerStore } from '../../reducerStore';
import { LEG_TRACE_IMAGE_PREFIX, LEG_TRACE_RECORD_KEY, deleteImage, deleteTraceRecord, loadTraceRecord, openLociDb, putImage, saveTraceRecord, type LociDb } from '../../storage';
import { MAX_IMAGE_BYTES, imageSize } from '../../target/BackgroundControls';
import { SIGNATURE_BYTES, traceFileProblem } from '../../suspension/trace/imageFile';
import { errorMessage, keepRecordChanges, readKeptImage } from '../../suspension/trace/keptImage';
import type { ImagePlacement } from '../../suspension/trace/placement';
import { LEG_TRACE_FORMAT, LEG_TRACE_VERSION, readStoredLegTrace, type StoredLegTrace } from './storedTrace';
import type { TraceImage } from './traceImage';

export interface LegTraceState {
  readonly image: TraceImage | null;
  readonly hidden: boolean;
  /** About the image, its keeping or its calibration (shown beside the buttons). */
  readonly notice: string | null;
}

type LegTraceAction =
  | { readonly type: 'image'; readonly image: TraceImage | null; readonly hidden?: boolean; readonly notice: string | null }
  | { readonly type: 'placement'; readonly placement: ImagePlacement; readonly notice: string }
  | { readonly type: 'hidden'; readonly hidden: boolean }
  | { readonly type: 'notice'; readonly notice: string | null };

const INITIAL: LegTraceState = { image: null, hidden: false, notice: null };

function reduce(state: LegTraceState, action: LegTraceAction): LegTraceState {
  switch (action.type) {
    case 'image':
      return { image: action.image, hidden: action.hidden ?? false, notice: action.notice };
    case 'placement':
      return state.image === null ? state : { ...state, image: { ...state.image, placement: action.placement }, notice: action.notice };
    case 'hidden':
      return { ...state, hidden: action.hidden };
    case 'notice':
      return { ...state, notice: action.notice };
  }
}

const store = createReducerStore(reduce, INITIAL);

/** The part of the state `select` picks; `select` must return a value kept in the state (or a primitive). */
export function useLegTrace<T>(select: (state: LegTraceState) => T): T {
  return useSyncExternalStore(store.subscribe, () => select(store.getState()));
}

let database: Promise<LociDb | null> | null = null;
function db(): Promise<LociDb | null> {
  database ??= openLociDb().catch(() => null);
  return database;
}

function revokeShown(): void {
  const url = store.getState().image?.url ?? null;
  if (url !== null) URL.revokeObjectURL(url);
}

/** Loads an image file to trace over: PNG, JPEG or WebP up to the size limit; anything else is refused with the reason. */
export async function loadLegTraceFile(file: File): Promise<void> {
  const fail = (reason: string) => store.dispatch({ type: 'notice', notice: `Could not load ${file.name}: ${reason}.` });
  const head = new Uint8Array(await file.slice(0, SIGNATURE_BYTES).arrayBuffer());
  const problem = traceFileProblem(file.size, head, MAX_IMAGE_BYTES);
  if (problem !== null) return fail(problem);
  let size: { width: number; height: number };
  try {
    size = await imageSize(file);
  } catch {
    return fail('this browser could not decode it (a damaged or cut-short file?)');
  }
  const imageId = `${LEG_TRACE_IMAGE_PREFIX}${crypto.randomUUID()}`;
  const kept = await db();
  const previous = store.getState().image;
  let notKept: string | null = kept === null ? 'this browser gives no storage to keep it: it is shown until the page is closed' : null;
  try {
    await putImage(kept, imageId, file.name, file);
  } catch (e) {
    notKept = `the browser's storage refused it (${errorMessage(e)}): it is shown until the page is closed, not kept`;
  }
  revokeShown();
  const image: TraceImage = { imageId, name: file.name, widthPx: size.width, heightPx: size.height, url: URL.createObjectURL(file), placement: null };
  store.dispatch({ type: 'image', image, notice: `${notKept === null ? `${file.name} is kept with the project` : `${file.name}: ${notKept}`}; calibrate it before tracing so the points are in mm.` });
  if (previous !== null) await deleteImage(kept, previous.imageId).catch(() => {});
}

export function placeLegTrace(placement: ImagePlacement, notice: string): void {
  store.dispatch({ type: 'placement', placement, notice });
}

export function hideLegTrace(hidden: boolean): void {
  store.dispatch({ type: 'hidden', hidden });
}

/** Removes the traced image, its bytes and its record. */
export async function removeLegTrace(): Promise<void> {
  const previous = store.getState().image;
  revokeShown();
  store.dispatch({ type: 'image', image: null, notice: null });
  if (previous !== null) await deleteImage(await db(), previous.imageId).catch(() => {});
}

function storedOf(state: LegTraceState): StoredLegTrace | null {
  const i = state.image;
  if (i === null) return null;
  return { format: LEG_TRACE_FORMAT, version: LEG_TRACE_VERSION, image: { imageId: i.imageId, name: i.name, widthPx: i.widthPx, heightPx: i.heightPx }, placement: i.placement, hidden: state.hidden };
}

function sameStored(a: StoredLegTrace | null, b: StoredLegTrace | null): boolean {
  if (a === null || b === null) return a === b;
  return a.image.imageId === b.image.imageId && a.placement === b.placement && a.hidden === b.hidden;
}

let started = false;

/** Reads the kept image back (once per page), then keeps every change of it. */
export function startLegTrace(): void {
  if (started) return;
  started = true;
  void restore().finally(() =>
    keepRecordChanges({
      subscribe: store.subscribe,
      record: () => storedOf(store.getState()),
      same: sameStored,
      db,
      save: (kept, record) => saveTraceRecord(kept, record, LEG_TRACE_RECORD_KEY),
      remove: (kept) => deleteTraceRecord(kept, LEG_TRACE_RECORD_KEY),
      onError: (e) => store.dispatch({ type: 'notice', notice: `The traced image could not be kept in this browser's storage (${errorMessage(e)}).` }),
    }),
  );
}

async function restore(): Promise<void> {
  const kept = await db();
  if (kept === null) return;
  let value: unknown;
  try {
    value = await loadTraceRecord(kept, LEG_TRACE_RECORD_KEY);
  } catch (e) {
    store.dispatch({ type: 'notice', notice: `The traced image could not be read back from this browser's storage (${errorMessage(e)}).` });
    return;
  }
  // A file loaded while this was read wins over the kept one.
  if (value === undefined || store.getState().image !== null) return;
  const read = readStoredLegTrace(value);
  if (!read.ok) {
    // The record stays as it is until an image is loaded again.
    store.dispatch({ type: 'notice', notice: `The kept trace image's record is damaged (${read.reason}); load the image again.` });
    return;
  }
  const t = read.trace;
  const bytes = await readKeptImage(kept, t.image);
  const calibration = t.placement === null ? 'not calibrated yet' : `calibrated at ${(1 / t.placement.mmPerPx).toPrecision(4)} px per mm`;
  store.dispatch({
    type: 'image',
    image: { ...t.image, url: bytes.ok ? bytes.url : null, placement: t.placement },
    hidden: t.hidden,
    notice: bytes.ok ? `${t.image.name}, kept with the project, is shown again (${calibration}).` : bytes.problem,
  });
}
