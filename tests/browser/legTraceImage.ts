/** The leg workspace's traced image in the browser tests: a picture made here, and where its pixels are on the screen. */
import { crc32, deflateSync } from 'node:zlib';
import type { Page } from 'playwright-core';

/** A plain grey PNG of w × h pixels, written here (Source: W3C, "Portable Network Graphics (PNG) Specification", 2003, sections 5 and 11). */
export function greyPng(w: number, h: number): Buffer {
  const chunk = (type: string, data: Buffer) => {
    const body = Buffer.concat([Buffer.from(type, 'ascii'), data]);
    const out = Buffer.alloc(body.length + 8);
    out.writeUInt32BE(data.length, 0);
    body.copy(out, 4);
    out.writeUInt32BE(crc32(body), body.length + 4);
    return out;
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(w, 0);
  ihdr.writeUInt32BE(h, 4);
  ihdr.set([8, 0, 0, 0, 0], 8); // 8-bit greyscale, no interlace
  const rows = Buffer.alloc((w + 1) * h, 0xc0);
  for (let y = 0; y < h; y++) rows[y * (w + 1)] = 0; // filter type 0 on each row
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk('IHDR', ihdr), chunk('IDAT', deflateSync(rows)), chunk('IEND', Buffer.alloc(0))]);
}

/** Where image pixel (u, v) is on the screen now. */
export function screenOfPixel(page: Page, u: number, v: number): Promise<{ x: number; y: number }> {
  return page.locator('image.legws-trace-image').evaluate((el, [pu, pv]) => {
    const m = (el as SVGGraphicsElement).getScreenCTM();
    if (m === null) throw new Error('the traced image has no screen matrix');
    const p = new DOMPoint(pu, pv).matrixTransform(m);
    return { x: p.x, y: p.y };
  }, [u, v] as const);
}
