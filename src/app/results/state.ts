/**
 * The results views' own state (selection, compare set, filter, sort) and the pure
 * functions that update it and turn the ranked candidates into table rows.
 */
import type { CandidateReport } from '../../core/synthesis';

export type SortKey = 'rank' | 'family' | 'rms' | 'max' | 'grashof' | 'transmission' | 'size' | 'defects';
export type SortDirection = 'asc' | 'desc';

export interface ResultsFilter {
  /** A family id, or null for every family. */
  readonly family: string | null;
  readonly feasibleOnly: boolean;
  /** Rows with an RMS error above this (mm) are hidden; null for no limit. */
  readonly maxRmsMm: number | null;
}

/** The most candidates compared at once, and the fewest that make a comparison. */
export const MAX_COMPARE = 4;
export const MIN_COMPARE = 2;
/** Rows shown before "show more", and how many more each time. */
export const ROWS_PAGE = 50;

export interface ResultsState {
  readonly sort: { readonly key: SortKey; readonly direction: SortDirection };
  readonly filter: ResultsFilter;
  /** Key of the selected candidate (see `candidateKey`), or null. */
  readonly selected: string | null;
  /** Keys of the candidates picked for comparison, in the order picked. */
  readonly compare: readonly string[];
  readonly rowsShown: number;
}

export const INITIAL_RESULTS_STATE: ResultsState = {
  sort: { key: 'rank', direction: 'asc' },
  filter: { family: null, feasibleOnly: false, maxRmsMm: null },
  selected: null,
  compare: [],
  rowsShown: ROWS_PAGE,
};

export type ResultsAction =
  | { readonly type: 'sort'; readonly key: SortKey }
  | { readonly type: 'filter'; readonly filter: Partial<ResultsFilter> }
  | { readonly type: 'select'; readonly key: string | null }
  | { readonly type: 'toggle-compare'; readonly key: string }
  | { readonly type: 'clear-compare' }
  | { readonly type: 'show-more' };

export function resultsReducer(state: ResultsState, action: ResultsAction): ResultsState {
  switch (action.type) {
    case 'sort': {
      // The same header again turns the order round; a new one starts with the natural order.
      const direction: SortDirection = state.sort.key === action.key
        ? (state.sort.direction === 'asc' ? 'desc' : 'asc')
        : 'asc';
      return { ...state, sort: { key: action.key, direction } };
    }
    case 'filter':
      return { ...state, filter: { ...state.filter, ...action.filter }, rowsShown: ROWS_PAGE };
    case 'select':
      return { ...state, selected: action.key };
    case 'toggle-compare': {
      if (state.compare.includes(action.key)) return { ...state, compare: state.compare.filter((k) => k !== action.key) };
      if (state.compare.length >= MAX_COMPARE) return state;
      return { ...state, compare: [...state.compare, action.key] };
    }
    case 'clear-compare':
      return { ...state, compare: [] };
    case 'show-more':
      return { ...state, rowsShown: state.rowsShown + ROWS_PAGE };
  }
}

export interface CandidateRow {
  /** Stable across re-rankings: the family and the design vector. */
  readonly key: string;
  /** 1-based place in the ranking the search gave. */
  readonly rank: number;
  readonly candidate: CandidateReport;
  /** The kept run it comes from, when it is not the current results. */
  readonly runName?: string;
}

const keys = new WeakMap<CandidateReport, string>();

/** A candidate's identity: family and design vector (the same design found twice is one row). */
export function candidateKey(candidate: CandidateReport): string {
  let key = keys.get(candidate);
  if (key === undefined) {
    key = `${candidate.family}:${candidate.x.join(',')}`;
    keys.set(candidate, key);
  }
  return key;
}

export function toRows(candidates: readonly CandidateReport[], runName?: string): CandidateRow[] {
  const seen = new Set<string>();
  const rows: CandidateRow[] = [];
  candidates.forEach((candidate, i) => {
    const key = candidateKey(candidate);
    if (seen.has(key)) return;
    seen.add(key);
    rows.push(runName === undefined ? { key, rank: i + 1, candidate } : { key, rank: i + 1, candidate, runName });
  });
  return rows;
}

/** One family's line in the overview: how many designs, how many feasible, and the best error. */
export interface FamilySummary {
  readonly family: string;
  readonly designs: number;
  readonly feasible: number;
  /** Best RMS error (mm) of its feasible designs, or of all when none is feasible; null when none is finite. */
  readonly bestRmsMm: number | null;
  readonly bestFeasible: boolean;
  /** Rank of that best design. */
  readonly bestRank: number | null;
}

/** A summary per family, in the order of each family's best rank. */
export function familySummaries(rows: readonly CandidateRow[]): FamilySummary[] {
  const byFamily = new Map<string, CandidateRow[]>();
  for (const row of rows) {
    const list = byFamily.get(row.candidate.family);
    if (list === undefined) byFamily.set(row.candidate.family, [row]);
    else list.push(row);
  }
  const out: FamilySummary[] = [];
  for (const [family, list] of byFamily) {
    const feasible = list.filter((r) => r.candidate.feasible);
    const pool = feasible.length > 0 ? feasible : list;
    let best: CandidateRow | null = null;
    for (const r of pool) {
      // A NaN error never becomes the best (the safe branch).
      if (!(Number.isFinite(r.candidate.error.rmsMm))) continue;
      if (best === null || r.candidate.error.rmsMm < best.candidate.error.rmsMm) best = r;
    }
    out.push({
      family,
      designs: list.length,
      feasible: feasible.length,
      bestRmsMm: best === null ? null : best.candidate.error.rmsMm,
      bestFeasible: feasible.length > 0,
      bestRank: best === null ? null : best.rank,
    });
  }
  return out.sort((a, b) => (a.bestRank ?? Infinity) - (b.bestRank ?? Infinity));
}

export function filterRows(rows: readonly CandidateRow[], filter: ResultsFilter): CandidateRow[] {
  const maxRms = filter.maxRmsMm;
  return rows.filter(({ candidate }) =>
    (filter.family === null || candidate.family === filter.family) &&
    (!filter.feasibleOnly || candidate.feasible) &&
    // A NaN error fails any limit: the safe branch hides it.
    (maxRms === null || candidate.error.rmsMm <= maxRms));
}

/** What a sort needs that the candidate does not carry: its size, known once its motion is. */
export interface RowFigures {
  readonly grashof: string;
  /** Least and greatest transmission angle, deg, or undefined while unknown. */
  readonly transmissionDeg: { readonly min: number; readonly max: number } | undefined;
  /** Bounding-box area (mm²), or undefined while the motion is not computed. */
  readonly sizeAreaMm2: number | undefined;
}

/**
 * Rows in the order asked. Missing or non-finite figures sort last whichever way; ties
 * keep the search's rank.
 */
export function sortRows(
  rows: readonly CandidateRow[],
  sort: ResultsState['sort'],
  figures: (row: CandidateRow) => RowFigures,
): CandidateRow[] {
  const sign = sort.direction === 'asc' ? 1 : -1;
  const numeric = (value: (row: CandidateRow) => number | undefined) => (a: CandidateRow, b: CandidateRow) => {
    const va = value(a);
    const vb = value(b);
    const fa = va !== undefined && Number.isFinite(va);
    const fb = vb !== undefined && Number.isFinite(vb);
    if (fa && fb) return sign * (va - vb) || a.rank - b.rank;
    if (fa !== fb) return fa ? -1 : 1;
    return a.rank - b.rank;
  };
  const text = (value: (row: CandidateRow) => string) => (a: CandidateRow, b: CandidateRow) =>
    sign * value(a).localeCompare(value(b)) || a.rank - b.rank;
  const compare: Record<SortKey, (a: CandidateRow, b: CandidateRow) => number> = {
    rank: numeric((r) => r.rank),
    family: text((r) => r.candidate.family),
    rms: numeric((r) => r.candidate.error.rmsMm),
    max: numeric((r) => r.candidate.error.maxMm),
    grashof: text((r) => figures(r).grashof),
    // The worse end of the range decides: distance of the least angle from the ideal 90°.
    transmission: numeric((r) => {
      const t = figures(r).transmissionDeg;
      return t === undefined ? undefined : Math.max(Math.abs(90 - t.min), Math.abs(t.max - 90));
    }),
    size: numeric((r) => figures(r).sizeAreaMm2),
    defects: numeric((r) => r.candidate.defects.length),
  };
  return [...rows].sort(compare[sort.key]);
}
