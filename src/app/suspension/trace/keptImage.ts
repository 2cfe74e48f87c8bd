/**
 * A traced image's keeping, shared by the workspaces that trace over an image (the
 * suspension side view, the walking leg's foot trajectory): its bytes read back from the
 * images store and checked against the size its calibration was made on, and its record
 * written after each change, one write after another.
 */
import { getImage, type LociDb } from '../../storage';
import { imageSize } from '../../target/BackgroundControls';

/** Which image: its id in the images store, its file name and size. */
export interface KeptImageRef {
  readonly imageId: string;
  readonly name: string;
  readonly widthPx: number;
  readonly heightPx: number;
}

export const errorMessage = (error: unknown): string => (error instanceof Error ? error.message : String(error));

/** The kept image's bytes as a blob: URL for this page, or what is wrong with them, in words. */
export async function readKeptImage(db: LociDb | null, ref: KeptImageRef): Promise<{ readonly ok: true; readonly url: string } | { readonly ok: false; readonly problem: string }> {
  const blob = await getImage(db, ref.imageId).catch(() => null);
  if (blob === null) return { ok: false, problem: `The image ${ref.name} is missing from this browser's storage; its record is kept. Load the image again to trace over it.` };
  let size: { width: number; height: number };
  try {
    size = await imageSize(blob);
  } catch {
    return { ok: false, problem: `The kept image ${ref.name} could not be read as an image (damaged in storage?); load it again.` };
  }
  if (size.width !== ref.widthPx || size.height !== ref.heightPx) {
    return { ok: false, problem: `The kept image ${ref.name} is ${size.width} × ${size.height} px but its calibration was made on ${ref.widthPx} × ${ref.heightPx} px; load it again.` };
  }
  return { ok: true, url: URL.createObjectURL(blob) };
}

/**
 * Keeps `record()` after every change `subscribe` reports (a null record is deleted),
 * one write after another, so an older record never lands after a newer one.
 */
export function keepRecordChanges<T>(options: {
  readonly subscribe: (listener: () => void) => void;
  readonly record: () => T | null;
  readonly same: (a: T | null, b: T | null) => boolean;
  readonly db: () => Promise<LociDb | null>;
  readonly save: (db: LociDb, record: T) => Promise<void>;
  readonly remove: (db: LociDb) => Promise<void>;
  readonly onError: (error: unknown) => void;
}): void {
  let saved = options.record();
  let writing: Promise<void> = Promise.resolve();
  options.subscribe(() => {
    const next = options.record();
    if (options.same(next, saved)) return;
    saved = next;
    writing = writing
      .then(async () => {
        const kept = await options.db();
        if (kept === null) return;
        if (next === null) await options.remove(kept);
        else await options.save(kept, next);
      })
      .catch(options.onError);
  });
}
