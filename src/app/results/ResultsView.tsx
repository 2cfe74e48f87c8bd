/**
 * The results of a search: the best of each family, the ranked table, the selected design
 * in detail, the compare view and the exports; in the workspace also the kept runs and
 * the shortlist of pinned designs. Holds its own selection, compare, filter and sort
 * state; the workspace feeds it the target and the ranked candidates (notes/app-api.md).
 * On a wide screen the detail and compare views sit beside the table.
 */
import { useCallback, useContext, useEffect, useLayoutEffect, useMemo, useReducer, useRef, type CSSProperties } from 'react';
import type { CandidateReport } from '../../core/synthesis';
import { HistoryPanel, pinCompareKey } from '../history/HistoryPanel';
import { pinKeyOf } from '../history/types';
import { useRunHistory, type RunHistory } from '../history/useRunHistory';
import { ServicesContext } from '../services';
import { StoreContext } from '../state/store';
import type { LociDb } from '../storage';
import { CandidateTable } from './CandidateTable';
import { CompareView } from './CompareView';
import { DRAWING_COLOURS } from './export';
import { DetailView } from './DetailView';
import { FamilyOverview } from './FamilyOverview';
import { grashofLabel, sizeOverMotionMm, transmissionRangeDeg } from './figures';
import { TABLE_STEPS } from './motion';
import { motionNow } from './motionStore';
import { ResultsToolbar } from './ResultsToolbar';
import {
  INITIAL_RESULTS_STATE, MAX_COMPARE, MIN_COMPARE, familySummaries, filterRows, resultsReducer, sortRows, toRows,
  type CandidateRow, type RowFigures,
} from './state';
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

/** In the workspace (a store and storage above it) the results come with the run history; alone, without. */
export function ResultsView(props: ResultsViewProps) {
  const store = useContext(StoreContext);
  const services = useContext(ServicesContext);
  if (store !== null && services !== null && services.db !== null) return <ResultsWithHistory {...props} db={services.db} />;
  return <ResultsBody {...props} history={null} />;
}

function ResultsWithHistory({ db, ...props }: ResultsViewProps & { db: LociDb }) {
  const history = useRunHistory(db);
  return <ResultsBody {...props} history={history} />;
}

function ResultsBody({ target: currentTarget, candidates: currentCandidates, running, history }: ResultsViewProps & { history: RunHistory | null }) {
  const [state, dispatch] = useReducer(resultsReducer, INITIAL_RESULTS_STATE);
  const shownRun = history?.shown ?? null;
  const candidates = shownRun === null ? currentCandidates : shownRun.candidates;
  const target = shownRun === null ? currentTarget : shownRun.target;
  const rows = useMemo(() => toRows(candidates, shownRun?.name), [candidates, shownRun?.name]);
  const byKey = useMemo(() => new Map(rows.map((row) => [row.key, row])), [rows]);
  const pinRows = useMemo(
    () => new Map((history?.pins ?? []).map((pin): [string, CandidateRow] => [pinCompareKey(pin.pinKey), { key: pinCompareKey(pin.pinKey), rank: pin.rank, candidate: pin.candidate, runName: pin.runName }])),
    [history?.pins],
  );
  const overview = useMemo(() => familySummaries(rows), [rows]);
  const families = useMemo(() => overview.map((f) => f.family).sort(), [overview]);
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
      const row = byKey.get(key) ?? pinRows.get(key);
      return row ? [row] : [];
    }),
    [state.compare, byKey, pinRows],
  );

  // Pins: the rows of the run shown (kept or current), against the shortlist.
  const rowsRunId = shownRun?.runId ?? history?.currentRunId ?? null;
  const rowsRunName = shownRun?.name ?? history?.runs.find((r) => r.runId === rowsRunId)?.name ?? 'Latest run';
  const pinned = useMemo(() => {
    if (history === null || rowsRunId === null) return undefined;
    const keys = new Set(history.pins.map((p) => p.pinKey));
    return new Set(rows.filter((row) => keys.has(pinKeyOf(rowsRunId, row.key))).map((row) => row.key));
  }, [history, rowsRunId, rows]);
  // The table's rows keep one pin handler across renders; it reads the latest history through a ref.
  const latest = useRef({ history, rowsRunId, rowsRunName, target });
  useLayoutEffect(() => {
    latest.current = { history, rowsRunId, rowsRunName, target };
  });
  const onPin = useCallback((row: CandidateRow, pin: boolean) => {
    const { history: h, rowsRunId: runId, rowsRunName: runName, target: t } = latest.current;
    if (h === null || runId === null) return;
    if (pin) h.pin({ runId, runName, rank: row.rank, target: { points: t.points, closed: t.closed }, candidate: row.candidate, designKey: row.key });
    else h.unpin(pinKeyOf(runId, row.key));
  }, []);

  // A new selection, or a comparison made, comes into view with the keyboard focus on its heading.
  const side = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (state.selected === null) return;
    focusHeading(side.current?.querySelector<HTMLElement>('[data-testid="detail-view"] h3'));
  }, [state.selected]);
  const comparing = compared.length >= MIN_COMPARE;
  useEffect(() => {
    if (comparing) focusHeading(side.current?.querySelector<HTMLElement>('[data-testid="compare-view"] h3'));
  }, [comparing]);

  const historyPanel = history && (
    <HistoryPanel
      history={history}
      compared={state.compare}
      compareFull={state.compare.length >= MAX_COMPARE}
      onToggleCompare={(key) => dispatch({ type: 'toggle-compare', key })}
    />
  );
  const sideViews = (
    <div className="results-side" ref={side}>
      {compared.length > 0 && compared.length < MIN_COMPARE && (
        <p className="results-note">Pick one more design to compare (up to four), from this table or the shortlist.</p>
      )}
      {comparing && <CompareView rows={compared} target={target} dispatch={dispatch} />}
      {selected
        ? <DetailView key={selected.key} candidate={selected.candidate} rank={selected.rank} target={target} />
        : rows.length > 0 && <p className="results-note">Select a row to see the design move, its error along the path and its transmission angle.</p>}
    </div>
  );

  return (
    <section className="results" aria-label="Results" style={COLOUR_VARIABLES}>
      <div className="results-layout">
        <div className="results-main">
          {shownRun !== null && history !== null && (
            <p className="notice results-shown-run" role="status" data-testid="shown-run">
              Showing the kept run <strong>{shownRun.name}</strong> ({shownRun.candidates.length} designs), not the latest results.{' '}
              <button type="button" onClick={() => history.show(null)}>Back to latest results</button>
            </p>
          )}
          {rows.length === 0 ? (
            <p className="results-empty">{running ? 'The search is running; candidates appear here as it finds them.' : 'No candidates yet: run a search to fill this table.'}</p>
          ) : (
            <>
              <FamilyOverview families={overview} active={state.filter.family} dispatch={dispatch} />
              <ResultsToolbar families={families} filter={state.filter} shown={filtered.length} total={rows.length} running={running && shownRun === null} dispatch={dispatch} />
              <CandidateTable
                rows={shownRows}
                totalRows={sorted.length}
                target={target}
                state={state}
                dispatch={dispatch}
                {...(pinned === undefined ? {} : { pinned, onPin })}
              />
            </>
          )}
          {historyPanel}
        </div>
        {sideViews}
      </div>
    </section>
  );
}

function focusHeading(heading: HTMLElement | null | undefined): void {
  if (!heading) return;
  heading.tabIndex = -1;
  heading.focus({ preventScroll: true });
  heading.scrollIntoView({ block: 'start', behavior: 'auto' });
}
