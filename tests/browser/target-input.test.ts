/**
 * Entering a target as a user does, in headless Chromium: a CSV weight column reaches the
 * point table, the saved project and the search; a pasted table says itself whether the
 * path closes; an emptied or unreadable point cell is refused beside the cell and listed
 * under Start; the table is one Tab stop; Fit view shows the keep-out circles; and a
 * paste far over the target limit is refused before it reaches the text box.
 */
import type { Locator, Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { MAX_CSV_BOX_CHARS } from '../../src/app/target/csvImport';
import { MAX_POINTS_CSV_CHARS } from '../../src/core/io/pointsCsv';
import { describeBrowser, saveScreenshot, useBrowser, type AppPage } from './harness';
import { csvBox, makeTextInPage, openCsv, pasteKeptText } from './targetPaste';

const SEARCH_TIMEOUT_MS = 150_000;
/** The test with a search: its two waits on the search may take SEARCH_TIMEOUT_MS each, more than the 60 s a test may take by default. */
const SEARCH_TEST_MS = 3 * SEARCH_TIMEOUT_MS;
/** Tab presses allowed to reach Start search from the table: a cap, so a lost focus fails rather than loops. */
const MAX_TABS = 200;

/** Words of the code's own, which the page must never show. */
const INTERNAL = /\b(?:target|budget|jobs)(?:\.|\[)|worker \d+ refused/;

async function openWorkspace(browser: ReturnType<typeof useBrowser>): Promise<AppPage> {
  const app = await browser.openApp('/');
  await app.page.getByTestId('project-name').waitFor({ timeout: 30_000 });
  return app;
}

/** What the target panel says about the last import: what was read, or why it was refused. */
async function targetNotice(page: Page): Promise<string> {
  return (await page.getByTestId('target-notice').textContent()) ?? '';
}

async function pasteCsv(page: Page, text: string): Promise<void> {
  await openCsv(page);
  await csvBox(page).fill(text);
  await page.getByRole('button', { name: 'Read pasted points' }).click();
}

function startButton(page: Page): Locator {
  return page.getByRole('button', { name: 'Start search' });
}

/** The message beside a field: the element its aria-describedby names. */
async function messageBeside(page: Page, field: Locator): Promise<string> {
  const id = await field.getAttribute('aria-describedby');
  if (id === null) return '';
  return (await page.locator(`[id="${id}"]`).textContent()) ?? '';
}

/** Twelve points on a circle of radius 40 mm about (50, 50), to 3 decimals, as a CSV writer would print them. */
function circle(): [number, number][] {
  return Array.from({ length: 12 }, (_, i) => {
    const a = (2 * Math.PI * i) / 12;
    return [Math.round((50 + 40 * Math.cos(a)) * 1000) / 1000, Math.round((50 + 40 * Math.sin(a)) * 1000) / 1000];
  });
}

/** A record of IndexedDB's "loci" database, read in the page. */
function readStore(page: Page, store: 'projects' | 'checkpoints'): Promise<unknown[]> {
  return page.evaluate(
    (name) =>
      new Promise<unknown[]>((resolve, reject) => {
        const open = indexedDB.open('loci');
        open.onerror = () => reject(new Error('cannot open the database'));
        open.onsuccess = () => {
          const all = open.result.transaction(name).objectStore(name).getAll();
          all.onsuccess = () => resolve(all.result as unknown[]);
        };
      }),
    store,
  );
}

interface SavedPoint {
  x: number;
  y: number;
  weight?: number;
}

async function savedPoints(page: Page): Promise<SavedPoint[]> {
  const [project] = (await readStore(page, 'projects')) as { target: { points: SavedPoint[] } }[];
  return project?.target.points ?? [];
}

describeBrowser('target input', () => {
  const browser = useBrowser();

  it('carries a weight column into the table, the saved project and the search, and refuses all-zero weights', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    const points = circle();
    const weights = [1, 2, 3, 0.5, 1, 2, 3, 0.5, 1, 2, 3, 0.5];
    await pasteCsv(page, ['x_mm,y_mm,weight', ...points.map(([x, y], i) => `${x},${y},${weights[i]}`)].join('\n'));

    // The table shows the file's weights, row by row.
    await expect.poll(() => page.getByRole('columnheader', { name: 'weight' }).count()).toBe(1);
    for (const [i, w] of weights.entries()) expect(await page.getByLabel(`weight of point ${i + 1}`, { exact: true }).inputValue()).toBe(String(w));
    const notice = await targetNotice(page);
    expect(notice).toMatch(/Weights were read/);
    expect(notice).not.toMatch(/not used/);

    // The project in IndexedDB (what a reload opens) holds them.
    await expect.poll(async () => (await savedPoints(page)).map((p) => p.weight), { timeout: 10_000 }).toEqual(weights);

    // A weight typed in the table is checked as typed: below 0 is refused beside the cell and under Start.
    const third = page.getByLabel('weight of point 3', { exact: true });
    await third.fill('-1');
    await third.press('Tab');
    expect(await third.getAttribute('aria-invalid')).toBe('true');
    expect(await messageBeside(page, third)).toMatch(/^Point 3, weight: -1 is below 0; expected a weight from 0 to 1,000,000/);
    expect((await page.getByTestId('start-issues').textContent()) ?? '').toContain('Point 3, weight: -1 is below 0');
    await third.fill('4');
    await third.press('Tab');
    await expect.poll(() => startButton(page).isDisabled()).toBe(false);
    await expect.poll(async () => (await savedPoints(page))[2]?.weight, { timeout: 10_000 }).toBe(4);

    // A search starts with them: the run's spec, which every checkpoint carries, holds the problem with these weights.
    const sent = [1, 2, 4, 0.5, 1, 2, 3, 0.5, 1, 2, 3, 0.5];
    await page.getByLabel('Budget in evaluations').fill('4000');
    await page.getByLabel('Budget in evaluations').press('Tab');
    await startButton(page).click();
    await expect
      .poll(async () => ((await readStore(page, 'checkpoints')) as { text: string }[]).some((c) => c.text.includes(`"weights":${JSON.stringify(sent)}`)), {
        timeout: SEARCH_TIMEOUT_MS,
        interval: 500,
      })
      .toBe(true);
    await expect.poll(() => page.getByTestId('run-progress').getAttribute('data-status'), { timeout: SEARCH_TIMEOUT_MS }).toMatch(/finished|failed/);
    expect(await page.getByTestId('run-progress').getAttribute('data-status')).toBe('finished');

    // An all-zero weight column leaves the target as it was, and says why.
    await pasteCsv(page, ['x,y,weight', ...points.map(([x, y]) => `${x},${y},0`)].join('\n'));
    const refused = await targetNotice(page);
    expect(refused).toContain('the target is unchanged');
    expect(refused).toContain('every weight is 0; expected at least one point with a weight above 0');
    expect(await page.getByLabel('weight of point 3', { exact: true }).inputValue()).toBe('4');
    await saveScreenshot(page, 'target-input-weights');
    expect(app.problems()).toEqual([]);
  }, SEARCH_TEST_MS);

  it('takes open or closed from the pasted table itself, and says which', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    const closed = page.getByLabel(/Closed path/);
    const loop = [...circle(), circle()[0]];
    await pasteCsv(page, loop.map(([x, y]) => `${x},${y}`).join('\n'));
    await expect.poll(() => closed.isChecked()).toBe(true);
    expect(await targetNotice(page)).toMatch(/repeated the first, so it was dropped and the path is closed/);

    // An open path pasted after the closed one: the box is no longer ticked, and the notice says why.
    await pasteCsv(page, circle().slice(0, 6).map(([x, y]) => `${x},${y}`).join('\n'));
    await expect.poll(() => closed.isChecked()).toBe(false);
    expect(await targetNotice(page)).toMatch(/does not repeat the first, so the path is open/);
    expect(app.problems()).toEqual([]);
  });

  it('refuses an emptied or unreadable point cell beside it and under Start, and keeps the table to one Tab stop', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    const rows = await page.getByTestId('point-row').count();
    expect(rows).toBeGreaterThan(3);
    const x2 = page.getByLabel('x of point 2 (mm)', { exact: true });
    const before = await x2.inputValue();

    for (const [typed, said] of [
      ['', /^Point 2, x: empty; expected a coordinate in mm from −[\d,]+ to [\d,]+/],
      ['abc', /^Point 2, x: "abc" is not a number; expected a coordinate in mm/],
    ] as const) {
      await x2.fill(typed);
      await x2.press('Tab');
      expect(await x2.getAttribute('aria-invalid')).toBe('true');
      const beside = await messageBeside(page, x2);
      expect(beside).toMatch(said);
      expect(beside).not.toMatch(INTERNAL);
      // What was typed stays; the point keeps its old place until the cell holds a number; Start lists the cell.
      expect(await x2.inputValue()).toBe(typed);
      expect(await startButton(page).isDisabled()).toBe(true);
      expect((await page.getByTestId('start-issues').textContent()) ?? '').toContain(beside);
    }
    await saveScreenshot(page, 'target-input-empty-cell');
    await expect.poll(async () => String((await savedPoints(page))[1]?.x), { timeout: 10_000 }).toBe(before);
    await x2.fill('12.5');
    await x2.press('Tab');
    expect(await x2.getAttribute('aria-invalid')).toBe('false');
    await expect.poll(() => startButton(page).isDisabled()).toBe(false);
    await expect.poll(async () => (await savedPoints(page))[1]?.x, { timeout: 10_000 }).toBe(12.5);

    // Arrow keys move within the table: down to the next point, right to the next column.
    const x1 = page.getByLabel('x of point 1 (mm)', { exact: true });
    await x1.focus();
    await page.keyboard.press('ArrowDown');
    expect(await page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('x of point 2 (mm)');
    await page.keyboard.press('End');
    await page.keyboard.press('ArrowRight');
    expect(await page.evaluate(() => document.activeElement?.getAttribute('aria-label'))).toBe('y of point 2 (mm)');

    /** Tab presses from the table's first cell to Start search. */
    const tabsToStart = async (): Promise<number> => {
      await x1.focus();
      for (let n = 1; n <= MAX_TABS; n++) {
        await page.keyboard.press('Tab');
        if ((await page.evaluate(() => document.activeElement?.textContent)) === 'Start search') return n;
      }
      return Infinity;
    };
    // The same page around the table for both counts: a pasted target (its notice) with the CSV box open.
    await pasteCsv(page, circle().map(([x, y]) => `${x},${y}`).join('\n'));
    expect(await page.getByTestId('point-row').count()).toBe(12);
    // One Tab leaves the table (its cells are one stop) ...
    await x1.focus();
    await page.keyboard.press('Tab');
    expect(await page.evaluate(() => document.activeElement?.closest('.point-table tbody') === null)).toBe(true);
    // ... so reaching Start takes as many presses with many points as with three. // theorem: a single tab stop adds 1 whatever the row count.
    const many = await tabsToStart();
    expect(many).toBeLessThan(MAX_TABS);
    await pasteCsv(page, '0,0\n30,0\n30,20\n');
    expect(await page.getByTestId('point-row').count()).toBe(3);
    expect(await tabsToStart()).toBe(many);
    expect(app.problems()).toEqual([]);
  });

  it('fits the view to the keep-out circles and bound regions drawn, not to the points alone', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await page.getByLabel('Keep-out circle, centre x (mm)').fill('900');
    await page.getByLabel('Keep-out circle, centre y (mm)').fill('-700');
    await page.getByLabel('Keep-out circle, radius (mm)').fill('60');
    await page.getByRole('button', { name: 'Add keep-out circle' }).click();
    await page.getByRole('button', { name: 'Fit view' }).click();
    const drawing = page.getByTestId('target-drawing');
    const frame = await drawing.boundingBox();
    if (frame === null) throw new Error('the drawing has no box');
    const inside = async (shape: Locator) => {
      const box = await shape.boundingBox();
      if (box === null) return false;
      // theorem: a shape is in view when its box lies within the drawing's box (1 px for rounding).
      return box.x >= frame.x - 1 && box.y >= frame.y - 1 && box.x + box.width <= frame.x + frame.width + 1 && box.y + box.height <= frame.y + frame.height + 1;
    };
    await expect.poll(() => inside(page.getByTestId('keep-out-region').locator('circle'))).toBe(true);
    const regions = page.getByTestId('bound-region').locator('rect');
    for (let i = 0; i < (await regions.count()); i++) expect(await inside(regions.nth(i))).toBe(true);
    for (const point of await page.getByTestId('target-drawing').locator('[data-drag]').all()) expect(await inside(point)).toBe(true);
    await saveScreenshot(page, 'target-input-fit-view');
    expect(app.problems()).toEqual([]);
  });

  // How long the page's main-thread tasks take over these two pastes is measured in
  // `npm run bench -- main-thread` (a time is no test: it moves with the machine).
  it('refuses a 5 MB paste before it reaches the box, with a message', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await openCsv(page);
    const box = csvBox(page);
    const size = 5_000_000;
    expect(size).toBeGreaterThan(MAX_POINTS_CSV_CHARS);
    expect(await makeTextInPage(page, size, 'repeated')).toBe(size);
    await box.focus();
    // A synthetic paste carries the text as a real one does (a DataTransfer); the page must cancel it.
    const accepted = await pasteKeptText(box);
    expect(accepted).toBe(false);
    expect(await box.inputValue()).toBe('');
    const notice = await targetNotice(page);
    expect(notice).toContain(`the text is ${size / 1000} kB; a target pasted as text may be at most ${MAX_POINTS_CSV_CHARS / 1000} kB`);

    // Then select all and replace, as the user did.
    await box.focus();
    await page.keyboard.press('Control+A');
    await page.keyboard.insertText('0,0\n30,0\n30,20\n');
    expect(await box.inputValue()).toBe('0,0\n30,0\n30,20\n');
    // The box works as before: what replaced the text is read with the button.
    await page.getByRole('button', { name: 'Read pasted points' }).click();
    await expect.poll(() => page.getByTestId('point-row').count()).toBe(3);
    expect(app.problems()).toEqual([]);
  });

  it('reads a paste too long for the box directly, off the page thread', async () => {
    const app = await openWorkspace(browser);
    const { page } = app;
    await openCsv(page);
    const box = csvBox(page);
    // Rows of distinct points up to just under the reader's limit: more rows than a target may have.
    const size = await makeTextInPage(page, MAX_POINTS_CSV_CHARS - 40, 'distinct');
    expect(size).toBeGreaterThan(MAX_CSV_BOX_CHARS);
    await box.focus();
    expect(await pasteKeptText(box)).toBe(false);
    expect(await box.inputValue()).toBe('');
    await expect.poll(() => targetNotice(page)).toMatch(/read directly: too long to edit in the box\); the target is unchanged/);
    // Read in a worker of its own: the page loaded the reader's worker script.
    expect(app.requests.some((r) => /csvParseWorker.*\.js$/.test(new URL(r.url).pathname))).toBe(true);
    expect(await targetNotice(page)).toMatch(/rows of points; a target may have at most [\d,]+ \(resample it first\)/);
    // Then select all and replace.
    await box.focus();
    await page.keyboard.press('Control+A');
    await page.keyboard.insertText('0,0\n30,0\n30,20\n');
    expect(await box.inputValue()).toBe('0,0\n30,0\n30,20\n');

    // A target of 2,000 points pasted whole, longer than the box takes: read directly, the table a page of rows at a time.
    const many = Array.from({ length: 2000 }, (_, i) => `${(i * 0.25).toFixed(2)},${(50 * Math.sin(i / 20)).toFixed(3)}`).join('\n');
    expect(many.length).toBeGreaterThan(MAX_CSV_BOX_CHARS);
    await box.fill('');
    await page.evaluate((t) => ((window as unknown as { __text: string }).__text = t), many);
    expect(await pasteKeptText(box)).toBe(false);
    await expect.poll(() => page.getByTestId('point-table-page').textContent(), { timeout: 30_000 }).toBe('Points 1–100 of 2000');
    expect(await page.getByTestId('point-row').count()).toBe(100);
    expect(await page.getByTestId('target-drawing').locator('[data-drag]').count()).toBe(2000);
    await page.getByRole('button', { name: 'Next 100' }).click();
    expect(await page.getByTestId('point-table-page').textContent()).toBe('Points 101–200 of 2000');
    // Point 101 is row 101 of the text: x = 100 × 0.25 mm.
    expect(await page.getByLabel('x of point 101 (mm)', { exact: true }).inputValue()).toBe('25');

    // A short paste goes into the box as before, to be edited and read with the button.
    await page.evaluate(() => ((window as unknown as { __text: string }).__text = '0,0\n30,0\n30,20\n'));
    expect(await pasteKeptText(box)).toBe(true);
    expect(app.problems()).toEqual([]);
  });
});
