/**
 * Checkpoints in a JSON file. A save writes a temporary file beside it, flushes it to
 * disk and renames it over the file, so the file always holds a whole checkpoint (a
 * rename within one directory is atomic). The checkpoint it replaces is kept as
 * FILE.prev, the fallback when the newest turns out to be corrupt.
 */
import { copyFile, open, readFile, rename, rm } from 'node:fs/promises';
import type { CheckpointStore } from '../checkpointStore';

let tempCounter = 0;

/** Writes `text` to `path` atomically: temporary file, flush, rename. */
export async function writeFileAtomic(path: string, text: string): Promise<void> {
  const temp = `${path}.${process.pid}.${++tempCounter}.tmp`;
  try {
    const handle = await open(temp, 'w');
    try {
      await handle.writeFile(text, 'utf8');
      await handle.sync();
    } finally {
      await handle.close();
    }
    await rename(temp, path);
  } catch (error) {
    await rm(temp, { force: true });
    throw error;
  }
}

async function readIfPresent(path: string): Promise<string | null> {
  try {
    return await readFile(path, 'utf8');
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw error;
  }
}

export function fileCheckpointStore(path: string): CheckpointStore {
  const previous = `${path}.prev`;
  return {
    async save(text) {
      try {
        await copyFile(path, previous);
      } catch (error) {
        if ((error as NodeJS.ErrnoException).code !== 'ENOENT') throw error;
      }
      await writeFileAtomic(path, text);
    },
    async load() {
      const texts: string[] = [];
      for (const file of [path, previous]) {
        const text = await readIfPresent(file);
        if (text !== null) texts.push(text);
      }
      return texts;
    },
  };
}
