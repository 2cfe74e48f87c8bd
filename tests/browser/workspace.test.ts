/**
 * The workspace as a user meets it, in headless Chromium: the demo on first start,
 * target entry (paste, a bad CSV, the drawing), a short search in workers with its
 * ranked candidates, work kept across a reload, a search a reload interrupted going on
 * from its checkpoint (a damaged newest checkpoint skipped for the one before), and no
 * request to any other origin.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser, type AppPage } from './harness';
import { damageNewestCheckpointOfRunningSearch } from './storedCheckpoints';
import { storedTextHas } from './storedProject';

const SEARCH_TIMEOUT_MS = 150_000;
/** A test with a search in it: its waits for the search, each up to SEARCH_TIMEOUT_MS, and what it does around them (the file's default of 60 s is less than one such wait). */
const SEARCH_TEST_MS = 600_000;

async function openWorkspace(browser: ReturnType<typeof useBrowser>): Promise<AppPage> {
  const app = await browser.openApp('/');
  await app.page.getByTestId('project-name').waitFor({ timeout: 30_000 });
  return app;
}

async function pointRows(page: Page): Promise<number> {
  return page.getByTestId('point-row').count();
}

async function pasteCsv(page: Page, text: string): Promise<void> {
  const details = page.locator('details.csv-entry');
  if ((await details.getAttribute('open')) === null) await details.locator('summary').click();
  await page.getByLabel(/Rows of x, y in mm/).fill(text);
  await page.getByRole('button', { name: 'Read pasted points' }).click();
}

/** Sets the evaluation budget through its field, as a user types it. */
async function setEvaluationBudget(page: Page, evaluations: number): Promise<void> {
  const field = page.getByLabel('Budget in evaluations');
  await field.fill(String(evaluations));
  await field.press('Enter');
  await expect.poll(() => field.inputValue()).toBe(String(evaluations));
}

/** Checkpoints this often, seconds: shorter than the default so the test waits less. */
async function setCheckpointEvery(page: Page, seconds: number): Promise<void> {
  const field = page.getByLabel('Checkpoint every', { exact: true });
  await field.fill(String(seconds));
  await field.press('Enter');
  await expect.poll(() => field.inputValue()).toBe(String(seconds));
}

async function runStatus(page: Page): Promise<string | null> {
  return page.getByTestId('run-progress').getAttribute('data-status');
}

async function waitForStatus(page: Page, statuses: readonly string[], timeoutMs = SEARCH_TIMEOUT_MS): Promise<string> {
  await expect.poll(() => runStatus(page), { timeout: timeoutMs, interval: 250 }).toSatisfy((s: string | null) => s !== null && statuses.includes(s));
  return (await runStatus(page)) as string;
}

async function checkpointSeen(page: Page): Promise<{ round: number; evaluations: number } | null> {
  const note = page.getByTestId('run-checkpoint');
  if ((await note.count()) === 0) return null;
  return { round: Number(await note.getAttribute('data-round')), evaluations: Number(await note.getAttribute('data-evaluations')) };
}

/** Waits for a checkpoint of a round after `afterRound`, and returns it. */
async function waitForCheckpointAfter(page: Page, afterRound: number, timeoutMs = SEARCH_TIMEOUT_MS): Promise<{ round: number; evaluations: number }> {
  await expect.poll(async () => (await checkpointSeen(page))?.round ?? -1, { timeout: timeoutMs, interval: 200 }).toBeGreaterThan(afterRound);
  return (await checkpointSeen(page)) as { round: number; evaluations: number };
}

describeBrowser('workspace', () => {
  const browser = useBrowser();

  it('opens the demo on first start, ready to run, and asks no other origin', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await expect.poll(() => page.getByTestId('project-name').textContent()).toMatch(/Demo: transfer motion/);
    // The demo: 24 points of a closed coupler curve (src/app/demo/transferDemo.ts).
    expect(await pointRows(page)).toBe(24);
    expect(await page.getByLabel(/Closed path/).isChecked()).toBe(true);
    expect(await page.getByTestId('target-point').count()).toBe(24);
    expect(await page.getByTestId('target-path').count()).toBe(1);
    expect(await page.getByRole('button', { name: 'Start search' }).isEnabled()).toBe(true);
    expect(await page.getByRole('note', { name: 'Caution' }).isVisible()).toBe(true);
    // Units are shown: the table's columns and the drawing's axis.
    expect(await page.getByRole('columnheader', { name: 'x (mm)' }).count()).toBe(1);
    expect(await page.getByTestId('target-drawing').locator('.unit-label').textContent()).toBe('mm');
    await saveScreenshot(page, 'workspace-demo');
    expect(app.problems()).toEqual([]);
  });

  it('takes a pasted CSV target (semicolons, decimal commas, a header)', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await pasteCsv(page, 'x (mm);y (mm)\n0;0\n12,5;4\n25;6,5\n37,5;4\n50;0\n');
    await expect.poll(() => pointRows(page)).toBe(5);
    expect(await page.getByTestId('target-notice').textContent()).toContain('Read 5 points');
    expect(await page.getByLabel('x of point 2 (mm)').inputValue()).toBe('12.5');
    expect(await page.getByLabel('y of point 3 (mm)').inputValue()).toBe('6.5');
    expect(app.problems()).toEqual([]);
  });

  it('says which row of a bad CSV is wrong and keeps the current target', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await pasteCsv(page, 'x,y\n0,0\n10,abc\n20,5\n30,9\n');
    const alert = page.getByRole('alert');
    await alert.waitFor();
    const text = await alert.textContent();
    expect(text).toContain('the target is unchanged');
    expect(text).toContain('row 3: y is "abc", which is not a number');
    expect(await pointRows(page)).toBe(24);

    // A ragged row is named too.
    await pasteCsv(page, '0,0\n10,0\n10,10,3\n0,10\n');
    await expect.poll(() => page.getByRole('alert').textContent()).toContain('row 3 has 3 values; the first row has 2');
    expect(await pointRows(page)).toBe(24);
    await saveScreenshot(page, 'workspace-csv-error');
    expect(app.problems()).toEqual([]);
  });

  it('places, moves and deletes points on the drawing', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await page.getByRole('button', { name: 'Clear all' }).click();
    const drawing = page.getByTestId('target-drawing');
    await drawing.scrollIntoViewIfNeeded();
    const box = (await drawing.boundingBox())!;
    for (const [fx, fy] of [
      [0.3, 0.5],
      [0.5, 0.3],
      [0.7, 0.5],
      [0.5, 0.7],
    ]) {
      await page.mouse.click(box.x + fx * box.width, box.y + fy * box.height);
    }
    await expect.poll(() => pointRows(page)).toBe(4);
    const before = Number(await page.getByLabel('x of point 1 (mm)').inputValue());
    // Drag point 1 to the right by 60 px.
    const p1 = (await page.getByTestId('target-point').first().boundingBox())!;
    await page.mouse.move(p1.x + p1.width / 2, p1.y + p1.height / 2);
    await page.mouse.down();
    await page.mouse.move(p1.x + p1.width / 2 + 30, p1.y + p1.height / 2, { steps: 3 });
    await page.mouse.move(p1.x + p1.width / 2 + 60, p1.y + p1.height / 2, { steps: 3 });
    await page.mouse.up();
    await expect.poll(async () => Number(await page.getByLabel('x of point 1 (mm)').inputValue())).toBeGreaterThan(before);
    expect(await pointRows(page)).toBe(4);
    // Point 1 is selected by the drag: Delete removes it.
    await page.keyboard.press('Delete');
    await expect.poll(() => pointRows(page)).toBe(3);
    expect(app.problems()).toEqual([]);
  });

  it('traces over a background image after calibrating its scale with two points and a distance', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    // A 400 × 200 px picture of our own, made in the page (no file leaves the machine).
    const png = await page.evaluate(() => {
      const canvas = document.createElement('canvas');
      canvas.width = 400;
      canvas.height = 200;
      const g = canvas.getContext('2d') as CanvasRenderingContext2D;
      g.fillStyle = '#fff';
      g.fillRect(0, 0, 400, 200);
      g.strokeStyle = '#000';
      g.lineWidth = 4;
      g.strokeRect(50, 50, 300, 100);
      return canvas.toDataURL('image/png').split(',')[1];
    });
    await page.getByRole('button', { name: 'Clear all' }).click();
    await page.locator('details.background-controls summary').click();
    await page.locator('details.background-controls input[type=file]').setInputFiles({ name: 'side-view.png', mimeType: 'image/png', buffer: Buffer.from(png, 'base64') });
    await page.getByTestId('background-image').waitFor();
    await expect.poll(() => page.locator('details.background-controls').textContent()).toContain('side-view.png: 400 × 200 px, 200.0 mm wide');

    // Two spots on the drawing, first as points (the table gives their mm), then as calibration marks.
    const drawing = page.getByTestId('target-drawing');
    const clickSpots = async () => {
      await drawing.scrollIntoViewIfNeeded();
      const box = (await drawing.boundingBox())!;
      for (const f of [0.3, 0.7]) await page.mouse.click(box.x + f * box.width, box.y + 0.5 * box.height);
    };
    await page.getByRole('button', { name: 'Points', exact: true }).click();
    await clickSpots();
    await expect.poll(() => pointRows(page)).toBe(2);
    const mm = async (label: string) => Number(await page.getByLabel(label).inputValue());
    const measuredMm = Math.hypot((await mm('x of point 2 (mm)')) - (await mm('x of point 1 (mm)')), (await mm('y of point 2 (mm)')) - (await mm('y of point 1 (mm)')));
    await page.getByRole('button', { name: 'Clear all' }).click();

    await page.getByRole('button', { name: 'Calibrate image' }).click();
    await clickSpots();
    // A distance that cannot be one is named beside the Set scale button, which waits for a good one.
    await page.getByLabel('Known distance between calibration points (mm)').fill('0');
    const issue = page.locator('details.background-controls .calibrate').getByTestId('calibration-issue');
    await expect.poll(() => issue.textContent()).toContain('"0" is not a distance');
    expect(await page.getByRole('button', { name: 'Set scale' }).isDisabled()).toBe(true);
    await page.getByLabel('Known distance between calibration points (mm)').fill('150');
    expect(await issue.count()).toBe(0);
    await page.getByRole('button', { name: 'Set scale' }).click();
    await expect.poll(() => page.getByTestId('target-notice').textContent()).toContain('Image calibrated: 150 mm');
    // The image is scaled by 150 / measured (a similarity; theorem): 200 mm wide becomes 200 · 150 / measured.
    const widthText = (await page.locator('details.background-controls').textContent()) ?? '';
    const shownWidth = Number(/([\d.]+) mm wide \(calibrated\)/.exec(widthText)?.[1]);
    expect(shownWidth).toBeCloseTo((200 * 150) / measuredMm, 0);

    // Tracing: the point tool places points over the image.
    await page.getByRole('button', { name: 'Points', exact: true }).click();
    await drawing.scrollIntoViewIfNeeded();
    const traced = (await drawing.boundingBox())!;
    for (const f of [0.2, 0.4, 0.6]) await page.mouse.click(traced.x + f * traced.width, traced.y + 0.4 * traced.height);
    await expect.poll(() => pointRows(page)).toBe(3);
    await saveScreenshot(page, 'workspace-background');
    // The image survives a reload (its bytes are in IndexedDB, shown through a blob: URL). The
    // project naming it is saved a moment after the change (the saver's delay): wait for the record, then reload.
    await expect.poll(() => storedTextHas(page, 'side-view.png', '"calibrated":true'), { timeout: 10_000 }).toBe(true);
    await page.reload();
    await page.getByTestId('background-image').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('background-image').getAttribute('href')).toMatch(/^blob:/);
    expect(app.problems()).toEqual([]);
  });

  it('draws keep-out regions and shows the pivot bounds of a fixed placement on the drawing', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    expect(await page.getByTestId('bound-region').count()).toBe(0);
    await page.getByLabel(/Fixed: the pivots are searched/).check();
    // The four-bar's ground pivots A0 and B0: one rectangle, as their default boxes are the same.
    await expect.poll(() => page.getByTestId('bound-region').count()).toBe(1);
    expect(await page.getByTestId('bound-region').textContent()).toContain('A0, B0 (four-bar)');

    await page.getByRole('button', { name: 'Keep-out region' }).click();
    const drawing = page.getByTestId('target-drawing');
    await drawing.scrollIntoViewIfNeeded();
    const box = (await drawing.boundingBox())!;
    const centre = { x: box.x + 0.5 * box.width, y: box.y + 0.8 * box.height };
    await page.mouse.move(centre.x, centre.y);
    await page.mouse.down();
    await page.mouse.move(centre.x + 20, centre.y, { steps: 2 });
    await page.mouse.move(centre.x + 40, centre.y, { steps: 2 });
    await page.mouse.up();
    await expect.poll(() => page.getByTestId('keep-out-region').count()).toBe(1);
    expect(await page.locator('.keep-out-list').textContent()).toMatch(/1: centre \(-?[\d.]+, -?[\d.]+\) mm, radius [\d.]+ mm/);
    expect(await pointRows(page)).toBe(24);
    // The wheel zooms out until the pivot regions (default boxes are wide) fit inside the drawing.
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    const regionWidth = async () => Number(await page.getByTestId('bound-region').first().locator('rect').getAttribute('width'));
    const wide = await regionWidth();
    for (let k = 0; k < 20 && (await regionWidth()) > 0.6 * box.width; k++) {
      await page.mouse.wheel(0, 150);
      await page.waitForTimeout(100);
    }
    // The last wheel turns may not be drawn yet when the loop ends.
    await expect.poll(regionWidth).toBeLessThan(Math.min(wide, 0.6 * box.width) + 1);
    expect(await regionWidth()).toBeLessThan(wide);
    await saveScreenshot(page, 'workspace-constraints');
    await page.getByRole('button', { name: 'Remove keep-out region 1' }).click();
    await expect.poll(() => page.getByTestId('keep-out-region').count()).toBe(0);
    expect(app.problems()).toEqual([]);
  });

  it('runs a short search in workers, ranks candidates, and keeps them across a reload', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await setEvaluationBudget(page, 4000);
    // How long the page's main-thread tasks take while the search runs is measured in
    // `npm run bench -- main-thread` (a time is no test: it moves with the machine).
    await page.getByRole('button', { name: 'Start search' }).click();
    expect(await waitForStatus(page, ['finished', 'failed'])).toBe('finished');

    const rows = page.getByTestId('candidate-row');
    await expect.poll(() => rows.count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(5);
    expect(await page.getByTestId('run-status').textContent()).toMatch(/Finished: .*candidates ranked/);
    // Every evaluation ran in a worker: the page loaded the search worker's script.
    expect(app.requests.some((r) => /searchWorker.*\.js$/.test(new URL(r.url).pathname))).toBe(true);
    await saveScreenshot(page, 'workspace-results', { fullPage: true });

    const rankedBefore = await rows.count();
    await page.reload();
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBe(rankedBefore);
    expect(await pointRows(page)).toBe(24);
    expect(await page.getByLabel('Budget in evaluations').inputValue()).toBe('4000');
    expect(await runStatus(page)).toBe('finished');
    expect(app.problems()).toEqual([]);
  }, SEARCH_TEST_MS);

  it('goes on from its checkpoint after a reload, skipping a damaged newest checkpoint', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await setEvaluationBudget(page, 5_000_000);
    await setCheckpointEvery(page, 2);
    await page.getByRole('button', { name: 'Start search' }).click();
    await waitForStatus(page, ['running']);

    const first = await waitForCheckpointAfter(page, 0);
    expect(first.evaluations).toBeGreaterThan(0);
    await saveScreenshot(page, 'workspace-search-running');
    // The target is locked, but it can still be saved while the search runs on it.
    expect(await page.getByLabel('Closed path (a loop, once per crank turn)').isDisabled()).toBe(true);
    const file = await downloadFrom(page, page.getByRole('button', { name: 'Export target as CSV' }));
    expect(file.suggestedFilename()).toBe('target.csv');
    const csvRows = (await readFile(await file.path(), 'utf8')).trim().split(/\r?\n/);
    // The header, the 24 points, and the first point again: a closed loop, as the CSV reader reads one.
    expect(csvRows.length).toBe(1 + 24 + 1);
    expect(csvRows[25]).toBe(csvRows[1]);
    const second = await waitForCheckpointAfter(page, first.round);
    expect(second.evaluations).toBeGreaterThan(first.evaluations);

    // Damage the newest checkpoint in IndexedDB (one digit of its payload), as a torn write would,
    // and write no more in this page: the search saves every 2 s, so one saved after `second`, or
    // between the damage and the reload, would otherwise be the newest by the time the page reloads.
    const before = await damageNewestCheckpointOfRunningSearch(page, 'run');
    if (before === null) throw new Error('fewer than two checkpoints stored: none to damage and go back before');
    // The checkpoint before the damaged one: `first`, or one saved after it (`second`, or the one
    // before a newer checkpoint saved in the moment before the writes stopped).
    expect(before).toBeGreaterThanOrEqual(first.evaluations);

    await page.reload();
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    const resumed = page.getByTestId('run-resumed');
    await resumed.waitFor({ timeout: SEARCH_TIMEOUT_MS });
    // It went back to the checkpoint before the damaged one, not to the start.
    expect(Number(await resumed.getAttribute('data-evaluations'))).toBe(before);
    await expect.poll(() => page.getByText(/Skipped 1 damaged checkpoint/).count()).toBe(1);
    // The best candidates found before the reload are there while the search goes on.
    await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(5);
    await waitForStatus(page, ['running']);
    await expect
      .poll(async () => Number((await page.getByTestId('run-evaluations').textContent())?.split(' of ')[0].replace(/,/g, '')), { timeout: SEARCH_TIMEOUT_MS })
      .toBeGreaterThan(before);
    await saveScreenshot(page, 'workspace-resumed');

    await page.getByRole('button', { name: 'Stop' }).click();
    expect(await waitForStatus(page, ['finished', 'failed'])).toBe('finished');
    await expect.poll(() => page.getByTestId('candidate-row').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(5);
    expect(app.problems()).toEqual([]);
  }, SEARCH_TEST_MS);
});
