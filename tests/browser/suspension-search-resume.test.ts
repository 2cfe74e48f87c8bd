/**
 * A suspension search that survives a reload: started on the demo with a time budget,
 * checkpointed into IndexedDB, the page reloaded and its newest checkpoint damaged, the
 * design opened again; the run resumes from the checkpoint before, says so, and ends with
 * its designs. Then Stop keeps what a second run found, a third run asks before it drops
 * the oldest kept run, and closing the workspace while it runs asks before it stops it.
 * Every wait polls for a state; nothing is timed.
 */
import { expect, it } from 'vitest';
import { SUSPENSION_CAUTION } from '../../src/core/suspension';
import { describeBrowser, saveScreenshot, useBrowser } from './harness';
import { damageNewestCheckpoint, storedCheckpoints, type StoredCheckpoint } from './storedCheckpoints';
import { storedTextHas } from './storedProject';

/**
 * The first run's time budget: long enough that the search is still running when the page
 * reloads. The test waits for two checkpoints (one each second of searching) and a project
 * write before the reload, which on a loaded machine can take several seconds: the run
 * must not end by its budget before it.
 */
const BUDGET_S = '20';
/** The later runs end on the user's word (Stop, or Stop and close): a budget they never reach, so none ends by itself while the test is between its steps. */
const LATER_BUDGET_S = '600';
const LONG_MS = 180_000;

const counted = (cs: readonly StoredCheckpoint[]) => cs.filter((c) => c.evaluations !== null && c.evaluations > 0).length;

describeBrowser('suspension search over a reload', () => {
  const browser = useBrowser();

  it('resumes after a reload from the checkpoint before a damaged one, keeps what Stop found, asks before dropping a run or closing', async () => {
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await page.getByTestId('suspension-workspace').waitFor();
    await page.getByLabel('Design name').fill('Resume check');
    const start = page.getByRole('button', { name: 'Start search' });
    const stop = page.getByRole('button', { name: 'Stop' });
    const progress = page.getByTestId('search-progress');
    const message = page.getByTestId('search-message');
    const summary = page.getByTestId('search-run-summary');

    // A time budget only, long enough to be still running at the reload.
    await page.locator('[data-field="budget.evaluations"] input').fill('');
    await page.locator('[data-field="budget.seconds"] input').fill(BUDGET_S);
    await page.locator('[data-field="seed"] input').fill('5');
    await expect.poll(() => start.isEnabled()).toBe(true);
    // Start is pressed from the keyboard, not clicked: while the workspace's deferred views
    // redraw after a field changed, the page can move between Playwright's scroll to the
    // button and its click, and the click then lands elsewhere (seen on 1 start in 20 to 40
    // under load: the click hit the bicycle panel, and Start did nothing).
    await start.press('Enter');
    // The panel shows the run as it starts; the long wait is for a page slowed by another browser file on two cores.
    await progress.waitFor({ timeout: LONG_MS });
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS }).toBe('running');

    // Two checkpoints with evaluations in them (the run's first is taken before any), and the running search kept in the project.
    await expect.poll(async () => counted(await storedCheckpoints(page, 'suspension')), { timeout: LONG_MS, interval: 250 }).toBeGreaterThanOrEqual(2);
    await expect.poll(() => storedTextHas(page, 'searchRunning', 'Resume check'), { timeout: 10_000 }).toBe(true);
    const runIds = new Set((await storedCheckpoints(page, 'suspension')).map((c) => c.runId));
    expect(runIds.size).toBe(1);

    // Reload mid-run; damage the newest checkpoint before the design is opened again.
    await page.reload();
    const reopen = page.getByRole('button', { name: 'Rear suspension: Resume check' });
    await reopen.waitFor();
    expect(await damageNewestCheckpoint(page, 'suspension')).toBe(true);
    await reopen.click();
    await page.getByTestId('suspension-workspace').waitFor();

    // Resumed from the checkpoint before the damaged one, and said so, with the best of each layout so far.
    await expect.poll(() => message.textContent(), { timeout: LONG_MS }).toMatch(/^Resumed after a reload: the search goes on from its last checkpoint \([\d,]+ evaluations/);
    expect(await message.textContent()).toMatch(/The newest checkpoint was damaged \(checkpoint is corrupt\) and skipped/);
    expect(await progress.getAttribute('data-status')).toMatch(/^(running|finished)$/);
    expect(await progress.locator('li').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('suspension-search').textContent()).toContain(SUSPENSION_CAUTION);
    // Said at the top of the workspace too, since the search section is far down the page.
    const notice = page.getByTestId('search-resume-notice');
    expect(await notice.textContent()).toMatch(/^The search a reload interrupted (goes on from its last checkpoint|has ended)/);
    await notice.getByRole('button', { name: 'Go to the search' }).click();
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('susp-search-title');
    await saveScreenshot(page, 'suspension-search-resumed');

    // It ends by its time budget with its designs, under the id it ran with; its checkpoints go once it has ended.
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS, interval: 500 }).toBe('finished');
    await page.getByTestId('search-results').waitFor();
    expect(await summary.textContent()).toMatch(/^Latest run: .*ended by its time budget/);
    expect(await notice.textContent()).toMatch(/^The search a reload interrupted has ended/);
    expect(await page.getByTestId('all-ranked').locator('tr[data-rank]').count()).toBeGreaterThan(0);
    await expect.poll(async () => (await storedCheckpoints(page, 'suspension')).length, { timeout: 10_000 }).toBe(0);
    await expect.poll(() => storedTextHas(page, 'searchRunning'), { timeout: 10_000 }).toBe(false);

    // A second run, stopped: the designs it found are kept, and the resumed run is the previous one.
    await page.locator('[data-field="budget.seconds"] input').fill(LATER_BUDGET_S);
    await expect.poll(() => start.isEnabled()).toBe(true);
    await start.press('Enter');
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS }).toBe('running');
    expect(await notice.count()).toBe(0);
    await expect.poll(async () => counted(await storedCheckpoints(page, 'suspension')), { timeout: LONG_MS, interval: 250 }).toBeGreaterThanOrEqual(1);
    await stop.click();
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS }).toBe('finished');
    expect(await message.textContent()).toBe('Stopped: the designs found so far are kept below.');
    expect(await summary.textContent()).toMatch(/^Latest run: .*ended by Stop/);
    expect(await page.getByTestId('all-ranked').locator('tr[data-rank]').count()).toBeGreaterThan(0);
    const runShown = page.getByLabel('Run shown');
    await runShown.selectOption('previous');
    expect(await summary.textContent()).toMatch(/^Previous run: .*ended by its time budget/);
    await runShown.selectOption('latest');

    // A third run asks before it drops the oldest kept run; Cancel starts nothing.
    await start.press('Enter');
    const drop = page.getByRole('alertdialog', { name: 'Drop the older run?' });
    await drop.waitFor();
    expect(await drop.textContent()).toMatch(/the older previous run \(.*ended by its time budget.*\) is dropped/);
    await drop.getByRole('button', { name: 'Cancel' }).click();
    await drop.waitFor({ state: 'detached' });
    expect(await progress.getAttribute('data-status')).toBe('finished');
    await start.press('Enter');
    await drop.getByRole('button', { name: 'Start and drop the older run' }).click();
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS }).toBe('running');
    await expect.poll(async () => counted(await storedCheckpoints(page, 'suspension')), { timeout: LONG_MS, interval: 250 }).toBeGreaterThanOrEqual(1);

    // Closing the workspace while it runs asks; Keep searching leaves it running.
    const back = page.getByRole('button', { name: 'Back to path synthesis' });
    await back.click();
    const closing = page.getByRole('alertdialog', { name: 'Close while the search runs?' });
    await closing.waitFor();
    await closing.getByRole('button', { name: 'Keep searching' }).click();
    await closing.waitFor({ state: 'detached' });
    expect(await progress.getAttribute('data-status')).toBe('running');
    // Stop and close: the designs found are kept with the design, and shown when it is opened again.
    await back.click();
    await closing.getByRole('button', { name: 'Stop the search and close' }).click();
    await page.getByTestId('suspension-workspace').waitFor({ state: 'detached', timeout: LONG_MS });
    await page.getByRole('button', { name: 'Rear suspension: Resume check' }).click();
    await page.getByTestId('search-results').waitFor();
    expect(await summary.textContent()).toMatch(/^Latest run: .*ended by Stop/);
    await runShown.selectOption('previous');
    // The run stopped before is now the previous one; the resumed run was dropped.
    expect(await summary.textContent()).toMatch(/^Previous run: .*ended by Stop/);
    expect(await progress.count()).toBe(0);
    expect(app.problems()).toEqual([]);
    await app.close();
  }, 600_000);
});
