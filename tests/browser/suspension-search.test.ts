/**
 * The suspension search from the app: a short deterministic search of a single pivot, a
 * four-bar and a six-bar on the demo bicycle; the ranked table with each layout's best;
 * a row's figures against the core's own analysis of the design opened from it; two rows
 * compared on shared plots; the results kept over a reload.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { parseSuspensionFileText } from '../../src/core/io/suspensionFile';
import { SUSPENSION_CAUTION, suspensionCurves } from '../../src/core/suspension';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser } from './harness';
import { storedTextHas } from './storedProject';

/** The page shows figures to four significant figures (three for percentages and small movements). */
const shown = (x: number, digits = 4) => (Number.isFinite(x) ? String(Number(x.toPrecision(digits))) : '—');
const LAYOUTS = ['singlePivot', 'fourBarSeatStayAxle', 'wattSixBar'];
/** The set-up's default number of samples over the stroke (DEFAULT_SUSPENSION_STEPS). */
const STEPS = 41;
/** The wait for a search's first restart, ms: how soon it comes depends on the machine and its load. */
const RESTART_WAIT_MS = 120_000;
/** That test's time: the wait for a restart, then Stop and the ranking, more than the 60 s a test may take by default. */
const RESTART_TEST_MS = 300_000;

async function cells(page: Page, section: string, rank: string): Promise<Record<string, { text: string; value: number }>> {
  return page.getByTestId(section).locator(`tr[data-rank="${rank}"] td[data-col]`).evaluateAll((tds) =>
    Object.fromEntries(tds.map((td) => [td.getAttribute('data-col'), { text: td.textContent ?? '', value: Number(td.getAttribute('data-value')) }])));
}

describeBrowser('suspension search', () => {
  const browser = useBrowser();

  it('searches three layouts, ranks them in one table, opens and compares designs, and keeps the results over a reload', async () => {
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await page.getByTestId('suspension-workspace').waitFor();
    await page.getByLabel('Design name').fill('Search check');
    const start = page.getByRole('button', { name: 'Start search' });

    // Not ready: the reason is shown beside a disabled Start.
    await page.locator('[data-field="seed"] input').fill('x');
    await page.getByTestId('search-not-ready').waitFor();
    expect(await start.isDisabled()).toBe(true);

    // A short deterministic search: an evaluation budget only, a fixed seed.
    await page.locator('[data-field="budget.seconds"] input').fill('');
    await page.locator('[data-field="budget.evaluations"] input').fill('1500');
    await page.locator('[data-field="seed"] input').fill('7');
    await expect.poll(() => start.isEnabled()).toBe(true);
    // Start is pressed from the keyboard, not clicked: while the workspace's deferred views
    // redraw after a field changed, the page can move between Playwright's scroll to the
    // button and its click, and the click then lands elsewhere (seen on 1 start in 20 to 40
    // under load: the click hit the bicycle panel, and Start did nothing).
    await start.press('Enter');
    const table = page.getByTestId('search-results');
    await table.waitFor({ timeout: 120_000 });
    expect(await page.getByTestId('search-progress').getAttribute('data-status')).toBe('finished');

    // The best of each layout searched, each once.
    const bestLayouts = await page.getByTestId('best-per-layout').locator('tr[data-layout]').evaluateAll((trs) => trs.map((tr) => tr.getAttribute('data-layout')));
    expect([...bestLayouts].sort()).toEqual([...LAYOUTS].sort());
    // Feasible first: no infeasible row above a feasible one.
    const feasible = await page.getByTestId('all-ranked').locator('td[data-col="feasible"]').allTextContents();
    const firstInfeasible = feasible.findIndex((f) => f !== 'feasible');
    if (firstInfeasible >= 0) expect(feasible.slice(firstInfeasible).every((f) => f !== 'feasible')).toBe(true);
    expect(await page.getByTestId('suspension-search').textContent()).toContain(SUSPENSION_CAUTION);
    await page.locator('#susp-search-title').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'suspension-search-table');

    // Open the best four-bar: the workspace shows it and focus moves to the side view.
    const fourBarRank = await page.getByTestId('best-per-layout').locator('tr[data-layout="fourBarSeatStayAxle"]').getAttribute('data-rank');
    const row = await cells(page, 'best-per-layout', fourBarRank ?? '');
    await page.getByTestId('best-per-layout').getByRole('button', { name: `Open #${fourBarRank}` }).click();
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('susp-view-title');
    // Downloads are asked for from the keyboard too (downloadFrom; see Start above).
    const file = await downloadFrom(page, page.getByRole('button', { name: 'Design file (JSON)' }));
    const design = parseSuspensionFileText(await readFile(await file.path(), 'utf8'));
    if (!design.ok) throw new Error(JSON.stringify(design.issues));
    expect(design.design.layout.kind).toBe('fourBarSeatStayAxle');
    // Source: the core's suspensionCurves run here in Node on the opened design's file, a route apart from the page's table.
    const analysed = suspensionCurves(design.linkage, design.design.bicycle, { steps: STEPS });
    if (!analysed.ok) throw new Error(analysed.reason);
    const r = analysed.report;
    const c = r.curves;
    const last = c.steps - 1;
    const cog = Math.floor(r.cogTeeth.length / 2);
    const expected: Record<string, [number, number]> = {
      leverageRatioStart: [r.leverageRatioStart, 4],
      leverageRatioEnd: [r.leverageRatioEnd, 4],
      progressionPct: [r.progressionPct, 3],
      antiSquatAtSagPct: [r.sagPoint.antiSquatPct[cog], 3],
      antiRiseAtSagPct: [r.sagPoint.antiRisePct, 3],
      rearwardAtFullTravelMm: [c.rearwardMm[last], 3],
      travelMm: [r.totalTravelMm, 4],
      kickbackAtFullTravelDeg: [c.kickbackDeg[cog][last], 3],
      chainGrowthAtFullTravelMm: [c.chainGrowthMm[cog][last], 3],
    };
    for (const [key, [value, digits]] of Object.entries(expected)) {
      expect(row[key].text, key).toBe(shown(value, digits));
      expect(row[key].value, key).toBeCloseTo(value, 9);
    }

    // Compare the best single pivot and the best six-bar: both on every plot, each with its sag marker.
    for (const layout of ['singlePivot', 'wattSixBar']) {
      await page.getByTestId('best-per-layout').locator(`tr[data-layout="${layout}"] input[type="checkbox"]`).check();
    }
    const compare = page.getByTestId('compare-view');
    await compare.waitFor();
    for (const id of ['compare-leverage', 'compare-anti-squat', 'compare-anti-rise', 'compare-axle-path', 'compare-chain-growth', 'compare-kickback']) {
      const plot = page.getByTestId(id);
      const series = await plot.locator('path.susp-plot-line:not(.susp-plot-target)').evaluateAll((ps) => ps.map((p) => [p.getAttribute('data-series'), p.getAttribute('d')]));
      expect(series.length, id).toBe(2);
      expect(series.map(([label]) => label).join(' ')).toMatch(/single pivot.*Watt six-bar|Watt six-bar.*single pivot/);
      for (const [, d] of series) expect(d).toMatch(/^M[^N]*$/);
      expect(await plot.getByTestId('sag-marker').count(), id).toBe(2);
    }
    // The problem's bands: anti-squat at sag in the middle cogs, anti-rise.
    expect(await page.getByTestId('compare-anti-rise').getByTestId('target-band').count()).toBe(1);
    expect(await page.getByTestId('compare-side-views').locator('g[data-design]').count()).toBe(2);
    expect(await compare.textContent()).toContain(SUSPENSION_CAUTION);
    const csv = await downloadFrom(page, page.getByRole('button', { name: 'Download the compared curves (CSV)' }));
    const csvLines = (await readFile(await csv.path(), 'utf8')).split('\r\n');
    expect(csvLines[1]).toBe(`# ${SUSPENSION_CAUTION}`);
    expect(csvLines[2]).toMatch(/^design,layout,step,travel_mm,/);
    // Two designs, one row per travel sample each, after the two notes and the header.
    expect(csvLines.filter((l) => /^#\d+,/.test(l))).toHaveLength(2 * STEPS);
    await page.locator('#susp-compare-title').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'suspension-compare');
    await page.getByTestId('compare-side-views').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'suspension-compare-side-views');

    // Kept in the project: reload, open the kept design, the same table.
    await expect.poll(() => storedTextHas(page, 'searchResults'), { timeout: 10_000 }).toBe(true);
    const before = await page.getByTestId('all-ranked').locator('tr[data-rank]').evaluateAll((trs) => trs.map((tr) => tr.textContent));
    await page.reload();
    await page.getByRole('button', { name: 'Rear suspension: Search check' }).click();
    await page.getByTestId('search-results').waitFor();
    const after = await page.getByTestId('all-ranked').locator('tr[data-rank]').evaluateAll((trs) => trs.map((tr) => tr.textContent));
    expect(after).toEqual(before);
    expect(app.problems()).toEqual([]);
    await app.close();
  }, 240_000);
});

describeBrowser('a suspension search that uses its whole time', () => {
  const browser = useBrowser();

  it('starts the search afresh within a time budget when a run has spent what one search needs, and says how often', async () => {
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await page.getByTestId('suspension-workspace').waitFor();
    for (const layout of ['four-bar, axle on the seat stay', 'Watt six-bar']) await page.getByRole('checkbox', { name: layout, exact: true }).uncheck();
    expect(await page.getByRole('checkbox', { name: 'single pivot', exact: true }).isChecked()).toBe(true);
    // A time budget only, far longer than the test waits: each island's restart scheme
    // sizes its first run as one search of 10,000 × dim evaluations (common practice: the
    // CEC 2005 benchmark's budget per run) and restarts when it is spent, converged or
    // stalled, so a single pivot's few variables restart well inside the hour. The wait is
    // for a count of evaluations, not a time: how soon it comes depends on the machine.
    await page.locator('[data-field="budget.evaluations"] input').fill('');
    await page.locator('[data-field="budget.seconds"] input').fill('3600');
    await page.locator('[data-field="seed"] input').fill('7');
    const start = page.getByRole('button', { name: 'Start search' });
    await expect.poll(() => start.isEnabled()).toBe(true);
    await start.press('Enter');
    const progress = page.getByTestId('search-progress');
    const restarts = async () => Number(((await page.getByTestId('search-progress-restarts').textContent()) ?? '').replace(/^Search restarts: /, '').replace(/,/g, ''));
    await expect.poll(restarts, { timeout: RESTART_WAIT_MS, interval: 500 }).toBeGreaterThanOrEqual(1);
    expect(await progress.getAttribute('data-status')).toBe('running');
    // No evaluation budget to show against: the count alone.
    expect(await progress.textContent()).toMatch(/Searching: [\d,]+ evaluations, [\d.]+ s/);
    // The user's word ends it; the designs found so far are kept and ranked.
    await page.getByRole('button', { name: 'Stop', exact: true }).click();
    await page.getByTestId('search-results').waitFor({ timeout: 60_000 });
    expect(await progress.getAttribute('data-status')).toBe('finished');
    expect(await restarts()).toBeGreaterThanOrEqual(1);
    expect(app.problems()).toEqual([]);
  }, RESTART_TEST_MS);
});
