/**
 * The results of a search: the ranked table, the selected design in detail, the compare
 * view and the exports. Holds its own selection, compare, filter and sort state; the
 * workspace feeds it the target and the ranked candidates (notes/app-api.md).
 */
import { useMemo, useReducer, type CSSProperties } from 'react';
import type { CandidateReport } from '../../core/synthesis';
import { CandidateTable } from './CandidateTable';
import { CompareView } from './CompareView';
import { DRAWING_COLOURS } from './export';
import { DetailView } from './DetailView';
import { grashofLabel, sizeOverMotionMm, transmissionRangeDeg } from './figures';
import { TABLE_STEPS } from './motion';
import { motionNow } from './motionStore';
import { ResultsToolbar } from './ResultsToolbar';
import { INITIAL_RESULTS_STATE, MIN_COMPARE, filterRows, resultsReducer, sortRows, toRows, type CandidateRow, type RowFigures } from './state';
import type { ResultsTarget } from './types';
import './results.css';

/** The drawing colours on screen are those of the exported SVG: one source for both. */
const COLOUR_VARIABLES = {
  '--results-target': DRAWING_COLOURS.target,
  '--results-output': DRAWING_COLOURS.output,
  '--results-centre': DRAWING_COLOURS.centre,
  '--results-link': DRAWING_COLOURS.link,
} as CSSProperties;

export interface ResultsViewProps {
  readonly target: ResultsTarget;
  /** Ranked best first (src/core/synthesis ranking). */
  readonly candidates: readonly CandidateReport[];
  /** A search is running: the table keeps its rendering cheap. */
  readonly running: boolean;
}

export function ResultsView({ target, candidates, running }: ResultsViewProps) {
  const [state, dispatch] = useReducer(resultsReducer, INITIAL_RESULTS_STATE);
  const rows = useMemo(() => toRows(candidates), [candidates]);
  const byKey = useMemo(() => new Map(rows.map((row) => [row.key, row])), [rows]);
  const families = useMemo(() => [...new Set(rows.map((row) => row.candidate.family))].sort(), [rows]);
  const filtered = useMemo(() => filterRows(rows, state.filter), [rows, state.filter]);
  const sorted = useMemo(() => {
    // These sorts need every row's motion (cached, so once per design); the others only the report.
    const needsMotion = state.sort.key === 'size' || state.sort.key === 'grashof' || state.sort.key === 'transmission';
    const figures = (row: CandidateRow): RowFigures => {
      const motion = needsMotion ? motionNow(row.candidate, TABLE_STEPS) : undefined;
      const size = sizeOverMotionMm(row.candidate, motion);
      return {
        grashof: grashofLabel(row.candidate, motion),
        transmissionDeg: transmissionRangeDeg(row.candidate, motion),
        sizeAreaMm2: size === undefined ? undefined : size.widthMm * size.heightMm,
      };
    };
    return sortRows(filtered, state.sort, figures);
  }, [filtered, state.sort]);
  const shownRows = useMemo(() => sorted.slice(0, state.rowsShown), [sorted, state.rowsShown]);
  const selected = state.selected === null ? undefined : byKey.get(state.selected);
  const compared = useMemo(
    () => state.compare.flatMap((key) => {
      const row = byKey.get(key);
      return row ? [row] : [];
    }),
    [state.compare, byKey],
  );

  if (rows.length === 0) {
    return (
      <section className="results" aria-label="Results" style={COLOUR_VARIABLES}>
        <p className="results-empty">{running ? 'The search is running; candidates appear here as it finds them.' : 'No candidates yet: run a search to fill this table.'}</p>
      </section>
    );
  }
  return (
    <section className="results" aria-label="Results" style={COLOUR_VARIABLES}>
      <ResultsToolbar families={families} filter={state.filter} shown={filtered.length} total={rows.length} running={running} dispatch={dispatch} />
      <CandidateTable rows={shownRows} totalRows={sorted.length} target={target} state={state} dispatch={dispatch} />
      {compared.length > 0 && compared.length < MIN_COMPARE && (
        <p className="results-note">Pick one more design to compare (up to four).</p>
      )}
      {compared.length >= MIN_COMPARE && <CompareView rows={compared} target={target} dispatch={dispatch} />}
      {selected
        ? <DetailView key={selected.key} candidate={selected.candidate} rank={selected.rank} target={target} />
        : <p className="results-note">Select a row to see the design move, its error along the path and its transmission angle.</p>}
    </section>
  );
}
