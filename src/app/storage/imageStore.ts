/**
 * Background images: their bytes in IndexedDB, so a reload shows them again, and in
 * memory for this page (which is all there is when the browser gives no storage).
 */
import type { LociDb } from './db';

const sessionImages = new Map<string, Blob>();

export async function putImage(db: LociDb | null, imageId: string, name: string, blob: Blob): Promise<void> {
  sessionImages.set(imageId, blob);
  if (db !== null) await db.put('images', { imageId, name, blob });
}

export async function getImage(db: LociDb | null, imageId: string): Promise<Blob | null> {
  const kept = sessionImages.get(imageId);
  if (kept !== undefined) return kept;
  if (db === null) return null;
  const record = await db.get('images', imageId);
  return record?.blob ?? null;
}

/** The id of every image traced under the suspension side view starts so; the path editor's images are kept apart from it. */
export const TRACE_IMAGE_PREFIX = 'suspension-trace-';
/** The id of every image the walking-leg workspace's foot trajectory is traced over starts so. */
export const LEG_TRACE_IMAGE_PREFIX = 'leg-trace-';

const isTraceImage = (key: string) => key.startsWith(TRACE_IMAGE_PREFIX) || key.startsWith(LEG_TRACE_IMAGE_PREFIX);

/** Removes every path-editor image but `keepId` (the path editor shows one at a time; each workspace's traced image is its own). */
export async function dropImagesExcept(db: LociDb | null, keepId: string | null): Promise<void> {
  for (const key of [...sessionImages.keys()]) if (key !== keepId && !isTraceImage(key)) sessionImages.delete(key);
  if (db === null) return;
  const tx = db.transaction('images', 'readwrite');
  for (const key of await tx.store.getAllKeys()) if (key !== keepId && !isTraceImage(key)) await tx.store.delete(key);
  await tx.done;
}

export async function deleteImage(db: LociDb | null, imageId: string): Promise<void> {
  sessionImages.delete(imageId);
  if (db !== null) await db.delete('images', imageId);
}
