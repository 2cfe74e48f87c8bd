/**
 * A standalone SVG file of a suspension side view at 1:1 (one user unit is one mm, the
 * sheet's width and height in mm): the primitives of `sideView`, labelled pivots, the
 * axes at the origin (the bottom bracket), a 100 mm scale bar, and the caution as text.
 * The drawing's y is up, as the bicycle frame's; SVG's is down, so every y is negated.
 */
import { sideViewExtent, type SideViewPrimitive, type SideViewRole } from '../suspension';
import { escapeXml, wrapWords } from './svgText';

export interface SideViewSvgOptions {
  /** Printed under the drawing and kept whole in the file's <desc>. */
  readonly caution: string;
  readonly title?: string;
}

/** Length of the scale bar, mm. */
export const SCALE_BAR_MM = 100;
const MARGIN_MM = 40;
const AXIS_MM = 60;
/** Characters per caution line, about the sheet's width at the caution's font size. */
const CAUTION_LINE_CHARS = 90;

/** Our palette, by role. */
const ROLE_STYLE: Readonly<Record<SideViewRole, { readonly stroke: string; readonly widthMm: number }>> = {
  rearWheel: { stroke: '#39424e', widthMm: 3 },
  frontWheel: { stroke: '#39424e', widthMm: 3 },
  chainring: { stroke: '#7a4fb0', widthMm: 1.5 },
  cog: { stroke: '#7a4fb0', widthMm: 1.5 },
  bottomBracket: { stroke: '#39424e', widthMm: 1.5 },
  ground: { stroke: '#8a8f96', widthMm: 1 },
  chain: { stroke: '#b4232a', widthMm: 2 },
  shockBody: { stroke: '#1f5fa8', widthMm: 9 },
  shockStroke: { stroke: '#1f5fa8', widthMm: 3 },
  link: { stroke: '#2f6b3a', widthMm: 5 },
  framePivot: { stroke: '#39424e', widthMm: 1.5 },
  pivot: { stroke: '#2f6b3a', widthMm: 1.5 },
  axle: { stroke: '#39424e', widthMm: 1.5 },
};


/** A coordinate for the file: 0.001 mm is finer than any drawing needs. */
function n(v: number): string {
  return String(Math.round(v * 1000) / 1000);
}


/** The SVG text of a side view. */
export function sideViewSvg(primitives: readonly SideViewPrimitive[], options: SideViewSvgOptions): string {
  const title = options.title ?? 'Rear suspension, side view';
  const box = sideViewExtent(primitives, { minX: -AXIS_MM, maxX: AXIS_MM, minY: -AXIS_MM, maxY: AXIS_MM });
  const width = box.maxX - box.minX + 2 * MARGIN_MM;
  const font = Math.max(8, width / 90);
  const caution = wrapWords(options.caution, CAUTION_LINE_CHARS);
  const below = 3 * font + caution.length * font * 1.4;
  // Sheet coordinates: x as drawn, y negated.
  const left = box.minX - MARGIN_MM;
  const top = -box.maxY - MARGIN_MM;
  const drawingBottom = -box.minY + MARGIN_MM;
  const height = drawingBottom - top + below;

  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${n(width)}mm" height="${n(height)}mm" viewBox="${n(left)} ${n(top)} ${n(width)} ${n(height)}">`,
    `<title>${escapeXml(title)}</title>`,
    `<desc>${escapeXml(options.caution)}</desc>`,
    `<rect x="${n(left)}" y="${n(top)}" width="${n(width)}" height="${n(height)}" fill="#ffffff"/>`,
    '<g fill="none" stroke-linecap="round">',
  ];
  const order: readonly SideViewPrimitive['kind'][] = ['circle', 'segment'];
  for (const kind of order) {
    for (const p of primitives) {
      if (p.kind !== kind) continue;
      const style = ROLE_STYLE[p.role];
      const attrs = `stroke="${style.stroke}" stroke-width="${n(style.widthMm)}" data-role="${p.role}"`;
      if (p.kind === 'circle') {
        out.push(`<circle cx="${n(p.cxMm)}" cy="${n(-p.cyMm)}" r="${n(p.rMm)}" ${attrs}><title>${escapeXml(p.label)}</title></circle>`);
      } else if (p.kind === 'segment') {
        out.push(`<line x1="${n(p.x1Mm)}" y1="${n(-p.y1Mm)}" x2="${n(p.x2Mm)}" y2="${n(-p.y2Mm)}" ${attrs}><title>${escapeXml(p.label)}</title></line>`);
      }
    }
  }
  out.push('</g>');

  // Axes at the origin, the bottom bracket.
  const arrow = font * 0.6;
  out.push(
    '<g stroke="#000000" stroke-width="1" fill="none" data-role="axes">',
    `<path d="M0 0 H${n(AXIS_MM)} M${n(AXIS_MM - arrow)} ${n(-arrow / 2)} L${n(AXIS_MM)} 0 L${n(AXIS_MM - arrow)} ${n(arrow / 2)}"/>`,
    `<path d="M0 0 V${n(-AXIS_MM)} M${n(-arrow / 2)} ${n(-AXIS_MM + arrow)} L0 ${n(-AXIS_MM)} L${n(arrow / 2)} ${n(-AXIS_MM + arrow)}"/>`,
    '</g>',
    `<g font-family="sans-serif" font-size="${n(font)}" fill="#000000">`,
    `<text x="${n(AXIS_MM + font * 0.3)}" y="${n(font * 0.35)}">x</text>`,
    `<text x="${n(font * 0.3)}" y="${n(-AXIS_MM)}">y</text>`,
    `<text x="${n(font * 0.3)}" y="${n(font * 1.3)}">origin (0, 0): bottom bracket; mm, x forward, y up</text>`,
    `<text x="${n(left + MARGIN_MM)}" y="${n(top + 1.5 * font)}" font-size="${n(1.2 * font)}" class="heading">${escapeXml(title)}</text>`,
  );

  // Pivots and named points, each a dot and its label.
  for (const p of primitives) {
    if (p.kind !== 'point') continue;
    const style = ROLE_STYLE[p.role];
    out.push(
      `<circle cx="${n(p.xMm)}" cy="${n(-p.yMm)}" r="${n(font * 0.35)}" fill="#ffffff" stroke="${style.stroke}" stroke-width="${n(style.widthMm)}" data-role="${p.role}"/>`,
      `<text x="${n(p.xMm + font * 0.5)}" y="${n(-p.yMm - font * 0.5)}" class="label">${escapeXml(p.label)}</text>`,
    );
  }

  // Scale bar under the drawing, at the left.
  const barY = drawingBottom + font;
  const tick = font * 0.5;
  out.push(
    `<path d="M${n(left + MARGIN_MM)} ${n(barY - tick)} V${n(barY)} H${n(left + MARGIN_MM + SCALE_BAR_MM)} V${n(barY - tick)}" stroke="#000000" stroke-width="1" fill="none" data-role="scale-bar"/>`,
    `<text x="${n(left + MARGIN_MM + SCALE_BAR_MM + font * 0.5)}" y="${n(barY)}">${SCALE_BAR_MM} mm</text>`,
  );
  caution.forEach((line, i) => {
    out.push(`<text x="${n(left + MARGIN_MM)}" y="${n(barY + 2 * font + i * font * 1.4)}" class="caution" fill="#5c3b00">${escapeXml(line)}</text>`);
  });
  out.push('</g>', '</svg>');
  return `${out.join('\n')}\n`;
}
