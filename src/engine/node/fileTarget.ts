/**
 * Whether a file can be written where a command was told to write it, checked before
 * any work starts: the path is not a folder, its folder exists and is a folder, and
 * every name the writer will create there (the file, its temporary and previous files)
 * can be created — tried for real with a probe file, removed at once. What this cannot
 * foresee (a disk that fills later) the writers still report when it happens.
 */
import { open, rm, stat } from 'node:fs/promises';
import { basename, dirname } from 'node:path';
import { errorCode, fsReason } from './fileOps';

export type FileTargetCheck = { readonly ok: true } | { readonly ok: false; readonly reason: string };

async function statOrNull(path: string): Promise<Awaited<ReturnType<typeof stat>> | null> {
  try {
    return await stat(path);
  } catch (error) {
    if (errorCode(error) === 'ENOENT') return null;
    throw error;
  }
}

/**
 * Checks that `path` can be written through the names in `creates` (all in its folder:
 * the file's own and its temporary files; the longest is tried). `reading` also
 * requires an existing file to be readable (a checkpoint that will be resumed).
 */
export async function checkFileTarget(path: string, creates: readonly string[], reading = false): Promise<FileTargetCheck> {
  const dir = dirname(path);
  try {
    const existing = await statOrNull(path);
    if (existing !== null && existing.isDirectory()) return { ok: false, reason: `${path} is a folder; expected a file name` };
    if (existing !== null && !existing.isFile()) return { ok: false, reason: `${path} is not a regular file` };
    if (existing === null) {
      const folder = await statOrNull(dir);
      if (folder === null) return { ok: false, reason: `the folder ${dir} does not exist` };
      if (!folder.isDirectory()) return { ok: false, reason: `${dir} is not a folder` };
    }
    if (existing !== null && reading) await (await open(path, 'r')).close();
    for (const name of creates) {
      // A name too long for the file system is the probe's to report, below.
      const other = name === path ? null : await statOrNull(name).catch(() => null);
      if (other?.isDirectory() === true) return { ok: false, reason: `${name} is a folder; ${path} needs that name for a file` };
    }
  } catch (error) {
    return { ok: false, reason: `cannot use ${path}: ${fsReason(error)}` };
  }
  // The probe is the longest name the writer creates (a temporary name of this process, so truncating it harms nothing).
  const probe = [...creates].filter((name) => name !== path).sort((a, b) => Buffer.byteLength(basename(b)) - Buffer.byteLength(basename(a)))[0];
  if (probe === undefined) return { ok: true };
  try {
    await (await open(probe, 'w')).close();
    await rm(probe, { force: true });
  } catch (error) {
    if (errorCode(error) === 'ENAMETOOLONG') {
      return { ok: false, reason: `the name ${basename(path)} is too long: the file system must also hold ${basename(probe)} beside it (${Buffer.byteLength(basename(probe))} bytes)` };
    }
    return { ok: false, reason: `cannot write in the folder ${dir}: ${fsReason(error)}` };
  }
  return { ok: true };
}
