/**
 * Per-family results and the run history in the workspace, with real searches in
 * workers: two families searched together each show their best; every run that ends is
 * kept with a name; designs pinned from two runs are compared and survive a new run and
 * a reload; an old run is deleted only on the user's word.
 */
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { DEFAULT_RESULTS_PER_FAMILY } from '../../src/engine/runSpec';
import { describeBrowser, saveScreenshot, useBrowser, type AppPage } from './harness';

const SEARCH_TIMEOUT_MS = 180_000;
/** A test with searches in it: each wait for one may take SEARCH_TIMEOUT_MS, more than the 60 s a test may take by default. */
const ONE_SEARCH_TEST_MS = 2 * SEARCH_TIMEOUT_MS;
const TWO_SEARCHES_TEST_MS = 3 * SEARCH_TIMEOUT_MS;

describeBrowser('per-family results and run history', () => {
  const browser = useBrowser();

  async function openWorkspace(viewport?: { width: number; height: number }): Promise<AppPage> {
    const app = await browser.openApp('/', viewport ? { viewport } : {});
    await app.page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    return app;
  }

  async function setEvaluationBudget(page: Page, evaluations: number): Promise<void> {
    const field = page.getByLabel('Budget in evaluations');
    await field.fill(String(evaluations));
    await field.press('Enter');
    await expect.poll(() => field.inputValue()).toBe(String(evaluations));
  }

  async function searchToEnd(page: Page): Promise<void> {
    await page.getByRole('button', { name: 'Start search' }).click();
    await expect.poll(() => page.getByTestId('run-progress').getAttribute('data-status'), { timeout: SEARCH_TIMEOUT_MS, interval: 500 }).toBe('finished');
  }

  async function keptRuns(page: Page): Promise<number> {
    return page.getByTestId('kept-run').count();
  }

  it('shows the best of each of two families searched together, and keeps the run', async () => {
    const app = await openWorkspace({ width: 1920, height: 1080 });
    const page = app.page;
    await page.getByRole('group', { name: /^Mechanism families/ }).getByRole('checkbox', { name: /Watt I six-bar/ }).check();
    await setEvaluationBudget(page, 3000);
    await searchToEnd(page);
    const overview = page.getByTestId('family-overview');
    await expect.poll(() => overview.getByTestId('family-summary').count(), { timeout: 30_000 }).toBe(2);
    const families = await overview.getByTestId('family-summary').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-family')));
    expect([...families].sort()).toEqual(['fourbar', 'watt-i']);
    // Each family brings its own best designs (the run keeps and describes 50 per family), not only those that made the overall top 20.
    const designs = await overview.getByTestId('family-summary').evaluateAll((rows) => rows.map((r) => Number(r.querySelector('td')?.textContent)));
    expect(designs).toEqual([DEFAULT_RESULTS_PER_FAMILY, DEFAULT_RESULTS_PER_FAMILY]);
    // Each family has rows of its own in the table, whichever family leads the ranking.
    for (const [id, family] of [['fourbar', 'four-bar'], ['watt-i', 'Watt I six-bar']]) {
      await page.getByRole('button', { name: `Show only ${family}`, exact: true }).click();
      const cells = await page.locator('[data-testid="candidate-row"] td.results-family').allTextContents();
      expect(cells.length).toBeGreaterThan(0);
      expect(cells.every((c) => c.startsWith(family))).toBe(true);
      // The overview's best is the least RMS error of that family's feasible rows (of all when none is). // theorem (a minimum)
      const best = await overview.locator(`[data-family="${id}"]`).getByTestId('family-best').textContent();
      const feasible = await page.locator('[data-testid="candidate-row"]:not(.results-row-infeasible) td:nth-child(4)').allTextContents();
      const rms = feasible.length > 0 ? feasible : await page.locator('[data-testid="candidate-row"] td:nth-child(4)').allTextContents();
      expect(Number.parseFloat(best ?? '')).toBe(Math.min(...rms.map(Number.parseFloat)));
      await page.getByRole('button', { name: 'All families' }).click();
    }
    // The Family filter lists both families.
    const options = await page.getByLabel('Family').locator('option').allTextContents();
    expect(options).toEqual(expect.arrayContaining(['four-bar', 'Watt I six-bar']));
    await expect.poll(() => keptRuns(page), { timeout: 15_000 }).toBe(1);
    await saveScreenshot(page, 'results-families-1920', { fullPage: true });
    await page.getByRole('button', { name: 'Show the design ranked 1', exact: true }).click();
    await page.getByTestId('run-history').scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'history-1920');
    expect(app.problems()).toEqual([]);
  }, ONE_SEARCH_TEST_MS);

  it('keeps two runs, compares pinned designs of both, keeps the pins over a new run and a reload, deletes on request', async () => {
    const app = await openWorkspace();
    const page = app.page;
    await setEvaluationBudget(page, 2000);
    await searchToEnd(page);
    await expect.poll(() => keptRuns(page), { timeout: 15_000 }).toBe(1);
    await page.getByRole('button', { name: 'Pin the design ranked 1', exact: true }).click();
    await expect.poll(() => page.getByTestId('pinned-design').count()).toBe(1);

    // A second run with another seed: the first run's designs and the pin stay.
    const seed = page.getByLabel('Seed', { exact: true });
    await seed.fill('17');
    await seed.press('Enter');
    await searchToEnd(page);
    await expect.poll(() => keptRuns(page), { timeout: 15_000 }).toBe(2);
    expect(await page.getByTestId('pinned-design').count()).toBe(1);
    await page.getByRole('button', { name: 'Pin the design ranked 1', exact: true }).click();
    await expect.poll(() => page.getByTestId('pinned-design').count()).toBe(2);

    // The earlier run can be shown again in the table.
    const names = await page.getByTestId('kept-run').locator('input[type="text"]').evaluateAll((inputs) => inputs.map((i) => (i as HTMLInputElement).value));
    expect(new Set(names).size).toBe(2);
    await page.getByRole('button', { name: `Show ${names[1]}`, exact: true }).click();
    await expect.poll(() => page.getByTestId('shown-run').textContent()).toContain(names[1]);
    await page.getByRole('button', { name: 'Back to latest results' }).first().click();

    // Compare the two pinned designs, one from each run.
    const pins = page.getByTestId('pinned-design');
    await pins.nth(0).getByRole('checkbox').check();
    await pins.nth(1).getByRole('checkbox').check();
    const compare = page.getByTestId('compare-view');
    await compare.waitFor();
    expect(await compare.getByTestId('compare-drawing').count()).toBe(2);
    const header = await compare.locator('thead th').allTextContents();
    const fromRun = header.slice(1).map((h) => names.find((n) => h.startsWith(`${n}: Rank 1,`)));
    expect([...fromRun].sort()).toEqual([...names].sort());
    await saveScreenshot(page, 'history-compare-1280', { fullPage: true });

    // A reload keeps both runs and both pins.
    await page.reload({ waitUntil: 'load' });
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    await expect.poll(() => keptRuns(page), { timeout: 15_000 }).toBe(2);
    await expect.poll(() => page.getByTestId('pinned-design').count()).toBe(2);

    // Deleting asks first; "Keep" keeps it, "Delete" deletes it, and its pinned design stays.
    const older = names.find((n) => !n.startsWith('Run 2')) ?? names[1];
    await page.getByRole('button', { name: `Delete ${older}`, exact: true }).click();
    await page.getByRole('button', { name: 'Keep', exact: true }).click();
    expect(await keptRuns(page)).toBe(2);
    await page.getByRole('button', { name: `Delete ${older}`, exact: true }).click();
    await page.getByRole('button', { name: 'Delete', exact: true }).click();
    await expect.poll(() => keptRuns(page)).toBe(1);
    expect(await page.getByTestId('pinned-design').count()).toBe(2);
    await saveScreenshot(page, 'history-after-delete-1280', { fullPage: true });
    expect(app.problems()).toEqual([]);
  }, TWO_SEARCHES_TEST_MS);
});
