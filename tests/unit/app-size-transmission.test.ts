/**
 * The app's side of size and force transmission (issue 9): the fields that set the size
 * limit, the terms and the designs kept per family, checked as typed and sent to the
 * search in the problem file's units; the table's words for a transmission range outside
 * the common guideline; the best of each family while a search runs; the target CSV
 * keeping weights and closure; a saved project from before these settings.
 */
import { describe, expect, it } from 'vitest';
import { createDemoProject } from '../../src/app/demo/demoProject';
import { outsideGuidelineLabel } from '../../src/app/results/figures';
import { bestArchived } from '../../src/app/run/interimCandidates';
import { problemFileOf } from '../../src/app/run/runInput';
import { checkGuideline, checkMaxSizeSpans, checkResultsPerFamily, checkTermWeight } from '../../src/app/state/fields';
import type { Project } from '../../src/app/state/project';
import { DEFAULT_SETTINGS, setMaxSizeSpans, setResultsPerFamily } from '../../src/app/state/settings';
import { readProject } from '../../src/app/storage/projectSchema';
import { importTableAction } from '../../src/app/target/csvImport';
import { parseProblemFile } from '../../src/core/io/problem';
import { formatPointsCsv, parsePointsCsv } from '../../src/core/io/pointsCsv';

describe('the fields, checked as typed, nothing clamped', () => {
  it('size limit: a multiple of the span above 1, or empty for none', () => {
    expect(checkMaxSizeSpans('')).toEqual({ ok: true, value: null });
    expect(checkMaxSizeSpans('4,5')).toEqual({ ok: true, value: 4.5 });
    for (const bad of ['abc', '1', '0.5', '-3', '1e9']) {
      const checked = checkMaxSizeSpans(bad);
      expect(checked.ok).toBe(false);
      if (!checked.ok) expect(checked.message).toMatch(/^Largest size: .*expected a multiple of the target's span/);
    }
    // A refused value leaves the settings as they were.
    expect(setMaxSizeSpans(DEFAULT_SETTINGS, 0.5)).toBe(DEFAULT_SETTINGS);
  });

  it('weights from 0, the guideline above 0° up to 90°', () => {
    expect(checkTermWeight('Size weight', '0')).toEqual({ ok: true, value: 0 });
    expect(checkTermWeight('Size weight', '-1').ok).toBe(false);
    expect(checkTermWeight('Size weight', 'x').ok).toBe(false);
    expect(checkGuideline('40')).toEqual({ ok: true, value: 40 });
    expect(checkGuideline('0').ok).toBe(false);
    expect(checkGuideline('100').ok).toBe(false);
  });

  it("designs kept per family: 1 to the run archive's 64", () => {
    expect(checkResultsPerFamily('64')).toEqual({ ok: true, value: 64 });
    for (const bad of ['0', '65', '2.5', '']) expect(checkResultsPerFamily(bad).ok).toBe(false);
    expect(setResultsPerFamily(DEFAULT_SETTINGS, 65)).toBe(DEFAULT_SETTINGS);
    expect(setResultsPerFamily(DEFAULT_SETTINGS, 10).resultsPerFamily).toBe(10);
  });
});

describe('what the search is sent', () => {
  it('the limit in mm (the multiple times the target span) and the guideline in rad', () => {
    const demo = createDemoProject();
    const project: Project = {
      ...demo,
      settings: {
        ...demo.settings,
        constraints: { ...demo.settings.constraints, maxSizeSpans: 4 },
        terms: { sizeWeight: 0.5, transmissionWeight: 2, transmissionGuidelineDeg: 40 },
      },
    };
    const xs = demo.target.points.map((p) => p.x);
    const ys = demo.target.points.map((p) => p.y);
    const spanMm = Math.max(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys));
    const parsed = parseProblemFile(JSON.parse(JSON.stringify(problemFileOf(project))));
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.problem.constraints.maxSizeMm).toBeCloseTo(4 * spanMm, 9);
    // 40° = 2π/9 rad (definition of the radian).
    expect(parsed.problem.terms?.transmissionGuidelineRad).toBeCloseTo((2 * Math.PI) / 9, 12);
    expect(parsed.problem.terms?.transmissionWeight).toBe(2);
    expect(parsed.problem.terms?.sizeWeight).toBe(0.5);
  });

  it('no terms at all when both weights are 0, so the problem is as before', () => {
    const demo = createDemoProject();
    const project: Project = { ...demo, settings: { ...demo.settings, constraints: { ...demo.settings.constraints, maxSizeSpans: null }, terms: { sizeWeight: 0, transmissionWeight: 0, transmissionGuidelineDeg: 40 } } };
    const file = problemFileOf(project);
    expect(file.terms).toBeUndefined();
    expect(file.constraints?.maxSizeMm).toBeUndefined();
  });
});

describe('the table marks a transmission range outside 40°–140° in words', () => {
  // common practice: transmission angles from 40° to 140°.
  it('marks 10°–154° (the issue’s example) and leaves 45°–135° alone', () => {
    expect(outsideGuidelineLabel({ min: 10, max: 154 })).toBe('outside 40°–140°: below 40° and above 140°');
    expect(outsideGuidelineLabel({ min: 50, max: 154 })).toBe('outside 40°–140°: above 140°');
    expect(outsideGuidelineLabel({ min: 45, max: 135 })).toBeNull();
    expect(outsideGuidelineLabel(undefined)).toBeNull();
  });
});

describe('while a search runs', () => {
  it('shows the best of each family beside the overall best, in the order of the whole pool', () => {
    // Family a holds the three best; b's best comes fourth and would be left out of a top 2.
    const payload = {
      archive: [
        { jobId: 'a', entries: [{ x: [1], value: 1, violation: 0 }, { x: [2], value: 2, violation: 0 }, { x: [3], value: 3, violation: 0 }] },
        { jobId: 'b', entries: [{ x: [4], value: 4, violation: 0 }, { x: [5], value: 5, violation: 0 }] },
      ],
    };
    expect(bestArchived(payload, 2).map((d) => d.x[0])).toEqual([1, 2]);
    expect(bestArchived(payload, 2, 1).map((d) => d.x[0])).toEqual([1, 2, 4]);
    expect(bestArchived(payload, 4, 1).map((d) => d.x[0])).toEqual([1, 2, 3, 4]);
  });
});

describe('the target CSV keeps what the table holds', () => {
  it('round-trips weights, crank angles and a closed path through export and import', () => {
    const points = [
      { x: 0, y: 0, driverDeg: 0, weight: 1 },
      { x: 10.5, y: 0, driverDeg: 90, weight: 0.25 },
      { x: 10, y: 8, driverDeg: 180, weight: 0 },
      { x: -1, y: 6, driverDeg: 270, weight: 3 },
    ];
    const text = formatPointsCsv(points, { closed: true });
    const action = importTableAction(parsePointsCsv(text), 'the test', createDemoProject().target);
    expect(action.type).toBe('target/replace');
    if (action.type !== 'target/replace') return;
    expect(action.points).toEqual(points);
    expect(action.closed).toBe(true);
    const open = importTableAction(parsePointsCsv(formatPointsCsv(points)), 'the test', createDemoProject().target);
    expect(open.type === 'target/replace' && open.closed).toBe(false);
  });

  it('says a radian column was read in radians', () => {
    const action = importTableAction(parsePointsCsv('x,y,theta_rad\n0,0,0\n10,0,1\n10,8,2\n'), 'the test', createDemoProject().target);
    expect(action.type).toBe('target/replace');
    if (action.type !== 'target/replace') return;
    expect((action.notice?.lines ?? []).join(' ')).toMatch(/read in radians/);
    // 1 rad = 180/π degrees (definition of the radian).
    expect(action.points[1].driverDeg).toBeCloseTo(180 / Math.PI, 12);
  });
});

describe('a project saved before these settings', () => {
  it('opens with no size limit and no terms, as it was searched, and 50 designs per family', () => {
    const saved = JSON.parse(JSON.stringify(createDemoProject())) as Record<string, Record<string, unknown>>;
    const settings = saved.settings as Record<string, unknown> & { constraints: Record<string, unknown> };
    delete settings.terms;
    delete settings.resultsPerFamily;
    delete settings.constraints.maxSizeSpans;
    const read = readProject(saved);
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.project.settings.constraints.maxSizeSpans).toBeNull();
    expect(read.project.settings.terms.sizeWeight).toBe(0);
    expect(read.project.settings.terms.transmissionWeight).toBe(0);
    expect(read.project.settings.resultsPerFamily).toBe(50);
  });
});
