/**
 * The suspension side view's own scale, read from what it draws, for tests that drag on
 * it or check where something is drawn: an independent route from the page's code.
 */
import type { Page } from 'playwright-core';
import { expect } from 'vitest';

/** The side view's viewBox, px (SideView.tsx draws into 960 × 540 user units). */
const VIEW_W = 960;
const VIEW_H = 540;
/** The length the scale bar stands for, as its own label says (checked below). */
const SCALE_BAR_MM = 100;

/**
 * The side view's own scale, read from what it draws: the axes start at the bottom
 * bracket (0, 0) and the scale bar is 100 mm long. A client point becomes SVG units
 * through the element's box and the viewBox (preserveAspectRatio xMidYMid meet).
 */
export interface DrawnScale {
  toMm(clientX: number, clientY: number): { x: number; y: number };
  toClient(xMm: number, yMm: number): { x: number; y: number };
  originX: number;
  originY: number;
  pxPerMm: number;
}

export async function drawnScale(page: Page): Promise<DrawnScale> {
  const view = page.getByTestId('side-view');
  const svg = view.locator('svg').first();
  expect(await view.locator('.susp-scale-bar text').textContent()).toBe(`${SCALE_BAR_MM} mm`);
  const axis = view.locator('.susp-axes line').first();
  const originX = Number(await axis.getAttribute('x1'));
  const originY = Number(await axis.getAttribute('y1'));
  const barPx = Number(await view.locator('.susp-scale-bar line').first().getAttribute('x2'));
  const pxPerMm = barPx / SCALE_BAR_MM;
  const box = await svg.boundingBox();
  if (box === null) throw new Error('the side view has no box');
  // theorem: a viewBox scaled uniformly to fit ("meet") and centred in the element.
  const k = Math.min(box.width / VIEW_W, box.height / VIEW_H);
  const ox = box.x + (box.width - VIEW_W * k) / 2;
  const oy = box.y + (box.height - VIEW_H * k) / 2;
  return {
    originX,
    originY,
    pxPerMm,
    toMm: (cx, cy) => ({ x: ((cx - ox) / k - originX) / pxPerMm, y: (originY - (cy - oy) / k) / pxPerMm }),
    toClient: (x, y) => ({ x: ox + (originX + x * pxPerMm) * k, y: oy + (originY - y * pxPerMm) * k }),
  };
}

