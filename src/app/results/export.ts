/**
 * The exports of a selected design, as text: the linkage file (JSON), its paths (CSV) and
 * the drawing (a standalone SVG file). Pure: the view hands the text to a download.
 */
import { IC_FINITE, IC_INDETERMINATE, IC_INFINITE } from '../../core/linkage/analysis';
import type { Linkage } from '../../core/linkage';
import { toLinkageFile } from '../../core/io/linkageFile';
import { centreGeometry, drawingFrame, errorWhiskersD, linkageShapes, markerD, num, pointsBox, polylineD, scaleLabel, unionBox, viewOf, type View } from './drawing';
import { driverDisplayValue, type CandidateMotion } from './motion';
import type { ResultsTarget } from './types';
import { escapeXml, wrapWords } from '../../core/io/svgText';

/** The line every exported drawing and the detail view carry. */
export const KINEMATICS_ONLY_CAUTION =
  'Loci computes kinematics only; check the design with a qualified engineer, physical tests and the applicable standards.';

/** Our linkage file, pretty-printed, as `toLinkageFile` writes it. */
export function linkageFileText(linkage: Linkage, name: string): string {
  return `${JSON.stringify(toLinkageFile(linkage, name), null, 2)}\n`;
}

/** The columns of the paths CSV after the driver column. */
export const PATHS_CSV_COLUMNS = [
  'assembled',
  'output_x_mm',
  'output_y_mm',
  'ic_kind',
  'ic_x_mm',
  'ic_y_mm',
  'ic_direction_x',
  'ic_direction_y',
] as const;

/** The name of the driver column: the driver value per step in the unit it is shown in. */
export function driverColumn(motion: Pick<CandidateMotion, 'driver'>): 'driver_deg' | 'driver_mm' {
  return motion.driver.unit === 'deg' ? 'driver_deg' : 'driver_mm';
}

const CENTRE_KIND_NAMES: Readonly<Record<number, string>> = {
  [IC_FINITE]: 'finite',
  [IC_INFINITE]: 'infinite',
  [IC_INDETERMINATE]: 'indeterminate',
};

/**
 * One row per step of the motion: the driver value (deg or mm), the output point (mm),
 * and the instant centre of the output body relative to ground: its position (mm) when
 * finite, its unit direction when at infinity. Empty cells where a value does not exist.
 * Numbers are written in full (shortest round-trip form), so they read back exactly.
 */
export function pathsCsv(motion: CandidateMotion): string {
  const header = ['step', driverColumn(motion), ...PATHS_CSV_COLUMNS];
  const lines = [header.join(',')];
  const cell = (v: number) => (Number.isFinite(v) ? String(v) : '');
  for (let k = 0; k < motion.steps; k++) {
    const assembled = motion.assembled[k] === 1;
    const kind = assembled ? (CENTRE_KIND_NAMES[motion.centre.kind[k]] ?? 'indeterminate') : 'unassembled';
    const finite = kind === 'finite';
    const infinite = kind === 'infinite';
    lines.push([
      String(k),
      cell(driverDisplayValue(motion, motion.values[k])),
      assembled ? '1' : '0',
      assembled ? cell(motion.output.x[k]) : '',
      assembled ? cell(motion.output.y[k]) : '',
      kind,
      finite ? cell(motion.centre.x[k]) : '',
      finite ? cell(motion.centre.y[k]) : '',
      infinite ? cell(motion.centre.x[k]) : '',
      infinite ? cell(motion.centre.y[k]) : '',
    ].join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}

export interface DrawingSvgInput {
  readonly motion: CandidateMotion;
  readonly target: ResultsTarget;
  /** A solved pose of `motion.plan` to draw the linkage in; the first assembled step when absent. */
  readonly pose?: Float64Array;
  readonly title: string;
}

/** Colours of the drawings, ours: target, output path, instant-centre path, linkage. */
export const DRAWING_COLOURS = {
  target: '#b4232a',
  output: '#1f5fa8',
  centre: '#7a4fb0',
  link: '#39424e',
  ground: '#39424e',
} as const;

const CAUTION_COLOUR = '#5c3b00';
/** Axes, origin, axis directions and scale bar: a quiet grey, ours. */
const FRAME_COLOUR = '#6b7280';
/** Characters per legend line, about two thirds of the sheet's width at the legend's font size. */
const LEGEND_LINE_CHARS = 80;

/**
 * A standalone SVG file of the design at 1:1 (one user unit is one mm, width and height
 * in mm): target points, output path, instant-centre path with direction markers for
 * centres off the sheet or at infinity, and the linkage in one pose, with a legend.
 */
export function drawingSvg(input: DrawingSvgInput): string {
  const { motion, target } = input;
  const box = unionBox([motion.bounds, pointsBox(target.points)]) ?? motion.bounds;
  const view = viewOf(box);
  const size = Math.max(view.width, view.height);
  const stroke = size / 400;
  const font = view.width / 60;
  const legend = legendLines(motion);
  const legendHeight = legend.length * font * 1.4 + font;
  const sheet: View = { ...view, height: view.height + legendHeight };
  const d = (v: number) => num(v, view.decimals);
  const pose = input.pose ?? firstAssembledPose(motion);
  const shapes = linkageShapes(view, motion, pose);
  const centre = centreGeometry(view, motion.centre);
  const tx = target.points.map((p) => p[0]);
  const ty = target.points.map((p) => p[1]);
  const out: string[] = [];
  out.push('<?xml version="1.0" encoding="UTF-8"?>');
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="${d(sheet.width)}mm" height="${d(sheet.height)}mm" ` +
      `viewBox="${d(sheet.x)} ${d(sheet.y)} ${d(sheet.width)} ${d(sheet.height)}">`,
  );
  out.push(`<title>${escapeXml(input.title)}</title>`);
  out.push(
    `<desc>${escapeXml(`Units: mm, one user unit is one millimetre; the design's y axis points up (the drawing is mirrored into SVG's downward y). ${KINEMATICS_ONLY_CAUTION}`)}</desc>`,
  );
  out.push(`<rect x="${d(sheet.x)}" y="${d(sheet.y)}" width="${d(sheet.width)}" height="${d(sheet.height)}" fill="#ffffff"/>`);
  // Paths that may run past the drawing (instant centres far off, slide lines) stop at its edge, above the legend.
  out.push(`<clipPath id="sheet-view"><rect x="${d(view.x)}" y="${d(view.y)}" width="${d(view.width)}" height="${d(view.height)}"/></clipPath>`);
  const frame = drawingFrame(view);
  out.push(`<g id="frame" fill="none" stroke="${FRAME_COLOUR}" stroke-width="${d(stroke * 0.6)}">`);
  if (frame.axesD !== '') out.push(`<path id="axes" d="${frame.axesD}" stroke-dasharray="${d(stroke * 8)} ${d(stroke * 3)} ${d(stroke)} ${d(stroke * 3)}"/>`);
  if (frame.origin) out.push(`<circle id="origin" cx="0" cy="0" r="${d(stroke * 3)}"/>`);
  out.push(`<path id="axis-directions" d="${frame.indicatorD}" stroke-width="${d(stroke)}"/>`);
  out.push(`<path id="scale-bar" d="${frame.scaleD}" stroke-width="${d(stroke * 1.5)}"/>`);
  out.push('</g>');
  out.push(`<g id="frame-labels" font-family="sans-serif" font-size="${d(frame.fontSize)}" fill="${FRAME_COLOUR}">`);
  if (frame.origin) out.push(`<text x="${d(frame.fontSize * 0.4)}" y="${d(frame.fontSize * 1.1)}">O</text>`);
  out.push(`<text x="${d(frame.xLabel.x)}" y="${d(frame.xLabel.y)}">x</text>`);
  out.push(`<text x="${d(frame.yLabel.x)}" y="${d(frame.yLabel.y)}" text-anchor="middle">y</text>`);
  out.push(`<text id="scale-label" x="${d(frame.scaleLabelAt.x)}" y="${d(frame.scaleLabelAt.y)}" text-anchor="middle">${escapeXml(scaleLabel(frame.scaleMm))}</text>`);
  out.push('</g>');
  out.push(`<g id="target" fill="none" stroke="${DRAWING_COLOURS.target}" stroke-width="${d(stroke)}">`);
  if (target.points.length > 1) out.push(`<path d="${polylineD(view, tx, ty, target.closed)}" stroke-dasharray="${d(stroke * 4)} ${d(stroke * 3)}"/>`);
  for (const [x, y] of target.points) out.push(`<circle cx="${d(x)}" cy="${d(-y)}" r="${d(stroke * 3)}"/>`);
  out.push('</g>');
  out.push(`<path id="error-whiskers" d="${errorWhiskersD(view, target.points, motion.matched)}" fill="none" stroke="${DRAWING_COLOURS.target}" stroke-width="${d(stroke * 0.6)}"/>`);
  out.push(`<path id="output-path" d="${polylineD(view, motion.output.x, motion.output.y, motion.driver.fullTurn)}" fill="none" stroke="${DRAWING_COLOURS.output}" stroke-width="${d(stroke * 1.5)}"/>`);
  out.push(`<path id="ic-path" clip-path="url(#sheet-view)" d="${centre.d}" fill="none" stroke="${DRAWING_COLOURS.centre}" stroke-width="${d(stroke)}" stroke-dasharray="${d(stroke * 3)} ${d(stroke * 2)}"/>`);
  out.push(`<g id="ic-directions" fill="${DRAWING_COLOURS.centre}">`);
  for (const m of centre.markers) out.push(`<path d="${markerD(view, m, font * 0.9)}"/>`);
  out.push('</g>');
  out.push(`<g id="linkage" fill="none" stroke="${DRAWING_COLOURS.link}" stroke-width="${d(stroke * 2)}" stroke-linejoin="round" stroke-linecap="round">`);
  for (const slide of shapes.slides) out.push(`<path class="slide" clip-path="url(#sheet-view)" d="${slide}" stroke-width="${d(stroke)}" stroke-dasharray="${d(stroke * 6)} ${d(stroke * 3)}"/>`);
  for (const link of shapes.links) out.push(`<path class="link" data-body="${escapeXml(link.bodyId)}" d="${link.d}" fill="${DRAWING_COLOURS.link}" fill-opacity="0.12"/>`);
  for (const j of shapes.joints) {
    out.push(j.ground
      ? `<rect class="ground-pivot" x="${d(j.x - stroke * 4)}" y="${d(j.y - stroke * 4)}" width="${d(stroke * 8)}" height="${d(stroke * 8)}" fill="${DRAWING_COLOURS.ground}"/>`
      : `<circle class="joint" cx="${d(j.x)}" cy="${d(j.y)}" r="${d(stroke * 3)}" fill="#ffffff"/>`);
  }
  if (shapes.output) out.push(`<circle class="output-point" cx="${d(shapes.output.x)}" cy="${d(shapes.output.y)}" r="${d(stroke * 4)}" fill="${DRAWING_COLOURS.output}" stroke="none"/>`);
  out.push('</g>');
  out.push(`<g id="joint-labels" font-family="sans-serif" font-size="${d(frame.fontSize)}" fill="${DRAWING_COLOURS.link}">`);
  for (const j of shapes.joints) out.push(`<text x="${d(j.x + frame.labelOffset)}" y="${d(j.y - frame.labelOffset)}">${escapeXml(j.id)}</text>`);
  out.push('</g>');
  const legendTop = view.y + view.height + font;
  out.push(`<g id="legend" font-family="sans-serif" font-size="${d(font)}">`);
  legend.forEach(([colour, text], i) => {
    out.push(`<text x="${d(view.x + font)}" y="${d(legendTop + (i + 0.8) * font * 1.4)}" fill="${colour}">${escapeXml(text)}</text>`);
  });
  out.push('</g>');
  out.push('</svg>');
  return `${out.join('\n')}\n`;
}

function legendLines(motion: CandidateMotion): [string, string][] {
  const entries: [string, string][] = [
    [DRAWING_COLOURS.target, 'Target points (dashed), with lines to the matched output points.'],
    [DRAWING_COLOURS.output, `Output path of point ${motion.output.pointId}.`],
    [DRAWING_COLOURS.centre, `Instant-centre path of ${motion.output.bodyId} relative to ground (dashed); arrows point to centres off the sheet or at infinity.`],
    [DRAWING_COLOURS.link, 'Linkage, joints labelled by id; squares are ground pivots. All lengths in mm.'],
    [FRAME_COLOUR, 'Axes x and y through the origin O (dash-dot, where they cross the sheet); arrows at the lower left show +x and +y; the bar at the lower right is to scale.'],
    [CAUTION_COLOUR, KINEMATICS_ONLY_CAUTION],
  ];
  return entries.flatMap(([colour, text]) => wrapWords(text, LEGEND_LINE_CHARS).map((line): [string, string] => [colour, line]));
}


/** The first pose of the motion that assembled (the reference pose if none did). */
export function firstAssembledPose(motion: CandidateMotion): Float64Array {
  for (let k = 0; k < motion.steps; k++) {
    if (motion.assembled[k] === 1) return motion.poses.slice(k * motion.stride, (k + 1) * motion.stride);
  }
  return Float64Array.from(motion.plan.reference);
}

/** A file name stem of our own: `loci-fourbar-rank-3`. */
export function exportFileStem(family: string, rank: number): string {
  return `loci-${family.replace(/[^a-z0-9-]+/gi, '-').toLowerCase()}-rank-${rank}`;
}
