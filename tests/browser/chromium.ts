/**
 * Where Chromium is and how it is started. The browser comes from the system
 * (Debian's `chromium` package), never from a download by playwright-core.
 */
import { access, constants, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Browser } from 'playwright-core';

export const DEFAULT_CHROMIUM_PATH = '/usr/bin/chromium';

/**
 * The command-line flags, and only these (playwright-core's own defaults are switched
 * off): headless, no sandbox (CI runs as root), no GPU, and no traffic of the browser's
 * own (QUIC, first-run, background networking, component updates, sync).
 */
export const CHROMIUM_FLAGS: readonly string[] = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** `LOCI_CHROMIUM` overrides the default path. */
export function chromiumExecutablePath(): string {
  const fromEnv = process.env.LOCI_CHROMIUM;
  return fromEnv !== undefined && fromEnv !== '' ? fromEnv : DEFAULT_CHROMIUM_PATH;
}

export async function isExecutable(path: string): Promise<boolean> {
  try {
    await access(path, constants.X_OK);
    return true;
  } catch {
    return false;
  }
}

export interface LaunchedChromium {
  readonly browser: Browser;
  /** Closes the browser and removes its profile folder. */
  close(): Promise<void>;
}

const LAUNCH_TIMEOUT_MS = 60_000;

/** Starts Chromium with CHROMIUM_FLAGS and a fresh profile in a new temporary folder. */
export async function launchChromium(executablePath = chromiumExecutablePath()): Promise<LaunchedChromium> {
  const userDataDir = await mkdtemp(join(tmpdir(), 'loci-chromium-'));
  let browser: Browser;
  try {
    browser = await chromium.launch({
      executablePath,
      // With every default switched off, playwright-core passes `args` unchanged;
      // `--remote-debugging-pipe` is the channel it drives the browser through.
      ignoreDefaultArgs: true,
      args: [...CHROMIUM_FLAGS, `--user-data-dir=${userDataDir}`, '--remote-debugging-pipe'],
      timeout: LAUNCH_TIMEOUT_MS,
    });
  } catch (error) {
    await rm(userDataDir, { recursive: true, force: true });
    throw error;
  }
  return {
    browser,
    async close() {
      await browser.close();
      await rm(userDataDir, { recursive: true, force: true, maxRetries: 3 });
    },
  };
}
