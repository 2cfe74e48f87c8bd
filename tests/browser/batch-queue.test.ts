/**
 * The batch queue, left to run as overnight: jobs added through the form (a bad budget
 * refused beside its field), reordered, one deleted and one skipped; the queue started
 * and the page reloaded after the first job ends and again in the middle of the time-
 * budget job once it has a checkpoint; all three jobs end, each kept in the run history
 * under its name, the summary has one row per job and opens a job's designs in the
 * results; a second page in the same browser is told the queue runs elsewhere.
 * Every wait polls for a state; nothing is timed.
 */
import { readFileSync } from 'node:fs';
import type { Locator, Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser } from './harness';

const LONG_MS = 240_000;
/** The project's checkpoints every 2 s instead of 10, which the jobs keep: the test waits less for one. */
const CHECKPOINT_EVERY_S = '2';
/**
 * A time-budget job long enough to take a checkpoint after its first and still be running
 * when the page reloads: before that reload the test opens a second page of the app, which
 * on a loaded machine can take many seconds of the job's time.
 */
const TIMED_JOB_S = '30';

describeBrowser('batch queue', () => {
  const browser = useBrowser();

  const queue = (page: Page): Locator => page.getByTestId('batch-queue');
  const job = (page: Page, name: string): Locator => queue(page).locator(`[data-testid="queue-job"][data-name="${name}"]`);
  const statusOf = (page: Page, name: string) => job(page, name).getAttribute('data-status');
  const order = (page: Page) => queue(page).getByTestId('queue-job').evaluateAll((rows) => rows.map((r) => r.getAttribute('data-name')));

  async function addJob(page: Page, name: string, unit: 'evaluations' | 'seconds', budget: string, seed: string): Promise<void> {
    const form = queue(page).getByRole('form', { name: 'Add a job' });
    await form.getByLabel('Job name').fill(name);
    await form.getByLabel('Budget unit').selectOption(unit);
    await form.getByLabel('Job budget').fill(budget);
    await form.getByLabel('Job seed').fill(seed);
    await form.getByRole('button', { name: 'Add to queue' }).click();
    await job(page, name).waitFor();
  }

  async function reloadPage(page: Page): Promise<void> {
    await page.reload({ waitUntil: 'load' });
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    await expect.poll(() => queue(page).getAttribute('data-owner'), { timeout: 30_000 }).toBe('self');
  }

  it('runs three jobs over two reloads, keeps each in the run history and sums them up', async () => {
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    await expect.poll(() => queue(page).getAttribute('data-owner'), { timeout: 30_000 }).toBe('self');
    const form = queue(page).getByRole('form', { name: 'Add a job' });
    const every = page.getByLabel('Checkpoint every', { exact: true });
    await every.fill(CHECKPOINT_EVERY_S);
    await every.press('Enter');
    await expect.poll(() => every.inputValue()).toBe(CHECKPOINT_EVERY_S);

    // A budget out of range is refused beside its field, not clamped: nothing is added.
    await form.getByLabel('Job name').fill('too-small');
    await form.getByLabel('Budget unit').selectOption('evaluations');
    await form.getByLabel('Job budget').fill('0');
    await form.getByRole('button', { name: 'Add to queue' }).click();
    const budgetError = form.getByTestId('job-field-error');
    await expect.poll(() => budgetError.first().textContent()).toMatch(/from 1 to 1,000,000,000/);
    expect(await form.getByLabel('Job budget').getAttribute('aria-invalid')).toBe('true');
    expect(await queue(page).getByTestId('queue-job').count()).toBe(0);

    await addJob(page, 'night-a', 'evaluations', '2000', '1');
    await addJob(page, 'night-c', 'evaluations', '2000', '3');
    await addJob(page, 'night-b', 'seconds', TIMED_JOB_S, '2');
    await addJob(page, 'night-x', 'evaluations', '1000', '4');
    await addJob(page, 'night-d', 'evaluations', '1000', '5');
    // A name taken already (names are compared ignoring case, as in the queue file) is refused.
    await form.getByLabel('Job name').fill('NIGHT-A');
    await form.getByRole('button', { name: 'Add to queue' }).click();
    await expect.poll(() => form.getByTestId('job-field-error').first().textContent()).toMatch(/job 1 too/);

    // Reorder, delete and skip.
    await queue(page).getByRole('button', { name: 'Move night-b up' }).click();
    await expect.poll(() => order(page)).toEqual(['night-a', 'night-b', 'night-c', 'night-x', 'night-d']);
    await queue(page).getByRole('button', { name: 'Delete night-x' }).click();
    await queue(page).getByRole('button', { name: 'Skip night-d' }).click();
    await expect.poll(() => order(page)).toEqual(['night-a', 'night-b', 'night-c', 'night-d']);
    await expect.poll(() => statusOf(page, 'night-d')).toBe('skipped');

    // The queue survives a reload before it starts, in its new order.
    await reloadPage(page);
    expect(await order(page)).toEqual(['night-a', 'night-b', 'night-c', 'night-d']);
    expect(await statusOf(page, 'night-d')).toBe('skipped');

    await queue(page).getByRole('button', { name: 'Start queue' }).click();
    await expect.poll(() => statusOf(page, 'night-a'), { timeout: LONG_MS, interval: 500 }).toBe('done');

    // Reload between jobs: the first stays done, the queue goes on by itself.
    await reloadPage(page);
    expect(await statusOf(page, 'night-a')).toBe('done');
    await expect.poll(() => statusOf(page, 'night-b'), { timeout: LONG_MS, interval: 500 }).toBe('running');

    // A second page in the same browser is told the queue runs elsewhere and cannot change it.
    const other = await app.context.newPage();
    await other.goto(app.baseUrl, { waitUntil: 'load' });
    await other.getByTestId('queue-owned-elsewhere').waitFor({ timeout: 30_000 });
    expect(await queue(other).getByRole('button', { name: 'Pause queue' }).isDisabled()).toBe(true);
    expect(await queue(other).getByRole('button', { name: 'Delete night-c' }).isDisabled()).toBe(true);
    // Closed before the next reload: a page waiting in line for the queue would take it over.
    await other.close();

    // Reload mid-job, once the time-budget job has a checkpoint: it goes on from it.
    // A run checkpoints as it starts (round 0) and then every 2 s here: wait for one after some rounds.
    const checkpoint = job(page, 'night-b').getByTestId('job-checkpoint');
    await expect.poll(async () => Number((await checkpoint.count()) > 0 ? await checkpoint.textContent() : 0), { timeout: LONG_MS, interval: 250 }).toBeGreaterThan(0);
    const savedRound = Number(await checkpoint.textContent());
    await reloadPage(page);
    await expect.poll(() => job(page, 'night-b').getByTestId('job-note').textContent(), { timeout: LONG_MS }).toMatch(/^ ?Went on from the checkpoint of round \d+/);
    // From that checkpoint or a newer one taken before the reload, never from the start.
    const resumedRound = Number(/round (\d+)/.exec((await job(page, 'night-b').getByTestId('job-note').textContent()) ?? '')?.[1]);
    expect(savedRound).toBeGreaterThan(0);
    expect(resumedRound).toBeGreaterThanOrEqual(savedRound);

    await expect.poll(() => statusOf(page, 'night-b'), { timeout: LONG_MS, interval: 500 }).toBe('done');
    // Paused and resumed on the user's word (night-c may be paused mid-run, or held before it starts).
    await queue(page).getByRole('button', { name: 'Pause queue' }).click();
    await expect.poll(() => queue(page).getAttribute('data-mode')).toBe('paused');
    await queue(page).getByRole('button', { name: 'Resume queue' }).click();
    await expect.poll(() => statusOf(page, 'night-c'), { timeout: LONG_MS, interval: 500 }).toBe('done');
    await expect.poll(() => queue(page).getAttribute('data-mode'), { timeout: 30_000 }).toBe('done');
    expect(await statusOf(page, 'night-d')).toBe('skipped');
    expect(await page.title()).toMatch(/^Queue done/);

    // The summary: one row per job, in queue order, each done job with its best design.
    const summary = queue(page).getByTestId('queue-summary');
    const rows = summary.getByTestId('summary-row');
    expect(await rows.evaluateAll((rs) => rs.map((r) => r.getAttribute('data-name')))).toEqual(['night-a', 'night-b', 'night-c', 'night-d']);
    for (const name of ['night-a', 'night-b', 'night-c']) expect(await summary.locator(`[data-name="${name}"]`).getByTestId('summary-best').count()).toBeGreaterThan(0);
    expect(await summary.locator('[data-name="night-d"]').getByTestId('summary-best').count()).toBe(0);

    // Each job is kept in the run history under its name.
    const kept = await page.getByTestId('kept-run').locator('input[type="text"]').evaluateAll((inputs) => inputs.map((i) => (i as HTMLInputElement).value));
    expect([...kept].sort()).toEqual(['night-a', 'night-b', 'night-c']);

    // The summary's best of a job is the best RMS error of the kept run's table. // theorem (the same minimum, read two ways)
    const summaryBest = Number.parseFloat((await summary.locator('[data-name="night-b"]').getByTestId('summary-best').first().locator('.results-num').textContent()) ?? '');
    await summary.getByRole('button', { name: 'Open night-b in the results' }).click();
    await expect.poll(() => page.getByTestId('shown-run').textContent()).toContain('night-b');
    const feasible = await page.locator('[data-testid="candidate-row"]:not(.results-row-infeasible) td:nth-child(4)').allTextContents();
    const rms = feasible.length > 0 ? feasible : await page.locator('[data-testid="candidate-row"] td:nth-child(4)').allTextContents();
    expect(summaryBest).toBe(Math.min(...rms.map(Number.parseFloat)));
    await page.getByRole('button', { name: 'Show the design ranked 1', exact: true }).click();
    await page.getByTestId('detail-view').waitFor();

    // The summary as CSV: a line per job (each searched one family), the header first.
    const download = await downloadFrom(page, summary.getByRole('button', { name: 'Export summary (CSV)' }));
    const csv = readFileSync(await download.path(), 'utf8').trim().split('\r\n');
    expect(csv[0].split(',')[0]).toBe('job');
    expect(csv.slice(1).map((line) => line.split(',')[0])).toEqual(['night-a', 'night-b', 'night-c', 'night-d']);

    await queue(page).scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'batch-queue-summary');
    expect(app.problems()).toEqual([]);
  }, 900_000);
});
