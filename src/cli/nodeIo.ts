/** The command line's I/O on Node: process streams and the file system. */
import { readFile } from 'node:fs/promises';
import type { CliIo, ReadTextResult } from './command';

async function readTextFile(path: string): Promise<ReadTextResult> {
  try {
    return { ok: true, text: await readFile(path, 'utf8') };
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
