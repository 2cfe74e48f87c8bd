import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { parseLinkageFileText } from '../../src/core/io/linkageFile';
import { fourBar, type Linkage } from '../../src/core/linkage';
import { drawingSvg, linkageFileText, pathsCsv } from '../../src/app/results/export';
import { wrapWords } from '../../src/core/io/svgText';
import { computeMotion, DETAIL_STEPS, type CandidateMotion } from '../../src/app/results/motion';
import type { ResultsTarget } from '../../src/app/results/types';

const DEG = 180 / Math.PI;
/** Scale of the test linkages: one unit of the classical proportions is this many mm. */
const S = 20;

/**
 * The straight-line four-bar of Chebyshev–Hoeken proportions (tests/reference/data/README.md,
 * from memory): crank 1, ground 2, rocker 2.5, coupler 2.5 from crank pin to rocker joint,
 * tracing point on the coupler extended to 5 from the crank pin; crank pivot (0, 0),
 * rocker pivot (−2, 0), rocker joint above the ground line. At crank angle 0 the point is
 * at (−2, 4), at 180° at (−2, 2√6).
 */
function hoeken(): Linkage {
  return fourBar({
    A0: { x: 0, y: 0 },
    B0: { x: -2 * S, y: 0 },
    A: { x: 1 * S, y: 0 },
    B: { x: -0.5 * S, y: 2 * S },
    P: { x: -2 * S, y: 4 * S },
  });
}

/** A parallelogram four-bar (crank = rocker 40 mm, coupler = ground 100 mm): its coupler translates. */
function parallelogram(): Linkage {
  return fourBar({
    A0: { x: 0, y: 0 },
    B0: { x: 100, y: 0 },
    A: { x: 0, y: 40 },
    B: { x: 100, y: 40 },
    P: { x: 50, y: 70 },
  });
}

function motionOf(linkage: Linkage, driverValues: number[]): CandidateMotion {
  const result = computeMotion({ linkage, linkageDriverValues: driverValues }, DETAIL_STEPS);
  if (!result.ok) throw new Error(result.reason);
  return result.motion;
}

type CsvRow = Record<string, number | string | null>;

function parseCsv(text: string): { fields: string[]; rows: CsvRow[] } {
  const parsed = Papa.parse<CsvRow>(text, { header: true, dynamicTyping: true, skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  return { fields: parsed.meta.fields ?? [], rows: parsed.data };
}

/** A blank cell reads back as null (papaparse dynamic typing); NaN in the motion stands for it. */
function cellNumber(v: number | string | null): number {
  if (v === null) return Number.NaN;
  if (typeof v !== 'number') throw new Error(`expected a number, got ${JSON.stringify(v)}`);
  return v;
}

describe('paths CSV of a design', () => {
  const motion = motionOf(hoeken(), [0, 0.4, 0.8]);

  it('has a header naming every column with its unit, and one row per step', () => {
    const { fields, rows } = parseCsv(pathsCsv(motion));
    expect(fields).toEqual([
      'step', 'driver_deg', 'assembled', 'output_x_mm', 'output_y_mm', 'ic_kind', 'ic_x_mm', 'ic_y_mm', 'ic_direction_x', 'ic_direction_y',
    ]);
    expect(rows).toHaveLength(DETAIL_STEPS);
  });

  it('parses back with papaparse to exactly the numbers of the motion', () => {
    const { rows } = parseCsv(pathsCsv(motion));
    rows.forEach((row, k) => {
      expect(row.step).toBe(k);
      expect(row.driver_deg).toBe(motion.values[k] * DEG);
      expect(row.assembled).toBe(1);
      expect(row.output_x_mm).toBe(motion.output.x[k]);
      expect(row.output_y_mm).toBe(motion.output.y[k]);
      if (row.ic_kind === 'finite') {
        expect(row.ic_x_mm).toBe(motion.centre.x[k]);
        expect(row.ic_y_mm).toBe(motion.centre.y[k]);
        expect(row.ic_direction_x).toBeNull();
        expect(row.ic_direction_y).toBeNull();
      } else {
        expect(row.ic_kind).toBe('infinite');
        expect(row.ic_x_mm).toBeNull();
        expect(row.ic_y_mm).toBeNull();
        expect(row.ic_direction_x).toBe(motion.centre.x[k]);
        expect(row.ic_direction_y).toBe(motion.centre.y[k]);
      }
    });
  });

  it('writes the centre at infinity where crank and rocker are parallel: both upright at crank angle 90° (theorem)', () => {
    // At 90° the crank pin is at (0, 1) and the rocker joint at (−2, 2.5): both links are
    // vertical, so the coupler translates for an instant and its centre lies at infinity
    // along them (Aronhold–Kennedy: on both the crank line and the rocker line).
    const { rows } = parseCsv(pathsCsv(motion));
    const row = rows.find((r) => Math.abs(cellNumber(r.driver_deg) - 90) < 1e-9);
    expect(row?.ic_kind).toBe('infinite');
    expect(Math.abs(cellNumber(row?.ic_direction_x ?? null))).toBeLessThan(1e-9);
    expect(Math.abs(cellNumber(row?.ic_direction_y ?? null))).toBeCloseTo(1, 12);
  });

  it('writes the Chebyshev–Hoeken path: (−2, 4) at crank angle 0 and (−2, 2√6) at 180° (README proportions, from memory)', () => {
    const { rows } = parseCsv(pathsCsv(motion));
    const at = (deg: number) => {
      const row = rows.find((r) => Math.abs(cellNumber(r.driver_deg) - deg) < 1e-9);
      if (!row) throw new Error(`no row at ${deg}°`);
      return [cellNumber(row.output_x_mm), cellNumber(row.output_y_mm)];
    };
    const [x0, y0] = at(0);
    expect(x0).toBeCloseTo(-2 * S, 9);
    expect(y0).toBeCloseTo(4 * S, 9);
    const [x180, y180] = at(180);
    expect(x180).toBeCloseTo(-2 * S, 9);
    expect(y180).toBeCloseTo(2 * Math.sqrt(6) * S, 9);
  });

  it("puts the coupler's instant centre where the crank and rocker lines cross (Aronhold–Kennedy theorem)", () => {
    const { rows } = parseCsv(pathsCsv(motion));
    const slot = (id: string) => {
      const s = motion.plan.slotIndex.get(id);
      if (s === undefined) throw new Error(`no slot ${id}`);
      return s;
    };
    const [a0, b0, a, b] = ['A0', 'B0', 'A', 'B'].map(slot);
    let checked = 0;
    rows.forEach((row, k) => {
      const p = (s: number) => [motion.poses[k * motion.stride + 2 * s], motion.poses[k * motion.stride + 2 * s + 1]] as const;
      const [A0, B0, A, B] = [p(a0), p(b0), p(a), p(b)];
      // Lines A0 + t (A − A0) and B0 + u (B − B0).
      const d1 = [A[0] - A0[0], A[1] - A0[1]];
      const d2 = [B[0] - B0[0], B[1] - B0[1]];
      const den = d1[0] * d2[1] - d1[1] * d2[0];
      if (Math.abs(den) < 1e-3 * Math.hypot(...d1) * Math.hypot(...d2)) return; // nearly parallel: far away, or at infinity
      const t = ((B0[0] - A0[0]) * d2[1] - (B0[1] - A0[1]) * d2[0]) / den;
      const cross = [A0[0] + t * d1[0], A0[1] + t * d1[1]];
      const tol = 1e-8 * Math.max(1, Math.hypot(cross[0], cross[1]));
      expect(Math.abs(cellNumber(row.ic_x_mm) - cross[0])).toBeLessThan(tol);
      expect(Math.abs(cellNumber(row.ic_y_mm) - cross[1])).toBeLessThan(tol);
      checked++;
    });
    expect(checked).toBeGreaterThan(300);
  });

  it('writes a centre at infinity as a unit direction along the crank, with no coordinates (parallelogram, theorem)', () => {
    const m = motionOf(parallelogram(), [0.3, 0.8, 1.3]);
    const { rows } = parseCsv(pathsCsv(m));
    let infinite = 0;
    for (const row of rows) {
      const theta = cellNumber(row.driver_deg) / DEG;
      // The reference pose's branch is the parallelogram for crank angles in (0, π); past
      // the change points the dyad keeps its side and the loop crosses.
      const s = Math.sin(theta);
      if (!(s > 0.05)) continue;
      expect(row.ic_kind).toBe('infinite');
      expect(row.ic_x_mm).toBeNull();
      expect(row.ic_y_mm).toBeNull();
      const dx = cellNumber(row.ic_direction_x);
      const dy = cellNumber(row.ic_direction_y);
      expect(Math.hypot(dx, dy)).toBeCloseTo(1, 12);
      expect(Math.abs(dx * Math.sin(theta) - dy * Math.cos(theta))).toBeLessThan(1e-9);
      infinite++;
    }
    expect(infinite).toBeGreaterThan(150);
  });

  it('leaves cells empty where the linkage does not assemble', () => {
    // Ground 100, input 60, coupler 50, output 80 (mm): a non-Grashof triple rocker
    // (Barker's classification, tests/reference/data/README.md). Its input cannot pass the
    // angle where |A − B0| = coupler + output = 130 mm, cos θ = (13600 − 16900) / 12000,
    // about 106° (law of cosines); target values up to 2.5 rad (143°) run into that lock.
    const A = { x: 0, y: 60 };
    const B0 = { x: 100, y: 0 };
    const d = Math.hypot(B0.x - A.x, B0.y - A.y);
    const along = (50 ** 2 - 80 ** 2 + d ** 2) / (2 * d);
    const h = Math.sqrt(50 ** 2 - along ** 2);
    const u = { x: (B0.x - A.x) / d, y: (B0.y - A.y) / d };
    const B = { x: A.x + along * u.x - h * u.y, y: A.y + along * u.y + h * u.x };
    const triple = fourBar({ A0: { x: 0, y: 0 }, B0, A, B, P: { x: 20, y: 90 } });
    const m = motionOf(triple, [0.5, 1.2, 2.5]);
    expect(m.driver.fullTurn).toBe(false);
    const { rows } = parseCsv(pathsCsv(m));
    const locked = rows.filter((r) => r.assembled === 0);
    const lockDeg = Math.acos((13600 - 130 ** 2) / 12000) * DEG;
    expect(locked.length).toBeGreaterThan(0);
    for (const row of locked) {
      expect(cellNumber(row.driver_deg)).toBeGreaterThan(lockDeg - 1e-6);
      expect(row.ic_kind).toBe('unassembled');
      for (const column of ['output_x_mm', 'output_y_mm', 'ic_x_mm', 'ic_y_mm', 'ic_direction_x', 'ic_direction_y']) expect(row[column]).toBeNull();
    }
    expect(locked.length).toBe(m.unassembledSteps);
  });
});

/**
 * Well-formedness of an XML document (XML 1.0 §2.1, §2.3–2.5, §3.1; the subset an SVG
 * writer emits: declaration, comments, elements, attributes, text, the predefined and
 * numeric entity references). No XML parser is installed for Node, so this checker stands
 * in here; the browser test parses the downloaded file with Chromium's DOMParser.
 */
function xmlIssues(text: string): string[] {
  const issues: string[] = [];
  const name = /^[A-Za-z_:][\w.:-]*$/;
  const entity = /^&(lt|gt|amp|quot|apos|#[0-9]+|#x[0-9a-fA-F]+);/;
  const stack: string[] = [];
  let roots = 0;
  let i = 0;
  if (text.startsWith('<?xml')) {
    const end = text.indexOf('?>');
    if (end < 0) return ['unterminated XML declaration'];
    i = end + 2;
  }
  const checkText = (chunk: string, where: string) => {
    for (let k = chunk.indexOf('&'); k >= 0; k = chunk.indexOf('&', k + 1)) {
      if (!entity.test(chunk.slice(k))) issues.push(`bad entity reference in ${where}: ${chunk.slice(k, k + 12)}`);
    }
  };
  while (i < text.length) {
    const lt = text.indexOf('<', i);
    const chunk = text.slice(i, lt < 0 ? text.length : lt);
    if (stack.length === 0 && chunk.trim() !== '') issues.push(`text outside the root element: ${chunk.trim().slice(0, 20)}`);
    checkText(chunk, 'text');
    if (lt < 0) break;
    if (text.startsWith('<!--', lt)) {
      const end = text.indexOf('-->', lt + 4);
      if (end < 0) return [...issues, 'unterminated comment'];
      i = end + 3;
      continue;
    }
    const gt = text.indexOf('>', lt);
    if (gt < 0) return [...issues, 'unterminated tag'];
    const tag = text.slice(lt + 1, gt);
    i = gt + 1;
    if (tag.startsWith('/')) {
      const closing = tag.slice(1).trim();
      const open = stack.pop();
      if (open !== closing) issues.push(`</${closing}> closes <${open ?? 'nothing'}>`);
      continue;
    }
    const selfClosing = tag.endsWith('/');
    const body = selfClosing ? tag.slice(0, -1) : tag;
    const m = /^([^\s]+)([\s\S]*)$/.exec(body);
    if (!m || !name.test(m[1])) {
      issues.push(`bad tag name in <${tag.slice(0, 20)}>`);
      continue;
    }
    const attributes = m[2];
    const seen = new Set<string>();
    const attribute = /\s+([^\s=]+)\s*=\s*("([^"<]*)"|'([^'<]*)')/gy;
    let rest = attributes.length;
    for (let a = attribute.exec(attributes); a !== null; a = attribute.exec(attributes)) {
      if (!name.test(a[1])) issues.push(`bad attribute name ${a[1]}`);
      if (seen.has(a[1])) issues.push(`attribute ${a[1]} repeated on <${m[1]}>`);
      seen.add(a[1]);
      checkText(a[3] ?? a[4] ?? '', `attribute ${a[1]}`);
      rest = attributes.length - attribute.lastIndex;
    }
    if (attributes.slice(attributes.length - rest).trim() !== '') issues.push(`malformed attributes on <${m[1]}>: ${attributes.slice(attributes.length - rest).trim().slice(0, 30)}`);
    if (stack.length === 0) roots++;
    if (!selfClosing) stack.push(m[1]);
  }
  if (stack.length > 0) issues.push(`unclosed elements: ${stack.join(', ')}`);
  if (roots !== 1) issues.push(`expected one root element, found ${roots}`);
  return issues;
}

/** Every number in SVG path data. */
function pathNumbers(d: string): number[] {
  return (d.match(/-?\d+(\.\d+)?(e[-+]?\d+)?/gi) ?? []).map(Number);
}

function attr(svg: string, selector: RegExp): string | null {
  const m = selector.exec(svg);
  return m ? m[1] : null;
}

describe('drawing SVG of a design', () => {
  const target: ResultsTarget = { points: [[-2 * S, 4 * S], [-1.2 * S, 4 * S], [-0.4 * S, 4 * S], [0.4 * S, 4.02 * S]], closed: false };
  const motion = motionOf(hoeken(), [0, 0.4, 0.8]);
  const svg = drawingSvg({ motion, target, title: 'Rank 1 <four-bar> & "test"' });

  it('checks what it claims: the well-formedness checker rejects broken documents', () => {
    expect(xmlIssues('<svg><g></svg>')).not.toEqual([]);
    expect(xmlIssues('<svg a="1" a="2"/>')).not.toEqual([]);
    expect(xmlIssues('<svg>a & b</svg>')).not.toEqual([]);
    expect(xmlIssues('<svg/><svg/>')).not.toEqual([]);
    expect(xmlIssues('<svg x=1/>')).not.toEqual([]);
    expect(xmlIssues('<?xml version="1.0"?><svg a="&amp;"><!-- c --><g/>t &lt; u</svg>')).toEqual([]);
  });

  it('is well-formed XML, a standalone SVG file at 1:1 in mm', () => {
    expect(xmlIssues(svg)).toEqual([]);
    expect(svg.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg"')).toBe(true);
    expect(svg).toMatch(/<svg [^>]*width="[\d.]+mm" height="[\d.]+mm" viewBox="[-\d. ]+"/);
    expect(svg).toContain('<title>Rank 1 &lt;four-bar&gt; &amp; &quot;test&quot;</title>');
    expect(svg).toContain('Loci computes kinematics only; check the design with a qualified engineer, physical tests and the applicable standards.');
  });

  it('has the target, the output path, the instant-centre path and the linkage', () => {
    const targetGroup = /<g id="target"[^>]*>([\s\S]*?)<\/g>/.exec(svg)?.[1] ?? '';
    expect(targetGroup.match(/<circle /g)).toHaveLength(target.points.length);
    const output = attr(svg, /<path id="output-path" d="([^"]*)"/);
    expect(output).toMatch(/^M/);
    // The first vertex is the output point at the first step, y mirrored into SVG's frame.
    const [x0, y0] = pathNumbers(output ?? '');
    expect(x0).toBeCloseTo(motion.output.x[0], 2);
    expect(y0).toBeCloseTo(-motion.output.y[0], 2);
    expect(attr(svg, /<path id="ic-path"[^>]* d="([^"]*)"/)).toMatch(/^M/);
    const linkageGroup = /<g id="linkage"[^>]*>([\s\S]*?)<\/g>/.exec(svg)?.[1] ?? '';
    expect(linkageGroup.match(/class="link"/g)).toHaveLength(3);
    expect(linkageGroup.match(/class="ground-pivot"/g)).toHaveLength(2);
    expect(linkageGroup.match(/class="joint"/g)).toHaveLength(2);
    expect(linkageGroup).toContain('class="output-point"');
  });

  it('draws centres far away or at infinity as direction markers, never as huge coordinates', () => {
    const m = motionOf(parallelogram(), [0.3, 0.8, 1.3]);
    const out = drawingSvg({ motion: m, target: { points: [[50, 70], [40, 80], [20, 90]], closed: false }, title: 'parallelogram' });
    expect(xmlIssues(out)).toEqual([]);
    const viewBox = (attr(out, /viewBox="([^"]*)"/) ?? '').split(' ').map(Number);
    const size = Math.max(viewBox[2], viewBox[3]);
    for (const d of out.match(/ d="[^"]*"/g) ?? []) {
      for (const v of pathNumbers(d)) expect(Math.abs(v)).toBeLessThan(10 * size);
    }
    const markers = /<g id="ic-directions"[^>]*>([\s\S]*?)<\/g>/.exec(out)?.[1] ?? '';
    expect((markers.match(/<path /g) ?? []).length).toBeGreaterThan(0);
  });

  it('wraps legend text at word boundaries', () => {
    expect(wrapWords('one two three four', 9)).toEqual(['one two', 'three', 'four']);
    expect(wrapWords('averyveryverylongword x', 5)).toEqual(['averyveryverylongword', 'x']);
  });
});

describe('linkage file of a design', () => {
  it('reads back with our own reader to the same linkage', () => {
    const linkage = hoeken();
    const text = linkageFileText(linkage, 'Rank 1: four-bar');
    const read = parseLinkageFileText(text);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.name).toBe('Rank 1: four-bar');
    expect(read.linkage).toEqual(linkage);
  });
});
