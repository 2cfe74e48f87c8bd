/**
 * The results views in Chromium, on the results test page (tests/browser/results-page):
 * ResultsView fed with synthesis `describe` reports of known linkages. The node side
 * builds the same reports to check what the page shows and what it exports.
 */
import Papa from 'papaparse';
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { familyName } from '../../src/app/results/format';
import { parseLinkageFileText } from '../../src/core/io/linkageFile';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser, type AppPage } from './harness';
import { resultsFixture } from './results-page/candidates';
import { PAGE_BASE, buildResultsPage, type BuiltPage } from './results-page/serve';

const fixture = resultsFixture();
const CAUTION = 'Loci computes kinematics only; check the design with a qualified engineer, physical tests and the applicable standards.';
const DETAIL_STEPS = 361;
/** A test with a search of the app's in it: the wait for the search alone may take up to 150 s, more than the 60 s a test may take by default. */
const SEARCH_TEST_MS = 300_000;

describeBrowser('results views', () => {
  const browser = useBrowser();
  let built: BuiltPage | undefined;

  beforeAll(async () => {
    built = await buildResultsPage();
  });
  afterAll(async () => {
    await built?.remove();
  });

  async function openResultsPage(query = ''): Promise<AppPage> {
    if (built === undefined) throw new Error('the results test page was not built');
    const app = await browser.openApp('/');
    await built.route(app.context, app.baseUrl);
    await app.page.goto(new URL(`${PAGE_BASE.slice(1)}index.html${query}`, app.baseUrl).href, { waitUntil: 'load' });
    await app.page.getByTestId('candidate-row').first().waitFor();
    return app;
  }

  function rows(page: Page) {
    return page.getByTestId('candidate-row');
  }

  async function rankOrder(page: Page): Promise<number[]> {
    return (await rows(page).evaluateAll((trs) => trs.map((tr) => Number(tr.getAttribute('data-rank')))));
  }

  async function select(page: Page, rank: number): Promise<void> {
    await page.getByRole('button', { name: `Show the design ranked ${rank}`, exact: true }).click();
    await page.getByTestId('detail-view').waitFor();
  }

  async function download(page: Page, button: string): Promise<{ name: string; text: string }> {
    const file = await downloadFrom(page, page.getByRole('button', { name: button }));
    return { name: file.suggestedFilename(), text: await readFile(await file.path(), 'utf8') };
  }

  it('ranks every candidate with its figures and draws each row', async () => {
    const app = await openResultsPage();
    const page = app.page;
    expect(await rows(page).count()).toBe(fixture.candidates.length);
    expect(await rankOrder(page)).toEqual(fixture.candidates.map((_, i) => i + 1));
    // Every row gets its drawing once its motion is swept in idle time: output path and IC path.
    await page.waitForFunction((n) => document.querySelectorAll('[data-testid="candidate-row"] svg.results-thumb').length === n, fixture.candidates.length);
    const thumbs = await rows(page).locator('svg.results-thumb .results-output-path').evaluateAll((ps) => ps.map((p) => p.getAttribute('d') ?? ''));
    expect(thumbs.every((d) => d.startsWith('M'))).toBe(true);
    // The first row is the exact Hoeken fit: its RMS error as the report gives it, in mm.
    const first = rows(page).first();
    const cells = await first.locator('td').allTextContents();
    expect(cells.join(' ')).toContain('Grashof crank-rocker');
    expect(fixture.candidates[0].error.rmsMm).toBeLessThan(1e-9);
    expect(await page.getByRole('columnheader', { name: 'RMS error (mm)' }).count()).toBe(1);
    expect(await page.getByRole('columnheader', { name: 'Size (mm)' }).count()).toBe(1);
    await saveScreenshot(page, 'results-table', { fullPage: true });
    expect(app.problems()).toEqual([]);
  });

  it('sorts by a column header, both ways, and filters by family, feasibility and RMS', async () => {
    const app = await openResultsPage();
    const page = app.page;
    const byRms = [...fixture.candidates.keys()].sort((a, b) => fixture.candidates[a].error.rmsMm - fixture.candidates[b].error.rmsMm || a - b).map((i) => i + 1);
    await page.getByRole('button', { name: /^RMS error \(mm\)/ }).click();
    expect(await rankOrder(page)).toEqual(byRms);
    await page.getByRole('button', { name: /^RMS error \(mm\)/ }).click();
    const descending = await rankOrder(page);
    const rmsOf = (rank: number) => fixture.candidates[rank - 1].error.rmsMm;
    for (let i = 1; i < descending.length; i++) expect(rmsOf(descending[i - 1])).toBeGreaterThanOrEqual(rmsOf(descending[i]));

    await page.getByRole('button', { name: /^Size \(mm\)/ }).click();
    const sizes = await rows(page).locator('td:nth-child(8)').allTextContents();
    const areas = sizes.map((s) => s.split('×').map(Number).reduce((a, b) => a * b, 1));
    for (let i = 1; i < areas.length; i++) expect(areas[i - 1]).toBeLessThanOrEqual(areas[i] * (1 + 1e-3));

    await page.getByLabel('Family').selectOption('fourbar');
    const fourBars = fixture.candidates.filter((c) => c.family === 'fourbar').length;
    expect(await rows(page).count()).toBe(fourBars);
    await page.getByLabel('Family').selectOption('');
    await page.getByLabel('feasible only').check();
    expect(await rows(page).count()).toBe(fixture.candidates.filter((c) => c.feasible).length);
    await page.getByLabel('feasible only').uncheck();
    await page.getByLabel('Max. RMS error (mm)').fill('1');
    expect(await rows(page).count()).toBe(fixture.candidates.filter((c) => c.error.rmsMm <= 1).length);
    expect(app.problems()).toEqual([]);
  });

  it('shows the selected design moving, with its instant-centre path, plots and the caution', async () => {
    const app = await openResultsPage();
    const page = app.page;
    await select(page, 1);
    const detail = page.getByTestId('detail-view');
    const ic = detail.getByTestId('ic-path');
    const d = (await ic.getAttribute('d')) ?? '';
    expect(d).toMatch(/^M[-\d.]+,[-\d.]+L/);
    // Centres far off or at infinity are markers, not coordinates: every vertex stays near the drawing.
    const viewBox = ((await detail.getByTestId('motion-stage').getAttribute('viewBox')) ?? '').split(' ').map(Number);
    const size = Math.max(viewBox[2], viewBox[3]);
    for (const v of d.match(/-?\d+(\.\d+)?/g) ?? []) expect(Math.abs(Number(v))).toBeLessThan(5 * size + Math.abs(viewBox[0]) + Math.abs(viewBox[1]));
    expect(await detail.getByTestId('output-path').getAttribute('d')).toMatch(/^M/);
    expect(await detail.getByRole('note').textContent()).toBe(CAUTION);
    expect(await detail.getByTestId('transmission-guideline').count()).toBe(1);
    expect(await detail.getByTestId('error-plot').locator('rect.results-bar').count()).toBe(fixture.target.points.length);

    // Pause, then scrub: the driver value (deg) and the linkage's pose follow the scrubber.
    await detail.getByRole('button', { name: 'Pause' }).click();
    const links = detail.getByTestId('linkage').locator('path.results-link');
    const before = await links.first().getAttribute('d');
    const scrubber = detail.getByRole('slider');
    await scrubber.fill(String(Number(await scrubber.getAttribute('min')) + 90));
    const shown = (await detail.getByTestId('driver-value').textContent()) ?? '';
    expect(shown).toMatch(/°$/);
    expect(await links.first().getAttribute('d')).not.toBe(before);
    await saveScreenshot(page, 'results-detail', { fullPage: true });

    // Playing moves it on without a click.
    await detail.getByRole('button', { name: 'Play' }).click();
    await page.waitForFunction((old) => document.querySelector('[data-testid="driver-value"]')?.textContent !== old, shown);
    expect(app.problems()).toEqual([]);
  });

  it('compares two designs in one drawing and a side-by-side table', async () => {
    const app = await openResultsPage();
    const page = app.page;
    await page.getByRole('checkbox', { name: 'Compare the design ranked 1', exact: true }).check();
    expect(await page.getByTestId('compare-view').count()).toBe(0);
    await page.getByRole('checkbox', { name: 'Compare the design ranked 3', exact: true }).check();
    const compare = page.getByTestId('compare-view');
    await compare.waitFor();
    const drawings = compare.getByTestId('compare-drawing');
    expect(await drawings.evaluateAll((gs) => gs.map((g) => Number(g.getAttribute('data-rank'))))).toEqual([1, 3]);
    for (const testId of ['compare-output-path', 'compare-ic-path']) {
      const ds = await compare.getByTestId(testId).evaluateAll((ps) => ps.map((p) => p.getAttribute('d') ?? ''));
      expect(ds).toHaveLength(2);
      expect(ds.every((d) => d.startsWith('M'))).toBe(true);
    }
    const colours = await compare.getByTestId('compare-output-path').evaluateAll((ps) => ps.map((p) => getComputedStyle(p).stroke));
    expect(new Set(colours).size).toBe(2);
    const header = await compare.locator('thead th').allTextContents();
    expect(header.slice(1)).toEqual([1, 3].map((rank) => `Rank ${rank}, ${familyName(fixture.candidates[rank - 1].family)}`));
    const rmsRow = await compare.getByRole('row', { name: /^RMS error/ }).locator('td').allTextContents();
    expect(rmsRow).toHaveLength(2);
    expect(rmsRow.every((t) => t.endsWith(' mm'))).toBe(true);
    await saveScreenshot(page, 'results-compare', { fullPage: true });
    expect(app.problems()).toEqual([]);
  });

  it('exports the selected design as our linkage file, its paths as CSV and the drawing as SVG', async () => {
    const app = await openResultsPage();
    const page = app.page;
    const rank = 3;
    const candidate = fixture.candidates[rank - 1];
    await select(page, rank);
    await page.getByTestId('detail-view').getByRole('button', { name: 'Pause' }).click();

    const json = await download(page, 'Linkage file (JSON)');
    expect(json.name).toMatch(/\.json$/);
    const read = parseLinkageFileText(json.text);
    expect(read.ok).toBe(true);
    if (read.ok) expect(read.linkage).toEqual(candidate.linkage);

    const csv = await download(page, 'Paths (CSV)');
    expect(csv.name).toMatch(/\.csv$/);
    const parsed = Papa.parse<Record<string, number | string | null>>(csv.text, { header: true, dynamicTyping: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual(['step', 'driver_deg', 'assembled', 'output_x_mm', 'output_y_mm', 'ic_kind', 'ic_x_mm', 'ic_y_mm', 'ic_direction_x', 'ic_direction_y']);
    expect(parsed.data).toHaveLength(DETAIL_STEPS);
    // The motion starts at the first target point's driver value: its output point is the
    // one the report matched to that target point.
    const row0 = parsed.data[0];
    expect(Number(row0.output_x_mm)).toBeCloseTo(candidate.points[0], 6);
    expect(Number(row0.output_y_mm)).toBeCloseTo(candidate.points[1], 6);
    expect(parsed.data.every((r) => r.ic_kind === 'finite' || r.ic_kind === 'infinite')).toBe(true);

    const svg = await download(page, 'Drawing (SVG)');
    expect(svg.name).toMatch(/\.svg$/);
    // Chromium's own XML parser is the reference for well-formedness.
    const check = await page.evaluate((text) => {
      const doc = new DOMParser().parseFromString(text, 'image/svg+xml');
      const root = doc.documentElement;
      return {
        error: doc.getElementsByTagName('parsererror').length > 0,
        root: root.localName,
        ns: root.namespaceURI,
        width: root.getAttribute('width'),
        targetCircles: doc.querySelectorAll('#target circle').length,
        output: doc.getElementById('output-path')?.getAttribute('d') ?? '',
        ic: doc.getElementById('ic-path')?.getAttribute('d') ?? '',
        links: doc.querySelectorAll('#linkage .link').length,
        desc: doc.querySelector('desc')?.textContent ?? '',
      };
    }, svg.text);
    expect(check).toMatchObject({ error: false, root: 'svg', ns: 'http://www.w3.org/2000/svg', targetCircles: fixture.target.points.length, links: candidate.linkage.bodies.length });
    expect(check.width).toMatch(/mm$/);
    expect(check.output).toMatch(/^M/);
    expect(check.ic).toMatch(/^M/);
    expect(check.desc).toContain(CAUTION);
    expect(app.problems()).toEqual([]);
  });

  it("shows the app's own search results: a design in detail, two compared, exported", async () => {
    // The workspace's demo (a closed coupler curve), searched in workers with a small budget.
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByTestId('project-name').waitFor({ timeout: 30_000 });
    const budget = page.getByLabel('Budget in evaluations');
    await budget.fill('2000');
    await budget.press('Enter');
    await page.getByRole('button', { name: 'Start search' }).click();
    await expect.poll(() => page.getByTestId('run-progress').getAttribute('data-status'), { timeout: 150_000, interval: 500 }).toBe('finished');
    await expect.poll(() => rows(page).count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(2);

    await select(page, 1);
    expect(await page.getByTestId('detail-view').getByTestId('ic-path').getAttribute('d')).toMatch(/^M[-\d.]+,[-\d.]+L/);
    await page.getByTestId('detail-view').getByRole('button', { name: /^(Pause|Play)$/ }).click();
    const csv = await download(page, 'Paths (CSV)');
    expect(csv.text.split('\r\n')[0]).toBe('step,driver_deg,assembled,output_x_mm,output_y_mm,ic_kind,ic_x_mm,ic_y_mm,ic_direction_x,ic_direction_y');

    await page.getByRole('checkbox', { name: 'Compare the design ranked 1', exact: true }).check();
    await page.getByRole('checkbox', { name: 'Compare the design ranked 2', exact: true }).check();
    const compare = page.getByTestId('compare-view');
    await compare.waitFor();
    expect(await compare.getByTestId('compare-drawing').count()).toBe(2);
    await saveScreenshot(page, 'results-app', { fullPage: true });
    expect(app.problems()).toEqual([]);
  }, SEARCH_TEST_MS);

  it('keeps working while a search refreshes the candidates', async () => {
    const app = await openResultsPage('?running=1');
    const page = app.page;
    expect(await page.getByText('search running').count()).toBe(1);
    // A design selected, then the refreshes: they start on the test's word, not on a timer from
    // the page's load, which a slow machine could let run out before the test got here.
    await select(page, 2);
    await page.getByRole('button', { name: 'Start the refreshes' }).click();
    await page.waitForFunction(() => document.querySelector('[data-testid="refreshes"]')?.textContent === '8');
    // The selection survives fresh report objects for the same designs.
    expect(await page.getByTestId('detail-view').getByRole('heading').textContent()).toBe(`Rank 2: ${familyName(fixture.candidates[1].family)}`);
    expect(await rows(page).count()).toBe(fixture.candidates.length);
    expect(await page.getByText('search running').count()).toBe(0);
    expect(app.problems()).toEqual([]);
  });
});
