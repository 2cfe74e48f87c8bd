/**
 * Exports and import: the curves as CSV, the side view as SVG (with the caution), and
 * the design file (download and import, with an import's problems listed by field).
 */
import { memo, useRef } from 'react';
import { suspensionCurvesCsv } from '../../core/io/suspensionCsv';
import { parseSuspensionFileText, toSuspensionFile, type SuspensionDesign } from '../../core/io/suspensionFile';
import { sideViewSvg } from '../../core/io/sideViewSvg';
import { SUSPENSION_CAUTION, sideView, type Bicycle, type SuspensionReport } from '../../core/suspension';
import type { Linkage } from '../../core/linkage';
import { downloadText } from '../results/download';
import { fileStem } from './labels';
import { useSuspension, useSuspensionDispatch } from './store';

/** A design file larger than this is refused before it is read (bytes); a design is a few kilobytes. */
const MAX_IMPORT_BYTES = 2_000_000;

export const ExportPanel = memo(function ExportPanel({ bicycle, linkage, report, shockLengthMm }: {
  bicycle: Bicycle | null;
  linkage: Linkage | null;
  report: SuspensionReport | null;
  shockLengthMm: number | null;
}) {
  const dispatch = useSuspensionDispatch();
  const name = useSuspension((s) => s.name);
  const layout = useSuspension((s) => s.layout);
  const cogIndex = useSuspension((s) => s.cogIndex);
  const importIssues = useSuspension((s) => s.importIssues);
  const fileInput = useRef<HTMLInputElement | null>(null);
  const stem = fileStem(name);

  const exportSvg = () => {
    if (bicycle === null || linkage === null || shockLengthMm === null) return;
    const view = sideView({ bicycle, linkage }, { shockLengthMm, cogIndex: Math.min(cogIndex, bicycle.cogTeeth.length - 1) });
    if (view.ok) downloadText(sideViewSvg(view.primitives, { caution: SUSPENSION_CAUTION, title: name }), `${stem}-side-view.svg`, 'image/svg+xml');
  };
  const exportDesign = () => {
    if (bicycle === null) return;
    const design: SuspensionDesign = {
      name,
      bicycle,
      layout: {
        kind: layout.kind,
        pivots: layout.pivots,
        ...(layout.kind === 'wattSixBar' || layout.kind === 'stephensonSixBar' ? { axleBody: layout.axleBody, ...(layout.shock === undefined ? {} : { shock: layout.shock }) } : {}),
        ...(layout.floatingBrakeBody === null ? {} : { floatingBrakeBody: layout.floatingBrakeBody }),
      },
    };
    downloadText(`${JSON.stringify(toSuspensionFile(design), null, 2)}\n`, `${stem}.loci-suspension.json`, 'application/json');
  };
  const importFile = async (file: File) => {
    if (file.size > MAX_IMPORT_BYTES) {
      dispatch({ type: 'importIssues', fileName: file.name, issues: [{ path: '', message: `the file is ${file.size} bytes; a design file may be at most ${MAX_IMPORT_BYTES} bytes` }] });
      return;
    }
    const parsed = parseSuspensionFileText(await file.text());
    if (parsed.ok) dispatch({ type: 'load', design: parsed.design, fallbackName: file.name.replace(/\.json$/i, '') });
    else dispatch({ type: 'importIssues', fileName: file.name, issues: parsed.issues });
  };

  const noBicycle = bicycle === null ? 'the bicycle panel has problems to correct first' : null;
  return (
    <section className="panel susp-panel" aria-labelledby="susp-export-title" data-testid="export-panel">
      <h2 id="susp-export-title">Export and import</h2>
      <div className="susp-buttons">
        <button type="button" disabled={report === null} onClick={() => report !== null && downloadText(suspensionCurvesCsv(report), `${stem}-curves.csv`, 'text/csv')}>
          Curves (CSV)
        </button>
        <button type="button" disabled={shockLengthMm === null} onClick={exportSvg}>Side view (SVG)</button>
        <button type="button" disabled={bicycle === null} onClick={exportDesign}>Design file (JSON)</button>
        <button type="button" onClick={() => fileInput.current?.click()}>Import design file…</button>
        <input
          ref={fileInput}
          type="file"
          accept=".json,application/json"
          className="susp-file-input"
          aria-label="Design file to import"
          data-testid="design-file-input"
          onChange={(e) => {
            const file = e.target.files?.[0];
            e.target.value = '';
            if (file !== undefined) void importFile(file);
          }}
        />
      </div>
      {report === null && <p className="susp-note">The CSV needs curves: {noBicycle ?? 'the layout does not work through its travel (see the layout panel)'}.</p>}
      {noBicycle !== null && <p className="susp-note">The design file needs a valid bicycle: {noBicycle}.</p>}
      {importIssues !== null && (
        <div className="susp-problem" role="alert" data-testid="import-issues">
          <strong>{`${importIssues.fileName} was not opened:`}</strong>
          <ul>
            {importIssues.issues.map((issue, i) => <li key={i}>{issue.path === '' ? issue.message : <><code>{issue.path}</code>: {issue.message}</>}</li>)}
          </ul>
          <button type="button" onClick={() => dispatch({ type: 'dismissImport' })}>Dismiss</button>
        </div>
      )}
    </section>
  );
});
