/**
 * A rear-suspension problem queued from its workspace: "Add to queue" beside Start
 * refuses a bad seed beside its field, takes a small evaluation budget, and the job runs
 * in the same queue as the path jobs; the morning summary shows its best design per
 * layout by score, with the suspension caution, and the CSV has the job with kind
 * `suspension`; opened from the summary, the run is the workspace's latest. Every wait polls for a state; nothing is timed.
 */
import { readFileSync } from 'node:fs';
import type { Locator, Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { describeBrowser, downloadFrom, useBrowser } from './harness';

const LONG_MS = 180_000;

describeBrowser('batch queue with a rear-suspension job', () => {
  const browser = useBrowser();
  const queue = (page: Page): Locator => page.getByTestId('batch-queue');

  it('queues the suspension problem from its workspace and sums it up by score with the caution', async () => {
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    await expect.poll(() => queue(page).getAttribute('data-owner'), { timeout: 30_000 }).toBe('self');

    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    // The workspace set up and its search ready (as the other suspension tests wait) before its queue form is opened.
    await page.getByTestId('suspension-workspace').waitFor({ timeout: 30_000 });
    const start = page.getByTestId('suspension-search').getByRole('button', { name: 'Start search' });
    await expect.poll(() => start.isEnabled(), { timeout: 30_000 }).toBe(true);
    await page.getByTestId('add-to-queue-open').click();
    const form = page.getByRole('form', { name: 'Add this problem to the queue' });
    await form.getByLabel('Job name').fill('susp-night');
    await form.getByLabel('Job budget unit').selectOption('evaluations');
    await form.getByLabel('Job budget', { exact: true }).fill('400');
    // A seed that is not a whole number is refused beside its field, not rounded.
    await form.getByLabel('Job seed').fill('1.5');
    await form.getByRole('button', { name: 'Add to queue' }).click();
    await expect.poll(() => form.getByTestId('queue-field-error').first().textContent()).toMatch(/seed|whole/i);
    expect(await form.getByLabel('Job seed').getAttribute('aria-invalid')).toBe('true');
    await form.getByLabel('Job seed').fill('3');
    await form.getByRole('button', { name: 'Add to queue' }).click();
    await form.getByTestId('queue-added').waitFor();

    await page.getByRole('button', { name: 'Back to path synthesis' }).click();
    const row = queue(page).locator('[data-testid="queue-job"][data-name="susp-night"]');
    await row.waitFor({ timeout: 30_000 });
    expect(await row.getByTestId('job-kind').textContent()).toBe('rear suspension');
    expect(await row.getByTestId('job-caution').textContent()).toMatch(/kinematics only/i);

    await queue(page).getByRole('button', { name: 'Start queue' }).click();
    await expect.poll(() => queue(page).getAttribute('data-mode'), { timeout: LONG_MS, interval: 500 }).toBe('done');
    expect(await row.getAttribute('data-status')).toBe('done');

    const summaryRow = queue(page).getByTestId('queue-summary').locator('[data-testid="summary-row"][data-name="susp-night"]');
    expect(await summaryRow.getAttribute('data-kind')).toBe('suspension');
    const best = await summaryRow.getByTestId('summary-best').allTextContents();
    expect(best.length).toBeGreaterThan(0);
    for (const b of best) expect(b).toMatch(/score [-+0-9.e]+/);
    expect(await summaryRow.getByTestId('summary-caution').textContent()).toMatch(/kinematics only/i);
    const heading = await queue(page).getByTestId('queue-summary').locator('th').allTextContents();
    expect(heading.join(' ')).toMatch(/search score/);

    const download = await downloadFrom(page, queue(page).getByRole('button', { name: 'Export summary (CSV)' }));
    const lines = readFileSync(await download.path(), 'utf8').trim().split('\r\n');
    const header = lines[0].split(',');
    const kindCol = header.indexOf('kind');
    const scoreCol = header.indexOf('best_score');
    const jobs = lines.slice(1).filter((l) => l.startsWith('susp-night,'));
    expect(jobs.length).toBe(best.length);
    // The caution holds commas, so it is the quoted last field; the columns before it split plainly.
    for (const line of jobs) {
      const cols = line.split(',');
      expect(cols[kindCol]).toBe('suspension');
      expect(Number.isFinite(Number(cols[scoreCol]))).toBe(true);
      expect(line).toMatch(/kinematics only/i);
    }

    // Opened in its workspace, the job's run is that workspace's latest run, one layout per best shown in the summary.
    await summaryRow.getByRole('button', { name: 'Open susp-night in the rear suspension workspace' }).click();
    await expect.poll(() => page.getByTestId('search-run-summary').textContent(), { timeout: 30_000 }).toMatch(new RegExp(`^Latest run: ${best.length} layouts`));
    expect(app.problems()).toEqual([]);
  }, 400_000);
});
