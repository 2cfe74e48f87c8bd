/**
 * The page's longest main-thread task, by CPU time, at three moments a user meets: a
 * search on the opening demo (4,000 evaluations, from Start until the progress panel says
 * "finished"), a 5 MB paste the target box refuses, and a paste too long for the box that
 * is read directly off the page thread. The built app in headless Chromium, each moment
 * in a fresh context, the renderer traced through the DevTools protocol
 * (tests/browser/mainThreadTasks.ts: CPU time, not wall time, so other work on the machine
 * does not stretch a task; the machine's own speed still does, which is why this is a
 * benchmark and not a test).
 *
 * Each figure is read against its bar, as a ratio: 50 ms while a search runs (the
 * browser's long-task threshold, W3C Long Tasks API), 200 ms for a paste (a page that
 * does not freeze). Needs Chromium (`LOCI_CHROMIUM`, or /usr/bin/chromium); builds the
 * app as the browser tests do.
 */
import type { Browser, Page } from 'playwright-core';
import { MAX_POINTS_CSV_CHARS } from '../src/core/io/pointsCsv';
import { launchChromium } from '../tests/browser/chromium';
import { traceMainThread, type MainThreadTask } from '../tests/browser/mainThreadTasks';
import { csvBox, makeTextInPage, openCsv, pasteKeptText } from '../tests/browser/targetPaste';
import { withServedApp } from './servedApp';

/** The browser's long-task threshold, ms (W3C Long Tasks API): the bar while a search runs. */
const LONG_TASK_MS = 50;
/** A page that does not freeze over a paste: no task over this, ms. */
const FREEZE_TASK_MS = 200;
const SEARCH_EVALUATIONS = '4000';
const REFUSED_PASTE_CHARS = 5_000_000;
const WAIT_MS = 150_000;
const FINISHED_MARK = 'loci-search-finished';

function longest(tasks: readonly MainThreadTask[]): number {
  if (tasks.length === 0) throw new Error('the trace holds no main-thread task');
  return Math.max(...tasks.map((t) => t.cpuMs));
}

/** `measure` on the opening workspace in a context of its own, closed afterwards. */
async function inFreshContext(browser: Browser, baseUrl: string, measure: (page: Page) => Promise<number>): Promise<number> {
  const context = await browser.newContext();
  try {
    const page = await context.newPage();
    await page.goto(baseUrl);
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    return await measure(page);
  } finally {
    await context.close();
  }
}

/** Start to "finished" of a search of SEARCH_EVALUATIONS evaluations on the opening demo. */
async function searchTasks(page: Page): Promise<number> {
  const budget = page.getByLabel('Budget in evaluations');
  await budget.fill(SEARCH_EVALUATIONS);
  await budget.press('Enter');
  // The search's end marked in the trace as the progress panel says it: the ranking and
  // drawing of the results come after it.
  await page.evaluate((mark) => {
    new MutationObserver((records) => {
      for (const r of records) if ((r.target as Element).getAttribute('data-status') === 'finished') performance.mark(mark);
    }).observe(document, { subtree: true, attributes: true, attributeFilter: ['data-status'] });
  }, FINISHED_MARK);
  const trace = await traceMainThread(page);
  await page.getByRole('button', { name: 'Start search' }).click();
  await page.waitForFunction(
    () => ['finished', 'failed'].includes(document.querySelector('[data-testid="run-progress"]')?.getAttribute('data-status') ?? ''),
    undefined,
    { timeout: WAIT_MS, polling: 250 },
  );
  const { tasks, marks } = await trace.stop();
  const endUs = marks.get(FINISHED_MARK);
  if (endUs === undefined) throw new Error('the search did not finish');
  return longest(tasks.filter((t) => t.startUs < endUs));
}

/** A paste of `chars` characters into the CSV box, then the box's text replaced as a user would. */
async function pasteTasks(page: Page, chars: number, kind: 'distinct' | 'repeated', readNotice: RegExp): Promise<number> {
  await openCsv(page);
  await makeTextInPage(page, chars, kind);
  const box = csvBox(page);
  await box.focus();
  const trace = await traceMainThread(page);
  if (await pasteKeptText(box)) throw new Error('the page did not cancel a paste too long for the box');
  await page.getByTestId('target-notice').filter({ hasText: readNotice }).waitFor({ timeout: WAIT_MS });
  await box.focus();
  await page.keyboard.press('Control+A');
  await page.keyboard.insertText('0,0\n30,0\n30,20\n');
  const { tasks } = await trace.stop();
  return longest(tasks);
}

export async function benchMainThread(): Promise<Record<string, number>> {
  return withServedApp(async (baseUrl) => {
    const chromium = await launchChromium();
    try {
      const browser = chromium.browser;
      const search = await inFreshContext(browser, baseUrl, searchTasks);
      const refused = await inFreshContext(browser, baseUrl, (page) => pasteTasks(page, REFUSED_PASTE_CHARS, 'repeated', /may be at most/));
      const direct = await inFreshContext(browser, baseUrl, (page) => pasteTasks(page, MAX_POINTS_CSV_CHARS - 40, 'distinct', /read directly/));
      return {
        searchLongestTaskCpuMs: search,
        searchLongestTaskOverLongTaskRatio: search / LONG_TASK_MS,
        refusedPasteLongestTaskCpuMs: refused,
        refusedPasteLongestTaskOverFreezeRatio: refused / FREEZE_TASK_MS,
        directReadLongestTaskCpuMs: direct,
        directReadLongestTaskOverFreezeRatio: direct / FREEZE_TASK_MS,
      };
    } finally {
      await chromium.close();
    }
  });
}
