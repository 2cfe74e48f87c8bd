/**
 * The browser test harness: what a browser test file imports.
 *
 *   import { describeBrowser, useBrowser } from './harness';
 *
 *   describeBrowser('editor', () => {
 *     const browser = useBrowser();              // one Chromium per file
 *     it('draws the target', async () => {
 *       const app = await browser.openApp('/');  // fresh context, everything recorded
 *       await app.page.getByRole('button', { name: 'Fit' }).click();
 *       expect(app.problems()).toEqual([]);      // console errors, page errors, foreign requests
 *     });
 *   });
 *
 * The app is built and served once per run by global-setup.ts (the `browser` project in
 * vitest.config.ts); Chromium and its flags are in chromium.ts.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { BrowserContext, Download, Locator, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, beforeEach, describe, inject } from 'vitest';
import { REPO_ROOT } from './app-server';
import { launchChromium, type LaunchedChromium } from './chromium';
import type { BrowserSetup } from './setup-state';

export { CHROMIUM_FLAGS, chromiumExecutablePath, launchChromium } from './chromium';
export type { BrowserSetup } from './setup-state';

/** What the run's globalSetup found: the served app's address, or why tests are skipped. */
export function browserSetup(): BrowserSetup {
  const setup = inject('lociBrowser');
  if (setup === undefined) {
    throw new Error('browser tests must run in the vitest project "browser" (its globalSetup builds and serves the app)');
  }
  return setup;
}

/** A `describe` that is skipped, with the reason in its name, when Chromium is missing. */
export function describeBrowser(name: string, body: () => void): void {
  const setup = browserSetup();
  if (setup.status === 'skipped') describe.skip(`${name} [skipped: ${setup.reason}]`, body);
  else describe(name, body);
}

export interface RecordedRequest {
  readonly url: string;
  readonly method: string;
  readonly resourceType: string;
}

export interface AppPage {
  readonly page: Page;
  readonly context: BrowserContext;
  /** The app's origin with a trailing slash. */
  readonly baseUrl: string;
  /** Every request made in the context (pages and their workers), in order. */
  readonly requests: readonly RecordedRequest[];
  /** Text of every console message of type "error". */
  readonly consoleErrors: readonly string[];
  /** Every uncaught exception in the page. */
  readonly pageErrors: readonly string[];
  /** Requests to any origin but the app's own (data: and blob: URLs stay local). */
  foreignRequests(): RecordedRequest[];
  /** Console errors, page errors and foreign requests as lines; empty when all is well. */
  problems(): string[];
  close(): Promise<void>;
}

export interface OpenAppOptions {
  /** CSS pixels; 1280 × 800 unless given, so screenshots are comparable. */
  readonly viewport?: { readonly width: number; readonly height: number };
  /** Wait for this load state after navigating; "load" unless given. */
  readonly waitUntil?: 'load' | 'domcontentloaded' | 'networkidle';
}

const DEFAULT_VIEWPORT = { width: 1280, height: 800 };
const LOCAL_URL_PROTOCOLS = new Set(['data:', 'blob:']);

function isForeign(url: string, origin: string): boolean {
  const parsed = new URL(url);
  if (LOCAL_URL_PROTOCOLS.has(parsed.protocol)) return false;
  return parsed.origin !== origin;
}

/** Opens `path` of the served app in a new context of `chromium`, recording as it goes. */
export async function openApp(launched: LaunchedChromium, path = '/', options: OpenAppOptions = {}): Promise<AppPage> {
  const setup = browserSetup();
  if (setup.status !== 'ready') throw new Error(`browser tests are skipped: ${setup.reason}`);
  const baseUrl = setup.baseUrl;
  const origin = new URL(baseUrl).origin;

  const context = await launched.browser.newContext({
    viewport: options.viewport ?? DEFAULT_VIEWPORT,
    deviceScaleFactor: 1,
    locale: 'en-GB',
    timezoneId: 'UTC',
    colorScheme: 'light',
  });
  const requests: RecordedRequest[] = [];
  const consoleErrors: string[] = [];
  const pageErrors: string[] = [];
  context.on('request', (request) => {
    requests.push({ url: request.url(), method: request.method(), resourceType: request.resourceType() });
  });
  const page = await context.newPage();
  page.on('console', (message) => {
    if (message.type() === 'error') consoleErrors.push(message.text());
  });
  page.on('pageerror', (error) => {
    pageErrors.push(error.stack ?? error.message);
  });
  await page.goto(new URL(path.replace(/^\//, ''), baseUrl).href, { waitUntil: options.waitUntil ?? 'load' });

  const foreignRequests = () => requests.filter((request) => isForeign(request.url, origin));
  return {
    page,
    context,
    baseUrl,
    requests,
    consoleErrors,
    pageErrors,
    foreignRequests,
    problems: () => [
      ...consoleErrors.map((text) => `console error: ${text}`),
      ...pageErrors.map((text) => `page error: ${text}`),
      ...foreignRequests().map((request) => `request to another origin: ${request.method} ${request.url}`),
    ],
    close: () => context.close(),
  };
}

export interface BrowserHandle {
  /** The file's Chromium; available inside tests (after beforeAll). */
  readonly chromium: LaunchedChromium;
  openApp(path?: string, options?: OpenAppOptions): Promise<AppPage>;
}

/** Where a failed test's pages are kept: a full-page screenshot and the page's text. */
const FAILURE_DIR = join(REPO_ROOT, 'tests', 'browser', '.artifacts', 'failures');
/** Characters of a failed page's text printed with the failure: CI keeps only the log. */
const FAILURE_TEXT_CHARS = 4000;
/** A page that does not answer within this (a busy main thread) is reported as such. */
const FAILURE_READ_MS = 10_000;

function withinFailureRead<T>(work: Promise<T>, instead: T): Promise<T> {
  return Promise.race([work.catch(() => instead), new Promise<T>((resolve) => setTimeout(() => resolve(instead), FAILURE_READ_MS))]);
}

/** What a page of a failed test showed, kept and printed: its screenshot, its text, what it recorded. */
async function reportFailedPage(app: AppPage, name: string): Promise<void> {
  await mkdir(FAILURE_DIR, { recursive: true });
  const shot = join(FAILURE_DIR, `${name}.png`);
  const [text, saved] = await Promise.all([
    withinFailureRead(app.page.evaluate(() => document.body.innerText), '(the page did not give its text)'),
    withinFailureRead(app.page.screenshot({ path: shot, fullPage: true, timeout: FAILURE_READ_MS }).then(() => true), false),
  ]);
  const lines = [`page ${app.page.url()}`, ...app.problems(), '--- the page\'s text ---', text.slice(0, FAILURE_TEXT_CHARS)];
  await writeFile(join(FAILURE_DIR, `${name}.txt`), lines.join('\n'));
  console.error(`[browser test failed] ${name}${saved ? `: screenshot ${shot}` : ''}\n${lines.join('\n')}`);
}

/**
 * Call inside a describeBrowser body: launches one Chromium before the file's tests and
 * closes it after them. A page opened through the handle inside a test is closed when
 * the test ends (one opened in a beforeAll, after the file's tests); when a test fails,
 * each page it opened is reported (reportFailedPage) before it is closed.
 */
export function useBrowser(): BrowserHandle {
  let launched: LaunchedChromium | undefined;
  const opened: AppPage[] = [];
  let firstOfTest = 0;
  beforeAll(async () => {
    const setup = browserSetup();
    if (setup.status !== 'ready') throw new Error(`browser tests are skipped: ${setup.reason}`);
    launched = await launchChromium(setup.chromiumPath);
  });
  beforeEach(() => {
    firstOfTest = opened.length;
  });
  afterEach(async ({ task }) => {
    if (task.result?.state === 'fail') {
      const slug = `${task.file.name.split('/').pop() ?? 'test'}-${task.name}`.toLowerCase().replace(/[^a-z0-9]+/g, '-').slice(0, 100);
      for (let i = firstOfTest; i < opened.length; i++) await reportFailedPage(opened[i], `${slug}-${i - firstOfTest + 1}`);
    }
    // A page left open goes on drawing and searching while the file's later tests run,
    // on the same two cores: the pages a test opened end with it.
    for (const app of opened.splice(firstOfTest)) await app.close().catch(() => {});
  });
  afterAll(async () => {
    for (const app of opened) await app.close().catch(() => {});
    await launched?.close();
  });
  const current = (): LaunchedChromium => {
    if (launched === undefined) throw new Error('Chromium is not running: call useBrowser() inside describeBrowser and use it inside a test');
    return launched;
  };
  return {
    get chromium() {
      return current();
    },
    async openApp(path, options) {
      const app = await openApp(current(), path, options);
      opened.push(app);
      return app;
    },
  };
}

/**
 * Saves a PNG of the page and returns its path. Into tests/browser/.artifacts/screenshots/
 * (ignored by git) by default; with LOCI_SCREENSHOTS=1 into docs/screenshots/, the
 * pictures the README shows, so an ordinary test run does not rewrite tracked files.
 */
export async function saveScreenshot(page: Page, name: string, options: { fullPage?: boolean } = {}): Promise<string> {
  if (!/^[a-z0-9][a-z0-9-]*$/.test(name)) {
    throw new Error(`screenshot name "${name}" should be lower-case letters, digits and dashes, without ".png"`);
  }
  const dir = process.env.LOCI_SCREENSHOTS === '1'
    ? join(REPO_ROOT, 'docs', 'screenshots')
    : join(REPO_ROOT, 'tests', 'browser', '.artifacts', 'screenshots');
  await mkdir(dir, { recursive: true });
  const file = join(dir, `${name}.png`);
  await page.screenshot({ path: file, fullPage: options.fullPage ?? false, animations: 'disabled' });
  return file;
}

/**
 * The file a download button gives, asked for from the keyboard: the button is focused
 * and Enter pressed. A click goes where the button was when Playwright scrolled to it, and
 * a view that redraws in between (a design opening, a comparison filling) can move the
 * page under it; seen with Start and a download on the suspension pages under the full
 * suite's load.
 */
export async function downloadFrom(page: Page, button: Locator): Promise<Download> {
  const [file] = await Promise.all([page.waitForEvent('download'), button.press('Enter')]);
  return file;
}
