/**
 * One leg design in full: its gait figures (taken here when not given), the leg walking
 * over the ground, the plots over the turn, the contact diagram when several legs share
 * the shaft, the exports, and the caution. A design whose figures cannot be taken is
 * said so in words.
 */
import { memo, useMemo } from 'react';
import { gaitFigures, type GaitFigures } from '../../../core/gait';
import type { LegDesign, LegPhasing } from '../../../core/io/legFile';
import { ContactDiagram } from './ContactDiagram';
import { GaitPlots } from './GaitPlots';
import { LegCaution } from './LegCaution';
import { LegExports } from './LegExports';
import { LegFigures } from './LegFigures';
import { LegWalkView } from './LegWalkView';

export const LegDesignView = memo(function LegDesignView({ design, figures, phasing }: { design: LegDesign; figures?: GaitFigures; phasing?: LegPhasing }) {
  const result = useMemo(
    () => (figures !== undefined ? { ok: true as const, figures } : gaitFigures(design.linkage, design.leg)),
    [figures, design.linkage, design.leg],
  );
  const shaft = phasing ?? design.phased;
  const title = design.name === undefined || design.name === '' ? 'Walking leg' : design.name;
  return (
    <section className="leg-views" aria-label={`${title}: gait figures and views`} data-testid="leg-design-view">
      <LegCaution />
      {result.ok ? (
        <>
          <div className="leg-views-grid">
            <LegWalkView design={design} figures={result.figures} caution={false} />
            <LegFigures figures={result.figures} />
          </div>
          <GaitPlots figures={result.figures} caution={false} />
          {shaft !== undefined && shaft.legs > 1 && <ContactDiagram figures={result.figures} phasing={shaft} caution={false} />}
        </>
      ) : (
        <p className="leg-problem" role="alert" data-testid="leg-figures-error">The gait figures cannot be taken for this design: {result.reason}.</p>
      )}
      <LegExports design={design} figures={result.ok ? result.figures : null} />
    </section>
  );
});
