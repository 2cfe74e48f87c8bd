import { describe, expect, it } from 'vitest';
import { computeMotion, TABLE_STEPS } from '../../src/app/results/motion';
import {
  INITIAL_RESULTS_STATE,
  MAX_COMPARE,
  filterRows,
  resultsReducer,
  sortRows,
  toRows,
  type CandidateRow,
  type RowFigures,
} from '../../src/app/results/state';
import { compile, run } from '../../src/core/linkage';
import { resultsFixture } from '../browser/results-page/candidates';

// Reports from synthesis `describe` of known linkages (the results test page's list).
const fixture = resultsFixture();
const rows = toRows(fixture.candidates);

function figures(row: CandidateRow): RowFigures {
  const m = computeMotion(row.candidate, TABLE_STEPS);
  return {
    grashof: row.candidate.grashof?.name ?? '',
    transmissionDeg: row.candidate.transmissionDeg,
    sizeAreaMm2: m.ok ? m.motion.sizeMm.widthMm * m.motion.sizeMm.heightMm : undefined,
  };
}

describe('results table rows', () => {
  it('ranks in the order given, one row per distinct design', () => {
    expect(rows.map((r) => r.rank)).toEqual(fixture.candidates.map((_, i) => i + 1));
    const twice = toRows([...fixture.candidates, ...fixture.candidates.map((c) => ({ ...c }))]);
    expect(twice.map((r) => r.key)).toEqual(rows.map((r) => r.key));
  });

  it('sorts by a figure both ways, as a permutation, ties by rank', () => {
    const up = sortRows(rows, { key: 'rms', direction: 'asc' }, figures);
    const down = sortRows(rows, { key: 'rms', direction: 'desc' }, figures);
    expect([...up.map((r) => r.rank)].sort((a, b) => a - b)).toEqual(rows.map((r) => r.rank));
    for (let i = 1; i < up.length; i++) {
      expect(up[i - 1].candidate.error.rmsMm).toBeLessThanOrEqual(up[i].candidate.error.rmsMm);
      expect(down[i - 1].candidate.error.rmsMm).toBeGreaterThanOrEqual(down[i].candidate.error.rmsMm);
    }
    const bySize = sortRows(rows, { key: 'size', direction: 'asc' }, figures).map((r) => figures(r).sizeAreaMm2 ?? Infinity);
    for (let i = 1; i < bySize.length; i++) expect(bySize[i - 1]).toBeLessThanOrEqual(bySize[i]);
  });

  it('puts rows without a figure last, whichever way', () => {
    const noTransmission = rows.filter((r) => r.candidate.transmissionDeg === undefined).map((r) => r.rank);
    expect(noTransmission.length).toBeGreaterThan(0); // the slider-crank has no four-bar loop
    for (const direction of ['asc', 'desc'] as const) {
      const sorted = sortRows(rows, { key: 'transmission', direction }, figures).map((r) => r.rank);
      expect(sorted.slice(-noTransmission.length)).toEqual(noTransmission);
    }
  });

  it('filters by family, feasibility and RMS, a NaN error failing any limit', () => {
    expect(filterRows(rows, { family: 'fourbar', feasibleOnly: false, maxRmsMm: null }).every((r) => r.candidate.family === 'fourbar')).toBe(true);
    expect(filterRows(rows, { family: null, feasibleOnly: true, maxRmsMm: null }).every((r) => r.candidate.feasible)).toBe(true);
    const limited = filterRows(rows, { family: null, feasibleOnly: false, maxRmsMm: 3 });
    expect(limited.map((r) => r.rank)).toEqual(rows.filter((r) => r.candidate.error.rmsMm <= 3).map((r) => r.rank));
    const nan = { ...rows[0], candidate: { ...rows[0].candidate, error: { ...rows[0].candidate.error, rmsMm: Number.NaN } } };
    expect(filterRows([nan], { family: null, feasibleOnly: false, maxRmsMm: 1e9 })).toEqual([]);
  });
});

describe('results state', () => {
  it('turns the sort round on a second click, and starts a new column ascending', () => {
    const once = resultsReducer(INITIAL_RESULTS_STATE, { type: 'sort', key: 'rms' });
    expect(once.sort).toEqual({ key: 'rms', direction: 'asc' });
    expect(resultsReducer(once, { type: 'sort', key: 'rms' }).sort).toEqual({ key: 'rms', direction: 'desc' });
    expect(resultsReducer(resultsReducer(once, { type: 'sort', key: 'rms' }), { type: 'sort', key: 'size' }).sort).toEqual({ key: 'size', direction: 'asc' });
  });

  it(`compares at most ${MAX_COMPARE} designs, in the order picked`, () => {
    let state = INITIAL_RESULTS_STATE;
    for (const row of rows) state = resultsReducer(state, { type: 'toggle-compare', key: row.key });
    expect(state.compare).toEqual(rows.slice(0, MAX_COMPARE).map((r) => r.key));
    state = resultsReducer(state, { type: 'toggle-compare', key: rows[1].key });
    expect(state.compare).toEqual([rows[0], rows[2], rows[3]].map((r) => r.key));
  });
});

describe('driver values of a report in the linkage frame', () => {
  it('reproduces the output points the search reported, for every family of the list', () => {
    for (const candidate of fixture.candidates) {
      const compiled = compile(candidate.linkage);
      if (!compiled.ok) throw new Error('a reported linkage does not compile');
      const plan = compiled.plan;
      const slot = plan.slotIndex.get('P');
      if (slot === undefined) throw new Error('no output point P');
      const m = computeMotion(candidate, TABLE_STEPS);
      if (!m.ok) throw new Error(m.reason);
      expect(candidate.linkageDriverValues).toHaveLength(candidate.driverValues.length);
      const pose = new Float64Array(2 * plan.slotCount);
      candidate.linkageDriverValues.forEach((value, i) => {
        pose.set(plan.reference);
        expect(run(plan, value, pose)).toBe(true);
        expect(Math.hypot(pose[2 * slot] - candidate.points[2 * i], pose[2 * slot + 1] - candidate.points[2 * i + 1])).toBeLessThan(1e-9);
        expect(Math.hypot(m.motion.matched.x[i] - candidate.points[2 * i], m.motion.matched.y[i] - candidate.points[2 * i + 1])).toBeLessThan(1e-9);
      });
    }
  });
});
