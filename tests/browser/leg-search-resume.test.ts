/**
 * A walking-leg search that survives a reload, with the image its foot trajectory is
 * traced over: the toy walker demo with a deterministic budget (evaluations only, a fixed
 * seed), an image loaded and calibrated, the search started and checkpointed into
 * IndexedDB, the page reloaded and its newest checkpoint damaged, the workspace opened
 * again; the run resumes from the checkpoint before, says so, and, stopped, ends with its
 * designs; the image is shown again where it was calibrated. Then closing the
 * workspace while a search runs asks, and a damaged image record is said on reopening.
 * Every wait polls for a state; nothing is timed.
 */
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { GAIT_CAUTION } from '../../src/core/gait';
import { describeBrowser, saveScreenshot, useBrowser } from './harness';
import { damageNewestCheckpoint, storedCheckpoints, type StoredCheckpoint } from './storedCheckpoints';
import { greyPng, screenOfPixel } from './legTraceImage';
import { storedTextHas } from './storedProject';

/** Evaluations of the whole search: enough that it is still running when the page reloads, on any machine the test runs on. */
const BUDGET_EVALUATIONS = '150000';
const LONG_MS = 300_000;

/** Writes `record` as the leg trace's record beside the project (what a damaged or hand-edited write leaves). */
function putLegTraceRecord(page: Page, record: unknown): Promise<boolean> {
  return page.evaluate((value) => new Promise<boolean>((resolve) => {
    const open = indexedDB.open('loci');
    open.onsuccess = () => {
      const db = open.result;
      const tx = db.transaction('projects', 'readwrite');
      tx.objectStore('projects').put(value, 'current:leg-trace');
      tx.oncomplete = () => { db.close(); resolve(true); };
      tx.onerror = () => resolve(false);
    };
    open.onerror = () => resolve(false);
  }), record);
}

const counted = (cs: readonly StoredCheckpoint[]) => cs.filter((c) => c.evaluations !== null && c.evaluations > 0).length;

describeBrowser('walking-leg search over a reload', () => {
  const browser = useBrowser();

  it('resumes after a reload from the checkpoint before a damaged one and ends with its designs; the traced image comes back calibrated', async () => {
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByRole('button', { name: 'Walking leg demo (toy walker)' }).click();
    await page.getByTestId('leg-workspace').waitFor();
    await page.getByLabel('Problem name').fill('Leg resume check');

    // An image to trace over, calibrated on two of its pixels.
    const W = 200;
    const H = 120;
    await page.getByLabel(/Trace over an image/).setInputFiles({ name: 'foot-path.png', mimeType: 'image/png', buffer: greyPng(W, H) });
    const traced = page.locator('image.legws-trace-image');
    await traced.waitFor();
    await page.getByRole('button', { name: 'Calibrate: click two points of the image' }).click();
    for (const u of [0.25 * W, 0.75 * W]) {
      const at = await screenOfPixel(page, u, 0.5 * H);
      await page.mouse.click(at.x, at.y);
    }
    const calibration = page.getByTestId('leg-trace-calibration');
    await calibration.getByLabel('Image point 1 x (mm)').fill('-12');
    await calibration.getByLabel('Image point 1 y (mm)').fill('-30');
    await calibration.getByLabel('Image point 2 x (mm)').fill('12');
    await calibration.getByLabel('Image point 2 y (mm)').fill('-30');
    await calibration.getByRole('button', { name: 'Set the scale' }).click();
    await page.getByTestId('leg-trace').getByText(/^Calibrated/).waitFor();
    const placedAt = await traced.getAttribute('transform');
    await expect.poll(() => storedTextHas(page, 'loci-leg-trace', 'foot-path.png', 'originXMm'), { timeout: 10_000 }).toBe(true);

    const start = page.getByRole('button', { name: 'Start search' });
    const progress = page.getByTestId('leg-search-progress');
    const message = page.getByTestId('leg-search-message');
    const summary = page.getByTestId('leg-run-summary');

    // A deterministic search: an evaluation budget only, a fixed seed.
    await page.locator('[data-field="budget.seconds"] input').fill('');
    await page.locator('[data-field="budget.evaluations"] input').fill(BUDGET_EVALUATIONS);
    await page.locator('[data-field="seed"] input').fill('5');
    await expect.poll(() => start.isEnabled()).toBe(true);
    await start.click();
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS }).toBe('running');

    // Two checkpoints with evaluations in them (the run's first is taken before any), and the running search kept in the project.
    await expect.poll(async () => counted(await storedCheckpoints(page, 'leg')), { timeout: LONG_MS, interval: 250 }).toBeGreaterThanOrEqual(2);
    await expect.poll(() => storedTextHas(page, 'searchRunning', 'Leg resume check'), { timeout: 10_000 }).toBe(true);
    expect(new Set((await storedCheckpoints(page, 'leg')).map((c) => c.runId)).size).toBe(1);

    // Reload mid-run; damage the newest checkpoint before the workspace is opened again.
    await page.reload();
    const reopen = page.getByRole('button', { name: 'Walking leg: Leg resume check' });
    await reopen.waitFor();
    expect(await damageNewestCheckpoint(page, 'leg')).toBe(true);
    await reopen.click();
    await page.getByTestId('leg-workspace').waitFor();

    // Resumed from the checkpoint before the damaged one, and said so, with the best of each family so far.
    await expect.poll(() => message.textContent(), { timeout: LONG_MS }).toMatch(/^Resumed after a reload: the search goes on from its last checkpoint \([\d,]+ evaluations/);
    expect(await message.textContent()).toMatch(/The newest checkpoint was damaged \(checkpoint is corrupt\) and skipped/);
    expect(await progress.getAttribute('data-status')).toMatch(/^(running|finished)$/);
    expect(await page.getByTestId('leg-search').textContent()).toContain(GAIT_CAUTION);
    const notice = page.getByTestId('leg-search-resume-notice');
    expect(await notice.textContent()).toMatch(/^The search a reload interrupted (goes on from its last checkpoint|has ended)/);
    await notice.getByRole('button', { name: 'Go to the search' }).click();
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('legws-search-title');

    // The traced image is shown again, where its calibration put it.
    await traced.waitFor();
    expect(await traced.getAttribute('transform')).toBe(placedAt);
    expect(await page.getByTestId('leg-trace-notice').textContent()).toMatch(/^foot-path\.png, kept with the project, is shown again \(calibrated at/);
    await saveScreenshot(page, 'leg-search-resumed');

    // Stopped (the unit test follows a resumed run to its budget): it ends with its designs, under the seed it ran
    // with; its checkpoints go once it has ended.
    if ((await progress.getAttribute('data-status')) === 'running') await page.getByRole('button', { name: 'Stop' }).click();
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS, interval: 500 }).toBe('finished');
    await page.getByTestId('leg-results-best').waitFor();
    expect(await summary.textContent()).toMatch(/^Latest run: .*seed 5, [\d,]+ evaluations, ended by (Stop|its budget)/);
    expect(await page.getByTestId('leg-results-best').locator('tr[data-family]').count()).toBeGreaterThan(0);
    expect(await notice.textContent()).toMatch(/^The search a reload interrupted has ended/);
    await expect.poll(async () => (await storedCheckpoints(page, 'leg')).length, { timeout: 10_000 }).toBe(0);
    await expect.poll(() => storedTextHas(page, 'searchRunning'), { timeout: 10_000 }).toBe(false);

    // Closing the workspace while a search runs asks; Keep searching leaves it running; Stop and close keeps what it found.
    await start.click();
    const drop = page.getByRole('alertdialog', { name: 'Drop the older run?' });
    if (await drop.count() > 0) await drop.getByRole('button', { name: 'Start and drop the older run' }).click();
    await expect.poll(() => progress.getAttribute('data-status'), { timeout: LONG_MS }).toBe('running');
    const back = page.getByRole('button', { name: 'Back to path synthesis' });
    await back.click();
    const closing = page.getByRole('alertdialog', { name: 'Close while the search runs?' });
    await closing.waitFor();
    await closing.getByRole('button', { name: 'Keep searching' }).click();
    await closing.waitFor({ state: 'detached' });
    expect(await progress.getAttribute('data-status')).toBe('running');
    await back.click();
    await closing.getByRole('button', { name: 'Stop the search and close' }).click();
    await page.getByTestId('leg-workspace').waitFor({ state: 'detached', timeout: LONG_MS });
    await expect.poll(() => storedTextHas(page, 'searchRunning'), { timeout: 10_000 }).toBe(false);

    // A damaged image record is said on reopening, not shown half-read.
    expect(await putLegTraceRecord(page, { format: 'loci-leg-trace', version: 1, image: { imageId: 7 } })).toBe(true);
    await page.reload();
    await page.getByRole('button', { name: 'Walking leg: Leg resume check' }).click();
    await page.getByTestId('leg-workspace').waitFor();
    await expect.poll(() => page.getByTestId('leg-trace-notice').textContent(), { timeout: 10_000 }).toMatch(/^The kept trace image's record is damaged \(image\.imageId: /);
    expect(await traced.count()).toBe(0);
    expect(app.problems()).toEqual([]);
    await app.close();
  }, 900_000);
});
