/**
 * The traced image's store for the page (one suspension workspace at a time; the image
 * stays while the workspace is closed and opened again), and its keeping: the bytes in
 * the images store, the record beside the project, both in IndexedDB, read back once.
 */
import { useSyncExternalStore } from 'react';
import { createReducerStore } from '../../reducerStore';
import {
  TRACE_IMAGE_PREFIX,
  deleteImage,
  deleteTraceRecord,
  loadTraceRecord,
  openLociDb,
  putImage,
  saveTraceRecord,
  type LociDb,
} from '../../storage';
import { MAX_IMAGE_BYTES, imageSize } from '../../target/BackgroundControls';
import { SIGNATURE_BYTES, imageFormatOf, traceFileProblem } from './imageFile';
import { errorMessage, keepRecordChanges, readKeptImage } from './keptImage';
import { readStoredTrace, storedTraceOf, type StoredTrace } from './stored';
import { INITIAL_TRACE, reduceTrace, type TraceAction, type TraceState } from './traceState';

const store = createReducerStore(reduceTrace, INITIAL_TRACE);

export const dispatchTrace: (action: TraceAction) => void = store.dispatch;

/** The part of the trace state `select` picks; `select` must return a value kept in the state (or a primitive). */
export function useTrace<T>(select: (state: TraceState) => T): T {
  return useSyncExternalStore(store.subscribe, () => select(store.getState()));
}

let database: Promise<LociDb | null> | null = null;
function db(): Promise<LociDb | null> {
  database ??= openLociDb().catch(() => null);
  return database;
}

const message = errorMessage;
const error = (text: string): TraceAction => ({ type: 'notice', notice: { kind: 'error', text } });

function revokeShown(): void {
  const url = store.getState().url;
  if (url !== null) URL.revokeObjectURL(url);
}

/** Loads an image file to trace over: PNG, JPEG or WebP up to the size limit; anything else is refused with the reason. */
export async function loadTraceFile(file: File): Promise<void> {
  const fail = (reason: string) => store.dispatch(error(`Could not load ${file.name}: ${reason}.`));
  const head = new Uint8Array(await file.slice(0, SIGNATURE_BYTES).arrayBuffer());
  const problem = traceFileProblem(file.size, head, MAX_IMAGE_BYTES);
  if (problem !== null) return fail(problem);
  const format = imageFormatOf(head);
  let size: { width: number; height: number };
  try {
    size = await imageSize(file);
  } catch {
    return fail(`it begins as a ${format.ok ? format.format : ''} file but this browser could not decode it (a damaged or cut-short file?)`);
  }
  const imageId = `${TRACE_IMAGE_PREFIX}${crypto.randomUUID()}`;
  const kept = await db();
  const previous = store.getState().image;
  let stored: string | null = null;
  try {
    await putImage(kept, imageId, file.name, file);
  } catch (e) {
    stored = `the browser's storage refused it (${message(e)}): it is shown until the page is closed, not kept`;
  }
  revokeShown();
  store.dispatch({ type: 'image', image: { imageId, name: file.name, widthPx: size.width, heightPx: size.height }, url: URL.createObjectURL(file) });
  if (kept === null) store.dispatch(error(`${file.name} is shown until the page is closed: this browser gives no storage to keep it.`));
  else if (stored !== null) store.dispatch(error(`${file.name}: ${stored}.`));
  if (previous !== null) await deleteImage(kept, previous.imageId).catch(() => {});
}

/** Removes the traced image and its record. */
export async function removeTrace(): Promise<void> {
  const previous = store.getState().image;
  revokeShown();
  store.dispatch({ type: 'remove' });
  if (previous !== null) await deleteImage(await db(), previous.imageId).catch(() => {});
}

function sameStored(a: StoredTrace | null, b: StoredTrace | null): boolean {
  if (a === null || b === null) return a === b;
  return a.image === b.image && a.placement === b.placement && a.opacity === b.opacity && a.hidden === b.hidden;
}

let started = false;

/** Reads the kept image back (once per page), then keeps every change of it. */
export function startTrace(): void {
  if (started) return;
  started = true;
  void restore().finally(keepChanges);
}

async function restore(): Promise<void> {
  const kept = await db();
  if (kept === null) return;
  let value: unknown;
  try {
    value = await loadTraceRecord(kept);
  } catch (e) {
    store.dispatch(error(`The traced image could not be read back from this browser's storage (${message(e)}).`));
    return;
  }
  // A file loaded while this was read wins over the kept one.
  if (value === undefined || store.getState().image !== null) return;
  const read = readStoredTrace(value);
  if (!read.ok) {
    store.dispatch(error(`The kept trace image's record is damaged (${read.reason}); load the image again.`));
    return;
  }
  const t = read.trace;
  const bytes = await readKeptImage(kept, t.image);
  store.dispatch({ type: 'restored', image: t.image, url: bytes.ok ? bytes.url : null, placement: t.placement, opacity: t.opacity, hidden: t.hidden, notice: bytes.ok ? null : { kind: 'error', text: bytes.problem } });
}

function keepChanges(): void {
  keepRecordChanges({
    subscribe: store.subscribe,
    record: () => storedTraceOf(store.getState()),
    same: sameStored,
    db,
    save: (kept, record) => saveTraceRecord(kept, record),
    remove: (kept) => deleteTraceRecord(kept),
    onError: (e) => store.dispatch(error(`The traced image could not be kept in this browser's storage (${message(e)}).`)),
  });
}
