/**
 * Vitest globalSetup of the `browser` project only, so unit test runs never build.
 * Once per run: find Chromium, build the app into a temporary folder, serve it, and
 * hand the tests the address (or the reason they are skipped) through `provide`.
 */
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';
import { buildApp, serveApp } from './app-server';
import { chromiumExecutablePath, isExecutable } from './chromium';
import type { BrowserSetup } from './setup-state';

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const chromiumPath = chromiumExecutablePath();
  if (!(await isExecutable(chromiumPath))) {
    const reason = `Chromium not found at ${chromiumPath} (install Debian's chromium package, or set LOCI_CHROMIUM to its path)`;
    if (process.env.REQUIRE_BROWSER === '1') {
      throw new Error(`REQUIRE_BROWSER=1 but ${reason}`);
    }
    console.warn(`\n[browser tests] SKIPPED: ${reason}. Set REQUIRE_BROWSER=1 to make this a failure.\n`);
    project.provide('lociBrowser', { status: 'skipped', reason } satisfies BrowserSetup);
    return async () => {};
  }

  const outDir = await mkdtemp(join(tmpdir(), 'loci-app-build-'));
  let served;
  try {
    await buildApp(outDir);
    served = await serveApp(outDir);
  } catch (error) {
    await rm(outDir, { recursive: true, force: true });
    throw error;
  }
  project.provide('lociBrowser', { status: 'ready', baseUrl: served.baseUrl, chromiumPath } satisfies BrowserSetup);
  return async () => {
    await served.close();
    await rm(outDir, { recursive: true, force: true });
  };
}
