/**
 * The detail and compare views you can read, on the results test page
 * (tests/browser/results-page): the compare view frames the target and the output paths
 * (not the instant centres), zooms and pans, and draws each design's linkage; the detail
 * view comes into view with the focus on a selection, with joint labels, axes, origin and
 * a scale bar, in the drawing and in its SVG. Screenshots at 1280 × 800 and 1920 × 1080.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser, type AppPage } from './harness';
import { resultsFixture } from './results-page/candidates';
import { PAGE_BASE, buildResultsPage, type BuiltPage } from './results-page/serve';

const fixture = resultsFixture();

interface Box {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

/** Every "x,y" pair of SVG path data written as M/L commands (the drawing's own form). */
function pathPoints(d: string): [number, number][] {
  return [...d.matchAll(/[ML](-?[\d.]+),(-?[\d.]+)/g)].map((m) => [Number(m[1]), Number(m[2])]);
}

function boxOf(points: readonly (readonly [number, number])[]): Box {
  const xs = points.map((p) => p[0]);
  const ys = points.map((p) => p[1]);
  return { minX: Math.min(...xs), minY: Math.min(...ys), maxX: Math.max(...xs), maxY: Math.max(...ys) };
}

describeBrowser('readable detail and compare views', () => {
  const browser = useBrowser();
  let built: BuiltPage | undefined;

  beforeAll(async () => {
    built = await buildResultsPage();
  });
  afterAll(async () => {
    await built?.remove();
  });

  async function openResultsPage(viewport?: { width: number; height: number }): Promise<AppPage> {
    if (built === undefined) throw new Error('the results test page was not built');
    const app = await browser.openApp('/', viewport ? { viewport } : {});
    await built.route(app.context, app.baseUrl);
    await app.page.goto(new URL(`${PAGE_BASE.slice(1)}index.html`, app.baseUrl).href, { waitUntil: 'load' });
    await app.page.getByTestId('candidate-row').first().waitFor();
    return app;
  }

  async function viewBox(page: Page): Promise<number[]> {
    return ((await page.getByTestId('compare-stage').getAttribute('viewBox')) ?? '').split(' ').map(Number);
  }

  async function compareTwo(page: Page): Promise<void> {
    await page.getByRole('checkbox', { name: 'Compare the design ranked 1', exact: true }).check();
    await page.getByRole('checkbox', { name: 'Compare the design ranked 2', exact: true }).check();
    await page.getByTestId('compare-view').waitFor();
  }

  it('frames the target and the output paths, zooms, pans and draws each linkage', async () => {
    const app = await openResultsPage();
    const page = app.page;
    await compareTwo(page);
    const [x, y, w, h] = await viewBox(page);
    // The target in SVG coordinates (y down), from the fixture, not from the page.
    const target = fixture.target.points.map(([px, py]) => [px, -py] as [number, number]);
    const outputs = (await page.getByTestId('compare-output-path').evaluateAll((ps) => ps.map((p) => p.getAttribute('d') ?? ''))).flatMap(pathPoints);
    expect(outputs.length).toBeGreaterThan(10);
    const framed = boxOf([...target, ...outputs]);
    // Everything framed lies in the view…
    expect(framed.minX).toBeGreaterThanOrEqual(x);
    expect(framed.maxX).toBeLessThanOrEqual(x + w);
    expect(framed.minY).toBeGreaterThanOrEqual(y);
    expect(framed.maxY).toBeLessThanOrEqual(y + h);
    // …and fills it: no more than a margin round the larger side (the drawing's 8 % each side, with room). // common practice
    const side = Math.max(framed.maxX - framed.minX, framed.maxY - framed.minY);
    expect(Math.max(w, h)).toBeLessThanOrEqual(side * 1.25);
    // The target alone is not a blob: it spans a good share of the view.
    const t = boxOf(target);
    expect(Math.max(t.maxX - t.minX, t.maxY - t.minY)).toBeGreaterThan(0.3 * Math.max(w, h));

    // Each design's linkage in the chosen pose, its joints labelled with the linkage's ids.
    const compare = page.getByTestId('compare-view');
    expect(await compare.getByTestId('compare-linkage').count()).toBe(2);
    const labels = await compare.getByTestId('joint-label').allTextContents();
    const ids = [0, 1].flatMap((k) => fixture.candidates[k].linkage.joints.map((j) => j.id));
    expect([...labels].sort()).toEqual([...ids].sort());
    const before = await compare.getByTestId('compare-linkage').first().innerHTML();
    await compare.getByRole('slider', { name: /Pose/ }).fill('40');
    expect(await compare.getByTestId('compare-linkage').first().innerHTML()).not.toBe(before);

    // Zoom in twice, then back to the frame.
    await compare.getByRole('button', { name: 'Zoom in' }).click();
    await compare.getByRole('button', { name: 'Zoom in' }).click();
    const zoomed = await viewBox(page);
    // Two steps of 1.5 each; the view box is written to 1/10 000 of the view.
    expect(Math.abs(zoomed[2] - w / 2.25)).toBeLessThan(w * 1e-3);
    // Pan: a drag to the left moves the view to the right.
    const stage = page.getByTestId('compare-stage');
    const rect = await stage.boundingBox();
    if (rect === null) throw new Error('no compare stage');
    await page.mouse.move(rect.x + rect.width / 2, rect.y + rect.height / 2);
    await page.mouse.down();
    await page.mouse.move(rect.x + rect.width / 2 - 80, rect.y + rect.height / 2, { steps: 4 });
    await page.mouse.up();
    const panned = await viewBox(page);
    expect(panned[0]).toBeGreaterThan(zoomed[0]);
    expect(Math.abs(panned[2] - zoomed[2])).toBeLessThan(w * 1e-3);
    await compare.getByRole('button', { name: 'Frame target and paths' }).click();
    expect(await viewBox(page)).toEqual([x, y, w, h]);
    await saveScreenshot(page, 'results-compare-1280');
    expect(app.problems()).toEqual([]);
  });

  it('brings the selected design into view with the focus, with joint labels, axes, origin and a scale bar', async () => {
    const app = await openResultsPage();
    const page = app.page;
    const rank = 2;
    const candidate = fixture.candidates[rank - 1];
    await page.getByRole('button', { name: `Show the design ranked ${rank}`, exact: true }).click();
    const detail = page.getByTestId('detail-view');
    await detail.waitFor();
    await expect.poll(() => page.evaluate(() => document.activeElement?.closest('[data-testid="detail-view"]') !== null)).toBe(true);
    const heading = await detail.locator('h3').boundingBox();
    expect(heading).not.toBeNull();
    if (heading) {
      expect(heading.y).toBeGreaterThanOrEqual(-1);
      expect(heading.y + heading.height).toBeLessThanOrEqual(801);
    }
    await detail.getByRole('button', { name: 'Pause' }).click();
    const labels = await detail.getByTestId('joint-label').allTextContents();
    expect([...labels].sort()).toEqual(candidate.linkage.joints.map((j) => j.id).sort());
    expect(await detail.getByTestId('scale-bar').count()).toBe(1);
    expect(await detail.getByTestId('axes').getAttribute('d')).toMatch(/^M/);

    const file = await downloadFrom(page, page.getByRole('button', { name: 'Drawing (SVG)' }));
    const text = await readFile(await file.path(), 'utf8');
    const svg = await page.evaluate((t) => {
      const doc = new DOMParser().parseFromString(t, 'image/svg+xml');
      return {
        error: doc.getElementsByTagName('parsererror').length > 0,
        labels: [...doc.querySelectorAll('#joint-labels text')].map((e) => e.textContent),
        scale: doc.getElementById('scale-bar')?.getAttribute('d') ?? '',
        scaleLabel: doc.getElementById('scale-label')?.textContent ?? '',
        directions: doc.getElementById('axis-directions')?.getAttribute('d') ?? '',
      };
    }, text);
    expect(svg.error).toBe(false);
    expect([...svg.labels].sort()).toEqual(candidate.linkage.joints.map((j) => j.id).sort());
    // The scale bar is drawn to scale: its horizontal run in mm (one user unit is one mm) is the length it is labelled with.
    const bar = pathPoints(svg.scale.replace(/V(-?[\d.]+)/g, '').replace(/H(-?[\d.]+)/g, (_, hx: string) => `L${hx},0`));
    const run = Math.abs(bar[bar.length - 1][0] - bar[0][0]);
    expect(`${Number(run.toPrecision(6))} mm`).toBe(svg.scaleLabel);
    expect(svg.directions).toMatch(/^M/);
    expect(app.problems()).toEqual([]);
  });

  it('puts detail and compare beside the table on a 1920 px screen', async () => {
    const app = await openResultsPage({ width: 1920, height: 1080 });
    const page = app.page;
    await compareTwo(page);
    await page.getByRole('button', { name: 'Show the design ranked 1', exact: true }).click();
    await page.getByTestId('detail-view').waitFor();
    const table = await page.locator('.results-table-wrap').boundingBox();
    const compare = await page.getByTestId('compare-view').boundingBox();
    expect(table).not.toBeNull();
    expect(compare).not.toBeNull();
    if (table && compare) {
      expect(compare.x).toBeGreaterThanOrEqual(table.x + table.width - 1);
      expect(table.width + compare.width).toBeGreaterThan(1500);
    }
    await saveScreenshot(page, 'results-wide-1920');
    expect(app.problems()).toEqual([]);
  });
});
