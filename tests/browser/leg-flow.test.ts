/**
 * The walking-leg workspace end to end at 1920 × 1080: open it from the start page (the
 * toy walker demo, with the walking-machine caution), type an own foot trajectory with a
 * step height and a duty-factor target, search the four-bar and the Watt I six-bar with
 * a small evaluation budget and a fixed seed, see both in the ranked table, open one
 * (the views render, the caution shows), compare the two families' bests, and download
 * the leg file: its gait figures, taken again in Node, are the row's.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { GAIT_CAUTION, gaitFigures } from '../../src/core/gait';
import { parseLegFileText } from '../../src/core/io/legFile';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser } from './harness';
import { greyPng, screenOfPixel } from './legTraceImage';
import { storedTextHas } from './storedProject';

const VIEWPORT = { width: 1920, height: 1080 };
/** An own foot trajectory, mm: a flat stance from x = 12 back to −12 on the ground line y = −30, then a lift of 8 mm forward. */
const TRAJECTORY: readonly (readonly [string, string])[] = [['12', '-30'], ['0', '-30'], ['-12', '-30'], ['-8', '-24'], ['0', '-22'], ['8', '-24']];

/** A row's exact figures, by column, from the cells' data-value. */
async function rowValues(page: Page, rank: string): Promise<Record<string, number | null>> {
  const cells = page.getByTestId('leg-results-best').locator(`tr[data-rank="${rank}"] td[data-column]`);
  const pairs = await cells.evaluateAll((tds) => tds.map((td) => [td.getAttribute('data-column') ?? '', td.getAttribute('data-value') ?? '']));
  return Object.fromEntries(pairs.map(([k, v]) => [k, v === 'null' ? null : Number(v)]));
}

async function setTarget(page: Page, key: string, on: boolean): Promise<void> {
  const box = page.getByTestId(`leg-target-${key}`).getByRole('checkbox');
  if ((await box.isChecked()) !== on) await box.click();
}

describeBrowser('walking-leg workspace', () => {
  const browser = useBrowser();

  it('sets up an own trajectory, searches two families, opens, compares and exports a leg whose figures are the row\'s', async () => {
    const app = await browser.openApp('/', { viewport: VIEWPORT });
    const page = app.page;
    await page.getByRole('button', { name: 'Walking leg demo (toy walker)' }).click();
    await page.getByTestId('leg-workspace').waitFor();
    expect(await page.getByTestId('leg-workspace-caution').textContent()).toContain(GAIT_CAUTION);

    await page.getByLabel('Problem name').fill('Leg flow check');
    // An own trajectory, typed point by point.
    for (let i = 0; i < TRAJECTORY.length; i++) {
      await page.getByRole('button', { name: 'Add point' }).click();
      await page.getByLabel(`Point ${i + 1} x (mm)`).fill(TRAJECTORY[i][0]);
      await page.getByLabel(`Point ${i + 1} y (mm)`).fill(TRAJECTORY[i][1]);
    }
    expect(await page.getByTestId('leg-setup-drawing').locator('circle.legws-point').count()).toBe(TRAJECTORY.length);

    // Tracing over an image: calibrate it on two of its pixels, then a click halfway between them adds a point halfway between their mm.
    const W = 200;
    const H = 120;
    await page.getByLabel(/Trace over an image/).setInputFiles({ name: 'foot-path.png', mimeType: 'image/png', buffer: greyPng(W, H) });
    await page.locator('image.legws-trace-image').waitFor();
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
    await page.getByLabel('Click to add points to the foot trajectory').check();
    const mid = await screenOfPixel(page, 0.5 * W, 0.5 * H);
    await page.mouse.click(mid.x, mid.y);
    await page.getByLabel(`Point ${TRAJECTORY.length + 1} x (mm)`).waitFor();
    // theorem: a similarity maps the midpoint of two points to the midpoint of their images. Within a screen pixel of the click (24 mm over about 100 px here).
    const CLICK_TOL_MM = 0.5;
    expect(Math.abs(Number(await page.getByLabel(`Point ${TRAJECTORY.length + 1} x (mm)`).inputValue()) - 0)).toBeLessThan(CLICK_TOL_MM);
    expect(Math.abs(Number(await page.getByLabel(`Point ${TRAJECTORY.length + 1} y (mm)`).inputValue()) - -30)).toBeLessThan(CLICK_TOL_MM);
    await page.getByLabel('Click to add points to the foot trajectory').uncheck();
    await page.getByRole('button', { name: `Delete point ${TRAJECTORY.length + 1}` }).click();
    expect(await page.getByTestId('leg-setup-drawing').locator('circle.legws-point').count()).toBe(TRAJECTORY.length);
    await page.getByRole('button', { name: 'Remove the image' }).click();
    // A step height and a duty factor; the demo's other targets off.
    for (const key of ['strideMm', 'maxFlatnessMm', 'maxSpeedVariation', 'minTransmissionDegInStance', 'sizeBoxMm']) await setTarget(page, key, false);
    await setTarget(page, 'stepHeightMm', true);
    await setTarget(page, 'minDutyFactor', true);
    await page.locator('[data-field="targets.stepHeightMm.value"] input').fill('8');
    await page.locator('[data-field="targets.minDutyFactor.min"] input').fill('0.4');
    // The four-bar and one six-bar.
    const stephensonI = page.getByTestId('leg-families').getByRole('checkbox', { name: 'Stephenson I six-bar', exact: true });
    if (await stephensonI.isChecked()) await stephensonI.click();
    expect(await page.getByTestId('leg-families').getByRole('checkbox', { name: 'four-bar', exact: true }).isChecked()).toBe(true);
    expect(await page.getByTestId('leg-families').getByRole('checkbox', { name: 'Watt I six-bar', exact: true }).isChecked()).toBe(true);

    await page.getByTestId('leg-workspace').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'leg-workspace');

    // A bad value: said beside its field, Start disabled with the list.
    const start = page.getByRole('button', { name: 'Start search' });
    await page.locator('[data-field="seed"] input').fill('x');
    await page.locator('[data-field="seed"] [role="alert"]').waitFor();
    expect(await page.getByTestId('leg-start-issues').textContent()).toContain('Seed: "x" is not a number');
    expect(await start.isDisabled()).toBe(true);

    // A small deterministic search: an evaluation budget only, a fixed seed.
    await page.locator('[data-field="seed"] input').fill('7');
    await page.locator('[data-field="budget.seconds"] input').fill('');
    await page.locator('[data-field="budget.evaluations"] input').fill('3000');
    await expect.poll(() => start.isEnabled()).toBe(true);
    await start.click();
    await page.getByTestId('leg-results-best').waitFor({ timeout: 120_000 });
    expect(await page.getByTestId('leg-search-progress').getAttribute('data-status')).toBe('finished');
    const families = await page.getByTestId('leg-results-best').locator('tr[data-family]').evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-family')));
    expect([...families].sort()).toEqual(['fourbar', 'watt-i']);
    // The trajectory column is there, since the trajectory is matched.
    expect(await page.getByTestId('leg-results-best').locator('td[data-column="trajectoryRmsMm"]').count()).toBe(2);
    await page.locator('#legws-search-title').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'leg-search-table');

    // Open the best four-bar: the views render with the caution.
    const fourBarRank = (await page.getByTestId('leg-results-best').locator('tr[data-family="fourbar"]').getAttribute('data-rank')) ?? '';
    const sixBarRank = (await page.getByTestId('leg-results-best').locator('tr[data-family="watt-i"]').getAttribute('data-rank')) ?? '';
    const row = await rowValues(page, fourBarRank);
    await page.getByTestId('leg-results-best').getByRole('button', { name: `Open #${fourBarRank} four-bar` }).click();
    const opened = page.getByTestId('leg-opened');
    await opened.getByTestId('leg-design-view').waitFor();
    expect(await opened.getByTestId('leg-caution').textContent()).toContain(GAIT_CAUTION);
    await opened.evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'leg-design');

    // The leg file: its gait figures, taken here in Node, are the row's.
    const file = await downloadFrom(page, opened.getByRole('button', { name: 'Leg file (JSON)' }));
    const read = parseLegFileText(await readFile(await file.path(), 'utf8'));
    if (!read.ok) throw new Error(JSON.stringify(read.issues));
    // Second, independent method: the core's gait figures of the downloaded leg file (what `loci analyze` prints of it).
    const g = gaitFigures(read.design.linkage, read.design.leg);
    if (!g.ok) throw new Error(g.reason);
    const f = g.figures;
    const s = f.longestStance;
    const worst = f.transmission.loops.map((l) => l.worstInStanceDeg).filter((v): v is number => v !== null);
    expect(row.strideMm).toBe(s === null ? null : s.strideMm);
    expect(row.stepHeightMm).toBe(f.stepHeightMm);
    expect(row.dutyFactor).toBe(f.dutyFactor.value);
    expect(row.flatnessPeakToPeakMm).toBe(s === null ? null : s.flatness.peakToPeakMm);
    expect(row.speedVariation).toBe(s === null ? null : s.speed.variation);
    expect(row.worstTransmissionInStanceDeg).toBe(worst.length === 0 ? null : Math.min(...worst));
    expect(row.widthMm).toBe(f.size.widthMm);
    expect(row.heightMm).toBe(f.size.heightMm);

    // Compare the two families' bests.
    await page.getByTestId('leg-results-best').getByLabel(`Compare #${fourBarRank} four-bar (best of its family)`).check();
    await page.getByTestId('leg-results-best').getByLabel(`Compare #${sixBarRank} Watt I six-bar (best of its family)`).check();
    const compare = page.getByTestId('leg-compare');
    await compare.waitFor();
    await compare.evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'leg-compare');

    // Kept in the project: reload, open the kept set-up, the same table.
    await expect.poll(() => storedTextHas(page, 'Leg flow check', 'legFile'), { timeout: 10_000 }).toBe(true);
    const before = await page.getByTestId('leg-results-all').locator('tr[data-rank]').evaluateAll((trs) => trs.map((tr) => tr.textContent));
    await page.reload();
    await page.getByRole('button', { name: 'Walking leg: Leg flow check' }).click();
    await page.getByTestId('leg-results-all').waitFor();
    const after = await page.getByTestId('leg-results-all').locator('tr[data-rank]').evaluateAll((trs) => trs.map((tr) => tr.textContent));
    expect(after).toEqual(before);
    expect(await page.getByLabel('Point 6 y (mm)').inputValue()).toBe('-24');

    expect(app.problems()).toEqual([]);
    await app.close();
  }, 240_000);
});
