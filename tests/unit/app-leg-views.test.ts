/**
 * The walking-leg views (issue 10, item 4): the curves CSV read back by an independent
 * reader with its stance column recomputed from the foot's coordinates and the ground
 * line; the SVG file well-formed, with the caution and the linkage in its reference
 * pose; the contact diagram's bars against phasedLegs' count of feet; each view rendered
 * once (react-dom/server) with its caution and labelled axes.
 */
import Papa from 'papaparse';
import { createElement } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { DEMO_TOY_LEG, DEMO_TOY_LEG_LINKAGE, GAIT_CAUTION, gaitFigures, type GaitFigures, type LegSpec } from '../../src/core/gait';
import type { LegDesign } from '../../src/core/io/legFile';
import { fourBar } from '../../src/core/linkage';
import {
  ContactDiagram,
  contactDiagramData,
  GaitPlots,
  LegCompareView,
  legCompareCsv,
  legCurvesCsv,
  LegDesignView,
  legSvg,
  LegWalkView,
} from '../../src/app/leg/views';

const DEMO: LegDesign = { name: 'Toy walker, front leg', linkage: DEMO_TOY_LEG_LINKAGE, leg: DEMO_TOY_LEG };
const THREE_LEGS = { legs: 3, phasesDeg: [0, 120, 240] } as const;

function figuresOf(design: LegDesign, steps?: number): GaitFigures {
  const r = gaitFigures(design.linkage, design.leg, steps === undefined ? {} : { steps });
  if (!r.ok) throw new Error(r.reason);
  return r.figures;
}

/** The demo leg turned by `deg` about the origin, its ground line turned with it: the same leg on a slope. */
function slopedDemo(deg: number): LegDesign {
  const a = (deg * Math.PI) / 180;
  const c = Math.cos(a);
  const s = Math.sin(a);
  const turn = (p: { x: number; y: number }) => ({ x: c * p.x - s * p.y, y: s * p.x + c * p.y });
  const leg: LegSpec = {
    ...DEMO_TOY_LEG,
    ground: { kind: 'line', point: turn({ x: 0, y: -30.9 }), direction: { x: c, y: s } },
  };
  const linkage = fourBar({
    A0: turn({ x: 0, y: 0 }),
    B0: turn({ x: 24, y: -8 }),
    A: turn({ x: 8, y: 0 }),
    B: turn({ x: 33, y: 8 }),
    P: turn({ x: 20, y: -30 }),
  });
  return { name: 'sloped', linkage, leg };
}

type Row = Record<string, number | string | null>;
function readBack(csv: string): { fields: string[]; rows: Row[] } {
  // Source: RFC 4180 (CSV), read by papaparse with dynamic typing, an independent parser.
  // The file opens with the caution as a comment line, which the reader is told to skip.
  expect(csv.startsWith(`# ${GAIT_CAUTION}\r\n`)).toBe(true);
  const parsed = Papa.parse<Row>(csv.trimEnd(), { header: true, dynamicTyping: true, comments: '#' });
  expect(parsed.errors).toEqual([]);
  return { fields: parsed.meta.fields ?? [], rows: parsed.data };
}

/** Rows whose height lies this close (mm) to the tolerance are left out of the stance comparison: either side is right there. */
const BAND_EDGE_MM = 1e-9;

function expectCurvesMatch(figures: GaitFigures, rows: readonly Row[], groundHeight: (x: number, y: number) => number): void {
  const p = figures.path;
  const tol = figures.stance.toleranceMm;
  expect(rows).toHaveLength(p.turnRad.length);
  let inStance = 0;
  let compared = 0;
  rows.forEach((row, k) => {
    // Shortest round-trip decimals: every number reads back to the same double.
    expect(row.x_mm).toBe(p.xMm[k]);
    expect(row.y_mm).toBe(p.yMm[k]);
    expect(row.height_mm).toBe(p.heightMm[k]);
    expect(row.along_mm).toBe(p.alongMm[k]);
    expect(row.backward_speed_mm_per_rad).toBe(-p.alongRateMmPerRad[k]);
    // Samples are evenly spaced over one turn from the reference pose. // Source: GAIT_CONVENTIONS (one turn at constant speed)
    expect(row.crank_angle_deg as number).toBeCloseTo((360 * k) / figures.steps, 9);
    // second, independent method: the stance from the foot's coordinates and the ground line, |height| ≤ tolerance.
    // Source: GAIT_CONVENTIONS, the definition of stance
    const h = groundHeight(row.x_mm as number, row.y_mm as number);
    if (Math.abs(Math.abs(h) - tol) > BAND_EDGE_MM) {
      compared++;
      expect(row.in_stance).toBe(Math.abs(h) <= tol ? 1 : 0);
    }
    if (row.in_stance === 1) inStance++;
  });
  // Both kinds of row are there, so the comparison could have failed either way.
  expect(inStance).toBeGreaterThan(0);
  expect(inStance).toBeLessThan(rows.length);
  expect(compared).toBeGreaterThan(rows.length - 4);
}

describe('legCurvesCsv', () => {
  it('reads back to the figures\' path exactly, with a stance column that agrees with |height| ≤ tolerance (level ground)', () => {
    const figures = figuresOf(DEMO, 360);
    const { fields, rows } = readBack(legCurvesCsv(figures));
    expect(fields).toEqual(['crank_angle_deg', 'x_mm', 'y_mm', 'height_mm', 'along_mm', 'backward_speed_mm_per_rad', 'in_stance']);
    const ground = DEMO_TOY_LEG.ground;
    if (ground.kind !== 'level') throw new Error('the demo leg stands on level ground');
    expectCurvesMatch(figures, rows, (_x, y) => y - ground.yMm);
  });

  it('on sloping ground, the stance column agrees with the distance from the line computed here', () => {
    const design = slopedDemo(10);
    const figures = figuresOf(design, 360);
    const g = design.leg.ground;
    if (g.kind !== 'line') throw new Error('expected a sloping line');
    const n = Math.hypot(g.direction.x, g.direction.y);
    // Signed distance from the line, positive on its +y side. // theorem (cross product of the direction with the offset)
    const height = (x: number, y: number) => (g.direction.x * (y - g.point.y) - g.direction.y * (x - g.point.x)) / n;
    expectCurvesMatch(figures, readBack(legCurvesCsv(figures)).rows, height);
  });

  it('a label names the leg in a first column, quoted when it holds a comma; several legs stack in one file', () => {
    const a = figuresOf(DEMO, 72);
    const b = figuresOf(slopedDemo(5), 72);
    const { fields, rows } = readBack(legCurvesCsv(a, DEMO.name));
    expect(fields[0]).toBe('leg');
    expect(rows.every((r) => r.leg === 'Toy walker, front leg')).toBe(true);
    const both = readBack(legCompareCsv([{ label: 'A "one"', figures: a }, { label: 'B', figures: b }])).rows;
    expect(both).toHaveLength(a.path.turnRad.length + b.path.turnRad.length);
    expect(both[0].leg).toBe('A "one"');
    expect(both[both.length - 1].leg).toBe('B');
    expect(both[a.path.turnRad.length].x_mm).toBe(b.path.xMm[0]);
  });
});

/**
 * A small XML well-formedness check (no XML parser among the dependencies): tags nest
 * and close, attributes are quoted and not repeated, and no raw '<' or bare '&' is left
 * in text or attribute values. // Source: W3C, "Extensible Markup Language (XML) 1.0", 2008, §2.1, §3.1
 */
function xmlProblems(text: string): string[] {
  const problems: string[] = [];
  const stack: string[] = [];
  const entity = /&(amp|lt|gt|quot|apos|#\d+|#x[0-9a-fA-F]+);/g;
  const checkText = (s: string, where: string) => {
    if (s.includes('<')) problems.push(`raw '<' in ${where}`);
    if (s.replace(entity, '').includes('&')) problems.push(`bare '&' in ${where}`);
  };
  let i = 0;
  let roots = 0;
  while (i < text.length) {
    const open = text.indexOf('<', i);
    if (open < 0) {
      checkText(text.slice(i), 'trailing text');
      break;
    }
    checkText(text.slice(i, open), 'text');
    const close = text.indexOf('>', open);
    if (close < 0) {
      problems.push('unclosed tag');
      break;
    }
    const tag = text.slice(open + 1, close);
    i = close + 1;
    if (tag.startsWith('?') || tag.startsWith('!--')) continue;
    if (tag.startsWith('/')) {
      const name = tag.slice(1).trim();
      if (stack.pop() !== name) problems.push(`</${name}> closes the wrong element`);
      continue;
    }
    const m = /^([A-Za-z][\w:.-]*)((?:\s+[\w:.-]+="[^"]*")*)\s*(\/?)$/.exec(tag);
    if (m === null) {
      problems.push(`malformed tag <${tag.slice(0, 40)}>`);
      continue;
    }
    const names = [...m[2].matchAll(/([\w:.-]+)="([^"]*)"/g)].map((a) => {
      checkText(a[2], `attribute ${a[1]}`);
      return a[1];
    });
    if (new Set(names).size !== names.length) problems.push(`repeated attribute in <${m[1]}>`);
    if (stack.length === 0) roots++;
    if (m[3] !== '/') stack.push(m[1]);
  }
  if (stack.length > 0) problems.push(`unclosed elements: ${stack.join(', ')}`);
  if (roots !== 1) problems.push(`${roots} root elements`);
  return problems;
}

describe('legSvg', () => {
  const figures = figuresOf(DEMO);
  const svg = legSvg(DEMO, figures);

  it('is well-formed XML with one svg root, in mm', () => {
    expect(xmlProblems(svg)).toEqual([]);
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg" width="[\d.]+mm" height="[\d.]+mm" viewBox="/);
    // The checker itself catches what it should.
    expect(xmlProblems('<svg><g></svg>')).not.toEqual([]);
    expect(xmlProblems('<svg><text>a & b</text></svg>')).not.toEqual([]);
  });

  it('carries the caution whole, and draws the ground line, the tolerance band, the trajectory and stance', () => {
    expect(svg).toContain(`<desc>${GAIT_CAUTION}</desc>`);
    // The caution is also printed, wrapped, as text under the drawing.
    const printed = [...svg.matchAll(/<text [^>]*class="caution">([^<]*)<\/text>/g)].map((m) => m[1]).join(' ');
    expect(printed).toBe(GAIT_CAUTION);
    for (const role of ['ground-line', 'tolerance-band', 'foot-path', 'stance', 'linkage', 'scale-bar']) {
      expect(svg).toMatch(new RegExp(`<path d="M[^"]+"[^>]*data-role="${role}"|data-role="${role}"`));
    }
    expect(svg).toMatch(/<path d="M[^"]+" stroke="#b4232a"[^>]*data-role="stance"/);
  });

  it('draws the linkage in its reference pose: the joints where the linkage file puts them', () => {
    // theorem: crank angle 0 is the reference pose, the linkage as drawn (y negated on the sheet)
    const circles = [...svg.matchAll(/<(?:circle cx="([-\d.]+)" cy="([-\d.]+)"|rect x="([-\d.]+)" y="([-\d.]+)" width="([\d.]+)")[^>]*data-role="(joint|ground-pivot)"/g)].map((m) =>
      m[6] === 'joint' ? { x: Number(m[1]), y: -Number(m[2]) } : { x: Number(m[3]) + Number(m[5]) / 2, y: -(Number(m[4]) + Number(m[5]) / 2) },
    );
    const expected = [{ x: 0, y: 0 }, { x: 24, y: -8 }, { x: 8, y: 0 }, { x: 33, y: 8 }];
    expect(circles).toHaveLength(expected.length);
    for (const e of expected) expect(circles.some((c) => Math.hypot(c.x - e.x, c.y - e.y) < 0.01)).toBe(true);
  });
});

describe('contactDiagramData', () => {
  const figures = figuresOf(DEMO);

  it('on the demo leg, three legs at 0°, 120°, 240°: the stance bars over each stretch number the feet phasedLegs counts', () => {
    const r = contactDiagramData(figures, THREE_LEGS);
    if (!r.ok) throw new Error(r.reason);
    const { rows, counts, phased } = r.data;
    expect(rows).toHaveLength(3);
    expect(counts.length).toBeGreaterThan(1);
    // second, independent method: count the bars covering the middle of each of phasedLegs' stretches.
    // theorem: a foot is on the ground exactly where its leg's bar covers the shaft angle
    for (const c of counts) {
      const mid = (c.fromDeg + c.toDeg) / 2;
      const covering = rows.filter((row) => row.bars.some((b) => mid >= b.fromDeg && mid <= b.toDeg)).length;
      expect(covering).toBe(c.feet);
    }
    // theorem (counting): the bars' total length is the turn weighted by the feet on the ground.
    const barsDeg = rows.reduce((sum, row) => sum + row.bars.reduce((s, b) => s + b.toDeg - b.fromDeg, 0), 0);
    const weighted = phased.shareByFeet.reduce((sum, share, n) => sum + 360 * share * n, 0);
    expect(barsDeg).toBeCloseTo(weighted, 6);
    // Each leg is in stance for the duty factor's share of the turn. // Source: GAIT_CONVENTIONS, duty factor
    for (const row of rows) expect(row.bars.reduce((s, b) => s + b.toDeg - b.fromDeg, 0)).toBeCloseTo(360 * figures.dutyFactor.value, 9);
  });

  it('says in words what is wrong with a phasing, rather than throwing', () => {
    const r = contactDiagramData(figures, { legs: 3, phasesDeg: [0, 120] });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toMatch(/3 legs need one phase each/);
  });
});

describe('the views, rendered once on the demo leg', () => {
  const figures = figuresOf(DEMO);
  const render = (el: Parameters<typeof renderToStaticMarkup>[0]) => renderToStaticMarkup(el);
  const caution = GAIT_CAUTION.replace(/'/g, '&#x27;');

  it('LegDesignView: the caution, the figures with units and the duty factor with its tolerance, the plots\' labelled axes, the contact diagram, the exports', () => {
    const html = render(createElement(LegDesignView, { design: { ...DEMO, phased: THREE_LEGS } }));
    expect(html).toContain(caution);
    expect(html).toMatch(/Duty factor<\/th><td>0\.401 \(40\.1 % of the turn\) at a stance tolerance of ±1 mm/);
    expect(html).toContain('How these figures are defined');
    expect(html).toContain('crank angle from the reference pose (°)');
    expect(html).toContain('foot height (mm)');
    expect(html).toContain('backward speed (mm/rad of crank)');
    expect(html).toContain('shaft angle from the reference pose (°)');
    expect(html).toContain('Body height ripple');
    expect(html.split(caution)).toHaveLength(2);
    // A stance through the reference pose is written as one range through 0°, both ends within 0–360°.
    const through = figures.stance.intervals.find((r) => r.toRad > 2 * Math.PI);
    if (through === undefined) throw new Error('the demo leg has a stance through the reference pose');
    const deg = (rad: number) => ((rad * 180) / Math.PI).toFixed(1);
    expect(html).toContain(`${deg(through.fromRad)}°–${deg(through.toRad - 2 * Math.PI)}°`);
    expect(html).toMatch(/<svg[^>]*role="img"[^>]*aria-label="[^"]+"/);
    for (const b of ['Curves (CSV)', 'Leg drawing (SVG)', 'Leg file (JSON)']) expect(html).toContain(b);
    // One leg: no contact diagram.
    expect(render(createElement(LegDesignView, { design: DEMO, figures }))).not.toContain('data-testid="leg-contact-diagram"');
  });

  it('LegDesignView: a design whose figures cannot be taken is said so, with the caution', () => {
    const html = render(createElement(LegDesignView, { design: { ...DEMO, leg: { ...DEMO_TOY_LEG, foot: 'Q' } } }));
    expect(html).toContain('The gait figures cannot be taken for this design');
    expect(html).toContain('foot: the foot &#x27;Q&#x27; is not a joint or point of the linkage');
    expect(html).toContain(caution);
  });

  it('LegWalkView: a labelled slider, play, the ground line, band, stance and the body-frame caption', () => {
    const html = render(createElement(LegWalkView, { design: DEMO, figures }));
    expect(html).toMatch(/<label for="([^"]+)">Crank angle from the reference pose \(°\)<\/label><input id="\1" type="range"/);
    expect(html).toContain('>Play</button>');
    for (const id of ['leg-ground-line', 'leg-tolerance-band', 'leg-foot-path', 'leg-stance-path', 'leg-linkage', 'scale-bar']) expect(html).toContain(`data-testid="${id}"`);
    expect(html).toContain('body’s frame');
    expect(html).toContain(caution);
  });

  it('GaitPlots and ContactDiagram alone: labelled axes with units', () => {
    const plots = render(createElement(GaitPlots, { figures }));
    expect(plots).toContain('crank angle from the reference pose (°)');
    expect(plots).toContain('data-testid="tolerance-band"');
    expect((plots.match(/data-testid="stance-shade"/g) ?? []).length).toBe(2 * 3); // two intervals, one through 0°: three pieces per plot
    const contact = render(createElement(ContactDiagram, { figures, phasing: THREE_LEGS }));
    expect((contact.match(/data-testid="contact-row"/g) ?? []).length).toBe(3);
    expect(contact).toContain('shaft angle from the reference pose (°)');
    // Shown alone, each view carries the caution; inside LegDesignView it is shown once.
    expect(plots).toContain(caution);
    expect(contact).toContain(caution);
  });

  it('LegCompareView: two legs overlaid, shared plots, figures side by side, the caution', () => {
    const wider: LegDesign = { name: 'wider band', linkage: DEMO_TOY_LEG_LINKAGE, leg: { ...DEMO_TOY_LEG, stanceToleranceMm: 2 } };
    const html = render(createElement(LegCompareView, { legs: [{ label: 'demo', design: DEMO }, { label: 'wider band', design: wider }] }));
    expect(html).toContain(caution);
    expect(html).toContain('data-testid="leg-compare-overlay"');
    expect(html).toContain('data-testid="leg-compare-table"');
    expect(html).toContain('foot height (mm)');
    expect(html).toContain('Curves of all legs (CSV)');
    expect(html).toMatch(/at a stance tolerance of ±1 mm<\/td><td>[^<]*at a stance tolerance of ±2 mm/);
    expect(render(createElement(LegCompareView, { legs: [{ label: 'alone', design: DEMO }] }))).toContain('a comparison takes 2 to 4');
  });
});
