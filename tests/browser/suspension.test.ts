import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { parseSuspensionFileText } from '../../src/core/io/suspensionFile';
import {
  DEMO_TRAIL_BIKE,
  LAYOUT_NAMES,
  SUSPENSION_CAUTION,
  buildLayout,
  demoAxleBody,
  demoPivots,
  sideView,
  suspensionCurves,
  type LayoutKind,
  type SuspensionReport,
} from '../../src/core/suspension';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser, type AppPage } from './harness';
import { storedTextHas } from './storedProject';

/** The page shows figures to four significant figures. */
const shown = (x: number) => String(Number(x.toPrecision(4)));

function demoReport(kind: LayoutKind): SuspensionReport {
  const linkage = buildLayout(kind, demoPivots(kind), DEMO_TRAIL_BIKE.rearAxleMm, demoAxleBody(kind));
  const result = suspensionCurves(linkage, DEMO_TRAIL_BIKE);
  if (!result.ok) throw new Error(result.reason);
  return result.report;
}

/** The rear axle's height in the core's side view at a shock length: a second way to the leverage ratio. */
function drawnAxleYMm(kind: LayoutKind, shockLengthMm: number): number {
  const linkage = buildLayout(kind, demoPivots(kind), DEMO_TRAIL_BIKE.rearAxleMm, demoAxleBody(kind));
  const view = sideView({ bicycle: DEMO_TRAIL_BIKE, linkage }, { shockLengthMm, cogIndex: 0 });
  if (!view.ok) throw new Error(view.reason);
  const axle = view.primitives.find((p) => p.role === 'axle');
  if (axle === undefined || axle.kind !== 'point') throw new Error('the side view has no rear axle');
  return axle.yMm;
}

const PLOTS = ['plot-leverage', 'plot-anti-squat', 'plot-anti-rise', 'plot-axle-path', 'plot-chain-growth', 'plot-kickback', 'plot-wheel-rate'] as const;

describeBrowser('rear suspension', () => {
  const browser = useBrowser();

  async function openDemo(viewport?: { width: number; height: number }, startShot?: string): Promise<AppPage> {
    const app = await browser.openApp('/', viewport === undefined ? {} : { viewport });
    if (startShot !== undefined) {
      await app.page.getByRole('button', { name: 'Rear suspension demo' }).waitFor();
      await saveScreenshot(app.page, startShot);
    }
    await app.page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await app.page.getByTestId('suspension-workspace').waitFor();
    await app.page.getByTestId('plot-leverage').waitFor();
    return app;
  }

  const figureCell = (page: Page, what: string) => page.locator(`[data-figure="${what}"]`);

  async function download(page: Page, button: string): Promise<{ name: string; text: string }> {
    const file = await downloadFrom(page, page.getByRole('button', { name: button }));
    return { name: file.suggestedFilename(), text: await readFile(await file.path(), 'utf8') };
  }

  it('opens the demo from the start page: the side view, every plot, the caution, figures equal to the core', async () => {
    const app = await openDemo(undefined, 'suspension-start');
    const page = app.page;
    const view = page.getByTestId('side-view');
    // The pose at the sag point: the slider's sample nearest it.
    const slider = page.getByLabel('Wheel travel shown');
    await slider.fill('18');
    expect(await page.getByTestId('travel-readout').textContent()).toMatch(/^\d+(\.\d+)? mm of 143\.3 mm wheel travel/);
    await saveScreenshot(page, 'suspension-travel');
    await slider.fill('0');
    // Both wheels, the chainring and the cog are circles; the chain, shock and links are lines.
    expect(await view.locator('circle.susp-role-rearWheel, circle.susp-role-frontWheel').count()).toBe(2);
    expect(await view.locator('line.susp-role-chain').count()).toBe(1);
    expect(await view.locator('line.susp-role-shockBody').count()).toBe(1);
    expect(await view.locator('line.susp-role-link').count()).toBeGreaterThan(2);
    expect(await view.getByText('100 mm').count()).toBe(1);
    expect(await view.getByTestId('ic-path').getAttribute('d')).toMatch(/^M/);
    for (const id of PLOTS) {
      const plot = page.getByTestId(id);
      await expect.poll(() => plot.locator('path.susp-plot-line:not(.susp-plot-target)').count()).toBeGreaterThan(0);
      expect(await plot.locator('path.susp-plot-line:not(.susp-plot-target)').first().getAttribute('d')).toMatch(/^M[^N]*$/);
      expect(await plot.getByTestId('sag-marker').count()).toBe(1);
    }
    // One line per cog on the per-gear plots.
    expect(await page.getByTestId('plot-anti-squat').locator('path.susp-plot-line:not(.susp-plot-target)').count()).toBe(DEMO_TRAIL_BIKE.cogTeeth.length);
    expect(await page.getByTestId('plot-anti-squat').locator('path.susp-plot-line-strong').count()).toBe(1);

    // The page shows what the core computes for the same bicycle and layout (Node side).
    const report = demoReport('fourBarSeatStayAxle');
    expect(await figureCell(page, 'Leverage ratio at sag').textContent()).toBe(shown(report.sagPoint.leverageRatio));
    expect(await figureCell(page, 'Leverage ratio at full extension').textContent()).toBe(shown(report.leverageRatioStart));
    expect(await figureCell(page, 'Wheel travel').textContent()).toBe(shown(report.totalTravelMm));
    // theorem: LR = d(wheel travel)/d(shock shortening); a central difference of the side view's axle height agrees.
    const s = report.sagPoint.shockLengthMm;
    const h = 0.01;
    const lrByDifference = (drawnAxleYMm('fourBarSeatStayAxle', s - h) - drawnAxleYMm('fourBarSeatStayAxle', s + h)) / (2 * h);
    expect(Number(await figureCell(page, 'Leverage ratio at sag').textContent())).toBeCloseTo(lrByDifference, 2);

    const caution = page.getByTestId('suspension-caution');
    expect(await caution.isVisible()).toBe(true);
    expect(await caution.textContent()).toContain('ISO 4210');
    expect(await caution.textContent()).toContain('qualified engineer');
    await saveScreenshot(page, 'suspension-demo');
    await saveScreenshot(page, 'suspension-demo-full', { fullPage: true });
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('says beside the field what is wrong with a bad stroke, and why the plots are empty', async () => {
    const app = await openDemo();
    const page = app.page;
    const stroke = page.locator('[data-field="stroke"] input');
    await page.locator('[data-field="eyeToEye"] input').fill('150');
    await stroke.fill('180');
    const issue = page.getByTestId('issue-stroke');
    await issue.waitFor();
    expect(await issue.textContent()).toContain('stroke 180 mm is not shorter than the eye-to-eye length 150 mm');
    expect(await stroke.getAttribute('aria-invalid')).toBe('true');
    // The field keeps what was typed.
    expect(await stroke.inputValue()).toBe('180');
    expect(await page.getByTestId('plots-empty').textContent()).toContain('No curves: the bicycle panel has 1 problem');
    expect(await page.getByTestId('plot-leverage').count()).toBe(0);
    await issue.evaluate((e) => e.scrollIntoView({ block: 'center' }));
    await saveScreenshot(page, 'suspension-bad-field');

    const sag = page.locator('[data-field="sagPct"] input');
    await stroke.fill('55');
    await page.locator('[data-field="eyeToEye"] input').fill('210');
    await sag.fill('abc');
    expect(await page.getByTestId('issue-sagPct').textContent()).toContain('"abc" is not a number');
    await sag.fill('30');
    await page.getByTestId('plot-leverage').waitFor();

    // No spring: no wheel rate. An air spring states its gas law and gives one again.
    await page.getByRole('radio', { name: 'none' }).check();
    await expect.poll(() => page.getByTestId('plot-wheel-rate').count()).toBe(0);
    await page.getByRole('radio', { name: 'air' }).check();
    expect(await page.getByRole('radio', { name: /adiabatic, p·V\^γ constant \(γ = 1\.4\)/ }).count()).toBe(1);
    await page.locator('[data-field="airPressure"] input').fill('900');
    await page.locator('[data-field="airVolume"] input').fill('200000');
    await page.locator('[data-field="airPistonArea"] input').fill('400');
    await page.getByTestId('plot-wheel-rate').waitFor();
    // A chamber the stroke would sweep past is refused beside the volume field.
    await page.locator('[data-field="airVolume"] input').fill('20000');
    expect(await page.getByTestId('issue-airVolume').textContent()).toContain('expected a larger chamber');
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('changes the plots and figures when the layout changes', async () => {
    const app = await openDemo();
    const page = app.page;
    const before = await page.getByTestId('plot-leverage').locator('path.susp-plot-line:not(.susp-plot-target)').getAttribute('d');
    await page.getByLabel('Layout kind').selectOption({ label: LAYOUT_NAMES.singlePivot });
    const single = demoReport('singlePivot');
    await expect.poll(() => figureCell(page, 'Leverage ratio at full extension').textContent()).toBe(shown(single.leverageRatioStart));
    expect(await figureCell(page, 'Leverage ratio at sag').textContent()).toBe(shown(single.sagPoint.leverageRatio));
    const after = await page.getByTestId('plot-leverage').locator('path.susp-plot-line:not(.susp-plot-target)').getAttribute('d');
    expect(after).not.toBe(before);
    // Three pivots for a single pivot layout.
    expect(await page.getByTestId('pivot-table').locator('tbody tr').count()).toBe(3);

    // A floating brake on the four-bar's chain stay adds its own anti-rise line.
    await page.getByLabel('Layout kind').selectOption({ label: LAYOUT_NAMES.fourBarSeatStayAxle });
    await page.getByLabel('Brake caliper on').selectOption('chainStay');
    await expect.poll(() => page.getByTestId('plot-anti-rise').locator('path.susp-plot-line:not(.susp-plot-target)').count()).toBe(2);

    // A shock longer than the layout allows is explained in words.
    await page.locator('[data-field="eyeToEye"] input').fill('300');
    const problem = page.getByTestId('layout-problem');
    await problem.waitFor();
    expect(await problem.textContent()).toMatch(/eye-to-eye length 300 mm is longer than the layout allows|rear axle at/);
    expect(await page.getByTestId('plots-empty').textContent()).toContain('No curves:');
    await saveScreenshot(page, 'suspension-layout-problem');
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('moves a pivot by dragging it on the side view, and the table follows', async () => {
    const app = await openDemo();
    const page = app.page;
    const handle = page.locator('[data-pivot="rockerPivot"]');
    const box = await handle.boundingBox();
    if (box === null) throw new Error('no handle for the rocker pivot');
    const xCell = page.getByLabel('rocker pivot x (mm)');
    const before = Number(await xCell.inputValue());
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width / 2 + 15, box.y + box.height / 2, { steps: 3 });
    await page.mouse.up();
    await expect.poll(async () => Number(await xCell.inputValue())).toBeGreaterThan(before);
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('downloads the curves (CSV, units in the columns), the side view (SVG, with the caution) and the design file, and imports it back', async () => {
    const app = await openDemo();
    const page = app.page;
    const report = demoReport('fourBarSeatStayAxle');
    const csv = await download(page, 'Curves (CSV)');
    expect(csv.name).toMatch(/-curves\.csv$/);
    const [caution, ...lines] = csv.text.trimEnd().split('\r\n');
    expect(caution).toBe(`# ${SUSPENSION_CAUTION}`);
    const header = lines[0].split(',');
    expect(header).toContain('travel_mm');
    expect(header).toContain('leverage_ratio');
    expect(header).toContain('wheel_rate_n_per_mm');
    expect(lines.length).toBe(1 + report.curves.steps);
    const lrColumn = header.indexOf('leverage_ratio');
    expect(Number(lines[1].split(',')[lrColumn])).toBe(report.curves.leverageRatio[0]);

    const svg = await download(page, 'Side view (SVG)');
    expect(svg.name).toMatch(/-side-view\.svg$/);
    expect(svg.text).toContain('<svg');
    expect(svg.text).toContain(SUSPENSION_CAUTION.replace(/'/g, '&apos;').slice(0, 60));
    expect(svg.text).toContain('ISO 4210');
    expect(svg.text).toContain('mm');

    const design = await download(page, 'Design file (JSON)');
    const parsed = parseSuspensionFileText(design.text);
    expect(parsed.ok).toBe(true);
    if (parsed.ok) {
      expect(parsed.design.layout.kind).toBe('fourBarSeatStayAxle');
      expect(parsed.design.bicycle.shock).toEqual(DEMO_TRAIL_BIKE.shock);
    }

    // A file with a bad field is refused, and the problem is named by its path.
    const bad = JSON.parse(design.text) as { bicycle: { shock: { strokeMm: number } } };
    bad.bicycle.shock.strokeMm = 400;
    await page.getByTestId('design-file-input').setInputFiles({ name: 'bad.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(bad)) });
    const issues = page.getByTestId('import-issues');
    await issues.waitFor();
    expect(await issues.textContent()).toContain('bicycle.shock.strokeMm');

    // The good file opens: the name it carries is shown.
    await page.getByTestId('design-file-input').setInputFiles({ name: 'good.json', mimeType: 'application/json', buffer: Buffer.from(design.text) });
    await expect.poll(() => issues.count()).toBe(0);
    expect(await figureCell(page, 'Leverage ratio at sag').textContent()).toBe(shown(report.sagPoint.leverageRatio));
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('keeps the design in the project: back to path synthesis, reload, open it again', async () => {
    const app = await openDemo();
    const page = app.page;
    await page.getByLabel('Design name').fill('Kept design');
    await page.locator('[data-field="sagPct"] input').fill('25');
    await page.getByRole('button', { name: 'Back to path synthesis' }).click();
    // The project is written to IndexedDB a moment after the change (the saver's delay); wait for the record, then reload.
    await expect.poll(() => storedTextHas(page, 'Kept design'), { timeout: 10_000 }).toBe(true);
    await page.reload();
    await page.getByRole('button', { name: 'Rear suspension: Kept design' }).click();
    await page.getByTestId('suspension-workspace').waitFor();
    expect(await page.getByLabel('Design name').inputValue()).toBe('Kept design');
    expect(await page.locator('[data-field="sagPct"] input').inputValue()).toBe('25');
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('reads well at 1920 × 1080', async () => {
    const app = await openDemo({ width: 1920, height: 1080 });
    expect(await app.page.getByTestId('suspension-caution').isVisible()).toBe(true);
    await saveScreenshot(app.page, 'suspension-demo-1920');
    expect(app.problems()).toEqual([]);
    await app.close();
  });
});
