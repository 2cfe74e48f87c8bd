/**
 * The few file-system steps the checkpoint store and the atomic writer take, each one
 * call, so a test can stop a save between any two of them (as a kill would) on a real
 * folder. `nodeFileOps` is the real thing.
 */
import { link, open, readdir, readFile, rename, rm } from 'node:fs/promises';

export interface FileOps {
  /** Creates or truncates `path`, writes `text` and flushes it to disk (fsync) before closing. */
  writeDurably(path: string, text: string): Promise<void>;
  /** The file's text, or null when there is no such file. */
  readText(path: string): Promise<string | null>;
  /** A second name for the same file (a hard link); fails if `to` exists. */
  link(from: string, to: string): Promise<void>;
  /** Renames `from` to `to`, replacing `to` atomically (same folder). */
  rename(from: string, to: string): Promise<void>;
  /** Removes a file; no error when it is not there. */
  remove(path: string): Promise<void>;
  /** The names in a folder. */
  list(dir: string): Promise<string[]>;
  /** Flushes a folder's entries (the renames in it) to disk, where the platform can. */
  syncDir(dir: string): Promise<void>;
}

export function errorCode(error: unknown): string | undefined {
  return (error as NodeJS.ErrnoException | undefined)?.code;
}

export const nodeFileOps: FileOps = {
  async writeDurably(path, text) {
    const handle = await open(path, 'w');
    try {
      await handle.writeFile(text, 'utf8');
      await handle.sync();
    } finally {
      await handle.close();
    }
  },
  async readText(path) {
    try {
      return await readFile(path, 'utf8');
    } catch (error) {
      if (errorCode(error) === 'ENOENT') return null;
      throw error;
    }
  },
  link: (from, to) => link(from, to),
  rename: (from, to) => rename(from, to),
  remove: (path) => rm(path, { force: true }),
  list: (dir) => readdir(dir),
  async syncDir(dir) {
    let handle;
    try {
      handle = await open(dir, 'r');
      await handle.sync();
    } catch (error) {
      // Some platforms and file systems cannot open or flush a folder; the rename itself is still atomic there.
      if (!['EISDIR', 'EINVAL', 'EPERM', 'EACCES', 'ENOTSUP', 'EBADF'].includes(errorCode(error) ?? '')) throw error;
    } finally {
      await handle?.close();
    }
  },
};

const REASONS: Readonly<Record<string, string>> = {
  ENOENT: 'no such file or folder',
  ENOTDIR: 'a part of the path is a file, not a folder',
  EISDIR: 'it is a folder, not a file',
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  EROFS: 'the file system is read-only',
  ENAMETOOLONG: 'the name is too long for the file system',
  ENOSPC: 'no space left on the device',
  EDQUOT: 'disk quota exceeded',
  EIO: 'an input/output error of the device',
  EMFILE: 'too many open files',
};

/** A file-system error in words, with its code: "permission denied (EACCES)". */
export function fsReason(error: unknown): string {
  const code = errorCode(error);
  if (code !== undefined && code in REASONS) return `${REASONS[code]} (${code})`;
  return error instanceof Error ? error.message : String(error);
}
