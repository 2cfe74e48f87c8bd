/**
 * A standalone SVG file of a leg at 1:1 (one user unit is one mm; y up in the world, so
 * every y is negated on the sheet): the ground line and its stance tolerance band, the
 * foot's trajectory over one crank turn with stance drawn thick, the linkage in its
 * reference pose, axes, a scale bar, and the caution as text under the drawing and whole
 * in the file's <desc>.
 */
import { GAIT_CAUTION, type GaitFigures } from '../../../core/gait';
import type { LegDesign } from '../../../core/io/legFile';
import { drawingFrame, num, scaleLabel, viewOf } from '../../results/drawing';
import { groundHatchD, legPoseShapes, legStatic } from './legDrawing';
import { legBox, legPoser } from './legGeometry';
import { escapeXml, wrapWords } from '../../../core/io/svgText';

/** The notes and the caution under the drawing are at least this tall (mm), so they can be read on a sheet at 1:1. */
const MIN_TEXT_MM = 2.5;
/** Average width of a character of the sans-serif text, as a share of its size. */
const CHAR_WIDTH_SHARE = 0.55;

/** Our palette for the file (the page uses the same colours through legViews.css). */
const INK = '#1d2430';
const GROUND = '#5a6473';
const BAND = '#d99a00';
const SWING = '#1f5fa8';
const STANCE = '#b4232a';
const LINK = '#2f6b3a';
const CAUTION_INK = '#5c3b00';



/** The SVG text of a leg: ground, band, trajectory with stance marked, the linkage at the reference pose, the caution. */
export function legSvg(design: LegDesign, figures: GaitFigures): string {
  const view = viewOf(legBox(figures));
  const frame = drawingFrame(view);
  const font = frame.fontSize;
  const d = (v: number) => num(v, view.decimals);
  const poser = legPoser(design.linkage, figures);
  const drawing = legStatic(view, figures, poser);
  const pose = poser === null ? null : new Float64Array(2 * poser.plan.slotCount);
  const shapes = poser !== null && pose !== null && poser.poseAt(0, pose) ? legPoseShapes(view, poser, pose) : null;
  const title = design.name === undefined || design.name === '' ? 'Walking leg' : design.name;
  const textFont = Math.max(font, MIN_TEXT_MM);
  const lineChars = Math.max(24, Math.floor((view.width - 2 * font) / (CHAR_WIDTH_SHARE * textFont)));
  const caution = wrapWords(GAIT_CAUTION, lineChars);
  const legend = `Foot path over one crank turn (thick: stance, |height| ≤ ${figures.stance.toleranceMm} mm of the ground line; band: the stance tolerance). Linkage in its reference pose (crank angle 0°). mm, x right, y up.`;
  const notes = wrapWords(legend, lineChars);
  const lineGap = textFont * 1.4;
  const below = textFont + (notes.length + caution.length + 1) * lineGap;
  const top = view.y;
  const height = view.height + below;
  const width = view.width;
  const stroke = (w: number) => d(w * font * 0.1);

  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${d(width)}mm" height="${d(height)}mm" viewBox="${d(view.x)} ${d(top)} ${d(width)} ${d(height)}">`,
    `<title>${escapeXml(title)}</title>`,
    `<desc>${escapeXml(GAIT_CAUTION)}</desc>`,
    `<rect x="${d(view.x)}" y="${d(top)}" width="${d(width)}" height="${d(height)}" fill="#ffffff"/>`,
    `<path d="${drawing.bandD}" fill="${BAND}" fill-opacity="0.18" stroke="none" data-role="tolerance-band"/>`,
    `<path d="${groundHatchD(view, figures, 0)}" stroke="${GROUND}" stroke-width="${stroke(0.8)}" fill="none" data-role="ground-hatch"/>`,
    `<path d="${drawing.groundD}" stroke="${GROUND}" stroke-width="${stroke(1.6)}" fill="none" data-role="ground-line"/>`,
    `<path d="${drawing.pathD}" stroke="${SWING}" stroke-width="${stroke(1)}" stroke-dasharray="${d(font * 0.5)} ${d(font * 0.3)}" fill="none" data-role="foot-path"/>`,
    `<path d="${drawing.stanceD}" stroke="${STANCE}" stroke-width="${stroke(3)}" stroke-linecap="round" fill="none" data-role="stance"/>`,
  ];
  if (shapes !== null) {
    out.push(`<g stroke="${LINK}" stroke-width="${stroke(2.5)}" stroke-linecap="round" stroke-linejoin="round" fill="${LINK}" fill-opacity="0.12" data-role="linkage">`);
    for (const link of shapes.links) out.push(`<path d="${link.d}"><title>${escapeXml(link.bodyId)}</title></path>`);
    out.push('</g>');
    const r = font * 0.3;
    for (const j of shapes.joints) {
      out.push(
        j.ground
          ? `<rect x="${d(j.x - r)}" y="${d(j.y - r)}" width="${d(2 * r)}" height="${d(2 * r)}" fill="#ffffff" stroke="${INK}" stroke-width="${stroke(1)}" data-role="ground-pivot"/>`
          : `<circle cx="${d(j.x)}" cy="${d(j.y)}" r="${d(r)}" fill="#ffffff" stroke="${LINK}" stroke-width="${stroke(1)}" data-role="joint"/>`,
      );
    }
    if (shapes.foot !== null) out.push(`<circle cx="${d(shapes.foot.x)}" cy="${d(shapes.foot.y)}" r="${d(r * 1.3)}" fill="${STANCE}" data-role="foot"/>`);
  }
  out.push(
    `<path d="${frame.axesD}" stroke="${GROUND}" stroke-width="${stroke(0.6)}" stroke-dasharray="${d(font * 0.3)} ${d(font * 0.3)}" fill="none" data-role="axes"/>`,
    `<path d="${frame.indicatorD}" stroke="${INK}" stroke-width="${stroke(1)}" fill="none"/>`,
    `<path d="${frame.scaleD}" stroke="${INK}" stroke-width="${stroke(1.2)}" fill="none" data-role="scale-bar"/>`,
    `<g font-family="sans-serif" font-size="${d(font)}" fill="${INK}">`,
    `<text x="${d(frame.xLabel.x)}" y="${d(frame.xLabel.y)}">x</text>`,
    `<text x="${d(frame.yLabel.x)}" y="${d(frame.yLabel.y)}" text-anchor="middle">y</text>`,
    `<text x="${d(frame.scaleLabelAt.x)}" y="${d(frame.scaleLabelAt.y)}" text-anchor="middle">${escapeXml(scaleLabel(frame.scaleMm))}</text>`,
    `<text x="${d(view.x + font)}" y="${d(top + 1.5 * font)}" font-size="${d(1.2 * font)}">${escapeXml(title)}</text>`,
  );
  if (shapes !== null) {
    for (const j of shapes.joints) out.push(`<text x="${d(j.x + frame.labelOffset)}" y="${d(j.y - frame.labelOffset)}">${escapeXml(j.id)}</text>`);
  }
  out.push('</g>', `<g font-family="sans-serif" font-size="${d(textFont)}" fill="${INK}">`);
  let y = view.y + view.height + textFont;
  for (const line of notes) {
    out.push(`<text x="${d(view.x + font)}" y="${d(y)}">${escapeXml(line)}</text>`);
    y += lineGap;
  }
  y += lineGap * 0.5;
  for (const line of caution) {
    out.push(`<text x="${d(view.x + font)}" y="${d(y)}" fill="${CAUTION_INK}" class="caution">${escapeXml(line)}</text>`);
    y += lineGap;
  }
  out.push('</g>', '</svg>');
  return `${out.join('\n')}\n`;
}
