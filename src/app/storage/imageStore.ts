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

/** Removes every image but `keepId` (the project shows one at a time). */
export async function dropImagesExcept(db: LociDb | null, keepId: string | null): Promise<void> {
  for (const key of [...sessionImages.keys()]) if (key !== keepId) sessionImages.delete(key);
  if (db === null) return;
  const tx = db.transaction('images', 'readwrite');
  for (const key of await tx.store.getAllKeys()) if (key !== keepId) await tx.store.delete(key);
  await tx.done;
}
