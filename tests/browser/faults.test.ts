/**
 * Faults an overnight search in a tab meets, each in the path workspace with a long
 * evaluation budget: a search worker that ends mid-round (and then the engine worker that
 * orchestrates the run), a reload in the middle of a
 * checkpoint write, and storage that is full. Each shows the search going on, its best
 * designs kept, and what happened said on the page. (A corrupt newest checkpoint is
 * covered where it is resumed: workspace.test.ts, suspension-search-resume.test.ts and
 * leg-search-resume.test.ts.) Every wait polls for a state; nothing is timed.
 */
import type { Page, Worker } from 'playwright-core';
import { expect, it } from 'vitest';
import { describeBrowser, saveScreenshot, useBrowser, type AppPage } from './harness';
import {
  pathCheckpointShown,
  pathEvaluationsShown,
  setStorageFull,
  STORAGE_FULL_SCRIPT,
  storedCheckpoints,
  tornCheckpointWrite,
  tornCheckpointWriteScript,
} from './storedCheckpoints';

/** Far more than the test needs: the search is still running when each fault comes, and ends on Stop. */
const LONG_BUDGET = 5_000_000;
const LONG_MS = 120_000;
const CHECKPOINT_EVERY_S = 2;

async function startLongSearch(app: AppPage): Promise<void> {
  const { page } = app;
  await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
  const field = page.getByLabel('Budget in evaluations');
  await field.fill(String(LONG_BUDGET));
  await field.press('Enter');
  await expect.poll(() => field.inputValue()).toBe(String(LONG_BUDGET));
  // Checkpoints every 2 s instead of 10: the faults come between checkpoints all the same, and the test waits less.
  const every = page.getByLabel('Checkpoint every', { exact: true });
  await every.fill(String(CHECKPOINT_EVERY_S));
  await every.press('Enter');
  await expect.poll(() => every.inputValue()).toBe(String(CHECKPOINT_EVERY_S));
  await page.getByRole('button', { name: 'Start search' }).click();
  await expect.poll(() => runStatus(page), { timeout: LONG_MS }).toBe('running');
}

function runStatus(page: Page): Promise<string | null> {
  return page.getByTestId('run-progress').getAttribute('data-status');
}

/** Waits for a checkpoint with evaluations in it after round `afterRound`, as the page says it. */
async function checkpointAfter(page: Page, afterRound: number): Promise<{ round: number; evaluations: number }> {
  await expect
    .poll(async () => {
      const shown = await pathCheckpointShown(page);
      return shown !== null && shown.round > afterRound && shown.evaluations > 0;
    }, { timeout: LONG_MS, interval: 200 })
    .toBe(true);
  return (await pathCheckpointShown(page)) as { round: number; evaluations: number };
}

async function stopAndKeep(page: Page): Promise<void> {
  await page.getByRole('button', { name: 'Stop' }).click();
  await expect.poll(() => runStatus(page), { timeout: LONG_MS, interval: 250 }).toBe('finished');
  // The designs found are ranked at the end, as after any stopped search.
  await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(1);
}

/** Ends a worker from inside, as a crash or the browser reclaiming it would: `close()` run in the worker through the DevTools protocol. */
async function endWorker(worker: Worker): Promise<void> {
  const closed = new Promise<void>((resolve) => worker.once('close', () => resolve()));
  // The evaluation may never answer: the worker is gone once it runs.
  void worker.evaluate('close()').catch(() => {});
  await closed;
}

describeBrowser('faults during a long search', () => {
  const browser = useBrowser();

  it('goes on when a search worker, then the engine worker, ends mid-round, from its last checkpoint, and says so', async () => {
    const app = await browser.openApp('/');
    const { page } = app;
    await startLongSearch(app);
    const first = await checkpointAfter(page, 0);
    await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(1);

    // Every search worker of the page ends: the run's, started by the engine worker (nested
    // workers, which Playwright attaches to as well), and the one that describes checkpoints.
    expect(page.workers().filter((w) => /engineWorker/.test(w.url()))).toHaveLength(1);
    const workers = page.workers().filter((w) => /searchWorker/.test(w.url()));
    expect(workers.length).toBeGreaterThanOrEqual(2);
    const atFault = await pathCheckpointShown(page);
    await Promise.all(workers.map(endWorker));

    // Said on the page: a worker stopped, a new one took the search back to its last checkpoint.
    const said = page.getByText(/^A worker of the search stopped unexpectedly \((once|\d+ times so far)\)\. Loci started a new one and took the search back to its last checkpoint \(round \d+, [\d,]+ evaluations\)/);
    await expect.poll(() => said.count(), { timeout: LONG_MS }).toBe(1);
    expect(await runStatus(page)).toBe('running');
    // Back to a checkpoint the page had saved: the last one when the workers ended, or one
    // saved in the moment before they did (the search goes on saving every 2 s, so the page's
    // newest checkpoint may already be past the one named by the time the message is read).
    const named = /\(round (\d+), ([\d,]+) evaluations\)/.exec((await said.textContent()) ?? '');
    expect(named).not.toBeNull();
    const back = { round: Number(named?.[1]), evaluations: Number(named?.[2].replace(/,/g, '')) };
    const newest = await pathCheckpointShown(page);
    expect(back.round).toBeGreaterThanOrEqual(atFault?.round ?? first.round);
    expect(back.round).toBeLessThanOrEqual(newest?.round ?? back.round);
    // The best designs so far stay in the table, and the search goes on past the checkpoint, saving new ones.
    expect(await page.getByTestId('candidate-row').count()).toBeGreaterThanOrEqual(1);
    await expect.poll(() => pathEvaluationsShown(page), { timeout: LONG_MS }).toBeGreaterThan(back.evaluations);
    const later = await checkpointAfter(page, back.round);

    // The engine worker itself ends (where the run is orchestrated): a new one takes the run
    // over from the last checkpoint the page saved, and the page says so once more.
    const restartsSaid = async () => {
      const times = /\((once|(\d+) times so far)\)/.exec((await said.textContent()) ?? '');
      return times === null ? 0 : times[2] === undefined ? 1 : Number(times[2]);
    };
    const before = await restartsSaid();
    const engine = page.workers().filter((w) => /engineWorker/.test(w.url()));
    expect(engine).toHaveLength(1);
    await endWorker(engine[0]);
    await expect.poll(restartsSaid, { timeout: LONG_MS }).toBe(before + 1);
    expect(await runStatus(page)).toBe('running');
    await expect.poll(() => page.workers().filter((w) => /engineWorker/.test(w.url())).length, { timeout: LONG_MS }).toBe(1);
    expect(await page.getByTestId('candidate-row').count()).toBeGreaterThanOrEqual(1);
    await checkpointAfter(page, later.round);
    await stopAndKeep(page);
    expect(app.problems()).toEqual([]);
    await app.close();
  }, 300_000);

  it('goes on from the checkpoint before when a reload tears a checkpoint write', async () => {
    const app = await browser.openApp('/');
    const { page } = app;
    // The third checkpoint write (the first is taken before any evaluation) is torn by a reload.
    await app.context.addInitScript({ content: tornCheckpointWriteScript(3) });
    await page.reload();
    await startLongSearch(app);

    // The page reloads by itself in the middle of that write, and resumes.
    const resumed = page.getByTestId('run-resumed');
    await resumed.waitFor({ timeout: LONG_MS });
    const torn = await tornCheckpointWrite(page);
    expect(torn).not.toBeNull();
    expect(torn?.before).toBeGreaterThan(0);
    expect(torn?.torn).toBeGreaterThan(torn?.before ?? 0);
    // It goes on from the checkpoint written before, the torn one never landed (a transaction is all or nothing), and it says where from.
    expect(Number(await resumed.getAttribute('data-evaluations'))).toBe(torn?.before);
    expect(await resumed.textContent()).toMatch(/^Resumed after a reload from the checkpoint of round \d+ \([\d,]+ evaluations\)/);
    // Every checkpoint stored reads back whole.
    const stored = await storedCheckpoints(page, 'run');
    expect(stored.length).toBeGreaterThanOrEqual(1);
    expect(stored.every((c) => c.evaluations !== null)).toBe(true);
    // Its best designs are back in the table while it searches on.
    await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(1);
    await expect.poll(() => pathEvaluationsShown(page), { timeout: LONG_MS }).toBeGreaterThan(torn?.before ?? 0);
    await stopAndKeep(page);
    expect(app.problems()).toEqual([]);
    await app.close();
  }, 300_000);

  it('goes on when storage is full, says checkpoints are not saved, keeps its designs, and saves again once there is room', async () => {
    const app = await browser.openApp('/');
    const { page } = app;
    await app.context.addInitScript({ content: STORAGE_FULL_SCRIPT });
    await page.reload();
    const storage = page.getByTestId('storage-status');
    // Before a search: the storage used and allowed, in MB.
    await expect.poll(() => storage.textContent(), { timeout: 30_000 }).toMatch(/^Storage for checkpoints: [\d.,]+ MB used of [\d.,]+ MB allowed; /);
    await startLongSearch(app);
    // A search starting asks the browser to keep the storage, and the answer is said.
    await expect.poll(() => storage.getAttribute('data-persistence'), { timeout: 30_000 }).toMatch(/^(persistent|declined|unsupported)$/);
    expect(await storage.textContent()).toMatch(/the browser (keeps it until you clear it|declined to promise to keep it)|cannot be asked/);
    const saved = await checkpointAfter(page, 0);

    // The storage fills: every checkpoint write now fails with QuotaExceededError.
    await setStorageFull(page, true);
    const failure = page.getByTestId('checkpoint-save-failure');
    await failure.waitFor({ timeout: LONG_MS });
    expect(await failure.textContent()).toMatch(/^Checkpoints are not being saved \(QuotaExceededError: The quota has been exceeded\)\. The search goes on and keeps its best designs in this page/);
    // It searches on; the page still names the last checkpoint saved, the one a reload goes back to, which is still stored.
    // (That may be one saved after `saved`, in the moment before the storage filled: checkpoints come every 2 s.)
    expect(await runStatus(page)).toBe('running');
    const lastSaved = await pathCheckpointShown(page);
    expect(lastSaved?.round).toBeGreaterThanOrEqual(saved.round);
    const evaluationsAtFailure = await pathEvaluationsShown(page);
    await expect.poll(() => pathEvaluationsShown(page), { timeout: LONG_MS }).toBeGreaterThan(evaluationsAtFailure);
    expect(await failure.count()).toBe(1);
    expect((await pathCheckpointShown(page))?.round).toBe(lastSaved?.round);
    expect((await storedCheckpoints(page, 'run')).some((c) => c.evaluations === lastSaved?.evaluations)).toBe(true);
    expect(await page.getByTestId('candidate-row').count()).toBeGreaterThanOrEqual(1);
    await saveScreenshot(page, 'search-storage-full');

    // Room again: the next checkpoint is saved, and the page says so.
    await setStorageFull(page, false);
    await page.getByTestId('checkpoint-saved-again').waitFor({ timeout: LONG_MS });
    expect(await failure.count()).toBe(0);
    await checkpointAfter(page, lastSaved?.round ?? saved.round);
    // Stop ranks the best designs of the whole run, those found while nothing was saved among them.
    await stopAndKeep(page);
    expect(app.problems()).toEqual([]);
    await app.close();
  }, 300_000);
});
