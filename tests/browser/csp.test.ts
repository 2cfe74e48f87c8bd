/**
 * The built app under its Content-Security-Policy (csp.ts, sent as a header by
 * `vite preview`), in headless Chromium: a whole path search, an export, a background
 * image shown through a blob: URL, a pasted target read in its worker, the suspension
 * and leg workspaces. No violation at all (the app and its workers forgo code built from
 * strings: src/core/codeGeneration.ts), and no request to another origin.
 *
 * Violations are read from the `securitypolicyviolation` event (no report-uri): in the
 * page through an init script, in workers through the same listener put in front of
 * each of the app's scripts as it is served (the listener logs, nothing else; workers
 * are out of reach of init scripts). Both log to the console, which the harness records.
 * The run's search workers are started by the engine worker: their scripts are fetched
 * where the test's routing does not reach, so each worker the page gets (nested ones
 * included) is also given the listener through the DevTools protocol as it appears. Given
 * that way, a nested worker's listener is installed a moment after the worker starts, not
 * before its first line.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { CONTENT_SECURITY_POLICY } from '../../csp';
import { describeBrowser, downloadFrom, useBrowser, type AppPage } from './harness';

const TAG = 'csp-violation ';
/** Logged by the listener once installed, so a realm it never reached is seen. */
const READY = 'csp-listener ';

/** Installs, once per realm, a listener that logs each violation as TAG + JSON. */
const VIOLATION_LISTENER = `(() => {
  const g = globalThis;
  if (g.__lociCspListener) return;
  g.__lociCspListener = true;
  const realm = typeof WorkerGlobalScope !== 'undefined' && g instanceof WorkerGlobalScope ? 'worker ' + g.location.pathname : 'page';
  const id = Math.random().toString(36).slice(2);
  g.addEventListener('securitypolicyviolation', (e) => {
    console.error(${JSON.stringify(TAG)} + JSON.stringify({ realm, id, directive: e.effectiveDirective, blocked: e.blockedURI, source: e.sourceFile, line: e.lineNumber, column: e.columnNumber, sample: e.sample }));
  });
  console.error(${JSON.stringify(READY)} + realm);
})();
`;

interface Violation {
  readonly realm: string;
  /** Tells realms of the same script apart (each search worker is one). */
  readonly id: string;
  readonly directive: string;
  readonly blocked: string;
  readonly source: string;
  readonly line: number;
  readonly column: number;
  /** The start of the refused code ('report-sample'). */
  readonly sample: string;
}

const SEARCH_TIMEOUT_MS = 150_000;
/** The test with the search: the wait for it alone may take SEARCH_TIMEOUT_MS, more than the 60 s a test may take by default. */
const SEARCH_TEST_MS = 2 * SEARCH_TIMEOUT_MS;
/** Long enough for checkpoints with designs in them to be described during the search. */
const SEARCH_BUDGET_EVALUATIONS = 20_000;
const CSV_FILE_POINTS = 1500;

/** Opens the app with the listener in the page and in front of every script it serves. */
async function openWatched(browser: ReturnType<typeof useBrowser>): Promise<AppPage> {
  const app = await browser.openApp('/');
  // The worker may end before the evaluation answers (the describer's do, at a run's end).
  app.page.on('worker', (worker) => void worker.evaluate(VIOLATION_LISTENER).catch(() => {}));
  await app.context.addInitScript({ content: VIOLATION_LISTENER });
  const assets = new URL('assets/', app.baseUrl).href;
  await app.context.route((url) => url.href.startsWith(assets) && url.pathname.endsWith('.js'), async (route) => {
    const response = await route.fetch();
    await route.fulfill({ response, body: VIOLATION_LISTENER + (await response.text()) });
  });
  await app.page.reload();
  await app.page.getByTestId('project-name').waitFor({ timeout: 30_000 });
  return app;
}

function violations(app: AppPage): Violation[] {
  return app.consoleErrors.filter((text) => text.startsWith(TAG)).map((text) => JSON.parse(text.slice(TAG.length)) as Violation);
}

/**
 * What must not happen under the policy, as lines (empty when all is well): a violation,
 * another console error, a page error, a request to another origin (blob: and data: URLs
 * stay in the page).
 */
function unexpected(app: AppPage): string[] {
  return [
    ...violations(app).map((v) => `violation of ${v.directive} in ${v.realm}: ${v.blocked} (${v.source}:${v.line}:${v.column}) ${JSON.stringify(v.sample)}`),
    ...app.consoleErrors.filter((text) => !text.startsWith(TAG) && !text.startsWith(READY)).map((text) => `console error: ${text}`),
    ...app.pageErrors.map((text) => `page error: ${text}`),
    ...app.foreignRequests().map((r) => `request to another origin: ${r.method} ${r.url}`),
  ];
}

async function download(page: Page, button: string): Promise<{ name: string; text: string }> {
  const file = await downloadFrom(page, page.getByRole('button', { name: button }));
  return { name: file.suggestedFilename(), text: await readFile(await file.path(), 'utf8') };
}

async function runStatus(page: Page): Promise<string | null> {
  return page.getByTestId('run-progress').getAttribute('data-status');
}

/** A 40 × 20 px greyscale PNG made in the page (no file leaves the machine). */
async function pngBase64(page: Page): Promise<string> {
  return page.evaluate(() => {
    const canvas = document.createElement('canvas');
    canvas.width = 40;
    canvas.height = 20;
    const g = canvas.getContext('2d') as CanvasRenderingContext2D;
    g.fillStyle = '#888';
    g.fillRect(0, 0, 40, 20);
    return canvas.toDataURL('image/png').split(',')[1];
  });
}

describeBrowser('content security policy', () => {
  const browser = useBrowser();

  it('sends the policy as a header on the page and its worker scripts', async () => {
    const app = await openWatched(browser);
    const page = await fetch(app.baseUrl);
    expect(page.headers.get('content-security-policy')).toBe(CONTENT_SECURITY_POLICY);
    // What the policy must say (the brief of issue #12): own origin only, no inline script, no eval.
    expect(CONTENT_SECURITY_POLICY).toMatch(/(^|; )script-src 'self'( 'report-sample')?(;|$)/);
    expect(CONTENT_SECURITY_POLICY).toMatch(/(^|; )worker-src 'self'(;|$)/);
    expect(CONTENT_SECURITY_POLICY).toMatch(/(^|; )default-src 'none'(;|$)/);
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/unsafe-(eval|inline)|\*|https?:/);
    expect(unexpected(app)).toEqual([]);
  });

  it('runs a whole search, exports, shows an image, reads a CSV and opens both workspaces with no other violation and no foreign request', async () => {
    const app = await openWatched(browser);
    const { page } = app;

    // A background picture: its bytes go to IndexedDB and back through a blob: URL (img-src blob:).
    await page.locator('details.background-controls summary').click();
    await page.locator('details.background-controls input[type=file]').setInputFiles({ name: 'side.png', mimeType: 'image/png', buffer: Buffer.from(await pngBase64(page), 'base64') });
    await page.getByTestId('background-image').waitFor();
    expect(await page.getByTestId('background-image').getAttribute('href')).toMatch(/^blob:/);
    await expect.poll(() => page.getByTestId('background-image').evaluate((el) => (el as SVGGraphicsElement).getBBox().width)).toBeGreaterThan(0);

    // A whole search of the demo, to its end, checkpointing every second: the run's search
    // workers (the engine worker's children) and the page's own (the one that describes
    // each checkpoint's designs) all start.
    const every = page.getByLabel('Checkpoint every', { exact: true });
    await every.fill('1');
    await every.press('Enter');
    await expect.poll(() => every.inputValue()).toBe('1');
    const budget = page.getByLabel('Budget in evaluations');
    await budget.fill(String(SEARCH_BUDGET_EVALUATIONS));
    await budget.press('Enter');
    await expect.poll(() => budget.inputValue()).toBe(String(SEARCH_BUDGET_EVALUATIONS));
    await page.getByRole('button', { name: 'Start search' }).click();
    await expect.poll(() => runStatus(page), { timeout: SEARCH_TIMEOUT_MS, interval: 250 }).toSatisfy((s: string | null) => s === 'finished' || s === 'failed');
    expect(await runStatus(page)).toBe('finished');
    await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(1);
    const workerScripts = app.requests.map((r) => r.url).filter((url) => /searchWorker.*\.js$/.test(new URL(url).pathname));
    expect(workerScripts.length).toBeGreaterThan(0);
    // The worker's script carries the policy too: a page's policy does not reach a URL-loaded worker.
    expect((await fetch(workerScripts[0])).headers.get('content-security-policy')).toBe(CONTENT_SECURITY_POLICY);

    // An export of the best design, downloaded through a blob: URL.
    await page.getByRole('button', { name: 'Show the design ranked 1', exact: true }).click();
    await page.getByTestId('detail-view').waitFor();
    const csv = await download(page, 'Paths (CSV)');
    expect(csv.name).toMatch(/\.csv$/);
    expect(csv.text.trim().split(/\r?\n/).length).toBeGreaterThan(2);

    // A target file too long for the text box (over 16,000 characters) is read in a worker of its own (worker-src 'self').
    const rows = Array.from({ length: CSV_FILE_POINTS }, (_, k) => `${(100 * Math.cos((2 * Math.PI * k) / CSV_FILE_POINTS)).toFixed(4)},${(50 * Math.sin((2 * Math.PI * k) / CSV_FILE_POINTS)).toFixed(4)}`);
    const csvFile = Buffer.from(`x,y\n${rows.join('\n')}\n`);
    expect(csvFile.length).toBeGreaterThan(16_000);
    await page.locator('label.file-button', { hasText: 'Import CSV file' }).locator('input[type=file]').setInputFiles({ name: 'ellipse.csv', mimeType: 'text/csv', buffer: csvFile });
    await expect.poll(() => page.getByTestId('target-notice').textContent(), { timeout: 30_000 }).toContain(`Read ${CSV_FILE_POINTS} points`);
    expect(app.requests.some((r) => /csvParseWorker.*\.js$/.test(new URL(r.url).pathname))).toBe(true);

    // The suspension workspace draws its side view and plots.
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await page.getByTestId('suspension-workspace').waitFor();
    await expect.poll(() => page.getByTestId('plot-leverage').locator('path.susp-plot-line').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('side-view').locator('line.susp-role-link').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('suspension-caution').isVisible()).toBe(true);
    const svg = await download(page, 'Side view (SVG)');
    expect(svg.text).toContain('<svg');
    await page.getByRole('button', { name: 'Back to path synthesis' }).click();

    // The walking-leg workspace draws its set-up.
    await page.getByRole('button', { name: 'Walking leg demo (toy walker)' }).click();
    await page.getByTestId('leg-workspace').waitFor();
    await expect.poll(() => page.getByTestId('leg-setup-drawing').locator('line.legws-ground, circle.legws-point').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('leg-workspace-caution').isVisible()).toBe(true);

    // The listener watched the engine worker and the search workers (the run's at least one,
    // and the page's), and nothing was refused or fetched elsewhere.
    expect(app.consoleErrors.some((text) => new RegExp(`^${READY}worker .*engineWorkerEntry.*\\.js$`).test(text))).toBe(true);
    expect(app.consoleErrors.filter((text) => new RegExp(`^${READY}worker .*searchWorker.*\\.js$`).test(text)).length).toBeGreaterThanOrEqual(2);
    expect(unexpected(app)).toEqual([]);
    expect(app.requests.length).toBeGreaterThan(0);
  }, SEARCH_TEST_MS);
});
