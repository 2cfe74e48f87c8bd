/**
 * Checkpoints in a JSON file FILE, with the one before it in FILE.prev. Every step of a
 * save is atomic, so a kill at any moment leaves FILE and FILE.prev each whole (old or
 * new), never cut short:
 *
 *   1. the new text goes to a temporary file beside FILE, flushed to disk (fsync);
 *   2. if FILE holds a checkpoint that verifies, it becomes FILE.prev by a hard link and
 *      a rename (by a plain rename where the file system has no hard links), never by a
 *      copy; a FILE that does not verify is not promoted, so a good FILE.prev is kept;
 *   3. the temporary file is renamed over FILE, and the folder flushed.
 *
 * Reading (`list`) removes the temporary files an interrupted save left, and says so. One
 * process writes a checkpoint file at a time.
 */
import { basename, dirname, join } from 'node:path';
import { decodeCheckpoint } from '../checkpoint';
import type { CheckpointListing, CheckpointStore, StoredCheckpoint } from '../checkpointStore';
import { errorCode, fsReason, nodeFileOps, type FileOps } from './fileOps';

/** The temporary name a write to `path` goes through: beside it, so the rename stays in one folder. */
export function temporaryPathFor(path: string): string {
  return `${path}.${process.pid}.tmp`;
}

/** The previous checkpoint's file. */
export function previousPathFor(path: string): string {
  return `${path}.prev`;
}

/** Every name a checkpoint store at `path` writes, longest last: what a check of the folder must be able to create. */
export function checkpointPathsFor(path: string): readonly string[] {
  return [path, previousPathFor(path), temporaryPathFor(path), temporaryPathFor(previousPathFor(path))];
}

/** Errors of `link` that mean "this file system has no hard links here", not a fault. */
const NO_HARD_LINKS = new Set(['EPERM', 'ENOTSUP', 'EOPNOTSUPP', 'ENOSYS', 'EXDEV', 'EMLINK']);

/** Writes `text` to `path` atomically: a temporary file flushed to disk, renamed over `path`; nothing left behind on failure. */
export async function writeFileAtomic(path: string, text: string, ops: FileOps = nodeFileOps): Promise<void> {
  const temp = temporaryPathFor(path);
  try {
    await ops.writeDurably(temp, text);
    await ops.rename(temp, path);
  } catch (error) {
    await ops.remove(temp).catch(() => {});
    throw error;
  }
  await ops.syncDir(dirname(path));
}

export interface FileCheckpointStoreOptions {
  /** Whether a checkpoint's text is whole and sound; default: it decodes (JSON, format, checksum, shape). */
  readonly verify?: (text: string) => boolean;
  /** The file-system steps; default the real ones. */
  readonly ops?: FileOps;
}

/** FILE.<pid>.tmp and FILE.prev.<pid>.tmp: the temporary names of a save, by any process. */
function isLeftover(name: string, base: string): boolean {
  for (const stem of [base, `${base}.prev`]) {
    if (name.startsWith(`${stem}.`) && name.endsWith('.tmp') && /^\d+$/.test(name.slice(stem.length + 1, -'.tmp'.length))) return true;
  }
  return false;
}

/** A file-system error with its message in words ("permission denied (EACCES)") and its code kept; anything else as it is. */
function inWords(error: unknown): unknown {
  const code = errorCode(error);
  return code === undefined ? error : Object.assign(new Error(fsReason(error)), { code });
}

export function fileCheckpointStore(path: string, options: FileCheckpointStoreOptions = {}): CheckpointStore {
  const ops = options.ops ?? nodeFileOps;
  const verify = options.verify ?? ((text: string) => decodeCheckpoint(text).ok);
  const previous = previousPathFor(path);
  const dir = dirname(path);
  // Saves and listings run one at a time, in order: a listing never takes a save's temporary file for a leftover.
  let queue: Promise<unknown> = Promise.resolve();
  function inTurn<T>(task: () => Promise<T>): Promise<T> {
    const done = queue.then(task);
    queue = done.catch(() => {});
    return done;
  }

  async function promoteNewest(): Promise<void> {
    const linkTemp = temporaryPathFor(previous);
    await ops.remove(linkTemp);
    try {
      await ops.link(path, linkTemp);
    } catch (error) {
      if (!NO_HARD_LINKS.has(errorCode(error) ?? '')) throw error;
      await ops.rename(path, previous);
      return;
    }
    try {
      await ops.rename(linkTemp, previous);
    } catch (error) {
      await ops.remove(linkTemp).catch(() => {});
      throw error;
    }
  }

  async function saveNow(text: string): Promise<void> {
    const temp = temporaryPathFor(path);
    try {
      await ops.writeDurably(temp, text);
      const newest = await ops.readText(path);
      if (newest !== null && verify(newest)) await promoteNewest();
      await ops.rename(temp, path);
    } catch (error) {
      await ops.remove(temp).catch(() => {});
      throw inWords(error);
    }
    await ops.syncDir(dir).catch((error: unknown) => {
      throw inWords(error);
    });
  }

  async function list(): Promise<CheckpointListing> {
    const notes: string[] = [];
    let names: string[] = [];
    try {
      names = await ops.list(dir);
    } catch (error) {
      if (errorCode(error) !== 'ENOENT') throw error;
    }
    const base = basename(path);
    for (const name of names.filter((n) => isLeftover(n, base)).sort()) {
      await ops.remove(join(dir, name));
      notes.push(`removed ${join(dir, name)}, a temporary file an interrupted save left`);
    }
    const found: StoredCheckpoint[] = [];
    const newest = await ops.readText(path);
    const older = await ops.readText(previous);
    if (newest !== null) found.push({ source: path, text: newest });
    else if (older !== null) notes.push(`${path} is missing (removed, or a save was interrupted)`);
    if (older !== null) found.push({ source: previous, text: older });
    return { found, notes };
  }

  return {
    save: (text) => inTurn(() => saveNow(text)),
    list: () => inTurn(list),
    async load() {
      return (await inTurn(list)).found.map((stored) => stored.text);
    },
  };
}
