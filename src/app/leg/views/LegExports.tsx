/**
 * A leg's exports: its curves over the turn as CSV, the leg as an SVG drawing, and the
 * design as a loci-leg file. The CSV and the SVG carry the caution; the design file is
 * the design itself, read back by the app and `loci analyze`, which print it.
 */
import type { GaitFigures } from '../../../core/gait';
import { toLegFile, type LegDesign } from '../../../core/io/legFile';
import { downloadText } from '../../results/download';
import { fileStem } from '../../suspension/labels';
import { legCurvesCsv } from './legCsv';
import { legSvg } from './legSvg';

/** A file name stem for a design: its name (or none) and "leg", letters, digits and dashes. */
export function legFileStem(design: Pick<LegDesign, 'name'>): string {
  return fileStem(`${design.name ?? ''} leg`);
}

export function LegExports({ design, figures }: { design: LegDesign; figures: GaitFigures | null }) {
  const stem = legFileStem(design);
  return (
    <div className="leg-exports" role="group" aria-label="Export the leg">
      <button type="button" disabled={figures === null} onClick={() => figures !== null && downloadText(legCurvesCsv(figures, design.name), `${stem}-curves.csv`, 'text/csv')}>
        Curves (CSV)
      </button>
      <button type="button" disabled={figures === null} onClick={() => figures !== null && downloadText(legSvg(design, figures), `${stem}.svg`, 'image/svg+xml')}>
        Leg drawing (SVG)
      </button>
      <button type="button" onClick={() => downloadText(`${JSON.stringify(toLegFile(design), null, 2)}\n`, `${stem}.loci-leg.json`, 'application/json')}>
        Leg file (JSON)
      </button>
    </div>
  );
}
