/**
 * Tracing the bicycle over a side-view image: a picture of our own drawn in the page with
 * marks at known pixels, calibrated from the bottom bracket and a known distance, the rear
 * axle picked on it; the field is checked against the mark's position worked out here from
 * the clicked pixels (an independent route: the image's box on screen, not the app's
 * matrices). Then a reload brings the image and its calibration back, and a damaged or
 * missing kept image gives a message.
 */
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { describeBrowser, saveScreenshot, useBrowser, type AppPage } from './harness';

const W = 800;
const H = 500;
/** The marks on the picture, image pixels from its top-left corner (pixel centres). */
const BB = { u: 600.5, v: 300.5 };
/** 480 px behind and 140 px above the bottom bracket: 500 px away (7-24-25). */
const SECOND = { u: 120.5, v: 160.5 };
const AXLE = { u: 117.5, v: 313.5 };
/** Bottom bracket to the second mark, as if measured on the frame: 0.9 mm per pixel. */
const DISTANCE_MM = 450;
/** The kept record's key, as the app names it (src/app/storage/traceRecordStore.ts). */
const RECORD_KEY = 'current:suspension-trace';

type Box = { x: number; y: number; width: number; height: number };

/** A PNG of our own: white, with a red cross at each mark. */
async function drawPicture(page: Page): Promise<Buffer> {
  const base64 = await page.evaluate(({ w, h, marks }) => {
    const canvas = document.createElement('canvas');
    canvas.width = w;
    canvas.height = h;
    const g = canvas.getContext('2d') as CanvasRenderingContext2D;
    g.fillStyle = '#fff';
    g.fillRect(0, 0, w, h);
    g.strokeStyle = '#d00';
    g.lineWidth = 1;
    for (const m of marks) {
      g.beginPath();
      g.moveTo(m.u - 12, m.v);
      g.lineTo(m.u + 12, m.v);
      g.moveTo(m.u, m.v - 12);
      g.lineTo(m.u, m.v + 12);
      g.stroke();
    }
    return canvas.toDataURL('image/png').split(',')[1];
  }, { w: W, h: H, marks: [BB, SECOND, AXLE] });
  return Buffer.from(base64, 'base64');
}

/** Where a whole screen pixel near a mark is, and the image pixel it is over (from the image's box: a level image fills it). */
function clickPoint(box: Box, p: { u: number; v: number }) {
  const sx = Math.round(box.x + (p.u * box.width) / W);
  const sy = Math.round(box.y + (p.v * box.height) / H);
  return { sx, sy, u: ((sx - box.x) * W) / box.width, v: ((sy - box.y) * H) / box.height };
}

async function imageBox(page: Page): Promise<Box> {
  const box = await page.getByTestId('trace-image').boundingBox();
  if (box === null) throw new Error('the traced image is not on the page');
  return box;
}

/** A record of the projects store (the kept trace record unless named), read straight from IndexedDB. */
function keptRecord(page: Page, key = RECORD_KEY): Promise<unknown> {
  return page.evaluate((key) => new Promise<unknown>((resolve) => {
    const open = indexedDB.open('loci');
    open.onsuccess = () => {
      const db = open.result;
      const get = db.transaction('projects', 'readonly').objectStore('projects').get(key);
      get.onsuccess = () => { db.close(); resolve(get.result ?? null); };
      get.onerror = () => { db.close(); resolve(null); };
    };
    open.onerror = () => resolve(null);
  }), key);
}

describeBrowser('tracing the bicycle over a side-view image', () => {
  const browser = useBrowser();

  async function openDemo(): Promise<AppPage> {
    const app = await browser.openApp('/');
    await app.page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await app.page.getByTestId('suspension-workspace').waitFor();
    return app;
  }

  it('calibrates from the bottom bracket and a distance, picks the rear axle, and keeps both over a reload', async () => {
    const app = await openDemo();
    const page = app.page;
    const picture = await drawPicture(page);

    // Not an image the side view takes: refused with the reason.
    await page.getByTestId('trace-file-input').setInputFiles({ name: 'frame.gif', mimeType: 'image/gif', buffer: Buffer.from('GIF89a\u0001\u0000\u0001\u0000', 'latin1') });
    await expect.poll(() => page.getByTestId('trace-notice').textContent()).toBe('Could not load frame.gif: the file is a GIF image; expected PNG, JPEG or WebP.');
    expect(await page.getByTestId('trace-image').count()).toBe(0);

    await page.getByTestId('trace-file-input').setInputFiles({ name: 'side.png', mimeType: 'image/png', buffer: picture });
    await page.getByTestId('trace-image').waitFor();
    expect(await page.getByTestId('trace-status').textContent()).toContain(`side.png: ${W} × ${H} px, not calibrated`);
    await page.getByLabel('Calibration method').selectOption('distance');
    await page.getByTestId('trace-image').scrollIntoViewIfNeeded();

    // The very first click after loading is the bottom bracket: it is taken, even with a hand's jitter
    // (pressed a pixel away from where it is let go; a click is where it is let go).
    const before = await imageBox(page);
    const bb = clickPoint(before, BB);
    const second = clickPoint(before, SECOND);
    await page.mouse.move(bb.sx - 1, bb.sy);
    await page.mouse.down();
    await page.mouse.move(bb.sx, bb.sy);
    await page.mouse.up();
    await expect.poll(() => page.getByTestId('trace-mark').count()).toBe(1);
    await page.mouse.click(second.sx, second.sy);
    await expect.poll(() => page.getByTestId('trace-mark').count()).toBe(2);
    // A distance that is not a number is named beside the button; the clicks stay.
    await page.getByLabel('Distance from the bottom bracket to the second point (mm)').fill('4S0');
    await page.getByRole('button', { name: 'Set scale' }).click();
    await expect.poll(() => page.getByTestId('trace-notice').textContent()).toContain('the distance "4S0" is not a number');
    await page.getByLabel('Distance from the bottom bracket to the second point (mm)').fill(String(DISTANCE_MM));
    await page.getByRole('button', { name: 'Set scale' }).click();
    await expect.poll(() => page.getByTestId('trace-status').textContent()).toContain('calibrated');

    // Pick the rear axle on the calibrated image.
    await page.getByRole('button', { name: 'Pick the rear axle on the image' }).click();
    const after = await imageBox(page);
    const axle = clickPoint(after, AXLE);
    await page.mouse.click(axle.sx, axle.sy);
    await expect.poll(() => page.getByTestId('trace-pick-notice').textContent()).toContain('Rear axle set to');
    expect(await page.getByTestId('trace-pick-notice').textContent()).toMatch(/A screen pixel here is [\d.]+ mm/);
    const field = (name: string) => page.locator(`[data-field="${name}"] input`);
    const xText = await field('rearAxleX').inputValue();
    const yText = await field('rearAxleY').inputValue();

    // The independent route: a level image, the bottom bracket at the origin, 450 mm over the clicked pixels' distance.
    const mmPerPx = DISTANCE_MM / Math.hypot(second.u - bb.u, second.v - bb.v); // theorem: similarity of a level, unturned image
    const expected = { x: (axle.u - bb.u) * mmPerPx, y: (bb.v - axle.v) * mmPerPx };
    // The field holds the picked point to 0.1 mm (half a tenth either way, and float noise).
    expect(Math.abs(Number(xText) - expected.x)).toBeLessThanOrEqual(0.05 + 1e-6);
    expect(Math.abs(Number(yText) - expected.y)).toBeLessThanOrEqual(0.05 + 1e-6);
    expect(xText).toMatch(/^-?\d+(\.\d)?$/);
    // And it is the mark: (117.5 − 600.5)·0.9 = −434.7 mm, (300.5 − 313.5)·0.9 = −11.7 mm (worked by hand), within
    // where whole screen pixels let the clicks land: half a screen pixel's diagonal each, and the calibration's two
    // errors carried along the 435 mm to the axle (under 2 more), in mm at the coarser of the two views.
    const mmPerScreenPx = (DISTANCE_MM / 500) * Math.max(W / before.width, W / after.width);
    const clickSlackMm = 4 * Math.SQRT1_2 * mmPerScreenPx + 0.05;
    expect(Math.abs(Number(xText) - -434.7)).toBeLessThanOrEqual(clickSlackMm);
    expect(Math.abs(Number(yText) - -11.7)).toBeLessThanOrEqual(clickSlackMm);
    // The analysis reads the same number: the side view's rear axle is drawn there.
    await expect.poll(async () => page.getByTestId('side-view').locator('.susp-role-axle title').textContent()).toBe(`rear axle (${Number(xText)}, ${Number(yText)}) mm`);
    await saveScreenshot(page, 'suspension-trace');

    // Kept: wait for the record, then reload and open the kept design.
    await expect.poll(async () => ((await keptRecord(page)) as { placement?: unknown } | null)?.placement ?? null, { timeout: 10_000 }).not.toBeNull();
    const kept = await imageBox(page);
    await page.getByRole('button', { name: 'Back to path synthesis' }).click();
    // The design (with the picked axle) is saved a moment after the change: wait for it in the project record.
    await expect.poll(async () => ((await keptRecord(page, 'current')) as { suspension?: { draft?: { rearAxleX?: string } } } | null)?.suspension?.draft?.rearAxleX ?? null, { timeout: 10_000 }).toBe(xText);
    await page.reload();
    await page.getByRole('button', { name: /^Rear suspension: / }).click();
    await page.getByTestId('trace-image').waitFor({ timeout: 30_000 });
    expect(await page.getByTestId('trace-image').getAttribute('href')).toMatch(/^blob:/);
    expect(await page.getByTestId('trace-status').textContent()).toContain('calibrated, 0.9');
    expect(await field('rearAxleX').inputValue()).toBe(xText);
    await page.getByTestId('trace-image').scrollIntoViewIfNeeded();
    const back = await imageBox(page);
    // The same design, the same frame: the image lies where it did.
    for (const k of ['width', 'height'] as const) expect(back[k]).toBeCloseTo(kept[k], 3);
    expect(await page.getByRole('button', { name: 'Pick the rear axle on the image' }).count()).toBe(1);
    // Hidden: no image, nothing to pick on; shown again, as it was.
    await page.getByLabel('Hide image').check();
    await expect.poll(() => page.getByTestId('trace-image').count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Pick the rear axle on the image' }).count()).toBe(0);
    await page.getByLabel('Hide image').uncheck();
    await page.getByTestId('trace-image').waitFor();
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('calibrates from the bottom bracket and the rear axle the panel holds (scale and tilt), then picks a pivot', async () => {
    const app = await openDemo();
    const page = app.page;
    // A rear axle well above the line the picture's marks make: the image must turn about 30° to fit it.
    await page.locator('[data-field="rearAxleX"] input').fill('-380');
    await page.locator('[data-field="rearAxleY"] input').fill('200');
    await page.getByTestId('trace-file-input').setInputFiles({ name: 'side.png', mimeType: 'image/png', buffer: await drawPicture(page) });
    await page.getByTestId('trace-image').waitFor();
    await page.getByTestId('trace-image').scrollIntoViewIfNeeded();
    const box = await imageBox(page);
    const bb = clickPoint(box, BB);
    const axle = clickPoint(box, AXLE);
    await page.mouse.click(bb.sx, bb.sy);
    await page.mouse.click(axle.sx, axle.sy);
    await expect.poll(() => page.getByTestId('trace-status').textContent()).toContain('calibrated');
    const axleMm = { x: Number(await page.locator('[data-field="rearAxleX"] input').inputValue()), y: Number(await page.locator('[data-field="rearAxleY"] input').inputValue()) };

    // The image is turned now: where a mark is on screen comes from the drawn image's own screen matrix (the browser's).
    await page.getByRole('button', { name: 'Pick the main pivot on the image' }).click();
    // The pivot table is below the bicycle panel: back up to the image, the pick still waiting.
    await page.getByTestId('trace-image').scrollIntoViewIfNeeded();
    expect(await page.getByTestId('trace-prompt').textContent()).toBe('Click the main pivot on the image. Esc stops.');
    const m = await page.getByTestId('trace-image').evaluate((el) => {
      const c = (el as SVGGraphicsElement).getScreenCTM() as DOMMatrix;
      return { a: c.a, b: c.b, c: c.c, d: c.d, e: c.e, f: c.f };
    });
    const sx = Math.round(m.a * SECOND.u + m.c * SECOND.v + m.e);
    const sy = Math.round(m.b * SECOND.u + m.d * SECOND.v + m.f);
    await page.mouse.click(sx, sy);
    await expect.poll(() => page.getByTestId('trace-pick-notice').textContent()).toContain('main pivot set to');
    // The image pixel clicked: the 2 × 2 inverse written out here.
    expect(Math.abs(m.b)).toBeGreaterThan(0.3 * Math.abs(m.a)); // turned indeed
    const det = m.a * m.d - m.b * m.c;
    const u = (m.d * (sx - m.e) - m.c * (sy - m.f)) / det;
    const v = (-m.b * (sx - m.e) + m.a * (sy - m.f)) / det;
    // theorem: a similarity without mirror is z ↦ z · (W / A) in complex numbers, with the bottom bracket at 0,
    // A the axle's pixel offset (y up) and W its mm; this route shares nothing with the app's angle and matrix.
    const A = { re: axle.u - bb.u, im: bb.v - axle.v };
    const P = { re: u - bb.u, im: bb.v - v };
    const n = A.re * A.re + A.im * A.im;
    const k = { re: (axleMm.x * A.re + axleMm.y * A.im) / n, im: (axleMm.y * A.re - axleMm.x * A.im) / n };
    const expected = { x: P.re * k.re - P.im * k.im, y: P.re * k.im + P.im * k.re };
    const x = Number(await page.getByLabel('main pivot x (mm)').inputValue());
    const y = Number(await page.getByLabel('main pivot y (mm)').inputValue());
    expect(Math.abs(x - expected.x)).toBeLessThanOrEqual(0.05 + 1e-6);
    expect(Math.abs(y - expected.y)).toBeLessThanOrEqual(0.05 + 1e-6);
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('says so when the kept image is missing or its record is damaged', async () => {
    const app = await openDemo();
    const page = app.page;
    await page.getByTestId('trace-file-input').setInputFiles({ name: 'side.png', mimeType: 'image/png', buffer: await drawPicture(page) });
    await page.getByTestId('trace-image').waitFor();
    await page.getByLabel('Opacity').fill('0.4');
    await expect.poll(async () => ((await keptRecord(page)) as { opacity?: number } | null)?.opacity ?? null, { timeout: 10_000 }).toBe(0.4);

    // The image's bytes are damaged: not an image any more.
    await page.evaluate((key) => new Promise<void>((resolve) => {
      const open = indexedDB.open('loci');
      open.onsuccess = () => {
        const db = open.result;
        const tx = db.transaction(['projects', 'images'], 'readwrite');
        const get = tx.objectStore('projects').get(key);
        get.onsuccess = () => {
          const imageId = (get.result as { image: { imageId: string } }).image.imageId;
          tx.objectStore('images').put({ imageId, name: 'side.png', blob: new Blob([new Uint8Array([0x89, 0x50, 0x4e, 0x47, 1, 2, 3])], { type: 'image/png' }) });
        };
        tx.oncomplete = () => { db.close(); resolve(); };
      };
    }), RECORD_KEY);
    await page.reload();
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await expect.poll(() => page.getByTestId('trace-notice').textContent(), { timeout: 15_000 }).toContain('The kept image side.png could not be read as an image');
    expect(await page.getByTestId('trace-image').count()).toBe(0);

    // The image's bytes go missing.
    await page.evaluate(() => new Promise<void>((resolve) => {
      const open = indexedDB.open('loci');
      open.onsuccess = () => {
        const db = open.result;
        const tx = db.transaction('images', 'readwrite');
        tx.objectStore('images').clear();
        tx.oncomplete = () => { db.close(); resolve(); };
      };
    }));
    await page.reload();
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await expect.poll(() => page.getByTestId('trace-notice').textContent(), { timeout: 15_000 }).toContain('The image side.png is missing from this browser\'s storage');
    expect(await page.getByTestId('trace-image').count()).toBe(0);

    // The record itself is damaged.
    await page.evaluate((key) => new Promise<void>((resolve) => {
      const open = indexedDB.open('loci');
      open.onsuccess = () => {
        const db = open.result;
        const tx = db.transaction('projects', 'readwrite');
        tx.objectStore('projects').put({ format: 'loci-suspension-trace', version: 1, image: { imageId: 'x' } }, key);
        tx.oncomplete = () => { db.close(); resolve(); };
      };
    }), RECORD_KEY);
    await page.reload();
    await page.getByRole('button', { name: 'Rear suspension demo' }).click();
    await expect.poll(() => page.getByTestId('trace-notice').textContent(), { timeout: 15_000 }).toContain('The kept trace image\'s record is damaged (image.name:');
    expect(await page.getByTestId('suspension-workspace').isVisible()).toBe(true);
    expect(app.problems()).toEqual([]);
    await app.close();
  });

  it('the path editor takes the first calibration click after an image is loaded, even when the hand moves a little', async () => {
    const app = await browser.openApp('/');
    const page = app.page;
    await page.getByTestId('target-drawing').waitFor();
    await page.locator('details.background-controls summary').click();
    await page.locator('details.background-controls input[type=file]').setInputFiles({ name: 'side.png', mimeType: 'image/png', buffer: await drawPicture(page) });
    await page.locator('[data-testid="target-drawing"] [data-testid="background-image"]').waitFor();
    const drawing = page.getByTestId('target-drawing');
    await drawing.scrollIntoViewIfNeeded();
    const box = (await drawing.boundingBox())!;
    // A hand's click: the pointer moves 2 px between press and release. It is a click
    // (the first calibration point), not a pan of the drawing.
    const x = box.x + 0.4 * box.width;
    const y = box.y + 0.5 * box.height;
    await page.mouse.move(x, y);
    await page.mouse.down();
    await page.mouse.move(x + 2, y + 1);
    await page.mouse.up();
    // common practice: the first click of a two-point calibration is point A.
    await expect.poll(() => drawing.locator('g.calibration text').count()).toBe(1);
    expect(app.problems()).toEqual([]);
    await app.close();
  });
});
