/** Target entry: paste or import CSV, the point table, open or closed, timing, resampling, and the background image. */
import { useId, useState } from 'react';
import { MAX_POINTS_CSV_CHARS, formatPointsCsv } from '../../core/io/pointsCsv';
import { isLocked, type TimingMode } from '../state/project';
import { useDispatch, useStore, useWorkspace } from '../state/store';
import { BackgroundControls } from './BackgroundControls';
import { parsePointsCsvOffThread } from './csvParse';
import { MAX_CSV_BOX_CHARS, fileTooLarge, importCsvAction, importTableAction, tooLargeAction } from './csvImport';
import { NoticeBox } from './NoticeBox';
import { PointTable } from './PointTable';
import { MAX_RESAMPLE_POINTS, MIN_RESAMPLE_POINTS } from './resample';

const TIMING: readonly { mode: TimingMode; label: string; note: string }[] = [
  { mode: 'unprescribed', label: 'Unprescribed', note: 'each point is matched to the nearest point of the curve, in order' },
  { mode: 'free', label: 'Free', note: 'the crank angle at each point is searched too, in order' },
  { mode: 'prescribed', label: 'Prescribed', note: 'each point has a crank angle you give' },
];

function download(name: string, text: string) {
  const url = URL.createObjectURL(new Blob([text], { type: 'text/csv' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  a.click();
  setTimeout(() => URL.revokeObjectURL(url), 0);
}

export function TargetPanel() {
  const store = useStore();
  const dispatch = useDispatch();
  const target = useWorkspace((s) => s.project.target);
  const notice = useWorkspace((s) => s.ui.targetNotice);
  const locked = useWorkspace((s) => isLocked(s.project.run.status));
  const [csv, setCsv] = useState('');
  const [count, setCount] = useState(String(Math.max(MIN_RESAMPLE_POINTS, target.points.length || 24)));
  const id = useId();

  /** Text too long for the box, read in a worker: a megabyte takes the reader longer than a frame. */
  const readDirectly = async (text: string, what: string) => {
    const table = await parsePointsCsvOffThread(text);
    dispatch(importTableAction(table, `${what} (${Math.round(text.length / 1000)} kB, read directly: too long to edit in the box)`, store.getState().project.target));
  };

  /**
   * Large text never reaches the box: a text area lays out all its text again on every
   * edit, so one holding a long paste can hold the page for minutes. Text the reader
   * would refuse is refused here, with its message; text too long for the box but not
   * for a target is read at once, without the box.
   */
  const takeIncoming = (event: React.ClipboardEvent<HTMLTextAreaElement> | React.DragEvent<HTMLTextAreaElement>, incoming: string, what: string) => {
    const box = event.currentTarget;
    const replaced = event.type === 'paste' ? box.selectionEnd - box.selectionStart : 0;
    const total = box.value.length - replaced + incoming.length;
    const refused = tooLargeAction(Math.max(total, incoming.length), what, 'text');
    if (refused !== null) {
      event.preventDefault();
      dispatch(refused);
      return;
    }
    if (total <= MAX_CSV_BOX_CHARS) return;
    event.preventDefault();
    void readDirectly(incoming, what);
  };

  const readPasted = () => dispatch(importCsvAction(csv, 'the pasted text', store.getState().project.target));
  const readFile = async (file: File) => {
    const refused = fileTooLarge(file);
    if (refused !== null) {
      dispatch(refused);
      return;
    }
    const text = await file.text();
    if (text.length <= MAX_CSV_BOX_CHARS) dispatch(importCsvAction(text, `file ${file.name}`, store.getState().project.target));
    else dispatch(importTableAction(await parsePointsCsvOffThread(text), `file ${file.name}`, store.getState().project.target));
  };

  return (
    <section className="panel target-panel" aria-labelledby={`${id}-h`}>
      <h2 id={`${id}-h`}>Target path</h2>
      <p className="panel-note">
        {target.points.length} points, {target.closed ? 'closed loop' : 'open path'}; all lengths in mm.
      </p>
      <NoticeBox notice={notice} onClose={() => dispatch({ type: 'target/notice', notice: null })} />
      {locked && <p className="panel-note">The target is fixed while a search runs or is paused.</p>}

      {/* One fieldset disables every control below while a search runs, without re-rendering them. */}
      <fieldset className="plain-fieldset" disabled={locked}>
        <div className="field-row">
          <label>
            <input type="checkbox" checked={target.closed} onChange={(e) => dispatch({ type: 'target/closed', closed: e.target.checked })} /> Closed path (a
            loop, once per crank turn)
          </label>
        </div>
        <fieldset className="timing">
          <legend>Timing</legend>
          {TIMING.map((t) => (
            <label key={t.mode} title={t.note}>
              <input type="radio" name={`${id}-timing`} checked={target.timing === t.mode} onChange={() => dispatch({ type: 'target/timing', timing: t.mode })} /> {t.label}
              <span className="option-note"> — {t.note}</span>
            </label>
          ))}
        </fieldset>

        <PointTable />

        <details className="csv-entry" open={target.points.length === 0}>
          <summary>Paste or import CSV</summary>
          <label htmlFor={`${id}-csv`} className="block-label">
            Rows of x, y in mm (and optionally a crank angle in degrees and a weight); comma, semicolon or tab; a header row is optional; at most{' '}
            {MAX_POINTS_CSV_CHARS / 1000} kB.
          </label>
          <textarea
            id={`${id}-csv`}
            rows={6}
            value={csv}
            spellCheck={false}
            onPaste={(e) => takeIncoming(e, e.clipboardData.getData('text/plain'), 'the pasted text')}
            onDrop={(e) => takeIncoming(e, e.dataTransfer.getData('text/plain'), 'the dropped text')}
            onChange={(e) => {
              // Any other way in (an input method, a script) is held to the same sizes.
              const text = e.target.value;
              if (text.length <= MAX_CSV_BOX_CHARS) setCsv(text);
              else {
                const refused = tooLargeAction(text.length, 'the text', 'text');
                if (refused !== null) dispatch(refused);
                else void readDirectly(text, 'the text');
              }
            }}
            placeholder={'x;y\n0;0\n10,5;2\n…'}
          />
          <div className="row-actions">
            <button type="button" onClick={readPasted} disabled={csv.trim().length === 0}>
              Read pasted points
            </button>
            <label className="file-button">
              Import CSV file…
              <input
                type="file"
                accept=".csv,.tsv,.txt,text/csv,text/plain"
                onChange={(e) => {
                  const file = e.target.files?.[0];
                  e.target.value = '';
                  if (file !== undefined) void readFile(file);
                }}
              />
            </label>
          </div>
        </details>

        <div className="field-row resample">
          <label>
            Resample to{' '}
            <input type="number" min={MIN_RESAMPLE_POINTS} max={MAX_RESAMPLE_POINTS} step={1} value={count} onChange={(e) => setCount(e.target.value)} aria-label="Number of points after resampling" />{' '}
            evenly spaced points
          </label>
          <button type="button" disabled={target.points.length < 2} onClick={() => dispatch({ type: 'target/resample', count: Number(count) })}>
            Resample
          </button>
        </div>

        <BackgroundControls />
      </fieldset>
      {/* Outside the fieldset: the target can be saved while a search runs on it. */}
      <div className="row-actions">
        <button type="button" disabled={target.points.length === 0} onClick={() => download('target.csv', formatPointsCsv(target.points, { closed: target.closed }))}>
          Export target as CSV
        </button>
      </div>
    </section>
  );
}
