/**
 * The built app served on 127.0.0.1 for a benchmark that drives Chromium: built and
 * served as the browser tests do (tests/browser/app-server.ts), removed afterwards.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildApp, serveApp } from '../tests/browser/app-server';
import { chromiumExecutablePath, isExecutable } from '../tests/browser/chromium';

/** Runs `use` with the served app's address; fails first, saying so, where Chromium is missing. */
export async function withServedApp<T>(use: (baseUrl: string) => Promise<T>): Promise<T> {
  const executable = chromiumExecutablePath();
  if (!(await isExecutable(executable))) throw new Error(`Chromium not found at ${executable} (install Debian's chromium package, or set LOCI_CHROMIUM to its path)`);
  const outDir = await mkdtemp(join(tmpdir(), 'loci-bench-build-'));
  try {
    await buildApp(outDir);
    const served = await serveApp(outDir);
    try {
      return await use(served.baseUrl);
    } finally {
      await served.close();
    }
  } finally {
    await rm(outDir, { recursive: true, force: true });
  }
}
