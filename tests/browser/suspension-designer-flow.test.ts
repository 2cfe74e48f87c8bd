/**
 * A frame designer's whole flow, as the rear-suspension issue states it: open the demo,
 * enter their own bicycle, draw a pivot region and a chainring keep-out, ask for an axle
 * path, a leverage ratio falling from 2.9 to 2.4 and anti-squat near 100 % at sag in the
 * middle cogs, search a single pivot, two four-bars and a six-bar in one run, then read
 * and compare the ranked layouts.
 *
 * Checked by routes apart from the page: each layout's best design, downloaded, is
 * analysed in Node by the core's suspensionCurves (the table's figures must be its
 * figures), and the keep-outs a feasible design is said to respect are checked here by
 * plain geometry over a sweep ten times finer than the search's.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { parseSuspensionFileText } from '../../src/core/io/suspensionFile';
import { compile, run } from '../../src/core/linkage';
import { SUSPENSION_CAUTION, suspensionCurves, type Bicycle } from '../../src/core/suspension';
import type { Linkage } from '../../src/core/linkage';
import { describeBrowser, downloadFrom, saveScreenshot, useBrowser } from './harness';
import { drawnScale } from './sideViewScale';

const field = (page: Page, name: string) => page.locator(`[data-field="${name}"] input, [data-field="${name}"] textarea`).first();
const shown = (x: number, digits = 4) => (Number.isFinite(x) ? String(Number(x.toPrecision(digits))) : '—');
/** Samples over the stroke the search takes (the set-up's default). */
const STEPS = 41;
const LAYOUTS = ['singlePivot', 'fourBarSeatStayAxle', 'shortLinkFourBar', 'wattSixBar'] as const;

/** Our own bicycle (invented figures, no real frame's), typed over the demo's. */
const OWN_BICYCLE: Readonly<Record<string, string>> = {
  rearAxleX: '-438',
  rearAxleY: '-10',
  wheelRadius: '372',
  front: '1240',
  comHeight: '1080',
  chainringTeeth: '30',
  sagPct: '28',
};

interface Circle { readonly x: number; readonly y: number; readonly r: number }

/** Distance from (px, py) to the segment a–b. // theorem: projection onto the segment, clamped to its ends. */
function segmentDistance(ax: number, ay: number, bx: number, by: number, px: number, py: number): number {
  const dx = bx - ax;
  const dy = by - ay;
  const len2 = dx * dx + dy * dy;
  const t = len2 > 0 ? Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / len2)) : 0;
  return Math.hypot(ax + t * dx - px, ay + t * dy - py);
}

/**
 * How deep any frame pivot, moving joint or moving link goes into any circle over the
 * whole stroke, mm (0: none enters). The poses come from the core's kinematics; the
 * geometry is this test's own.
 */
function deepestIntrusionMm(linkage: Linkage, bicycle: Bicycle, circles: readonly Circle[], steps: number): number {
  const compiled = compile(linkage);
  if (!compiled.ok) throw new Error('the downloaded design does not compile');
  const plan = compiled.plan;
  const ground = new Set(linkage.joints.filter((j) => j.ground === true).map((j) => j.id));
  const frameBodies = new Set(linkage.bodies.filter((b) => b.joints.every((j) => ground.has(j))).map((b) => b.id));
  const pose = Float64Array.from(plan.reference);
  const at = (id: string) => {
    const s = 2 * (plan.slotIndex.get(id) ?? -1);
    return { x: pose[s], y: pose[s + 1] };
  };
  let deepest = 0;
  for (let k = 0; k < steps; k++) {
    const length = bicycle.shock.eyeToEyeMm - (bicycle.shock.strokeMm * k) / (steps - 1);
    expect(run(plan, length, pose), `the design assembles at shock length ${length} mm`).toBe(true);
    for (const c of circles) {
      for (const j of linkage.joints) {
        const p = at(j.id);
        deepest = Math.max(deepest, c.r - Math.hypot(p.x - c.x, p.y - c.y));
      }
      for (const body of linkage.bodies) {
        if (frameBodies.has(body.id)) continue;
        for (let i = 0; i < body.joints.length; i++) {
          for (let m = i + 1; m < body.joints.length; m++) {
            const a = at(body.joints[i]);
            const b = at(body.joints[m]);
            deepest = Math.max(deepest, c.r - segmentDistance(a.x, a.y, b.x, b.y, c.x, c.y));
          }
        }
      }
    }
  }
  return deepest;
}

async function rowCells(page: Page, layout: string): Promise<Record<string, { text: string; value: number }>> {
  return page.getByTestId('best-per-layout').locator(`tr[data-layout="${layout}"] td[data-col]`).evaluateAll((tds) =>
    Object.fromEntries(tds.map((td) => [td.getAttribute('data-col'), { text: td.textContent ?? '', value: Number(td.getAttribute('data-value')) }])));
}

describeBrowser('rear suspension: a frame designer’s flow', () => {
  const browser = useBrowser();

  it('enters a bicycle, draws a region and a keep-out, sets the targets, searches four layouts and compares them', async () => {
    const app = await browser.openApp('/', { viewport: { width: 1920, height: 1080 } });
    const page = app.page;
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await page.getByTestId('search-setup-panel').waitFor();
    await page.getByLabel('Design name').fill('Own trail frame');

    // Their own bicycle.
    for (const [name, value] of Object.entries(OWN_BICYCLE)) await field(page, name).fill(value);

    // A pivot region drawn on the side view around the demo rocker pivot (−15, 325) mm.
    await page.getByRole('button', { name: 'Draw the region of the rocker pivot on the side view' }).click();
    await page.getByTestId('setup-capture').waitFor();
    await page.getByTestId('side-view').scrollIntoViewIfNeeded();
    let scale = await drawnScale(page);
    const a = scale.toClient(-60, 370);
    const b = scale.toClient(30, 285);
    await page.mouse.move(a.x, a.y);
    await page.mouse.down();
    await page.mouse.move(b.x, b.y, { steps: 4 });
    await page.mouse.up();
    await expect.poll(() => page.getByTestId('setup-capture').count()).toBe(0);
    const kind = 'four-bar, axle on the seat stay';
    const regionX = [await page.getByLabel(`${kind}, rocker pivot x from (mm)`).inputValue(), await page.getByLabel(`${kind}, rocker pivot x to (mm)`).inputValue()].map(Number);
    expect(Math.abs(regionX[0] - -60)).toBeLessThanOrEqual(0.05 + 1 / scale.pxPerMm);
    expect(Math.abs(regionX[1] - 30)).toBeLessThanOrEqual(0.05 + 1 / scale.pxPerMm);

    // The chainring keep-out, drawn: the demo's two are removed first.
    await page.getByRole('button', { name: /Remove keep-out 2/ }).click();
    await page.getByRole('button', { name: /Remove keep-out 1/ }).click();
    await expect.poll(() => page.locator('.susp-keep-out').count()).toBe(0);
    await page.getByRole('button', { name: 'Place a keep-out on the side view' }).click();
    await page.getByTestId('setup-capture').waitFor();
    await page.getByTestId('side-view').scrollIntoViewIfNeeded();
    scale = await drawnScale(page);
    const centre = scale.toClient(0, 0);
    const rim = scale.toClient(66, 0);
    await page.mouse.move(centre.x, centre.y);
    await page.mouse.down();
    await page.mouse.move(rim.x, rim.y, { steps: 3 });
    await page.mouse.up();
    await expect.poll(() => page.locator('.susp-keep-out').count()).toBe(1);
    await page.getByLabel('Keep-out 1 name').fill('chainring 30 T');

    // The targets: an axle path, the leverage ratio 2.9 → 2.4, anti-squat 95–105 % at sag in the middle cogs.
    await page.locator('[data-target="axlePath"] input[type="checkbox"]').first().check();
    await field(page, 'targets.axlePath.points').fill('0, -438\n50, -443\n100, -445\n140, -443');
    await field(page, 'targets.axlePath.weight').fill('0.2');
    await field(page, 'targets.leverageRatio.start').fill('2.9');
    await field(page, 'targets.leverageRatio.end').fill('2.4');
    await field(page, 'targets.antiSquatAtSag.min').fill('95');
    await field(page, 'targets.antiSquatAtSag.max').fill('105');
    await field(page, 'targets.antiSquatAtSag.cogs').fill('21, 24, 28');

    // The targets are drawn on the design's own plots: the leverage and axle-path targets as
    // curves, the anti-squat band (the gear shown, 24 T, is among the target cogs).
    await expect.poll(() => page.getByTestId('plot-leverage').locator('path.susp-plot-target').count()).toBe(1);
    expect(await page.getByTestId('plot-axle-path').locator('path.susp-plot-target').count()).toBe(1);
    expect(await page.getByTestId('plot-anti-squat').getByTestId('target-band').count()).toBe(1);

    // Four layouts in one run: a short deterministic search (an evaluation budget, a seed).
    await page.getByRole('checkbox', { name: 'short-link four-bar' }).check();
    for (const layout of ['single pivot', 'four-bar, axle on the seat stay', 'Watt six-bar']) {
      expect(await page.getByRole('checkbox', { name: layout, exact: true }).isChecked(), layout).toBe(true);
    }
    await field(page, 'budget.seconds').fill('');
    await field(page, 'budget.evaluations').fill('2000');
    await field(page, 'seed').fill('3');
    await expect.poll(() => page.getByTestId('suspension-search-problem').getAttribute('data-ready')).toBe('true');
    const start = page.getByRole('button', { name: 'Start search' });
    await expect.poll(() => start.isEnabled()).toBe(true);
    // Start is pressed from the keyboard, not clicked: while the workspace's deferred views
    // redraw after a field changed, the page can move between Playwright's scroll to the
    // button and its click, and the click then lands elsewhere (seen on 1 start in 20 to 40
    // under load: the click hit the bicycle panel, and Start did nothing).
    await start.press('Enter');
    await page.getByTestId('search-results').waitFor({ timeout: 180_000 });
    expect(await page.getByTestId('search-progress').getAttribute('data-status')).toBe('finished');

    // Each layout's best is in the table, and its figures are the core's for the design it opens.
    const best = await page.getByTestId('best-per-layout').locator('tr[data-layout]').evaluateAll((trs) => trs.map((tr) => [tr.getAttribute('data-layout'), tr.getAttribute('data-rank')]));
    expect(best.map(([layout]) => layout).sort()).toEqual([...LAYOUTS].sort());
    let feasibleChecked = 0;
    for (const [layout, rank] of best) {
      const row = await rowCells(page, layout ?? '');
      await page.getByTestId('best-per-layout').getByRole('button', { name: `Open #${rank}` }).click();
      const file = await downloadFrom(page, page.getByRole('button', { name: 'Design file (JSON)' }));
      const design = parseSuspensionFileText(await readFile(await file.path(), 'utf8'));
      if (!design.ok) throw new Error(JSON.stringify(design.issues));
      expect(design.design.layout.kind).toBe(layout);
      // The bicycle the designer typed is the one the design was searched and is analysed on.
      expect(design.design.bicycle.rearAxleMm).toEqual({ x: -438, y: -10 });
      expect(design.design.bicycle.chainringTeeth).toBe(30);
      // Source: the core's suspensionCurves in Node on the downloaded file, a route apart from the page.
      const analysed = suspensionCurves(design.linkage, design.design.bicycle, { steps: STEPS });
      if (!analysed.ok) throw new Error(`${layout}: ${analysed.reason}`);
      const r = analysed.report;
      const cog = Math.floor(r.cogTeeth.length / 2);
      const expected: Record<string, [number, number]> = {
        leverageRatioStart: [r.leverageRatioStart, 4],
        leverageRatioEnd: [r.leverageRatioEnd, 4],
        antiSquatAtSagPct: [r.sagPoint.antiSquatPct[cog], 3],
        travelMm: [r.totalTravelMm, 4],
      };
      for (const [key, [value, digits]] of Object.entries(expected)) {
        expect(row[key].text, `${layout} ${key}`).toBe(shown(value, digits));
        expect(row[key].value, `${layout} ${key}`).toBeCloseTo(value, 9);
      }
      // A design reported feasible keeps out of the chainring over its whole stroke, sampled
      // ten times finer than the search: no pivot or moving link enters by more than 0.05 mm.
      if (row.feasible.text === 'feasible') {
        expect(deepestIntrusionMm(design.linkage, design.design.bicycle, [{ x: 0, y: 0, r: Number(await page.getByLabel("Keep-out 1 r (mm)").inputValue()) }], 10 * (STEPS - 1) + 1), layout ?? '').toBeLessThanOrEqual(0.05);
        feasibleChecked++;
      }
    }

    // The keep-out check above ran: at least one layout's best is feasible.
    expect(feasibleChecked).toBeGreaterThan(0);

    // Compare the best four-bar and the best six-bar.
    for (const layout of ['fourBarSeatStayAxle', 'wattSixBar']) {
      await page.getByTestId('best-per-layout').locator(`tr[data-layout="${layout}"] input[type="checkbox"]`).check();
    }
    const compare = page.getByTestId('compare-view');
    await compare.waitFor();
    expect(await page.getByTestId('compare-leverage').locator('path.susp-plot-line:not(.susp-plot-target)').count()).toBe(2);
    expect(await compare.textContent()).toContain(SUSPENSION_CAUTION);
    await page.locator('#susp-search-title').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'suspension-designer-flow');
    await page.locator('#susp-compare-title').evaluate((el) => el.scrollIntoView({ block: 'start' }));
    await saveScreenshot(page, 'suspension-designer-compare');
    expect(app.problems()).toEqual([]);
    await app.close();
  }, 300_000);
});
