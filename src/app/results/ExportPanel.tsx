/** The exports of the selected design: our linkage file, its paths as CSV, the drawing as SVG. */
import type { CandidateReport } from '../../core/synthesis';
import { downloadText } from './download';
import { drawingSvg, exportFileStem, linkageFileText, pathsCsv } from './export';
import { referencePoseNote } from './figures';
import { familyName } from './format';
import type { CandidateMotion } from './motion';
import type { ResultsTarget } from './types';

export function ExportPanel({
  candidate,
  rank,
  target,
  motion,
  pose,
}: {
  candidate: CandidateReport;
  rank: number;
  target: ResultsTarget;
  motion: CandidateMotion;
  /** The pose on screen, drawn into the SVG; the first of the motion when null. */
  pose: Float64Array | null;
}) {
  const stem = exportFileStem(candidate.family, rank);
  const title = `Loci design, rank ${rank}: ${familyName(candidate.family)}`;
  return (
    <div className="results-exports" role="group" aria-label="Export the selected design">
      <span className="results-exports-label">Export</span>
      <button type="button" onClick={() => downloadText(linkageFileText(candidate.linkage, `${title}${referencePoseNote(candidate)}`), `${stem}.json`, 'application/json')}>
        Linkage file (JSON)
      </button>
      <button type="button" onClick={() => downloadText(pathsCsv(motion), `${stem}-paths.csv`, 'text/csv')}>
        Paths (CSV)
      </button>
      <button
        type="button"
        onClick={() => downloadText(drawingSvg({ motion, target, title, ...(pose ? { pose } : {}) }), `${stem}.svg`, 'image/svg+xml')}
      >
        Drawing (SVG)
      </button>
    </div>
  );
}
