import type { Locator, Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { describeBrowser, saveScreenshot, useBrowser, type AppPage } from './harness';
import { storedTextHas } from './storedProject';
import { drawnScale } from './sideViewScale';

const status = (page: Page) => page.getByTestId('suspension-search-problem');
const fieldInput = (page: Page, field: string): Locator => page.locator(`[data-field="${field}"] input`);
const fieldIssue = (page: Page, field: string): Locator => page.getByTestId(`setup-issue-${field}`);

/** A number typed by a drag: on the 0.1 mm grid, shown with at most one decimal. */
const ON_GRID = /^-?\d+(\.\d)?$/;

describeBrowser('rear suspension: the search set-up', () => {
  const browser = useBrowser();

  async function openDemo(): Promise<AppPage> {
    const app = await browser.openApp('/');
    await app.page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await app.page.getByTestId('suspension-workspace').waitFor();
    await app.page.getByTestId('search-setup-panel').waitFor();
    return app;
  }

  it('opens ready to search; a bad value is shown beside its field and blocks the search until corrected', async () => {
    const app = await openDemo();
    const page = app.page;
    expect(await status(page).getAttribute('data-ready')).toBe('true');
    expect(await status(page).textContent()).toContain('Ready to search: 3 layouts');
    expect(await page.getByTestId('suspension-caution').isVisible()).toBe(true);

    const min = fieldInput(page, 'targets.travelMm.min');
    await min.fill('13o');
    await expect.poll(() => status(page).getAttribute('data-ready')).toBe('false');
    expect(await fieldIssue(page, 'targets.travelMm.min').textContent()).toContain('"13o" is not a number');
    // Beside the field: inside the same field block as the input.
    expect(await page.locator('[data-field="targets.travelMm.min"]').getByTestId('setup-issue-targets.travelMm.min').count()).toBe(1);
    expect(await min.getAttribute('aria-invalid')).toBe('true');
    expect(await min.inputValue()).toBe('13o');
    expect(await status(page).locator('li').first().textContent()).toContain('"13o" is not a number');

    // A band the wrong way round is the band's issue.
    await min.fill('160');
    await fieldIssue(page, 'targets.travelMm').waitFor();
    expect(await fieldIssue(page, 'targets.travelMm').textContent()).toMatch(/160 is above/);
    // A cog the cassette does not have is the cogs field's issue.
    await fieldInput(page, 'targets.antiSquatAtSag.cogs').fill('21, 20');
    await fieldIssue(page, 'targets.antiSquatAtSag.cogs').waitFor();
    expect(await fieldIssue(page, 'targets.antiSquatAtSag.cogs').textContent()).toContain('20 teeth is not a cog of the bicycle');
    await fieldIssue(page, 'targets.antiSquatAtSag.cogs').evaluate((e) => e.scrollIntoView({ block: 'center' }));
    await saveScreenshot(page, 'suspension-targets-bad-field');

    await min.fill('135');
    await fieldInput(page, 'targets.antiSquatAtSag.cogs').fill('21, 24, 28');
    await expect.poll(() => status(page).getAttribute('data-ready')).toBe('true');
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('draws a pivot region by dragging on the side view: the typed range is the dragged one, by the drawing’s own scale', async () => {
    const app = await openDemo();
    const page = app.page;
    await page.getByRole('button', { name: 'Draw the region of the rocker pivot on the side view' }).click();
    await page.getByTestId('setup-capture').waitFor();
    await page.getByTestId('side-view').scrollIntoViewIfNeeded();
    const scale = await drawnScale(page);
    // Around the demo rocker pivot (−15, 325) mm, in client pixels chosen off any grid.
    const a = scale.toClient(-62.3, 371.7);
    const b = scale.toClient(33.1, 281.4);
    const from = { x: a.x + 0.37, y: a.y + 0.21 };
    const to = { x: b.x - 0.29, y: b.y + 0.43 };
    await page.mouse.move(from.x, from.y);
    await page.mouse.down();
    await page.mouse.move((from.x + to.x) / 2, (from.y + to.y) / 2, { steps: 2 });
    await page.mouse.move(to.x, to.y, { steps: 3 });
    await page.mouse.up();
    await expect.poll(() => page.getByTestId('setup-capture').count()).toBe(0);

    const p = scale.toMm(from.x, from.y);
    const q = scale.toMm(to.x, to.y);
    const kind = 'four-bar, axle on the seat stay';
    const cells = {
      xMin: page.getByLabel(`${kind}, rocker pivot x from (mm)`),
      xMax: page.getByLabel(`${kind}, rocker pivot x to (mm)`),
      yMin: page.getByLabel(`${kind}, rocker pivot y from (mm)`),
      yMax: page.getByLabel(`${kind}, rocker pivot y to (mm)`),
    };
    const expected = { xMin: Math.min(p.x, q.x), xMax: Math.max(p.x, q.x), yMin: Math.min(p.y, q.y), yMax: Math.max(p.y, q.y) };
    for (const key of ['xMin', 'xMax', 'yMin', 'yMax'] as const) {
      const text = await cells[key].inputValue();
      expect(text, key).toMatch(ON_GRID);
      // The drag lands on the 0.1 mm grid: within half a step of where the pointer was, by the drawing's own scale (one pixel's doubt at most).
      expect(Math.abs(Number(text) - expected[key]), key).toBeLessThanOrEqual(0.05 + 1 / scale.pxPerMm);
    }
    // The rectangle drawn is the typed range.
    const rect = page.locator('[data-region="rockerPivot"] rect');
    const xMin = Number(await cells.xMin.inputValue());
    const yMax = Number(await cells.yMax.inputValue());
    expect(Number(await rect.getAttribute('x'))).toBeCloseTo(scale.originX + xMin * scale.pxPerMm, 6);
    expect(Number(await rect.getAttribute('y'))).toBeCloseTo(scale.originY - yMax * scale.pxPerMm, 6);

    // The regions table fits in its panel (the left column is narrow).
    const panel = await page.getByTestId('search-setup-panel').boundingBox();
    const table = await page.getByTestId('regions-fourBarSeatStayAxle').boundingBox();
    if (panel === null || table === null) throw new Error('no set-up panel or regions table');
    expect(table.x + table.width).toBeLessThanOrEqual(panel.x + panel.width);

    // Typed back the other way: the rectangle follows the field.
    await cells.xMin.fill('-80');
    await expect.poll(async () => Number(await rect.getAttribute('x'))).toBeCloseTo(scale.originX - 80 * scale.pxPerMm, 6);
    expect(await status(page).getAttribute('data-ready')).toBe('true');
    await page.getByTestId('side-view').scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'suspension-targets-region');
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('a keep-out typed in appears on the side view; dragging its centre types the new centre', async () => {
    const app = await openDemo();
    const page = app.page;
    expect(await page.locator('.susp-keep-out').count()).toBe(2);
    await page.getByRole('button', { name: 'Add a keep-out' }).click();
    await page.getByLabel('Keep-out 3 name').fill('tyre at full compression');
    await page.getByLabel('Keep-out 3 x (mm)').fill('-300');
    await page.getByLabel('Keep-out 3 y (mm)').fill('150');
    // Not yet a circle: the radius is empty, and the field says so.
    expect(await fieldIssue(page, 'keepOut.2.r').textContent()).toContain('empty');
    await page.getByLabel('Keep-out 3 r (mm)').fill('40');
    await page.getByTestId('search-keep-out').scrollIntoViewIfNeeded();
    await saveScreenshot(page, 'suspension-targets-keep-out');
    const drawn = page.getByTestId('side-view').locator('[data-keep-out="2"]');
    await drawn.waitFor();
    await page.getByTestId('side-view').scrollIntoViewIfNeeded();
    const scale = await drawnScale(page);
    const area = drawn.locator('circle.susp-keep-out-area');
    expect(Number(await area.getAttribute('cx'))).toBeCloseTo(scale.originX - 300 * scale.pxPerMm, 6);
    expect(Number(await area.getAttribute('cy'))).toBeCloseTo(scale.originY - 150 * scale.pxPerMm, 6);
    expect(Number(await area.getAttribute('r'))).toBeCloseTo(40 * scale.pxPerMm, 6);
    expect(await drawn.textContent()).toContain('tyre at full compression');

    // Drag the centre handle to a new place.
    const start = scale.toClient(-300, 150);
    const goal = scale.toClient(-287.4, 161.2);
    await page.mouse.move(start.x, start.y);
    await page.mouse.down();
    await page.mouse.move(goal.x, goal.y, { steps: 4 });
    await page.mouse.up();
    const x = page.getByLabel('Keep-out 3 x (mm)');
    const y = page.getByLabel('Keep-out 3 y (mm)');
    await expect.poll(async () => Number(await x.inputValue())).not.toBe(-300);
    const at = scale.toMm(goal.x, goal.y);
    expect(await x.inputValue()).toMatch(ON_GRID);
    expect(Math.abs(Number(await x.inputValue()) - at.x)).toBeLessThanOrEqual(0.05 + 1 / scale.pxPerMm);
    expect(Math.abs(Number(await y.inputValue()) - at.y)).toBeLessThanOrEqual(0.05 + 1 / scale.pxPerMm);
    // The radius was not dragged and keeps what was typed.
    expect(await page.getByLabel('Keep-out 3 r (mm)').inputValue()).toBe('40');

    // By keyboard: the focused centre handle moves 1 mm a key.
    const before = Number(await x.inputValue());
    await page.locator('[data-keep-out-centre="2"]').focus();
    await page.keyboard.press('ArrowRight');
    await expect.poll(async () => Number(await x.inputValue())).toBeCloseTo(before + 1, 9);

    await page.getByRole('button', { name: /Remove keep-out 3/ }).click();
    await expect.poll(() => page.locator('.susp-keep-out').count()).toBe(2);

    // Placed by dragging from the centre to the rim.
    await page.getByRole('button', { name: 'Place a keep-out on the side view' }).click();
    await page.getByTestId('setup-capture').waitFor();
    await page.getByTestId('side-view').scrollIntoViewIfNeeded();
    const placed = await drawnScale(page);
    const centre = placed.toClient(-150.3, 420.6);
    const rim = placed.toClient(-150.3 + 27.7, 420.6);
    await page.mouse.move(centre.x, centre.y);
    await page.mouse.down();
    await page.mouse.move(rim.x, rim.y, { steps: 3 });
    await page.mouse.up();
    await expect.poll(() => page.locator('.susp-keep-out').count()).toBe(3);
    const c = placed.toMm(centre.x, centre.y);
    const e = placed.toMm(rim.x, rim.y);
    const typed = await Promise.all(['x', 'y', 'r'].map((f) => page.getByLabel(`Keep-out 3 ${f} (mm)`).inputValue()));
    for (const t of typed) expect(t).toMatch(ON_GRID);
    const doubt = 0.05 + 1 / placed.pxPerMm;
    expect(Math.abs(Number(typed[0]) - c.x)).toBeLessThanOrEqual(doubt);
    expect(Math.abs(Number(typed[1]) - c.y)).toBeLessThanOrEqual(doubt);
    // theorem: the radius is the distance from the centre to where the drag ended.
    expect(Math.abs(Number(typed[2]) - Math.hypot(e.x - c.x, e.y - c.y))).toBeLessThanOrEqual(2 * doubt);
    expect(await status(page).getAttribute('data-ready')).toBe('true');
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('the set-up is kept in the project: back to path synthesis, reload, open it again', async () => {
    const app = await openDemo();
    const page = app.page;
    await page.getByLabel('Design name').fill('Set-up kept');
    await page.getByRole('checkbox', { name: 'Watt six-bar' }).uncheck();
    await fieldInput(page, 'seed').fill('7');
    await page.getByLabel('single pivot, main pivot y from (mm)').fill('55.5');
    await fieldInput(page, 'targets.leverageRatio.end').fill('2.35');
    await page.getByLabel('Keep-out 2 r (mm)').fill('3x');
    await fieldIssue(page, 'keepOut.1.r').waitFor();
    await page.getByRole('button', { name: 'Back to path synthesis' }).click();
    // Written to IndexedDB a moment after the change (the saver's delay): wait for the record, then reload.
    await expect.poll(() => storedTextHas(page, 'Set-up kept', '"3x"'), { timeout: 10_000 }).toBe(true);
    await page.reload();
    await page.getByRole('button', { name: 'Rear suspension: Set-up kept' }).click();
    await page.getByTestId('search-setup-panel').waitFor();
    expect(await page.getByRole('checkbox', { name: 'Watt six-bar' }).isChecked()).toBe(false);
    expect(await page.getByRole('checkbox', { name: 'single pivot', exact: true }).isChecked()).toBe(true);
    expect(await fieldInput(page, 'seed').inputValue()).toBe('7');
    expect(await page.getByLabel('single pivot, main pivot y from (mm)').inputValue()).toBe('55.5');
    expect(await fieldInput(page, 'targets.leverageRatio.end').inputValue()).toBe('2.35');
    // A value still being corrected is kept as typed, and still blocks the search.
    expect(await page.getByLabel('Keep-out 2 r (mm)').inputValue()).toBe('3x');
    expect(await status(page).getAttribute('data-ready')).toBe('false');
    expect(await fieldIssue(page, 'keepOut.1.r').textContent()).toContain('"3x" is not a number');
    expect(app.problems()).toEqual([]);
    await app.close();
  });
});
