/** The command line's I/O on Node: process streams and the file system. */
import { open } from 'node:fs/promises';
import type { CliIo, ReadTextResult } from './command';

/**
 * Largest file any command reads (bytes): well above the largest linkage file (8 M
 * characters) and any problem or target file a search can use, and small enough that
 * reading it costs a moment and little memory. Each reader has its own, tighter limits.
 */
export const MAX_INPUT_FILE_BYTES = 32 * 1024 * 1024;
const MIB = 1024 * 1024;
const CHUNK_BYTES = MIB;

/** Reads at most MAX_INPUT_FILE_BYTES: a pipe or device (no size to stat) is read in chunks up to the limit. */
async function readTextFile(path: string): Promise<ReadTextResult> {
  const tooLarge = (what: string): ReadTextResult => ({
    ok: false,
    message: `cannot read ${path}: it is ${what}; the limit for a file loci reads is ${MAX_INPUT_FILE_BYTES / MIB} MiB`,
  });
  try {
    const handle = await open(path, 'r');
    try {
      const stat = await handle.stat();
      if (stat.isDirectory()) return { ok: false, message: `cannot read ${path}: it is a directory, expected a file` };
      if (stat.size > MAX_INPUT_FILE_BYTES) return tooLarge(`${(stat.size / MIB).toFixed(1)} MiB`);
      const chunks: Buffer[] = [];
      let total = 0;
      const buffer = Buffer.allocUnsafe(CHUNK_BYTES);
      // Each turn reads at least a byte or ends, and the total is capped: the loop ends.
      for (;;) {
        const { bytesRead } = await handle.read(buffer, 0, CHUNK_BYTES, null);
        if (bytesRead === 0) break;
        total += bytesRead;
        if (total > MAX_INPUT_FILE_BYTES) return tooLarge(`more than ${MAX_INPUT_FILE_BYTES / MIB} MiB`);
        chunks.push(Buffer.from(buffer.subarray(0, bytesRead)));
      }
      return { ok: true, text: Buffer.concat(chunks, total).toString('utf8') };
    } finally {
      await handle.close();
    }
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const reason =
      code === 'ENOENT' ? 'no such file' :
      code === 'EISDIR' ? 'it is a directory, expected a file' :
      code === 'EACCES' ? 'permission denied' :
      error instanceof Error ? error.message : String(error);
    return { ok: false, message: `cannot read ${path}: ${reason}` };
  }
}

export const nodeIo: CliIo = {
  stdout: (text) => { process.stdout.write(text); },
  stderr: (text) => { process.stderr.write(text); },
  readTextFile,
};
