/** The views of a walking leg, shown by the leg workspace. */
import './legViews.css';

export { ContactDiagram } from './ContactDiagram';
export { contactDiagramData } from './contactData';
export type { ContactData, ContactResult, ContactRow } from './contactData';
export { gaitFigureRows } from './figureRows';
export type { FigureRow } from './figureRows';
export { GaitPlots, GaitPlotsOf } from './GaitPlots';
export type { PlottedLeg } from './GaitPlots';
export { LegCaution } from './LegCaution';
export { LegCompareView, MAX_COMPARED_LEGS, MIN_COMPARED_LEGS } from './LegCompareView';
export { legCompareCsv, legCurvesCsv, LEG_CSV_COLUMNS } from './legCsv';
export { LegDesignView } from './LegDesignView';
export { LegExports, legFileStem } from './LegExports';
export { GaitConventions, LegFigures } from './LegFigures';
export { legSvg } from './legSvg';
export { LegWalkView } from './LegWalkView';
